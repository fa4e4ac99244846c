import { olsFit, summary } from './stats/index.js';
import { rollingMean } from './rolling-mean.js';
import type { Table } from './table.js';

/** Whether the device under test looks like a one-leg meter that doubles its reading. */
export interface SingleSidedCheck {
  detected: boolean;
  /** The leg it measures, when that can be told. */
  side: 'left' | 'right' | null;
  /** Share of pedalling seconds where the test reports exactly even legs (left == right or balance 50), 0..1; NaN without legs or balance. */
  evenShare: number;
  /** SD of the reference's left share over pedalling seconds, percentage points; NaN without reference legs. */
  referenceShareSdPct: number;
  /**
   * Slope of the test/reference ratio (30 s means) against the reference's left share:
   * about +2 when the test doubles the left leg, -2 when it doubles the right, 0 for a
   * meter that measures the total. NaN without reference legs.
   */
  shareSlope: number;
  /** R² of that fit. */
  shareR2: number;
}

/**
 * Looks for single-sided doubling: a one-leg meter reports total = 2 x its leg, so its
 * reading follows the rider's balance. Evidence: the test reports even legs (or balance
 * exactly 50) nearly always while the reference's balance varies, or the ratio
 * test/reference moves with the reference's left share at a slope near ±2. O(n).
 *
 * @param minPowerW seconds under this reference power are not pedalling (default 50)
 * @example
 * detectSingleSided(paired).detected
 */
export function detectSingleSided(table: Table, minPowerW = 50): SingleSidedCheck {
  const c = table.columns;
  const ref = c.ref_power!;
  const test = c.test_power!;
  const n = ref.length;
  const pedalling = new Uint8Array(n);
  for (let i = 0; i < n; i++) pedalling[i] = ref[i]! >= minPowerW && Number.isFinite(test[i]!) ? 1 : 0;

  let even = 0;
  let judged = 0;
  const tl = c.test_left;
  const tr = c.test_right;
  const tb = c.test_balance;
  for (let i = 0; i < n; i++) {
    if (!pedalling[i]) continue;
    if (tl !== undefined && tr !== undefined && Number.isFinite(tl[i]!) && Number.isFinite(tr[i]!)) {
      judged++;
      if (Math.abs(tl[i]! - tr[i]!) <= 0.5 + 0.005 * test[i]!) even++;
    } else if (tb !== undefined && Number.isFinite(tb[i]!)) {
      judged++;
      if (tb[i] === 50) even++;
    }
  }
  const evenShare = judged > 0 ? even / judged : NaN;

  const rl = c.ref_left;
  let referenceShareSdPct = NaN;
  let shareSlope = NaN;
  let shareR2 = NaN;
  if (rl !== undefined) {
    const window = Math.max(1, Math.round(30 / (n > 1 ? table.timeS[1]! - table.timeS[0]! : 1)));
    const minCount = Math.ceil(window * 0.8);
    const sr = rollingMean(ref, window, { align: 'centred', minCount });
    const st = rollingMean(test, window, { align: 'centred', minCount });
    const sl = rollingMean(rl, window, { align: 'centred', minCount });
    const share = new Float64Array(n);
    const ratio = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const ok = pedalling[i] === 1 && sr[i]! >= minPowerW;
      share[i] = ok ? sl[i]! / sr[i]! : NaN;
      ratio[i] = ok ? st[i]! / sr[i]! : NaN;
    }
    const fit = olsFit(share, ratio);
    shareSlope = fit.slope;
    shareR2 = fit.r2;
    referenceShareSdPct = 100 * summary(share).sd;
  }
  const balanceVaries = referenceShareSdPct >= 0.5;
  const evenAlways = evenShare >= 0.98 && (balanceVaries || Number.isNaN(referenceShareSdPct));
  const tracks = referenceShareSdPct >= 0.3 && shareR2 >= 0.3 && Math.abs(Math.abs(shareSlope) - 2) <= 0.6;
  const side = tracks ? (shareSlope > 0 ? 'left' : 'right') : null;
  return { detected: evenAlways || tracks, side, evenShare, referenceShareSdPct, shareSlope, shareR2 };
}
