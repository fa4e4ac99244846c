import pino, { type Logger } from 'pino';

export type { Logger };

/** The server's one logger (JSON lines on stdout). Tests pass level 'silent'. */
export function createLogger(level: string): Logger {
  return pino({ level, base: { app: 'cogbook' }, redact: ['req.headers.cookie', 'req.headers.authorization', 'res.headers["set-cookie"]'] });
}
