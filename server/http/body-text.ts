import { isUtf8 } from 'node:buffer';
import type { IncomingMessage } from 'node:http';
import type { RequestHandler } from 'express';
import { AppError } from '../errors';

/** Requests whose JSON body holds `\u` escapes: only their strings can carry a NUL or half a surrogate pair. */
const hasEscapes = new WeakSet<IncomingMessage>();

/** A NUL, or half of a UTF-16 surrogate pair (text no database stores as sent). */
// eslint-disable-next-line no-control-regex
const BROKEN_TEXT = /\u0000|[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/;

/** The one refusal of text that is not UTF-8, holds a NUL or half a surrogate pair: 400 `invalid_text`. */
export const brokenText = () =>
  new AppError(400, 'invalid_text', 'The request holds text that is not valid UTF-8 (or a NUL character). Send the text as UTF-8.');

/** Whether `text` holds a NUL or half a surrogate pair. */
export function isBrokenText(text: string): boolean {
  return BROKEN_TEXT.test(text);
}

/**
 * The text of bytes that must be UTF-8 without a NUL (a multipart field, a tus metadata value).
 * @throws {AppError} 400 `invalid_text` otherwise.
 */
export function textOfBytes(bytes: Buffer): string {
  if (!isUtf8(bytes) || bytes.includes(0)) throw brokenText();
  return bytes.toString('utf8');
}

/**
 * multer (busboy) options that read multipart field values and file names as Latin-1, one
 * character per byte, for {@link checkMultipartText}: busboy's UTF-8 decoder would replace bad
 * bytes with U+FFFD and pass a NUL on. (multer passes `defCharset` on; its types do not name it.)
 */
export const MULTIPART_AS_BYTES: Record<'defCharset' | 'defParamCharset', string> = { defCharset: 'latin1', defParamCharset: 'latin1' };

/**
 * The text of a multipart value read as Latin-1 ({@link MULTIPART_AS_BYTES}: no byte is replaced before this check). A value
 * with a character above U+00FF was decoded by a charset its part declared; it is only checked.
 * @throws {AppError} 400 `invalid_text` when it is not UTF-8 or holds a NUL or half a surrogate pair.
 */
export function textOfLatin1(value: string): string {
  // eslint-disable-next-line no-control-regex
  if (!/[\u0080-\uffff\u0000]/.test(value)) return value;
  if (/[\u0100-\uffff]/.test(value)) {
    if (isBrokenText(value)) throw brokenText();
    return value;
  }
  return textOfBytes(Buffer.from(value, 'latin1'));
}

/**
 * After multer: the text fields of the body and the file's name as checked UTF-8 (see
 * {@link textOfLatin1}). @throws {AppError} 400 `invalid_text`.
 */
export function checkMultipartText(req: { body?: unknown; file?: { originalname: string } }): void {
  const body = req.body as Record<string, unknown> | undefined;
  if (body && typeof body === 'object') {
    for (const [name, value] of Object.entries(body)) {
      textOfLatin1(name);
      if (typeof value === 'string') body[name] = textOfLatin1(value);
      else if (Array.isArray(value)) body[name] = value.map((v) => (typeof v === 'string' ? textOfLatin1(v) : v));
    }
  }
  if (req.file) req.file.originalname = textOfLatin1(req.file.originalname);
}

/** The bytes a request target stands for: `%XX` escapes as their byte, other characters as one byte each. */
function targetBytes(target: string): Buffer {
  const out = Buffer.allocUnsafe(target.length);
  let n = 0;
  for (let i = 0; i < target.length; i++) {
    const c = target.charCodeAt(i);
    const hex = c === 0x25 ? target.slice(i + 1, i + 3) : '';
    if (/^[0-9a-fA-F]{2}$/.test(hex)) {
      out[n++] = parseInt(hex, 16);
      i += 2;
      continue;
    }
    out[n++] = c & 0xff;
  }
  return out.subarray(0, n);
}

/**
 * A path or query whose escapes (`%00`, `%C3%28`, `%ED%A0%80`) decode to a NUL or to bytes that
 * are not UTF-8 is refused with the same 400 `invalid_text`: the query parser would otherwise
 * pass a NUL on, or replace the bytes with U+FFFD, to a search or a route.
 */
export const refuseBrokenTarget: RequestHandler = (req, _res, next) => {
  const target = req.url;
  if (!target.includes('%')) return next();
  const bytes = targetBytes(target);
  next(isUtf8(bytes) && !bytes.includes(0) ? undefined : brokenText());
};

/**
 * `verify` of the JSON body parser: a UTF-8 body must be valid UTF-8 (the decoder would otherwise
 * replace bad bytes with U+FFFD and the text would be stored mangled). Notes whether the body has
 * `\u` escapes for {@link refuseBrokenText}.
 */
export function verifyBodyText(req: IncomingMessage, _res: unknown, buf: Buffer, encoding: string | null): void {
  if ((encoding === null || encoding === 'utf-8' || encoding === 'utf8') && !isUtf8(buf)) throw brokenText();
  if (buf.includes('\\u')) hasEscapes.add(req);
}

/** After parsing: a 400 when a string (or key) of the body holds a NUL or a lone surrogate, else undefined. */
export function refuseBrokenText(req: IncomingMessage, body: unknown): AppError | undefined {
  if (!hasEscapes.has(req)) return undefined;
  return holdsBrokenText(body) ? brokenText() : undefined;
}

/** Walks the parsed body without recursion (a deeply nested body must not overflow the stack). */
function holdsBrokenText(body: unknown): boolean {
  const pending: unknown[] = [body];
  while (pending.length) {
    const value = pending.pop();
    if (typeof value === 'string') {
      if (BROKEN_TEXT.test(value)) return true;
    } else if (Array.isArray(value)) {
      for (const item of value) pending.push(item);
    } else if (value !== null && typeof value === 'object') {
      for (const [key, v] of Object.entries(value)) {
        if (BROKEN_TEXT.test(key)) return true;
        pending.push(v);
      }
    }
  }
  return false;
}
