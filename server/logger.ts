// Structured JSON logs (pino). Cookies, CSRF tokens and passwords never reach them.
import pino from 'pino';
import type { Config } from './config';

// Tests are silent unless they give a destination to read the lines from.
export function createLogger(config: Pick<Config, 'LOG_LEVEL' | 'NODE_ENV'>, destination?: pino.DestinationStream) {
  const options: pino.LoggerOptions = {
    level: config.NODE_ENV === 'test' && !destination ? 'silent' : config.LOG_LEVEL,
    redact: {
      paths: [
        'req.headers.cookie',
        'req.headers.authorization',
        'req.headers["x-csrf-token"]',
        'res.headers["set-cookie"]',
        '*.password',
        '*.currentPassword',
        '*.newPassword',
        '*.passwordHash',
      ],
      censor: '[hidden]',
    },
  };
  return destination ? pino(options, destination) : pino(options);
}
export type Logger = ReturnType<typeof createLogger>;
