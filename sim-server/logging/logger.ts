import { pino, type Logger } from 'pino';

/** Structured JSON logs on stdout, one object a line. */
export function createLogger(level: string): Logger {
  return pino({ level, base: { app: 'kinetwin' }, redact: ['req.headers.cookie', 'password', '*.password'] });
}

export type { Logger };
