import type { BalanceSide } from './recording.js';

/**
 * Splits total power into left and right legs from a balance percent, in place into `left`/`right`.
 * `side` says whose share the percent is ('right' as FIT bit 0x80, 'left' as a CSV "% left").
 * Zero power gives zero on both legs; a missing balance gives NaN legs.
 * With side 'unknown' or 'none' nothing can be split: returns false and leaves the outputs alone.
 */
export function splitPower(power: Float64Array, balance: Float64Array, side: BalanceSide, left: Float64Array, right: Float64Array): boolean {
  if (side !== 'left' && side !== 'right') return false;
  for (let i = 0; i < power.length; i++) {
    const p = power[i]!;
    const b = balance[i]!;
    if (p === 0) {
      left[i] = 0;
      right[i] = 0;
    } else if (Number.isNaN(b) || Number.isNaN(p)) {
      left[i] = NaN;
      right[i] = NaN;
    } else {
      const rightShare = side === 'right' ? b : 100 - b;
      right[i] = (p * rightShare) / 100;
      left[i] = (p * (100 - rightShare)) / 100;
    }
  }
  return true;
}
