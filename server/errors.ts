import type { ErrorRequestHandler, RequestHandler } from 'express';
import { ZodError } from 'zod';
import type { Logger } from 'pino';
import { isValueRefused } from './db/dialect';

/** Base of every error the API answers on purpose; mapped once, in {@link errorHandler}. */
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
    this.name = new.target.name;
  }
}

export class BadRequestError extends AppError {
  constructor(message: string, code = 'bad_request') {
    super(400, code, message);
  }
}
export class UnauthorizedError extends AppError {
  constructor(message = 'Please sign in.', code = 'unauthorized') {
    super(401, code, message);
  }
}
export class ForbiddenError extends AppError {
  constructor(message = 'Your role does not allow this.', code = 'forbidden') {
    super(403, code, message);
  }
}
export class NotFoundError extends AppError {
  constructor(what = 'Resource') {
    super(404, 'not_found', `${what} not found.`);
  }
}
export class ConflictError extends AppError {
  constructor(message: string, code = 'conflict') {
    super(409, code, message);
  }
}
export class GoneError extends AppError {
  constructor(message: string, code: string) {
    super(410, code, message);
  }
}
export class ValidationError extends AppError {
  constructor(message: string, details: { path: (string | number)[]; message: string }[] = []) {
    super(422, 'validation_failed', message, details);
  }
}

/** Turns a zod error into our 422 with one `{ path, message }` per problem. */
export function fromZod(error: ZodError, where: string): ValidationError {
  const details = error.issues.map((i) => ({
    path: i.path.map((p) => (typeof p === 'symbol' ? String(p) : p)),
    message: i.message,
  }));
  const first = details[0];
  const summary = first ? `${where}: ${first.path.length ? first.path.join('.') + ' — ' : ''}${first.message}` : `${where} is not valid.`;
  return new ValidationError(summary, details);
}

/** 404 for any `/api` path no route answered. */
export const apiNotFound: RequestHandler = (req, _res, next) => {
  next(new AppError(404, 'not_found', `No API route for ${req.method} ${req.path}.`));
};

interface HttpishError {
  status?: number;
  statusCode?: number;
  type?: string;
  code?: string;
  expose?: boolean;
  message?: string;
}

/** The single place errors become HTTP answers: `{ error: { code, message, details? } }`. */
export function errorHandler(logger: Logger): ErrorRequestHandler {
  return (err, req, res, _next) => {
    let appError: AppError;
    if (err instanceof AppError) {
      appError = err;
    } else if (err instanceof ZodError) {
      appError = fromZod(err, 'Request');
    } else {
      const e = err as HttpishError;
      const status = e.status ?? e.statusCode;
      if (e.type === 'entity.parse.failed') {
        appError = new AppError(400, 'malformed_json', 'The request body is not valid JSON.');
      } else if (e.type === 'entity.too.large') {
        appError = new AppError(413, 'payload_too_large', 'The request body is too large.');
      } else if (e.code === 'EBADCSRFTOKEN' || (status === 403 && /csrf/i.test(e.message ?? ''))) {
        appError = new AppError(
          403,
          'csrf_invalid',
          'This page is out of date, or you were signed out. Reload the page, sign in again if asked, and try again.',
        );
      } else if (isValueRefused(err)) {
        appError = new AppError(400, 'value_refused', 'A value is out of range or too long for its field.');
      } else if (status && status >= 400 && status < 500 && e.expose !== false) {
        appError = new AppError(status, 'bad_request', e.message || 'Bad request.');
      } else {
        logger.error({ err, method: req.method, url: req.originalUrl }, 'unhandled error');
        appError = new AppError(500, 'internal', 'Something went wrong on our side. Please try again.');
      }
    }
    if (res.headersSent) return;
    const body: { error: { code: string; message: string; details?: unknown } } = {
      error: { code: appError.code, message: appError.message },
    };
    if (appError.details !== undefined) body.error.details = appError.details;
    res.status(appError.status).json(body);
  };
}
