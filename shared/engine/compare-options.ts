import type { GearOverride } from './apply-gear-overrides.js';
import type { SteadyBlockOptions } from './detect-steady-blocks.js';

/** Options of compareRecordings; every one has a default. */
export interface CompareOptions {
  /** Stated accuracy of the devices under test, percent (default 2). */
  tolerancePct?: number;
  /** Stated accuracy of the reference, percent (default 1). */
  referenceTolerancePct?: number;
  /** Common grid, seconds (default 1). */
  intervalS?: number;
  /** Longest gap bridged by interpolation, seconds (default 3). */
  maxGapS?: number;
  /** 'auto' (default) to find each test's clock offset, or a fixed offset in seconds for every test. */
  offset?: 'auto' | number;
  /** Largest offset searched, seconds (default 600). */
  maxLagS?: number;
  /** Chainring teeth, for inferring gears from speed and cadence when no file reports them. */
  chainrings?: number[];
  /** Cog teeth, for inferring gears. */
  cogs?: number[];
  /** Wheel, ETRTO ("25-622") or circumference in mm, for inferring gears. */
  wheel?: string | number;
  /** Infer gears even when a file reports them (default false: only when none does). */
  inferGears?: boolean;
  /** Where the chain physically was, from the tester's log. */
  gearOverrides?: GearOverride[];
  /** Sections to compare: detected steady blocks (default), the reference's laps, or ranges. */
  segments?: 'steady' | 'laps' | { startS: number; endS: number; label?: string }[];
  /** Parameters of steady-block detection. */
  steady?: SteadyBlockOptions;
  /** A leg or gear state with at least this share of the paired time decides the verdict (default 0.1). */
  minShare?: number;
  /** Seed of every bootstrap (default 1). */
  seed?: number;
  /** Bootstrap replicates (default 1000). */
  replicates?: number;
}

/** {@link CompareOptions} with the defaults filled in. */
export type ResolvedCompareOptions = Required<Pick<CompareOptions,
  'tolerancePct' | 'referenceTolerancePct' | 'intervalS' | 'maxGapS' | 'offset' | 'maxLagS' | 'minShare' | 'seed' | 'replicates' | 'inferGears'>> &
  CompareOptions;

/**
 * Fills in the defaults of {@link CompareOptions}.
 *
 * @example resolveCompareOptions({}).tolerancePct // 2
 */
export function resolveCompareOptions(options: CompareOptions = {}): ResolvedCompareOptions {
  return {
    ...options,
    tolerancePct: options.tolerancePct ?? 2,
    referenceTolerancePct: options.referenceTolerancePct ?? 1,
    intervalS: options.intervalS ?? 1,
    maxGapS: options.maxGapS ?? 3,
    offset: options.offset ?? 'auto',
    maxLagS: options.maxLagS ?? 600,
    minShare: options.minShare ?? 0.1,
    seed: options.seed ?? 1,
    replicates: options.replicates ?? 1000,
    inferGears: options.inferGears ?? false,
  };
}
