/** An analyst's statement of where the chain physically was over an interval. */
export interface GearOverride {
  /** Seconds on the table's time axis (from the reference's first sample); the interval is [startS, endS). */
  startS: number;
  endS: number;
  frontTeeth?: number;
  rearTeeth?: number;
}

/**
 * Replaces the gear state over the given intervals. The gear a device reports can
 * differ from the physical chain position (a shift signal sent while the chain does not
 * move), and the tester's log is the truth for the physical effect. Returns new arrays;
 * later overrides win where intervals overlap. O(n * overrides) at worst, O(n + k log n)
 * in practice through binary search on the sorted time axis.
 *
 * @example
 * applyGearOverrides(table.timeS, { frontTeeth: table.columns.front_teeth! }, [{ startS: 3000, endS: 3240, frontTeeth: 34 }])
 */
export function applyGearOverrides(
  timeS: Float64Array,
  gears: { frontTeeth?: Float64Array | undefined; rearTeeth?: Float64Array | undefined },
  overrides: readonly GearOverride[],
): { frontTeeth: Float64Array; rearTeeth: Float64Array } {
  const n = timeS.length;
  const frontTeeth = gears.frontTeeth?.slice() ?? new Float64Array(n).fill(NaN);
  const rearTeeth = gears.rearTeeth?.slice() ?? new Float64Array(n).fill(NaN);
  for (const o of overrides) {
    let i = lowerBound(timeS, o.startS);
    for (; i < n && timeS[i]! < o.endS; i++) {
      if (o.frontTeeth !== undefined) frontTeeth[i] = o.frontTeeth;
      if (o.rearTeeth !== undefined) rearTeeth[i] = o.rearTeeth;
    }
  }
  return { frontTeeth, rearTeeth };
}

function lowerBound(sorted: Float64Array, value: number): number {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (sorted[mid]! < value) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}
