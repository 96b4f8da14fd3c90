import type { RequestHandler } from 'express';
import type { Logger } from 'pino';

/** E-mailed tokens in URLs are logged as `[token]`. */
const TOKEN_IN_PATH = /\/(invitations|password-resets|reset-password|invitation)\/[A-Za-z0-9_-]{20,}/;

/** The URL as logged: e-mailed tokens masked. */
export function loggedUrl(url: string): string {
  return url.replace(TOKEN_IN_PATH, '/$1/[token]');
}

/**
 * One log line per API request when its answer is sent (or the client went away): method, URL
 * (tokens masked; never cookies or headers), status and time taken, at info, or error for 5xx.
 * The same lines pino-http wrote, without a child logger per request, which cost more than the
 * handlers of the common reads. The lines go through a child logger without the app logger's
 * redaction paths: a line holds nothing those paths name (no body, header or cookie), and matching
 * them on every request cost more than writing the line.
 */
export function accessLog(logger: Logger): RequestHandler {
  const lines = logger.child({}, { redact: { paths: [] } });
  return (req, res, next) => {
    if (!req.url.startsWith('/api/')) return next();
    const started = Date.now();
    let done = false;
    const finished = () => {
      if (done) return;
      done = true;
      const line = {
        req: { method: req.method, url: loggedUrl(req.originalUrl) },
        res: { statusCode: res.statusCode },
        responseTime: Date.now() - started,
      };
      if (res.statusCode >= 500) lines.error(line, 'request errored');
      else lines.info(line, res.writableFinished ? 'request completed' : 'request aborted');
    };
    // A response always closes, after its last byte is handed on or when the client went away.
    res.once('close', finished);
    next();
  };
}
