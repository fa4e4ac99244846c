import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { agreementNote, cogbookHeadline, compareHeadlines, peerHeadline } from './peer/agreement.js';
import { SHORT_RIDE, writeRideFiles, type RideFiles } from './peer/ride-files.js';
import { repoPath } from './repo-path.js';
import { median, timeProcess } from './time-process.js';
import type { BenchOptions, BenchRow } from './types.js';

const PYTHON = '/usr/bin/python3';
/** Set on some machines for an older numpy; they slow down a current one, so the peer runs without them. */
const PYTHON_ENV_DROPPED = ['OPENBLAS_CORETYPE', 'OPENBLAS_L2_SIZE'];

interface Case {
  name: string;
  cogbook: RideFiles;
  /** The CSV files the peer reads: the same ride as `cogbook`. */
  peer: RideFiles;
  /** False when Cogbook reads FIT (absolute clock) and the peer CSV (seconds from start). */
  sameClock: boolean;
}

/**
 * Cogbook's compare command against the same comparison written with pandas and numpy,
 * each run as a process on the same files (start-up included), interleaved, median of
 * several runs. value = Cogbook ms, baseline = pandas ms: a ratio below 1 means Cogbook
 * is faster. Each row's note says whether the two agree on the headline figures.
 */
export async function benchPeer(options: BenchOptions): Promise<BenchRow[]> {
  const env = { ...process.env };
  const dropped = PYTHON_ENV_DROPPED.filter((k) => env[k] !== undefined);
  for (const k of dropped) delete env[k];
  const versions = await pandasVersions(env);
  if (versions === undefined) {
    return [{ name: 'compare vs pandas', value: NaN, unit: 'ms', baseline: NaN, ratio: NaN, note: `skipped: ${PYTHON} cannot import pandas and numpy (apt-get install python3-pandas)` }];
  }
  const envNote = dropped.length > 0 ? `; python without ${dropped.join(', ')}` : '';
  const hours = options.quick ? 1 : 4;
  const reps = options.quick ? 3 : 5;
  const dir = await mkdtemp(join(tmpdir(), 'cogbook-bench-'));
  try {
    const csv1 = await writeRideFiles(dir, { hours, rateHz: 1, format: 'csv' });
    const csv10 = await writeRideFiles(dir, { hours, rateHz: 10, format: 'csv' });
    const fit1 = await writeRideFiles(dir, { hours, rateHz: 1, format: 'fit' });
    const short = await writeRideFiles(dir, { hours: 0, rateHz: 1, format: 'csv', blocks: SHORT_RIDE });
    const cases: Case[] = [
      // Nearly all start-up: every module the command needs against importing pandas.
      { name: 'start-up: compare 6 min 1 Hz CSV vs pandas', cogbook: short, peer: short, sameClock: true },
      { name: `compare ${hours} h 1 Hz CSV vs pandas`, cogbook: csv1, peer: csv1, sameClock: true },
      { name: `compare ${hours} h 10 Hz CSV vs pandas`, cogbook: csv10, peer: csv10, sameClock: true },
      { name: `compare ${hours} h 1 Hz FIT vs pandas CSV`, cogbook: fit1, peer: csv1, sameClock: false },
    ];
    const rows: BenchRow[] = [];
    for (const c of cases) {
      process.stderr.write(`  ${c.name} ...\n`);
      rows.push(await runCase(c, env, reps, `${versions}${envNote}`));
    }
    return rows;
  } finally {
    await rm(dir, { recursive: true, force: true });
  }
}

async function runCase(c: Case, env: NodeJS.ProcessEnv, reps: number, peerNote: string): Promise<BenchRow> {
  const cogbook = (): ReturnType<typeof timeProcess> =>
    timeProcess(process.execPath, [repoPath('dist/node/server/cli/compare.js'), '--reference', c.cogbook.reference, '--test', c.cogbook.test, '--json']);
  const peer = (): ReturnType<typeof timeProcess> => timeProcess(PYTHON, [repoPath('bench/peer/compare_pandas.py'), c.peer.reference, c.peer.test], env);
  // The first run of each warms the file cache and gives the outputs to check: a speed
  // comparison of two different computations would mean nothing.
  const first = { cogbook: await cogbook(), peer: await peer() };
  const headline = cogbookHeadline(first.cogbook.stdout);
  const mismatches = compareHeadlines(headline, peerHeadline(first.peer.stdout), c.sameClock);
  const times = { cogbook: [] as number[], peer: [] as number[] };
  for (let k = 0; k < reps; k++) {
    // Alternate which goes first, so a change in machine load hits both alike.
    const order = k % 2 === 0 ? (['cogbook', 'peer'] as const) : (['peer', 'cogbook'] as const);
    for (const who of order) times[who].push((await (who === 'cogbook' ? cogbook() : peer())).ms);
  }
  const value = median(times.cogbook);
  const baseline = median(times.peer);
  return {
    name: c.name,
    value,
    unit: 'ms',
    baseline,
    ratio: value / baseline,
    note: `${agreementNote(headline, mismatches, c.sameClock)}; ${c.cogbook.samples} samples/file; median of ${reps}; ${peerNote}`,
  };
}

async function pandasVersions(env: NodeJS.ProcessEnv): Promise<string | undefined> {
  try {
    const run = await timeProcess(PYTHON, ['-c', 'import numpy, pandas; print(f"pandas {pandas.__version__}, numpy {numpy.__version__}")'], env);
    return run.stdout.trim();
  } catch {
    return undefined;
  }
}
