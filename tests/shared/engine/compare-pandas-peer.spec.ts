import { spawnSync } from 'node:child_process';
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cogbookHeadline, compareHeadlines, peerHeadline } from '../../../bench/peer/agreement.js';
import { writeRideFiles, type RideFiles } from '../../../bench/peer/ride-files.js';
import { compareRecordings } from '../../../shared/engine/compare.js';
import { importRecording } from '../../../shared/recording/import-recording.js';
import type { Recording } from '../../../shared/recording/recording.js';

const PYTHON = '/usr/bin/python3';
const PEER = join(import.meta.dirname, '../../../bench/peer/compare_pandas.py');
// Both variables slow a current numpy down; they play no part in the result.
const env = Object.fromEntries(Object.entries(process.env).filter(([k]) => k !== 'OPENBLAS_CORETYPE' && k !== 'OPENBLAS_L2_SIZE'));
const hasPandas = spawnSync(PYTHON, ['-c', 'import numpy, pandas'], { env }).status === 0;
const NO_PANDAS = `${PYTHON} cannot import numpy and pandas (install Debian's python3-pandas); this check needs them as the outside implementation`;

async function load(path: string): Promise<Recording> {
  const result = await importRecording(new Uint8Array(await readFile(path)), path);
  if (!result.ok) throw new Error(result.error.message);
  return result.recording;
}

// numpy/pandas are an independent implementation of the same comparison (FFT
// cross-correlation, grid, steady-block rule, Bland-Altman, np.polyfit, np.corrcoef):
// agreement on every headline figure checks the engine against an outside source.
describe('compare command against the pandas peer (bench/peer/compare_pandas.py)', () => {
  let dir = '';
  let files: RideFiles;
  beforeAll(async () => {
    dir = await mkdtemp(join(tmpdir(), 'cogbook-peer-'));
    files = await writeRideFiles(dir, { hours: 1, rateHz: 1, format: 'csv' });
  });
  afterAll(async () => {
    if (dir !== '') await rm(dir, { recursive: true, force: true });
  });

  for (const rateHz of [1, 10] as const) {
    it(`gives the same offset, agreement, regression, drift, chainring ratios and steady blocks on a 1 h ${rateHz} Hz CSV ride`, async (ctx) => {
      if (!hasPandas) ctx.skip(NO_PANDAS);
      const ride = rateHz === 1 ? files : await writeRideFiles(dir, { hours: 1, rateHz, format: 'csv' });
      const report = compareRecordings(await load(ride.reference), [await load(ride.test)]);
      const peer = spawnSync(PYTHON, [PEER, ride.reference, ride.test], { env, encoding: 'utf8' });
      expect(peer.status, peer.stderr).toBe(0);
      const ours = cogbookHeadline(JSON.stringify(report));
      const theirs = peerHeadline(peer.stdout);
      expect(compareHeadlines(ours, theirs)).toEqual([]);
      // The device under test starts 37 s after the reference and smooths over 2 s.
      expect(Math.abs(ours.offsetSeconds + 37)).toBeLessThanOrEqual(1);
      expect(ours.ratioByTeeth.size).toBe(2);
      expect(ours.steadyBlocks).toBeGreaterThan(5);
    }, 120_000);
  }
});
