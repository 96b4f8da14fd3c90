import { RetryKeys } from './retry-keys';

describe('RetryKeys', () => {
  it('the same content again gets the same key; other content a new one; after reset a new one', () => {
    let n = 0;
    const keys = new RetryKeys(() => `key-${++n}-abcdefgh`);
    const a = keys.for({ firstName: 'Noor', lastName: 'Plainfield' });
    expect(keys.for({ firstName: 'Noor', lastName: 'Plainfield' })).toBe(a);
    const b = keys.for({ firstName: 'Noor', lastName: 'Plainfeld' });
    expect(b).not.toBe(a);
    keys.reset();
    expect(keys.for({ firstName: 'Noor', lastName: 'Plainfeld' })).not.toBe(b);
  });

  it('makes keys the server accepts (8 to 64 letters, digits, - or _)', () => {
    expect(new RetryKeys().for({})).toMatch(/^[A-Za-z0-9_-]{8,64}$/);
  });
});
