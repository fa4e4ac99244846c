import type { Table } from './table.js';

/** A band [min, max] on one column; either end may be left open. */
export interface Band {
  min?: number;
  max?: number;
}

/**
 * Which rows of a table to use. Every criterion given must hold (they combine with
 * AND); an empty selection means every row.
 */
export interface SelectionSpec {
  /** Rows inside any of these [startS, endS) ranges (a segment, or several). */
  ranges?: readonly { startS: number; endS: number }[];
  /** Front chainring teeth. */
  frontTeeth?: number;
  /** Rear cog teeth. */
  rearTeeth?: number;
  /** Reference power band, W. */
  powerW?: Band;
  /** Cadence band, rpm. */
  cadenceRpm?: Band;
}

/** Column names {@link buildSelection} reads; defaults fit a paired table. */
export interface SelectionColumns {
  power?: string;
  cadence?: string;
  frontTeeth?: string;
  rearTeeth?: string;
}

/**
 * A mask (1 = use the row) for a selection on a table: all rows, a segment, a gear
 * state, a power band, a cadence band, or any combination. A row whose column is NaN
 * fails any criterion on that column. O(n + ranges log ranges).
 *
 * @example
 * buildSelection(paired, { frontTeeth: 50, powerW: { min: 200 } })
 */
export function buildSelection(table: Table, spec: SelectionSpec = {}, names: SelectionColumns = {}): Uint8Array {
  const n = table.timeS.length;
  const mask = new Uint8Array(n).fill(1);
  const c = table.columns;
  if (spec.ranges !== undefined) {
    const ranges = [...spec.ranges].sort((a, b) => a.startS - b.startS);
    let r = 0;
    for (let i = 0; i < n; i++) {
      const t = table.timeS[i]!;
      while (r < ranges.length && ranges[r]!.endS <= t) r++;
      let inside = false;
      for (let q = r; q < ranges.length && ranges[q]!.startS <= t; q++) {
        if (t < ranges[q]!.endS) {
          inside = true;
          break;
        }
      }
      if (!inside) mask[i] = 0;
    }
  }
  const equals = (column: Float64Array | undefined, value: number | undefined): void => {
    if (value === undefined) return;
    for (let i = 0; i < n; i++) if (column === undefined || column[i] !== value) mask[i] = 0;
  };
  const within = (column: Float64Array | undefined, band: Band | undefined): void => {
    if (band === undefined) return;
    const lo = band.min ?? -Infinity;
    const hi = band.max ?? Infinity;
    for (let i = 0; i < n; i++) {
      const v = column === undefined ? NaN : column[i]!;
      if (!(v >= lo && v <= hi)) mask[i] = 0;
    }
  };
  equals(c[names.frontTeeth ?? 'front_teeth'], spec.frontTeeth);
  equals(c[names.rearTeeth ?? 'rear_teeth'], spec.rearTeeth);
  within(c[names.power ?? 'ref_power'], spec.powerW);
  within(c[names.cadence ?? 'cadence'], spec.cadenceRpm);
  return mask;
}
