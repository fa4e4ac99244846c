import { join } from 'node:path';
import { PGlite } from '@electric-sql/pglite';
import type { PgDatabase, PgQueryResultHKT } from 'drizzle-orm/pg-core';
import { drizzle as drizzlePglite } from 'drizzle-orm/pglite';
import { migrate as migratePglite } from 'drizzle-orm/pglite/migrator';
import { drizzle as drizzlePg } from 'drizzle-orm/node-postgres';
import { migrate as migratePg } from 'drizzle-orm/node-postgres/migrator';
import pg from 'pg';
import * as schema from './schema.js';

/** A Drizzle handle over either driver; repositories take this. */
export type Db = PgDatabase<PgQueryResultHKT, typeof schema>;

/** An open database and how to close it. */
export interface Database {
  db: Db;
  kind: 'pglite' | 'postgres';
  close(): Promise<void>;
  /** The PGlite instance, when that is the driver (tests dump it as a snapshot). */
  pglite?: PGlite;
}

export interface OpenDatabaseOptions {
  /** postgres:// URL; when absent PGlite is used. */
  databaseUrl?: string | undefined;
  /** PGlite data folder; omitted = in memory (tests). */
  pgliteDir?: string | undefined;
  /** Folder with drizzle-kit's SQL migrations; when given, pending migrations are applied. */
  migrationsFolder?: string | undefined;
  /** Start an in-memory PGlite from a dump (PGlite's dumpDataDir), much faster than a fresh one. */
  pgliteSnapshot?: Blob | undefined;
}

// Any number: it only has to be the same for every Cogbook process sharing a database.
const MIGRATION_LOCK_KEY = 0x636f6762;

/**
 * Opens PostgreSQL (node-postgres pool) when a URL is given, otherwise PGlite, and
 * applies pending migrations. PGlite has no lock between processes: the caller must
 * hold the data-folder lock (see data-lock.ts) before opening a folder.
 */
export async function openDatabase(options: OpenDatabaseOptions): Promise<Database> {
  if (options.databaseUrl) {
    const pool = new pg.Pool({ connectionString: options.databaseUrl, max: 10 });
    const db = drizzlePg(pool, { schema });
    if (options.migrationsFolder) {
      // Several app processes may start at once on one server: migrate one at a time.
      const lockClient = await pool.connect();
      try {
        await lockClient.query('SELECT pg_advisory_lock($1)', [MIGRATION_LOCK_KEY]);
        await migratePg(db, { migrationsFolder: options.migrationsFolder });
      } finally {
        await lockClient.query('SELECT pg_advisory_unlock($1)', [MIGRATION_LOCK_KEY]).catch(() => undefined);
        lockClient.release();
      }
    }
    return { db: db as unknown as Db, kind: 'postgres', close: () => pool.end() };
  }
  const client = options.pgliteDir
    ? new PGlite(options.pgliteDir)
    : new PGlite(options.pgliteSnapshot ? { loadDataDir: options.pgliteSnapshot } : {});
  const db = drizzlePglite(client, { schema });
  if (options.migrationsFolder) await migratePglite(db, { migrationsFolder: options.migrationsFolder });
  return { db: db as unknown as Db, kind: 'pglite', close: () => client.close(), pglite: client };
}

/** Where PGlite keeps its files inside DATA_DIR. */
export function pgliteDirOf(dataDir: string): string {
  return join(dataDir, 'pg');
}
