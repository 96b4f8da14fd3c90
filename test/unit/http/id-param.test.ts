/**
 * `idParam` (server/http/validate.ts): the plain-digits short way answers exactly what the schema
 * answers, for any text a route parameter can hold (property check against `IdParam`).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { IdParam, RouteIndex, idParam } from '../../../server/http/validate';

/** What the schema alone answers: the id, or "not found". */
const bySchema = (id: string): number | 'not found' => {
  const r = IdParam.safeParse({ id });
  return r.success ? r.data.id : 'not found';
};
const answer = (id: string): number | 'not found' => {
  try {
    return idParam({ id }, 'Clip');
  } catch {
    return 'not found';
  }
};

describe('idParam', () => {
  it('answers what the schema answers for ids, odd numbers and text', () => {
    for (const id of [
      '1',
      '42',
      '007',
      '0',
      '-3',
      '1.0',
      '1e3',
      ' 12',
      '0x10',
      '9007199254740991',
      '9007199254740992',
      '99999999999999999',
      '',
      'abc',
    ])
      expect(answer(id), id).toEqual(bySchema(id));
  });

  it('answers what the schema answers for any text (property check)', () => {
    const digits = fc.stringMatching(/^[0-9]{1,18}$/);
    fc.assert(
      fc.property(fc.oneof(digits, fc.string(), fc.integer().map(String), fc.double().map(String)), (id) => {
        expect(answer(id)).toEqual(bySchema(id));
      }),
      { numRuns: 2000 },
    );
  });

  it('a missing or non-text id is "not found"', () => {
    expect(() => idParam({}, 'Clip')).toThrow();
    expect(() => idParam(null, 'Clip')).toThrow();
    expect(() => idParam({ id: 5 }, 'Clip')).not.toThrow();
  });

  it('finds a resource at its one URL only: a sign, leading zero, space, fraction, exponent or hex is "not found"', () => {
    for (const id of ['+1', '01', '007', ' 1', '1 ', '1.0', '1e0', '0x1', '1_000', '١']) expect(answer(id), id).toBe('not found');
    expect(answer('1')).toBe(1);
    expect(answer('9007199254740991')).toBe(Number.MAX_SAFE_INTEGER);
  });

  it('a frame number is 0 or digits without a leading zero, within its limit', () => {
    const frame = RouteIndex(100);
    expect(['0', '7', '100'].map((n) => frame.safeParse(n).data)).toEqual([0, 7, 100]);
    for (const n of ['00', '007', '-0', '+1', '1.0', '101', ' 1', '']) expect(frame.safeParse(n).success, n).toBe(false);
  });
});
