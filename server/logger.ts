// Structured JSON logs (pino). Cookies, CSRF tokens and passwords never reach them.
import pino from 'pino';
import type { Config } from './config';

export function createLogger(config: Pick<Config, 'LOG_LEVEL' | 'NODE_ENV'>) {
  return pino({
    level: config.NODE_ENV === 'test' ? 'silent' : config.LOG_LEVEL,
    redact: {
      paths: ['req.headers.cookie', 'req.headers["x-csrf-token"]', 'res.headers["set-cookie"]', '*.password', '*.passwordHash'],
      censor: '[hidden]',
    },
  });
}
export type Logger = ReturnType<typeof createLogger>;
