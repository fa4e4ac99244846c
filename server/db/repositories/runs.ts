import { and, asc, desc, eq, sql } from 'drizzle-orm';
import type { Db } from '../client.js';
import { notebookRun, user } from '../schema.js';

export interface RunBindingRecord {
  slot: string;
  uploadId: string;
  fileName: string;
}

export interface RunRecord {
  id: string;
  notebookId: string;
  revision: number;
  label: string | null;
  bindings: RunBindingRecord[];
  cellCount: number;
  failedCells: number;
  durationMs: number;
  createdBy: string | null;
  createdByName: string | null;
  createdAt: Date;
}

const summaryColumns = {
  id: notebookRun.id,
  notebookId: notebookRun.notebookId,
  revision: notebookRun.revision,
  label: notebookRun.label,
  bindings: sql<RunBindingRecord[]>`${notebookRun.bindings}`,
  cellCount: notebookRun.cellCount,
  failedCells: notebookRun.failedCells,
  durationMs: notebookRun.durationMs,
  createdBy: notebookRun.createdBy,
  createdByName: user.name,
  createdAt: notebookRun.createdAt,
};

export async function insertRun(
  db: Db,
  input: Omit<RunRecord, 'id' | 'createdAt' | 'createdByName'> & { snapshot: unknown },
): Promise<string> {
  const [row] = await db.insert(notebookRun).values(input).returning({ id: notebookRun.id });
  return row!.id;
}

/** Runs of a notebook without their snapshots, newest first (oldest first with `oldestFirst`). */
export async function listRuns(db: Db, notebookId: string, oldestFirst = false): Promise<RunRecord[]> {
  const order = oldestFirst ? [asc(notebookRun.createdAt), asc(notebookRun.id)] : [desc(notebookRun.createdAt), desc(notebookRun.id)];
  return db
    .select(summaryColumns)
    .from(notebookRun)
    .leftJoin(user, eq(user.id, notebookRun.createdBy))
    .where(eq(notebookRun.notebookId, notebookId))
    .orderBy(...order);
}

export async function findRun(db: Db, runId: string): Promise<(RunRecord & { snapshot: unknown }) | undefined> {
  const rows = await db
    .select({ ...summaryColumns, snapshot: notebookRun.snapshot })
    .from(notebookRun)
    .leftJoin(user, eq(user.id, notebookRun.createdBy))
    .where(eq(notebookRun.id, runId));
  return rows[0];
}

/**
 * Each run's value at a JSON path inside its snapshot, oldest first. The database
 * picks the one cell out of each snapshot, so comparing many runs never loads them whole.
 */
export async function listRunCells(db: Db, notebookId: string, cellName: string): Promise<(RunRecord & { cell: unknown })[]> {
  const cell = sql<unknown>`(select c from jsonb_array_elements(${notebookRun.snapshot} -> 'cells') as c where c ->> 'name' = ${cellName} limit 1)`;
  return db
    .select({ ...summaryColumns, cell })
    .from(notebookRun)
    .leftJoin(user, eq(user.id, notebookRun.createdBy))
    .where(and(eq(notebookRun.notebookId, notebookId)))
    .orderBy(asc(notebookRun.createdAt), asc(notebookRun.id));
}

/** The newest run's snapshot, if the notebook has any run. */
export async function latestRunSnapshot(db: Db, notebookId: string): Promise<{ snapshot: unknown; createdAt: Date } | undefined> {
  const rows = await db
    .select({ snapshot: notebookRun.snapshot, createdAt: notebookRun.createdAt })
    .from(notebookRun)
    .where(eq(notebookRun.notebookId, notebookId))
    .orderBy(desc(notebookRun.createdAt), desc(notebookRun.id))
    .limit(1);
  return rows[0];
}
