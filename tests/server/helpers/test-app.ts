import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { sql } from 'drizzle-orm';
import supertest from 'supertest';
import { createDatabase } from '../../../bench/load/postgres.js';
import { createApp, type AppHandle } from '../../../server/app.js';
import { loadConfig, type Config } from '../../../server/config.js';
import { openDatabase, type Database } from '../../../server/db/client.js';
import { createLogger } from '../../../server/logger.js';
import { createSmtpMailer, type Mailer } from '../../../server/mail/mailer.js';
import { startSmtpCatcher, type SmtpCatcher } from '../../../server/mail/smtp-catcher.js';
import { storeCaughtMail } from '../../../server/services/outbox.js';

export const ROOT_DIR = join(import.meta.dirname, '..', '..', '..');
export const TEST_PASSWORD = 'test-password-1';

const MIGRATIONS = join(ROOT_DIR, 'drizzle');

/**
 * A fresh in-memory PGlite costs seconds to create and migrate; loading a dump of an
 * already migrated one is much faster. The dump is cached in .tmp/, keyed by the
 * migration files, so a new migration makes a new dump.
 */
async function openMigratedPglite(): Promise<Database> {
  const hash = createHash('sha256');
  for (const f of readdirSync(MIGRATIONS).filter((n) => n.endsWith('.sql')).sort()) hash.update(f).update(readFileSync(join(MIGRATIONS, f)));
  const file = join(ROOT_DIR, '.tmp', `test-pglite-${hash.digest('hex').slice(0, 16)}.tar.gz`);
  if (existsSync(file)) {
    return openDatabase({ pgliteSnapshot: new Blob([readFileSync(file)]), migrationsFolder: MIGRATIONS });
  }
  const database = await openDatabase({ migrationsFolder: MIGRATIONS });
  const dump = await database.pglite!.dumpDataDir('gzip');
  mkdirSync(join(ROOT_DIR, '.tmp'), { recursive: true });
  const tmp = `${file}.${process.pid}`;
  writeFileSync(tmp, new Uint8Array(await dump.arrayBuffer()));
  renameSync(tmp, file);
  return database;
}

export interface TestApp extends AppHandle {
  database: Database;
  config: Config;
  mailer: Mailer;
  /** The same database and mail with other settings (e.g. a low sign-in limit). */
  appWith(overrides: Partial<Config>): AppHandle;
  /** Empties every table (between tests). */
  reset(): Promise<void>;
  close(): Promise<void>;
}

/**
 * The real app on a real, migrated database: in-memory PGlite, or a fresh database
 * on the PostgreSQL server named by DATABASE_URL (dropped again on close). Mail goes
 * through the real SMTP catcher into mail_message. Open once per test file.
 */
export async function createTestApp(env: Record<string, string> = {}): Promise<TestApp> {
  const dataDir = mkdtempSync(join(tmpdir(), 'cogbook-test-'));
  const config = loadConfig({
    DATA_DIR: dataDir,
    AUTH_SECRET: 'test-secret-test-secret-test-secret-0123',
    BASE_URL: 'http://localhost:3000',
    LOG_LEVEL: 'silent',
    SIGN_IN_LIMIT: '10000',
    UPLOAD_LIMIT_MB: '1',
    ...env,
  });
  const pgTarget = process.env.DATABASE_URL ? await createDatabase(process.env.DATABASE_URL, 'cogbook_test') : undefined;
  const database = pgTarget
    ? await openDatabase({ databaseUrl: pgTarget.url, migrationsFolder: MIGRATIONS })
    : await openMigratedPglite();
  const logger = createLogger('silent');
  const catcher: SmtpCatcher = await startSmtpCatcher((m) => storeCaughtMail(database.db, m), logger);
  const mailer = createSmtpMailer(catcher.url, 'Cogbook <cogbook@localhost>');
  const handle = createApp({ database, config, mailer, logger, version: 'test' });
  return {
    ...handle,
    database,
    config,
    mailer,
    appWith(overrides) {
      return createApp({ database, config: { ...config, ...overrides }, mailer, logger, version: 'test' });
    },
    async reset() {
      await database.db.execute(
        sql.raw(
          'TRUNCATE TABLE "user", session, account, verification, workspace, workspace_member, notebook, notebook_revision, notebook_access, upload, upload_link, mail_message CASCADE',
        ),
      );
    },
    async close() {
      mailer.close();
      await catcher.close();
      await database.close();
      await pgTarget?.drop();
      rmSync(dataDir, { recursive: true, force: true });
    },
  };
}


export type Agent = ReturnType<typeof supertest.agent>;

/** Signs up a new account and returns an agent holding its session cookie, plus the user id. */
export async function signUp(t: TestApp, email: string, name = email.split('@')[0]!): Promise<{ agent: Agent; userId: string }> {
  const agent = supertest.agent(t.app);
  const res = await agent.post('/api/auth/sign-up/email').send({ email, password: TEST_PASSWORD, name });
  if (res.status !== 200) throw new Error(`sign-up of ${email} failed: ${res.status} ${res.text}`);
  return { agent, userId: (res.body as { user: { id: string } }).user.id };
}

/** The id of the caller's personal workspace. */
export async function personalWorkspaceOf(agent: Agent): Promise<string> {
  const res = await agent.get('/api/workspaces');
  const ws = (res.body as { workspaces: { id: string; personal: boolean }[] }).workspaces.find((w) => w.personal);
  if (!ws) throw new Error('no personal workspace');
  return ws.id;
}
