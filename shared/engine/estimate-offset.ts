import type { Recording } from '../recording/recording.js';
import { EngineError } from '../errors.js';
import { normalisedCrossCorrelation } from './normalised-cross-correlation.js';
import { resampleColumn } from './resample-column.js';
import { shiftForOffset } from './shift-for-offset.js';
import { pearson } from './stats/index.js';

/** Options of {@link estimateOffset}. */
export interface EstimateOffsetOptions {
  /** Largest clock offset searched either way, seconds (default 600). */
  maxLagS?: number;
  /** Grid the power traces are compared on, seconds (default 1); the offset is a multiple of it. */
  intervalS?: number;
  /** Use this offset instead of searching; the correlation at it is still reported. */
  manualOffsetS?: number;
  /** Lags this close to the best one belong to the same peak, seconds (default 5). */
  peakGuardS?: number;
}

/** The alignment of a test recording to the reference. */
export interface OffsetEstimate {
  /**
   * Test clock minus reference clock, seconds: the test sample stamped `c + offsetSeconds`
   * corresponds to the reference sample stamped `c` (see {@link shiftForOffset}).
   */
  offsetSeconds: number;
  /** Pearson correlation of the two power traces at that offset, over their overlap. */
  correlation: number;
  /**
   * How clearly the best lag beats the next distinct peak (a local maximum more than
   * `peakGuardS` away): `(best - next) / (1 - next)`, 0 = a tie, 1 = nothing else
   * correlates. NaN for a manual offset.
   */
  confidence: number;
  method: 'auto' | 'manual';
}

/**
 * Finds the clock offset between two recordings of the same ride by cross-correlating
 * their power on a common grid. Missing samples are masked and every lag is scored by
 * the Pearson correlation over its own overlap, so the edges (few samples) do not win;
 * lags whose overlap is under half the shorter trace are not considered. O(n log n)
 * through the FFT.
 *
 * @throws EngineError `no_power` when either recording has no power column,
 *   `no_overlap` when no lag within maxLagS overlaps enough.
 * @example
 * const { offsetSeconds } = estimateOffset(reference, test, { maxLagS: 300 });
 * const table = resample(test, { shiftS: shiftForOffset(reference, test, offsetSeconds) });
 */
export function estimateOffset(reference: Recording, test: Recording, options: EstimateOffsetOptions = {}): OffsetEstimate {
  const maxLagS = options.maxLagS ?? 600;
  const dt = options.intervalS ?? 1;
  const guardS = options.peakGuardS ?? 5;
  const refPower = reference.columns.power;
  const testPower = test.columns.power;
  if (refPower === undefined || testPower === undefined) {
    const file = refPower === undefined ? reference.meta.fileName : test.meta.fileName;
    throw new EngineError('no_power', `${file} has no power column to align on`, { file });
  }
  const refStart = reference.time.length > 0 ? reference.time[0]! : 0;
  const refCount = reference.time.length > 0 ? Math.floor((reference.time[reference.time.length - 1]! - refStart) / dt + 1e-9) + 1 : 0;
  // Point readings, not bin means: a bin mean is centred half a step away from a
  // point sample, which would leave two neighbouring lags tied when a 10 Hz file meets
  // a 1 Hz one.
  const read = (r: Recording, values: Float64Array, startS: number, count: number): Float64Array =>
    resampleColumn(r.time, values, { startS, intervalS: dt, count, sourceIntervalS: r.meta.sampleIntervalS, binMean: false });
  const r = read(reference, refPower, refStart, refCount);

  if (options.manualOffsetS !== undefined) {
    const shift = shiftForOffset(reference, test, options.manualOffsetS);
    const s = read(test, testPower, refStart + shift, refCount);
    return { offsetSeconds: options.manualOffsetS, correlation: pearson(s, r), confidence: NaN, method: 'manual' };
  }

  // Sample the test on a grid in step with the reference grid under a zero offset, so
  // every candidate offset is a whole number of grid steps.
  const base = shiftForOffset(reference, test, 0);
  const testFirst = test.time.length > 0 ? test.time[0]! : 0;
  const testLast = test.time.length > 0 ? test.time[test.time.length - 1]! : -1;
  const sStart = refStart + base + Math.ceil((testFirst - (refStart + base)) / dt - 1e-9) * dt;
  const sCount = testLast >= sStart ? Math.floor((testLast - sStart) / dt + 1e-9) + 1 : 0;
  const s = read(test, testPower, sStart, sCount);
  // s[j] pairs with r[i] when offset = (q + j - i) * dt.
  const q = Math.round((sStart - base - refStart) / dt);

  const minOverlap = Math.max(10, Math.floor(0.5 * Math.min(countFinite(r), countFinite(s))));
  const lagLo = Math.max(-(r.length - 1), Math.ceil(-maxLagS / dt - 1e-9) - q);
  const lagHi = Math.min(s.length - 1, Math.floor(maxLagS / dt + 1e-9) - q);
  const { correlation } = normalisedCrossCorrelation(s, r, { minOverlap, lags: { min: lagLo, max: lagHi } });
  const at = (k: number): number => correlation[k + r.length - 1]!;
  let bestK = NaN;
  let best = -Infinity;
  for (let k = lagLo; k <= lagHi; k++) {
    const c = at(k);
    if (c > best) {
      best = c;
      bestK = k;
    }
  }
  if (!Number.isFinite(best)) {
    throw new EngineError(
      'no_overlap',
      `${test.meta.fileName} and ${reference.meta.fileName} do not overlap with enough power samples within ±${maxLagS} s`,
      { file: test.meta.fileName },
    );
  }
  const guard = Math.max(1, Math.round(guardS / dt));
  let next = -Infinity;
  for (let k = lagLo; k <= lagHi; k++) {
    if (Math.abs(k - bestK) <= guard) continue;
    const c = at(k);
    if (!(c > next)) continue;
    const left = k > lagLo ? at(k - 1) : -Infinity;
    const right = k < lagHi ? at(k + 1) : -Infinity;
    if (!(c >= left || Number.isNaN(left)) || !(c >= right || Number.isNaN(right))) continue;
    next = c;
  }
  const confidence = Number.isFinite(next) ? clamp01((best - next) / (1 - next)) : 1;
  const offsetSeconds = Math.round((q + bestK) * dt * 1e9) / 1e9;
  return { offsetSeconds, correlation: best, confidence, method: 'auto' };
}

function countFinite(x: Float64Array): number {
  let m = 0;
  for (let i = 0; i < x.length; i++) if (Number.isFinite(x[i]!)) m++;
  return m;
}

function clamp01(x: number): number {
  return Number.isFinite(x) ? Math.max(0, Math.min(1, x)) : 0;
}
