import { PGlite } from '@electric-sql/pglite';
import { amcheck } from '@electric-sql/pglite/contrib/amcheck';
import { acquireDataDirLock } from '../../../server/db/data-lock.js';
import { pgliteDirOf } from '../../../server/db/client.js';

/** What the direct look into a data folder found. */
export interface FolderCheck {
  /** Tables of the public schema whose heap pages verify_heapam read without complaint. */
  tablesChecked: number;
  /** B-tree indexes that bt_index_check found consistent, every heap row present in them. */
  indexesChecked: number;
}

/**
 * Opens a server's PGlite folder directly (server stopped; takes the folder lock like the
 * server does) and checks it with PostgreSQL's own amcheck: every heap page of every table
 * (TOAST included) and every b-tree index, with heapallindexed so a row missing from an
 * index is found too. `inspect` then runs its own queries on the open database. Whatever is
 * wrong goes to `problems`; a folder that does not open at all is a problem too.
 */
export async function checkDataFolder(dataDir: string, problems: string[], inspect?: (db: PGlite) => Promise<void>): Promise<FolderCheck> {
  const result: FolderCheck = { tablesChecked: 0, indexesChecked: 0 };
  const lock = acquireDataDirLock(dataDir);
  let db: PGlite | undefined;
  try {
    db = new PGlite(pgliteDirOf(dataDir), { extensions: { amcheck } });
    await db.waitReady;
    await db.exec('CREATE EXTENSION IF NOT EXISTS amcheck');
    const tables = await db.query<{ name: string }>(
      `SELECT c.oid::regclass::text AS name FROM pg_class c JOIN pg_namespace n ON n.oid = c.relnamespace
       WHERE n.nspname = 'public' AND c.relkind = 'r' ORDER BY 1`,
    );
    for (const { name } of tables.rows) {
      const corrupt = await db.query<{ blkno: number; msg: string }>('SELECT blkno, msg FROM verify_heapam($1::regclass, check_toast => true)', [name]);
      for (const c of corrupt.rows) problems.push(`table ${name}, block ${c.blkno}: ${c.msg}`);
      result.tablesChecked++;
    }
    const indexes = await db.query<{ name: string }>(
      `SELECT c.oid::regclass::text AS name FROM pg_index i JOIN pg_class c ON c.oid = i.indexrelid
       JOIN pg_am a ON a.oid = c.relam JOIN pg_namespace n ON n.oid = c.relnamespace
       WHERE a.amname = 'btree' AND n.nspname = 'public' ORDER BY 1`,
    );
    for (const { name } of indexes.rows) {
      try {
        await db.query('SELECT bt_index_check($1::regclass, true)', [name]);
        result.indexesChecked++;
      } catch (error) {
        problems.push(`index ${name}: ${error instanceof Error ? error.message : String(error)}`);
      }
    }
    if (tables.rows.length === 0) problems.push(`${dataDir}: the database has no tables`);
    await inspect?.(db);
  } catch (error) {
    problems.push(`${dataDir} does not open cleanly: ${error instanceof Error ? error.message : String(error)}`);
  } finally {
    await db?.close().catch(() => undefined);
    lock.release();
  }
  return result;
}
