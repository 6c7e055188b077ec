import { pino, type Logger } from 'pino';
import type { Config } from './config';

export type { Logger };

/**
 * The server's one logger: JSON lines on stdout. Its level is LOG_LEVEL's, set when the app is
 * made ('silent' in tests). Session cookies, security tokens and passwords never reach a line.
 */
export const log: Logger = pino(
  {
    level: process.env.LOG_LEVEL ?? 'info',
    base: { app: 'lashline' },
    redact: { paths: ['req.headers.cookie', 'req.headers["x-csrf-token"]', 'req.headers.authorization', 'res.headers["set-cookie"]', '*.password'], censor: '[hidden]' },
  },
  // Written as it happens: a line is out before the process can be killed after it.
  pino.destination({ dest: 1, sync: true }),
);

export function setLogLevel(level: Config['LOG_LEVEL']) {
  log.level = level;
}
