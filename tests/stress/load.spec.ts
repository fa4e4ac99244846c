import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { setUpEditors, type Editor } from '../../bench/load/editors.js';
import { describeFigures } from '../../bench/load/figures.js';
import { loadProblems, runMixedLoad } from '../../bench/load/mixed.js';
import { createDatabase } from '../../bench/load/postgres.js';
import { findPublishedSlug } from '../../bench/load/readers.js';
import { describeLoadFailure, settle, startLoadServer, type LoadServer } from '../../bench/load/server.js';

/**
 * The built server (npm run build:node) under 50 readers of a published notebook and 20
 * editors autosaving their own notebooks every 2 s: nothing refused, nothing unanswered,
 * every acknowledged save in the revision history. The same driver as `npm run bench --
 * --only load`, bounded in time. LOAD_SECONDS changes the length.
 */
const SECONDS = Number(process.env.LOAD_SECONDS ?? 20);
const READERS = 50;
const EDITORS = 20;
const adminUrl = process.env.TEST_POSTGRES_URL;

function loadSuite(label: string, databaseUrl: () => Promise<{ url?: string; drop(): Promise<void> }>) {
  let server: LoadServer | undefined;
  let drop: () => Promise<void> = async () => {};
  let editors: Editor[] = [];
  let slug = '';

  beforeAll(async () => {
    const db = await databaseUrl();
    drop = db.drop;
    // A first start seeds the demo lab and computes its published snapshot: minutes on a busy machine.
    server = await startLoadServer({ ...(db.url ? { databaseUrl: db.url } : {}), readyWithinMs: 600_000 });
    try {
      slug = await findPublishedSlug(server.url);
      editors = await setUpEditors(server.url, EDITORS, label.toLowerCase());
      await settle(server);
    } catch (error) {
      throw new Error(describeLoadFailure(server, error, label), { cause: error });
    }
  }, 900_000);

  afterAll(async () => {
    await server?.stop();
    await drop();
  });

  it(`${READERS} readers and ${EDITORS} autosaving editors for ${SECONDS} s: no errors, no refusals, no lost saves`, { timeout: 600_000 }, async () => {
    const run = await runMixedLoad({ url: server!.url, slug, readers: READERS, editors, durationS: SECONDS, intervalMs: 2000 });
    console.info(`[load ${label}] reads: ${describeFigures(run.reads)}; saves: ${describeFigures(run.saves)}; ${run.audit.acknowledged} acknowledged`);
    expect(loadProblems(run), server!.output().slice(-2000)).toEqual([]);
    expect(run.reads.errors).toBe(0);
    expect(run.reads.non2xx).toBe(0);
    expect(run.reads.requests).toBeGreaterThan(0);
    expect(run.saves.errors).toBe(0);
    expect(run.saves.non2xx).toBe(0);
    // Every editor got at least one save through, and every acknowledged one is in its history.
    for (const editor of editors) expect(editor.acked.length, editor.email).toBeGreaterThan(0);
    expect(run.audit.acknowledged).toBe(run.saves.requests);
    expect(run.audit.lost).toEqual([]);
    expect(run.audit.problems).toEqual([]);
  });
}

describe('load on embedded PGlite', () => {
  loadSuite('PGlite', async () => ({ drop: async () => {} }));
});

describe.skipIf(!adminUrl)(`load on PostgreSQL${adminUrl ? '' : ' (skipped: set TEST_POSTGRES_URL)'}`, () => {
  loadSuite('PostgreSQL', () => createDatabase(adminUrl!));
});
