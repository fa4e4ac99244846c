import { ratioCi } from './stats/index.js';
import type { Table } from './table.js';

/** The device's gain (test / reference ratio of means) for one leg on one gear state. */
export interface GainCell {
  leg: 'total' | 'left' | 'right';
  /** Front chainring teeth; null = all gear states together. */
  frontTeeth: number | null;
  n: number;
  seconds: number;
  /** Share of all paired rows, 0..1. */
  share: number;
  gain: number;
  /** 95% block-bootstrap interval of the gain. */
  low: number;
  high: number;
  /** (gain - 1) * 100 and its interval. */
  diffPct: number;
  lowPct: number;
  highPct: number;
  blockLength: number;
  /** Bootstrap replicates that gave a finite gain. */
  replicates: number;
}

/** Options of {@link fitLegGearGains}. */
export interface FitLegGearGainsOptions {
  /** Rows to use; default all. */
  mask?: Uint8Array;
  /** Bootstrap seed (default 1). */
  seed?: number;
  /** Bootstrap replicates (default 1000). */
  replicates?: number;
  /** Gear states with less paired time are left out, seconds (default 60). */
  minSeconds?: number;
  /** Bootstrap block length, samples; default chosen from the data per cell (costs O(n^1.5)). */
  blockLength?: number;
}

const COLUMNS = { total: ['test_power', 'ref_power'], left: ['test_left', 'ref_left'], right: ['test_right', 'ref_right'] } as const;

/**
 * Gain of the device per leg (left and right when both devices report them, else the
 * total) per front chainring, and over all gear states (also for the total), each with a circular
 * block-bootstrap 95% interval (the ratio of means: robust when power sits at a few
 * steady levels, and what testers quote as "reads x% high"). O(cells * n * replicates).
 *
 * @example
 * fitLegGearGains(paired, { seed: 7 }).find((c) => c.leg === 'left' && c.frontTeeth === 50)?.diffPct
 */
export function fitLegGearGains(table: Table, options: FitLegGearGainsOptions = {}): GainCell[] {
  const { mask, seed = 1, replicates = 1000, minSeconds = 60, blockLength } = options;
  const n = table.timeS.length;
  const dt = n > 1 ? table.timeS[1]! - table.timeS[0]! : 1;
  const c = table.columns;
  const front = c.front_teeth;
  const gears = distinctFinite(front).sort((a, b) => b - a);
  const totalPairs = countPairs(c.test_power!, c.ref_power!, mask);
  const cells: GainCell[] = [];
  const hasLegs = c.test_left !== undefined && c.ref_left !== undefined && c.test_right !== undefined && c.ref_right !== undefined;
  for (const leg of ['total', 'left', 'right'] as const) {
    const [testName, refName] = COLUMNS[leg];
    const test = c[testName];
    const ref = c[refName];
    if (test === undefined || ref === undefined) continue;
    // With both legs known, the total per chainring adds nothing the legs do not say,
    // and each bootstrap costs O(n * replicates).
    for (const teeth of leg === 'total' && hasLegs ? [null] : [null, ...gears]) {
      const cellMask = new Uint8Array(n);
      for (let i = 0; i < n; i++) {
        cellMask[i] = (mask === undefined || mask[i] !== 0) && (teeth === null || front![i] === teeth) ? 1 : 0;
      }
      const pairs = countPairs(test, ref, cellMask);
      if (pairs === 0 || (teeth !== null && pairs * dt < minSeconds)) continue;
      const ci = ratioCi(test, ref, cellMask, { seed, replicates, ...(blockLength !== undefined && { blockLength }) });
      cells.push({
        leg,
        frontTeeth: teeth,
        n: pairs,
        seconds: pairs * dt,
        share: totalPairs > 0 ? pairs / totalPairs : 0,
        gain: ci.estimate,
        low: ci.low,
        high: ci.high,
        diffPct: (ci.estimate - 1) * 100,
        lowPct: (ci.low - 1) * 100,
        highPct: (ci.high - 1) * 100,
        blockLength: ci.blockLength,
        replicates: ci.replicates,
      });
    }
  }
  return cells;
}

function distinctFinite(column: Float64Array | undefined): number[] {
  const seen = new Set<number>();
  if (column !== undefined) for (let i = 0; i < column.length; i++) if (Number.isFinite(column[i]!)) seen.add(column[i]!);
  return [...seen];
}

function countPairs(a: Float64Array, b: Float64Array, mask?: Uint8Array): number {
  let m = 0;
  for (let i = 0; i < a.length; i++) {
    if (mask !== undefined && mask[i] === 0) continue;
    if (Number.isFinite(a[i]!) && Number.isFinite(b[i]!)) m++;
  }
  return m;
}
