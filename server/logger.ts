import pino, { type Logger } from 'pino';

/** JSON logs; passwords, tokens and cookies are redacted wherever they appear. */
export function createLogger(level: string): Logger {
  return pino({
    level,
    redact: {
      paths: ['password', '*.password', 'token', '*.token', 'passwordHash', '*.password_hash', 'req.headers.cookie'],
      censor: '[redacted]',
    },
  });
}
