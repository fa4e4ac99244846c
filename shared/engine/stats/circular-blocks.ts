import { createRandom, type Random } from '../../synthetic/random.js';

/** Options of a circular block bootstrap ({@link blockBootstrapCi}, {@link sumRatioBootstrapCi}). */
export interface BlockBootstrapOptions {
  /** Samples per block; default ceil(n^(1/3)). Pass optimalBlockLength(series) for a data-driven choice. */
  blockLength?: number;
  /** Bootstrap replicates; default 2000. */
  replicates?: number;
  /** Seed of the generator; default 1, so a result is reproducible unless asked otherwise. */
  seed?: number;
  /** Confidence level; default 0.95. */
  level?: number;
}

/** A statistic and its bootstrap percentile interval. */
export interface BootstrapCi {
  /** The statistic on the original sample order. */
  estimate: number;
  low: number;
  high: number;
  blockLength: number;
  /** Replicates that gave a finite statistic (the interval is built from these). */
  replicates: number;
}

/** The settings of one bootstrap run with every default filled in, and its seeded generator. */
export interface BootstrapPlan {
  blockLength: number;
  replicates: number;
  level: number;
  random: Random;
}

/**
 * Fills in the defaults of {@link BlockBootstrapOptions} for `n` samples: block length
 * ceil(n^(1/3)) rounded into [1, n], 2000 replicates, level 0.95, generator seeded with 1.
 * Every bootstrap path starts here, so the same options give the same draws.
 *
 * @example planBootstrap(1000, { seed: 7 }).blockLength // 10
 */
export function planBootstrap(n: number, options: BlockBootstrapOptions): BootstrapPlan {
  const requested = options.blockLength ?? Math.ceil(Math.cbrt(n));
  return {
    blockLength: Math.max(1, Math.min(n, Math.round(requested))),
    replicates: Math.max(1, Math.round(options.replicates ?? 2000)),
    level: options.level ?? 0.95,
    random: createRandom(options.seed ?? 1),
  };
}

/**
 * Draws the blocks of one circular block bootstrap replicate of `n` positions (Politis &
 * Romano 1992): blocks of `blockLength` consecutive positions from uniform random starts in
 * [0, n), wrapping from n - 1 to 0, the last block cut so exactly `n` positions are drawn.
 * Calls `visit(start, length)` once per block, in order. The draw scheme is written only
 * here, so a statistic resampled through indices and one resampled through block sums see
 * the same blocks for the same seed.
 *
 * @example drawCircularBlocks(10, 4, createRandom(1), (start, length) => sums.push(blockSum(start, length)));
 */
export function drawCircularBlocks(n: number, blockLength: number, random: Random, visit: (start: number, length: number) => void): void {
  let pos = 0;
  while (pos < n) {
    const start = random.int(0, n - 1);
    const length = Math.min(blockLength, n - pos);
    visit(start, length);
    pos += length;
  }
}

/**
 * Percentile interval (R quantile type 7: linear interpolation between order statistics)
 * at `level` from the first `count` replicate values; sorts them in place.
 *
 * @example percentileInterval(Float64Array.of(3, 1, 2), 3, 0.5) // { low: 1.5, high: 2.5 }
 */
export function percentileInterval(values: Float64Array, count: number, level: number): { low: number; high: number } {
  const sorted = values.subarray(0, count).sort();
  return { low: quantileSorted(sorted, (1 - level) / 2), high: quantileSorted(sorted, (1 + level) / 2) };
}

function quantileSorted(sorted: Float64Array, p: number): number {
  const n = sorted.length;
  if (n === 0) return NaN;
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(n - 1, lo + 1);
  return sorted[lo]! + (h - lo) * (sorted[hi]! - sorted[lo]!);
}
