import type { Recording } from '../recording/recording.js';
import { compareTest } from './compare-test.js';
import { resolveCompareOptions, type CompareOptions } from './compare-options.js';
import type { CompareReport } from './compare-report.js';
import { fileInfo } from './file-info.js';

/**
 * Compares one or more devices under test, each against the same reference: aligns
 * clocks, pairs on a common grid, and reports overall, per chainring and per section
 * means by leg, agreement, regression, drift, a diagnosis and a verdict against the
 * tolerance. The result is plain JSON data (NaN written as null) that
 * `compareReportSchema` validates.
 *
 * @throws EngineError from alignment or pairing (`no_power`, `no_overlap`, ...)
 * @example
 * const report = compareRecordings(reference, [crank, pedals], { tolerancePct: 1.5, chainrings: [50, 34] });
 * report.comparisons[0].verdict.pass
 */
export function compareRecordings(reference: Recording, tests: readonly Recording[], options: CompareOptions = {}): CompareReport {
  const o = resolveCompareOptions(options);
  return {
    reference: fileInfo(reference),
    options: {
      tolerancePct: o.tolerancePct,
      referenceTolerancePct: o.referenceTolerancePct,
      intervalS: o.intervalS,
      maxGapS: o.maxGapS,
      offset: o.offset,
      seed: o.seed,
      replicates: o.replicates,
    },
    comparisons: tests.map((test) => compareTest(reference, test, o)),
  };
}
