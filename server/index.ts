import type { Server } from 'node:http';
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { createApp } from './app.js';
import { loadConfig } from './config.js';
import { openDatabase, pgliteDirOf, type Database } from './db/client.js';
import { acquireDataDirLock, DataDirLockedError, type DataDirLock } from './db/data-lock.js';
import { createLogger } from './logger.js';
import { createSmtpMailer, type Mailer } from './mail/mailer.js';
import { startSmtpCatcher, type SmtpCatcher } from './mail/smtp-catcher.js';
import { findUserByEmail } from './db/repositories/users.js';
import { storeCaughtMail } from './services/outbox.js';
import { DEMO_ACCOUNTS, DEMO_PASSWORD, seedDemo } from './services/seed.js';
import { startupErrorLine } from './startup-error.js';
import { bindBlobStore, openObjectStore } from './storage/open-blob-store.js';

/** Starts Cogbook: lock, database, migrations, mail, seed, HTTP. Stops cleanly on SIGINT/SIGTERM. */
async function main(): Promise<void> {
  const config = loadConfig();
  const logger = createLogger(config.logLevel);
  mkdirSync(config.dataDir, { recursive: true });

  let lock: DataDirLock | undefined;
  if (!config.databaseUrl) {
    try {
      lock = acquireDataDirLock(config.dataDir);
    } catch (error) {
      if (error instanceof DataDirLockedError) {
        process.stderr.write(`cogbook: ${error.message}\n`);
        process.exit(2);
      }
      throw error;
    }
  }

  let database: Database | undefined;
  let catcher: SmtpCatcher | undefined;
  let mailer: Mailer | undefined;
  let server: Server | undefined;
  let stopping = false;
  const stop = async (signal: string) => {
    if (stopping) return;
    stopping = true;
    logger.info({ signal }, 'shutting down');
    const force = setTimeout(() => server?.closeAllConnections(), 5000);
    force.unref();
    if (server) await new Promise<void>((resolve) => server!.close(() => resolve()));
    mailer?.close();
    await catcher?.close();
    await database?.close();
    lock?.release();
    process.exit(0);
  };
  process.on('SIGINT', () => void stop('SIGINT'));
  process.on('SIGTERM', () => void stop('SIGTERM'));
  process.on('exit', () => lock?.release());

  // Before the database: a wrong bucket fails fast, and no PGlite folder is opened for nothing.
  const objectStore = await openObjectStore(config.s3);
  database = await openDatabase({
    databaseUrl: config.databaseUrl,
    pgliteDir: config.databaseUrl ? undefined : pgliteDirOf(config.dataDir),
    migrationsFolder: join(config.rootDir, 'drizzle'),
  });
  const db = database.db;
  const blobs = bindBlobStore(db, objectStore);
  if (config.smtpUrl) {
    mailer = createSmtpMailer(config.smtpUrl, config.mailFrom);
  } else {
    catcher = await startSmtpCatcher((m) => storeCaughtMail(db, m), logger);
    mailer = createSmtpMailer(catcher.url, config.mailFrom);
  }

  const { app, auth } = createApp({ database, config, mailer, logger });
  const seeded = config.seedDemo ? await seedDemo({ db, auth, logger }) : null;

  server = app.listen(config.port, config.host);
  await new Promise<void>((resolve, reject) => {
    server!.once('listening', resolve);
    server!.once('error', reject);
  });
  const address = server.address();
  const port = typeof address === 'object' && address ? address.port : config.port;
  const shownHost = config.host === '0.0.0.0' || config.host === '::' ? 'localhost' : config.host;
  const lines = [
    `Cogbook is running at http://${shownHost}:${port}  (database: ${database.kind}${lock ? `, data in ${config.dataDir}` : ''})`,
    ...(config.databaseUrl && !process.env.AUTH_SECRET
      ? [`Note: AUTH_SECRET is not set; this process uses ${config.dataDir}/secret. Give every process sharing the database the same AUTH_SECRET.`]
      : []),
    ...(blobs.kind === 's3' ? [`Uploads are stored in ${blobs.location}.`] : []),
    catcher ? `Mail is caught locally (no SMTP_URL): workspace admins read it under /api/outbox.` : `Mail goes out through SMTP_URL.`,
  ];
  if (seeded || (await findUserByEmail(db, DEMO_ACCOUNTS[0]!.email))) {
    lines.push(`Demo sign-ins (password "${DEMO_PASSWORD}"): ${DEMO_ACCOUNTS.map((a) => a.email).join(', ')}`);
  }
  process.stdout.write(`${lines.join('\n')}\n`);
}

main().catch((error: unknown) => {
  process.stderr.write(`cogbook: could not start: ${startupErrorLine(error, process.env)}\n`);
  if (/^(debug|trace)$/.test(process.env.LOG_LEVEL ?? '') && error instanceof Error) process.stderr.write(`${error.stack}\n`);
  process.exit(1);
});
