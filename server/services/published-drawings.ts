import type { Snapshot } from '../../shared/api/snapshots.js';
import { drawChartsInWorker } from '../engine/run-in-worker.js';
import type { Db } from '../db/client.js';
import { replacePublicationSnapshot } from '../db/repositories/publications.js';
import { forgetPublishedPage } from './published-pages.js';

/** A publication as read with its snapshot. */
interface StoredPublication {
  notebookId: string;
  slug: string;
  publishedAt: Date;
  snapshot: unknown;
}

/** How long a reader waits for the drawings of an older publication before getting it without them, ms. */
export const DRAWING_WAIT_MS = 10_000;
/** Longest the compute pool may spend drawing one publication's charts, ms. */
const DRAWING_LIMIT_MS = 120_000;

/** Drawings under way (or given up on in this process), by publication. */
const drawing = new Map<string, Promise<Snapshot | undefined>>();

/** True when some chart of the snapshot has no server drawing. */
export function missesDrawings(snapshot: Snapshot): boolean {
  return snapshot.cells.some((c) => c.result?.type === 'chart' && c.result.svg === undefined);
}

/**
 * The snapshot of a publication with every chart drawn. Publications made before the server
 * drew charts have none: the first read draws them on the compute pool, stores them with the
 * publication (unless it was republished or unpublished meanwhile) and drops the kept JSON page,
 * so every later read, here or in another process, has them. A reader waits for that at most
 * `waitMs`; past it, or when drawing fails, it gets the snapshot as stored (the page's script
 * then draws the charts, as it always could) while the drawing goes on. A chart that cannot be
 * drawn is not tried again by this process (the others are stored).
 */
export async function withDrawings(db: Db, found: StoredPublication, waitMs = DRAWING_WAIT_MS): Promise<Snapshot> {
  const snapshot = found.snapshot as Snapshot;
  if (!missesDrawings(snapshot)) return snapshot;
  const key = `${found.notebookId}\0${found.publishedAt.toISOString()}`;
  let running = drawing.get(key);
  if (!running) {
    running = drawAndStore(db, found, snapshot);
    drawing.set(key, running);
    // Once stored, reads get the drawings from the database; a chart that cannot be drawn is not tried again.
    void running.then((drawn) => drawn && !missesDrawings(drawn) && drawing.delete(key));
  }
  if (waitMs <= 0) return snapshot;
  let timer: NodeJS.Timeout | undefined;
  const late = new Promise<undefined>((resolve) => (timer = setTimeout(() => resolve(undefined), waitMs)));
  try {
    return (await Promise.race([running, late])) ?? snapshot;
  } finally {
    clearTimeout(timer);
  }
}

async function drawAndStore(db: Db, found: StoredPublication, snapshot: Snapshot): Promise<Snapshot | undefined> {
  try {
    const outcome = await drawChartsInWorker(snapshot, DRAWING_LIMIT_MS);
    if (!outcome.ok) return undefined;
    const stored = await replacePublicationSnapshot(db, found.notebookId, found.publishedAt, outcome.snapshot);
    forgetPublishedPage(db, found.slug);
    return stored ? outcome.snapshot : undefined;
  } catch {
    return undefined;
  }
}
