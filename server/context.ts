import type { Auth } from './auth.js';
import type { Config } from './config.js';
import type { Database } from './db/client.js';
import type { Logger } from './logger.js';
import type { Mailer } from './mail/mailer.js';

/** What createApp needs from outside: nothing here opens files, ports or connections. */
export interface AppDeps {
  database: Database;
  config: Config;
  mailer: Mailer;
  logger: Logger;
  /** Reported by /api/health; defaults to package.json's version. */
  version?: string;
}

/** Dependencies plus the things createApp builds from them, as routes see them. */
export interface AppContext extends AppDeps {
  auth: Auth;
  version: string;
}
