import { encodeExtended } from 'content-disposition';

/** Longest display name kept, in characters (code points). */
export const FILE_NAME_MAX = 200;
/** An extension of at most this many characters survives shortening. */
const EXTENSION_MAX = 16;

/**
 * C0 and C1 control characters, DEL, and the bidirectional formatting characters (embeddings,
 * overrides, isolates, marks) that can make `clip‮4pm.exe` read as something else.
 */
// eslint-disable-next-line no-control-regex
const UNSAFE = /[\u0000-\u001f\u007f-\u009f\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069]/g;

/** Half of a surrogate pair without its other half (not text; cannot be encoded). */
const LONE_SURROGATE = /[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/g;

/**
 * Keeps a display name only: no folders, no control or bidi formatting characters, NFC, at most
 * {@link FILE_NAME_MAX} characters with the extension kept when shortened; `clip` when nothing
 * is left. Pure.
 */
export function cleanFileName(name: string): string {
  const base = (name.replace(/\\/g, '/').split('/').pop() ?? '').normalize('NFC').replace(UNSAFE, '').trim();
  const chars = [...base.replace(LONE_SURROGATE, '')];
  if (chars.length <= FILE_NAME_MAX) return chars.join('') || 'clip';
  const dot = chars.lastIndexOf('.');
  const ext = dot > 0 && chars.length - dot <= EXTENSION_MAX ? chars.slice(dot) : [];
  const stem = chars
    .slice(0, FILE_NAME_MAX - ext.length)
    .join('')
    .trimEnd();
  return stem + ext.join('');
}

/** An ASCII stand-in for old clients: accents dropped, anything else non-ASCII or quoting → `_`. */
export function asciiFileName(name: string): string {
  return (
    name
      .normalize('NFKD')
      .replace(/[\u0300-\u036f]/g, '')
      .replace(/[^\x20-\x7e]|["\\%]/g, '_')
      .trim() || 'download'
  );
}

/**
 * `Content-Disposition` for a file of this name (RFC 6266): a quoted ASCII `filename` for old
 * clients (`ascii`, or one made from the name) and the exact name in `filename*` (RFC 8187 UTF-8
 * percent-encoding, by the `content-disposition` package).
 */
export function contentDisposition(name: string, type: 'attachment' | 'inline' = 'attachment', ascii = asciiFileName(name)): string {
  return `${type}; filename="${asciiFileName(ascii)}"; filename*=${encodeExtended(name)}`;
}
