import pino, { type Logger } from 'pino';

/** Structured JSON logs on stdout; `LOG_LEVEL=silent` in tests. */
export function createLogger(level: string): Logger {
  return pino({ level, base: { app: 'titrata' }, redact: ['req.headers.authorization', 'password', '*.password'] });
}
