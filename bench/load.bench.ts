import { get } from 'node:http';
import { setUpEditors } from './load/editors.js';
import { describeFigures, type LoadFigures } from './load/figures.js';
import { loadProblems, runMixedLoad } from './load/mixed.js';
import { createDatabase, openPostgres } from './load/postgres.js';
import { findPublishedSlug, READER_HEADERS, runReaders } from './load/readers.js';
import { describeLoadFailure, saveServerOutput, settle, startLoadServer, type LoadServer } from './load/server.js';
import type { BenchOptions, BenchRow } from './types.js';

const READERS = 50;
const EDITORS = 20;
const AUTOSAVE_MS = 2000;

interface Durations {
  warmS: number;
  readS: number;
  mixedS: number;
}

/**
 * The built server under load, on embedded PGlite and on PostgreSQL: 50 anonymous readers
 * of a published notebook alone, then with 20 signed-in editors autosaving their own
 * notebooks every 2 s. Baselines come from the same server in the same run: GET
 * /api/health (one database ping, the cheapest route) under the same 50 connections for
 * throughput and latency; the offered autosave rate (20 / 2 s) for saves. Every run also
 * counts errors, non-2xx answers and acknowledged saves missing from the history.
 */
export async function benchLoad(options: BenchOptions = { quick: false }): Promise<BenchRow[]> {
  const durations: Durations = options.quick ? { warmS: 1, readS: 5, mixedS: 5 } : { warmS: 3, readS: 30, mixedS: 60 };
  const rows: BenchRow[] = [];

  const server = await startLoadServer();
  try {
    rows.push(...(await measureOrExplain(server, 'PGlite', durations, true)));
  } finally {
    await server.stop();
  }

  const pg = await openPostgres();
  if ('skipped' in pg) {
    rows.push({ name: 'load PostgreSQL: skipped', value: NaN, unit: '', baseline: NaN, ratio: NaN, note: pg.skipped });
    return rows;
  }
  try {
    const db = await createDatabase(pg.adminUrl);
    try {
      const pgServer = await startLoadServer({ databaseUrl: db.url });
      try {
        const pgRows = await measureOrExplain(pgServer, 'PostgreSQL', durations, false);
        pgRows[0]!.note = `${pgRows[0]!.note}; ${pg.source}`;
        rows.push(...pgRows);
      } finally {
        await pgServer.stop();
      }
    } finally {
      await db.drop();
    }
  } finally {
    await pg.close();
  }
  return rows;
}

/** {@link measure}, and when it breaks off, an error that says why in one line (the bench table shows one). */
async function measureOrExplain(server: LoadServer, label: string, d: Durations, readersAlone: boolean): Promise<BenchRow[]> {
  try {
    return await measure(server, label, d, readersAlone);
  } catch (error) {
    throw new Error(`${label}: ${describeLoadFailure(server, error, label)}`, { cause: error });
  }
}

async function measure(server: LoadServer, label: string, d: Durations, readersAlone: boolean): Promise<BenchRow[]> {
  const slug = await findPublishedSlug(server.url);
  const page = `/api/published/${slug}`;
  const pageKb = (await pageBytes(`${server.url}${page}`, {})) / 1024;
  const sentKb = (await pageBytes(`${server.url}${page}`, READER_HEADERS)) / 1024;
  await runReaders({ url: server.url, path: '/api/health', connections: READERS, durationS: d.warmS });
  await runReaders({ url: server.url, path: page, connections: READERS, durationS: d.warmS });
  await settle(server);

  const health = await withCpu(server, () => runReaders({ url: server.url, path: '/api/health', connections: READERS, durationS: d.readS }));
  await settle(server);
  const floor = `baseline GET /api/health, ${READERS} connections, ${d.readS} s (${health.perSecond.toFixed(0)}/s, p50 ${health.p50Ms} ms, server CPU ${perRequest(health)})`;
  const rows: BenchRow[] = [];

  if (readersAlone) {
    const reads = await withCpu(server, () => runReaders({ url: server.url, path: page, connections: READERS, durationS: d.readS }));
    rows.push(
      throughput(`load ${label}: published page, ${READERS} readers`, reads, health, `${describeFigures(reads)}; ${pageKb.toFixed(0)} kB per page (${sentKb.toFixed(0)} kB as sent to a browser), server CPU ${perRequest(reads)}; ${floor}; ratio = page/health throughput, higher is better${clean(reads)}`),
      latency(`load ${label}: published page p99, ${READERS} readers`, reads, health, `p99 against the health route's p99 under the same load; lower is better`),
    );
    await settle(server);
  }

  const editors = await setUpEditors(server.url, EDITORS, label.toLowerCase());
  await settle(server);
  const cpuBefore = server.cpuMs();
  const mixed = await runMixedLoad({ url: server.url, slug, readers: READERS, editors, durationS: d.mixedS, intervalMs: AUTOSAVE_MS });
  // Includes the audit's reads of each history: a few requests next to thousands.
  const mixedCpu = `server CPU ${((server.cpuMs() - cpuBefore) / (mixed.reads.requests + mixed.saves.requests)).toFixed(2)} ms/request`;
  const problems = loadProblems(mixed);
  const verdict =
    problems.length === 0
      ? `; ${mixed.audit.acknowledged} acknowledged saves all in the history`
      : `; CHECK FAILED: ${problems.slice(0, 3).join('; ')} (server ${server.ended() ?? 'still running'}; ${saveServerOutput(server, label)})`;
  const offered = EDITORS / (AUTOSAVE_MS / 1000);
  rows.push(
    throughput(`load ${label}: reads with ${EDITORS} editors saving`, mixed.reads, health, `${describeFigures(mixed.reads)}; ${d.mixedS} s, ${mixedCpu}; ${label === 'PGlite' ? '' : `${floor}; `}ratio = page/health throughput${clean(mixed.reads)}`),
    latency(`load ${label}: reads p99 with editors saving`, mixed.reads, health, `p99 against the health route's p99 alone; lower is better`),
    {
      name: `load ${label}: autosaves, ${EDITORS} editors every ${AUTOSAVE_MS / 1000} s + ${READERS} readers`,
      value: mixed.saves.perSecond,
      unit: 'saves/s',
      baseline: offered,
      ratio: mixed.saves.perSecond / offered,
      note: `${describeFigures(mixed.saves)}; baseline = offered rate ${EDITORS}/${AUTOSAVE_MS / 1000} s, ratio 1 = every autosave on time${verdict}`,
    },
    {
      name: `load ${label}: autosave p99`,
      value: mixed.saves.p99Ms,
      unit: 'ms',
      baseline: health.p99Ms,
      ratio: mixed.saves.p99Ms / health.p99Ms,
      note: `p50 ${mixed.saves.p50Ms.toFixed(1)} ms, p99 ${mixed.saves.p99Ms.toFixed(1)} ms (value); baseline = health route p99 alone; lower is better`,
    },
  );
  return rows;
}

/** Bytes of one answer as they come over the wire (node:http does not decode them, fetch would). */
function pageBytes(url: string, headers: Record<string, string>): Promise<number> {
  return new Promise((resolve, reject) => {
    get(url, { headers }, (res) => {
      let n = 0;
      res.on('data', (chunk: Buffer) => (n += chunk.length));
      res.on('end', () => resolve(n));
      res.on('error', reject);
    }).on('error', reject);
  });
}

/** Figures plus the server's CPU time over the run, so a busy machine's share of the CPU can be told apart from the server's own cost. */
async function withCpu(server: LoadServer, run: () => Promise<LoadFigures>): Promise<LoadFigures & { cpuMs: number }> {
  const before = server.cpuMs();
  const figures = await run();
  return { ...figures, cpuMs: server.cpuMs() - before };
}

function perRequest(f: LoadFigures & { cpuMs: number }): string {
  return `${(f.cpuMs / f.requests).toFixed(2)} ms/request`;
}

function throughput(name: string, f: LoadFigures, health: LoadFigures, note: string): BenchRow {
  return { name, value: f.perSecond, unit: 'req/s', baseline: health.perSecond, ratio: f.perSecond / health.perSecond, note };
}

function latency(name: string, f: LoadFigures, health: LoadFigures, note: string): BenchRow {
  return { name, value: f.p99Ms, unit: 'ms', baseline: health.p99Ms, ratio: f.p99Ms / health.p99Ms, note: `p50 ${f.p50Ms} ms; ${note}` };
}

/** Nothing when the reads were clean, else a loud marker (they must be: 0 errors, 0 non-2xx). */
function clean(f: LoadFigures): string {
  return f.errors === 0 && f.non2xx === 0 ? '' : '; CHECK FAILED: errors or non-2xx answers';
}
