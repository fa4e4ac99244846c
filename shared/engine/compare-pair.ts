import {
  blandAltman, demingFit, driftFit, olsFit, originFit, pearson, percentDifference, ratioCi, rmse,
  type BlandAltmanResult, type BootstrapCi, type DemingFit, type DriftFit, type OlsFit, type OriginFit,
} from './stats/index.js';
import { mapSides, sideMeans, type SideMeans, type Sides } from './side-means.js';
import type { Table } from './table.js';

/** Options of {@link comparePair}. */
export interface ComparePairOptions {
  /** Rows to use (see buildSelection); default all. */
  mask?: Uint8Array;
  /** Seed of the block bootstrap (default 1). */
  seed?: number;
  /** Bootstrap replicates (default 1000); 0 skips the intervals. */
  replicates?: number;
  /** Bootstrap block length, samples; default chosen from the data (costs O(n^1.5)). */
  blockLength?: number;
  /** Deming error-variance ratio var(reference error) / var(test error) (default 1). */
  demingErrorRatio?: number;
}

/** Statistics of one device under test against the reference over one selection. */
export interface PairStats {
  /** Rows where both totals are finite. */
  n: number;
  /** Those rows in seconds. */
  seconds: number;
  means: SideMeans;
  /** Mean test - mean reference, W. */
  diffW: Sides;
  /** (mean test / mean reference - 1) * 100. */
  diffPct: Sides;
  /** Mean test / mean reference. */
  ratio: Sides;
  /** Block-bootstrap 95% intervals of the ratios (null when skipped or a side is unknown). */
  ratioCi: { total: BootstrapCi | null; left: BootstrapCi | null; right: BootstrapCi | null };
  /** Bland-Altman agreement of the totals, sample by sample. */
  agreement: BlandAltmanResult;
  /** Test on reference: slope = scale, intercept = offset. */
  ols: OlsFit;
  /** Test on reference through the origin: the gain. */
  origin: OriginFit;
  deming: DemingFit;
  /** Pearson correlation of the totals. */
  r: number;
  rmseW: number;
  /** Difference test - reference over time. */
  drift: DriftFit;
}

/**
 * Compares a device under test with the reference on a paired table over a selection:
 * means of total and legs, their difference and ratio with block-bootstrap intervals,
 * Bland-Altman agreement, OLS, through-origin and Deming fits, correlation, RMSE and
 * drift. The ratio of means is the headline figure: differences of single seconds are
 * noisy because devices sample and smooth at different moments. O(n * replicates).
 *
 * @example
 * const stats = comparePair(paired, { mask: buildSelection(paired, { frontTeeth: 50 }), seed: 7 });
 * stats.diffPct.left // e.g. 7.9
 */
export function comparePair(table: Table, options: ComparePairOptions = {}): PairStats {
  const { mask, seed = 1, replicates = 1000, blockLength } = options;
  const ref = table.columns.ref_power!;
  const test = table.columns.test_power!;
  const means = sideMeans(table, mask);
  const ratio = mapSides(means.test, means.reference, (t, r) => t / r);
  const ci = (t: Float64Array | undefined, r: Float64Array | undefined): BootstrapCi | null =>
    replicates > 0 && t !== undefined && r !== undefined ? ratioCi(t, r, mask, { seed, replicates, ...(blockLength !== undefined && { blockLength }) }) : null;
  const c = table.columns;
  const diff = new Float64Array(ref.length);
  for (let i = 0; i < ref.length; i++) diff[i] = test[i]! - ref[i]!;
  const dt = table.timeS.length > 1 ? table.timeS[1]! - table.timeS[0]! : 1;
  return {
    n: means.n.total,
    seconds: means.n.total * dt,
    means,
    diffW: mapSides(means.test, means.reference, (t, r) => t - r),
    diffPct: mapSides(means.test, means.reference, percentDifference),
    ratio,
    ratioCi: {
      total: ci(test, ref),
      left: means.n.left > 0 ? ci(c.test_left, c.ref_left) : null,
      right: means.n.right > 0 ? ci(c.test_right, c.ref_right) : null,
    },
    agreement: blandAltman(test, ref, mask === undefined ? {} : { mask }),
    ols: olsFit(ref, test, mask),
    origin: originFit(ref, test, mask),
    deming: demingFit(ref, test, { errorRatio: options.demingErrorRatio ?? 1, ...(mask !== undefined && { mask }) }),
    r: pearson(ref, test, mask),
    rmseW: rmse(test, ref, mask),
    drift: driftFit(table.timeS, diff, mask),
  };
}
