import type { Express, Response } from 'express';

/**
 * `res.json` for this app's answers, written as one string. Express's own converts a body of 1,000
 * characters or more to a Buffer, so the headers and the body leave as two chunks (a `writev`), and
 * it asks whether the request is fresh although no API answer carries a validator. This one sends
 * the same bytes and headers (`Content-Type: application/json; charset=utf-8` unless set,
 * `Content-Length`, no body for HEAD, 204 or 304) with the header block and the body in one write.
 * An answer that set an ETag or Last-Modified goes through Express's own, which may answer 304.
 */
export function useJsonAnswer(app: Express): void {
  const expressJson = app.response.json;
  app.response.json = function json(this: Response, value?: unknown): Response {
    if (this.hasHeader('etag') || this.hasHeader('last-modified')) return expressJson.call(this, value);
    const body = JSON.stringify(value) as string | undefined;
    if (!this.hasHeader('content-type')) this.setHeader('Content-Type', 'application/json; charset=utf-8');
    if (this.statusCode === 204 || this.statusCode === 304) {
      this.removeHeader('Content-Type');
      this.removeHeader('Content-Length');
      this.removeHeader('Transfer-Encoding');
      this.end();
      return this;
    }
    if (body === undefined) {
      this.end();
      return this;
    }
    this.setHeader('Content-Length', Buffer.byteLength(body));
    if (this.req.method === 'HEAD') this.end();
    else this.end(body, 'utf8');
    return this;
  };
}
