import { isUtf8 } from 'node:buffer';
import type { IncomingMessage } from 'node:http';
import { AppError } from '../errors';

/** Requests whose JSON body holds `\u` escapes: only their strings can carry a NUL or half a surrogate pair. */
const hasEscapes = new WeakSet<IncomingMessage>();

/** A NUL, or half of a UTF-16 surrogate pair (text no database stores as sent). */
// eslint-disable-next-line no-control-regex
const BROKEN_TEXT = /\u0000|[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/;

const brokenText = () =>
  new AppError(400, 'invalid_text', 'The request holds text that is not valid UTF-8 (or a NUL character). Send the text as UTF-8.');

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
