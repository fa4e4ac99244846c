import type { CreateRunBody, RunCompareResponse, RunCompareRow, RunResponse, RunSummary } from '../../shared/api/runs.js';
import type { Snapshot } from '../../shared/api/snapshots.js';
import type { Db } from '../db/client.js';
import { findNotebookForUser } from '../db/repositories/notebooks.js';
import * as repo from '../db/repositories/runs.js';
import { AppError, notFound } from '../errors.js';
import { assertNotebook, type NotebookAction } from './policy.js';
import { computeSnapshot, resolveBindings, revisionDocument } from './snapshot.js';

/** Computes the notebook's current revision on the server on the given uploads and stores the run. */
export async function createRun(db: Db, userId: string, notebookId: string, body: CreateRunBody): Promise<RunResponse> {
  const nb = await reach(db, userId, notebookId, 'edit');
  const document = await revisionDocument(db, notebookId, nb.currentRevision);
  const bindings = await resolveBindings(db, document, body.bindings, userId);
  const { snapshot, bindings: records } = await computeSnapshot(db, document, nb.currentRevision, bindings);
  const id = await repo.insertRun(db, {
    notebookId,
    revision: nb.currentRevision,
    label: body.label ? body.label : null,
    bindings: records,
    snapshot,
    cellCount: snapshot.cells.length,
    failedCells: snapshot.cells.filter((c) => c.state === 'failed').length,
    durationMs: Math.round(snapshot.durationMs),
    createdBy: userId,
  });
  return getRun(db, userId, id);
}

export async function listRuns(db: Db, userId: string, notebookId: string): Promise<RunSummary[]> {
  await reach(db, userId, notebookId, 'read');
  return (await repo.listRuns(db, notebookId)).map(toSummary);
}

export async function getRun(db: Db, userId: string, runId: string): Promise<RunResponse> {
  const run = await repo.findRun(db, runId);
  if (!run) throw notFound('Run');
  await reach(db, userId, run.notebookId, 'read', 'Run');
  return { ...toSummary(run), snapshot: run.snapshot as Snapshot };
}

/** One output across every run of a notebook, oldest first. */
export async function compareRuns(db: Db, userId: string, notebookId: string, path: string): Promise<RunCompareResponse> {
  await reach(db, userId, notebookId, 'read');
  const [cellName, ...keys] = path.split('.');
  const rows = await repo.listRunCells(db, notebookId, cellName!);
  return {
    path,
    rows: rows.map((r) => ({ runId: r.id, label: r.label, createdAt: r.createdAt.toISOString(), revision: r.revision, ...valueAt(r.cell, keys) })),
  };
}

/**
 * The whole table of one cell of a run, as CSV. Snapshots keep only a table's first
 * rows, so the run is computed again from its stored revision and uploads (the same
 * inputs give the same numbers).
 */
export async function runCellCsv(db: Db, userId: string, runId: string, cellId: string): Promise<{ fileName: string; csv: string }> {
  const run = await repo.findRun(db, runId);
  if (!run) throw notFound('Run');
  await reach(db, userId, run.notebookId, 'read', 'Run');
  const cell = (run.snapshot as Snapshot).cells.find((c) => c.cellId === cellId);
  if (!cell) throw notFound('Cell');
  if (cell.result?.type !== 'table') throw new AppError(400, 'not_a_table', `Cell "${cell.name}" has no table to download.`);
  const document = await revisionDocument(db, run.notebookId, run.revision);
  const { csv } = await computeSnapshot(db, document, run.revision, run.bindings, { csvCellId: cellId });
  if (typeof csv !== 'string') throw new AppError(409, 'not_a_table', `Cell "${cell.name}" no longer gives a table on this run's files.`);
  return { fileName: `${cell.name}.csv`, csv };
}

type Found = NonNullable<Awaited<ReturnType<typeof findNotebookForUser>>>;

async function reach(db: Db, userId: string, notebookId: string, action: NotebookAction, what?: string): Promise<Found> {
  const nb = await findNotebookForUser(db, notebookId, userId);
  try {
    assertNotebook(nb, action);
  } catch (error) {
    // A run of a notebook the caller cannot read is itself unknown to them.
    if (what && error instanceof AppError && error.status === 404) throw notFound(what);
    throw error;
  }
  return nb!;
}

function toSummary(r: repo.RunRecord): RunSummary {
  return {
    id: r.id,
    notebookId: r.notebookId,
    revision: r.revision,
    label: r.label,
    bindings: r.bindings,
    createdBy: r.createdBy ? { id: r.createdBy, name: r.createdByName ?? '' } : null,
    createdAt: r.createdAt.toISOString(),
    durationMs: r.durationMs,
    cellCount: r.cellCount,
    failedCells: r.failedCells,
  };
}

type Picked = Pick<RunCompareRow, 'value' | 'unit' | 'problem'>;
const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

/** Reads `keys` out of one snapshot cell (see the path rules in shared/api/runs.ts). */
function valueAt(cell: unknown, keys: string[]): Picked {
  if (!isRecord(cell)) return { value: null, problem: 'missing' };
  if (cell['state'] !== 'fresh') return { value: null, problem: 'failed' };
  const result = cell['result'];
  if (!isRecord(result)) return { value: null, problem: 'missing' };
  let node: unknown;
  if (result['type'] === 'values') {
    const values = result['values'] as Record<string, unknown>;
    node = keys.length === 0 ? (result['last'] ?? (Object.keys(values).length === 1 ? Object.values(values)[0] : undefined)) : dig(values, keys);
  } else if (result['type'] === 'table' || result['type'] === 'recording') {
    const body = (result['type'] === 'table' ? result['table'] : result['recording']) as Record<string, unknown>;
    const [first, ...rest] = keys;
    const column = (body['columns'] as { name: string }[]).find((c) => c.name === first);
    node = column ? dig(column, rest.length > 0 ? rest : ['mean']) : first === undefined ? undefined : dig(body, keys);
  }
  return scalar(node);
}

function dig(node: unknown, keys: string[]): unknown {
  let at = node;
  for (const k of keys) {
    if (Array.isArray(at) && /^\d+$/.test(k)) at = at[Number(k)];
    else if (isRecord(at)) at = at[k];
    else return undefined;
  }
  return at;
}

function scalar(node: unknown): Picked {
  if (node === undefined) return { value: null, problem: 'missing' };
  if (node === null || typeof node === 'number' || typeof node === 'string' || typeof node === 'boolean') return { value: node };
  if (isRecord(node) && node['quantity'] === true && typeof node['unit'] === 'string') {
    return { value: typeof node['value'] === 'number' ? node['value'] : null, unit: node['unit'] };
  }
  return { value: null, problem: 'not_a_value' };
}
