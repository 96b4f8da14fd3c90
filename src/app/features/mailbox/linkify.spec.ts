import { linkify, sameOriginPath } from './linkify';

describe('linkify', () => {
  it('returns plain text as one segment', () => {
    expect(linkify('Hello there')).toEqual([{ kind: 'text', text: 'Hello there' }]);
  });

  it('turns http and https addresses into links and keeps the text around them', () => {
    expect(linkify('Open http://localhost:3000/invitation/abc123 to join.')).toEqual([
      { kind: 'text', text: 'Open ' },
      { kind: 'link', text: 'http://localhost:3000/invitation/abc123', href: 'http://localhost:3000/invitation/abc123' },
      { kind: 'text', text: ' to join.' },
    ]);
  });

  it('leaves sentence punctuation and brackets outside the link', () => {
    const segments = linkify('(see https://example.test/a?b=1).');
    expect(segments[1]).toEqual({ kind: 'link', text: 'https://example.test/a?b=1', href: 'https://example.test/a?b=1' });
    expect(segments[2]).toEqual({ kind: 'text', text: ').' });
  });

  it('never turns other schemes into links', () => {
    const segments = linkify('javascript:alert(1) and <b>bold</b>');
    expect(segments).toEqual([{ kind: 'text', text: 'javascript:alert(1) and <b>bold</b>' }]);
  });

  it('handles several links and line breaks', () => {
    const segments = linkify('a https://one.test\nb https://two.test/x');
    expect(segments.filter((s) => s.kind === 'link').map((s) => s.text)).toEqual([
      'https://one.test',
      'https://two.test/x',
    ]);
  });
});

describe('sameOriginPath', () => {
  it('gives the path for links into this app', () => {
    expect(sameOriginPath('http://localhost:3000/reset-password/t?x=1#y', 'http://localhost:3000')).toBe(
      '/reset-password/t?x=1#y',
    );
  });

  it('gives null for other origins and for nonsense', () => {
    expect(sameOriginPath('https://elsewhere.test/a', 'http://localhost:3000')).toBeNull();
    expect(sameOriginPath('not a url', 'http://localhost:3000')).toBeNull();
  });
});
