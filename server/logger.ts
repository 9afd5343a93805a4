import { pino, type Logger } from 'pino';

/** Structured JSON logs on standard output; tests pass 'silent'. */
export function createLogger(level: string): Logger {
  return pino({
    level,
    base: { app: 'tuttiboard' },
    redact: ['req.headers.authorization', 'req.headers.cookie'],
  });
}

export type { Logger };
