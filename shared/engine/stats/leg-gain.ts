/**
 * Gain error (percent) on one leg that explains a total error, when only that leg is
 * off: a leg carrying `legShare` of the power (0.5 at an even split) that reads g% high
 * makes the total read legShare * g% high, so g = total / legShare (a 5.74% total excess
 * pinned on one leg at 50/50 is 11.48% on that leg).
 *
 * @example
 * legGainFromTotal(5.74, 0.5) // 11.48
 */
export function legGainFromTotal(totalPct: number, legShare: number): number {
  return totalPct / legShare;
}

/**
 * Total error (percent) caused by a gain error of `legPct` on one leg that carries
 * `legShare` of the power; the inverse of {@link legGainFromTotal}.
 *
 * @example
 * totalFromLegGain(11.48, 0.5) // 5.74
 */
export function totalFromLegGain(legPct: number, legShare: number): number {
  return legPct * legShare;
}
