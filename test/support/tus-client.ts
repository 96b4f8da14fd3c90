/**
 * The tus 1.0.0 requests a resumable-upload client sends, by hand over node:http, so tests can
 * cut a connection part-way through a PATCH. Requests carry a signed-in session's cookies and
 * CSRF header (see `signIn` in test/bench/support/bench-server.ts).
 */
import crypto from 'node:crypto';
import fs from 'node:fs';
import http from 'node:http';

export interface TusSession {
  cookie: string;
  xsrf: string;
}

export interface TusAnswer {
  status: number;
  headers: http.IncomingHttpHeaders;
  body: string;
}

/** One request without keep-alive (a cut connection must not be reused). */
function send(url: string, method: string, headers: Record<string, string>, body?: Buffer): Promise<TusAnswer> {
  return new Promise((resolve, reject) => {
    const req = http.request(url, { method, headers: { connection: 'close', ...headers }, agent: false }, (res) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(chunks).toString('utf8') }));
      res.on('error', reject);
    });
    req.on('error', reject);
    req.end(body);
  });
}

const b64 = (s: string) => Buffer.from(s, 'utf8').toString('base64');

/** Headers of a tus request in this session (`csrf: false` leaves the CSRF header out). */
export function tusHeaders(s: TusSession, extra: Record<string, string> = {}, csrf = true): Record<string, string> {
  return { cookie: s.cookie, 'tus-resumable': '1.0.0', ...(csrf ? { 'x-xsrf-token': s.xsrf } : {}), ...extra };
}

/** POST: creates an upload of `length` bytes; `location` is its absolute URL when created. */
export async function tusCreate(
  base: string,
  s: TusSession,
  assessmentId: number,
  length: number | string,
  opts: { filename?: string; csrf?: boolean } = {},
): Promise<TusAnswer & { location: string | null }> {
  const res = await send(
    `${base}/api/assessments/${assessmentId}/clip-uploads`,
    'POST',
    tusHeaders(
      s,
      { 'upload-length': String(length), 'upload-metadata': `filename ${b64(opts.filename ?? 'clip.mp4')},filetype ${b64('video/mp4')}` },
      opts.csrf ?? true,
    ),
  );
  const location = typeof res.headers.location === 'string' ? new URL(res.headers.location, base).toString() : null;
  return { ...res, location };
}

/** HEAD: the upload's offset (bytes the server holds) and length. */
export async function tusHead(s: TusSession, url: string): Promise<TusAnswer & { offset: number; length: number }> {
  const res = await send(url, 'HEAD', tusHeaders(s));
  return { ...res, offset: Number(res.headers['upload-offset'] ?? NaN), length: Number(res.headers['upload-length'] ?? NaN) };
}

/** PATCH: sends `file`'s bytes from `offset` to the end in one request. */
export async function tusPatch(
  s: TusSession,
  url: string,
  file: string,
  offset: number,
  opts: { csrf?: boolean } = {},
): Promise<TusAnswer> {
  const bytes = (await fs.promises.readFile(file)).subarray(offset);
  return send(
    url,
    'PATCH',
    tusHeaders(s, { 'upload-offset': String(offset), 'content-type': 'application/offset+octet-stream' }, opts.csrf ?? true),
    bytes,
  );
}

/**
 * PATCH that declares the bytes from `offset` to the end but sends only up to `cutAt`, waits until
 * they are on the wire, then drops the connection (as a phone losing its network does).
 */
export async function tusPatchCut(s: TusSession, url: string, file: string, offset: number, cutAt: number, settleMs = 400): Promise<void> {
  const held = await tusPatchHeld(s, url, file, offset, cutAt);
  await new Promise((r) => setTimeout(r, settleMs));
  held.drop();
  // The server notices the drop and releases the upload.
  await new Promise((r) => setTimeout(r, 200));
}

/**
 * Starts a PATCH of the bytes from `offset` and sends only up to `holdAt`, keeping the connection
 * open (for killing the server mid-upload). Resolves once those bytes are written; `drop` ends it.
 */
export async function tusPatchHeld(s: TusSession, url: string, file: string, offset: number, holdAt: number): Promise<{ drop(): void }> {
  const all = await fs.promises.readFile(file);
  const req = http.request(url, {
    method: 'PATCH',
    agent: false,
    headers: tusHeaders(s, {
      'upload-offset': String(offset),
      'content-type': 'application/offset+octet-stream',
      'content-length': String(all.length - offset),
    }),
  });
  req.on('error', () => undefined);
  await new Promise<void>((resolve) => req.write(all.subarray(offset, holdAt), () => resolve()));
  return { drop: () => req.destroy() };
}

/** SHA-256 of a file, hex. */
export async function sha256(file: string): Promise<string> {
  return crypto
    .createHash('sha256')
    .update(await fs.promises.readFile(file))
    .digest('hex');
}
