import type { Table } from './table.js';

/** A value for the total and each leg; NaN where a leg is not known. */
export interface Sides {
  total: number;
  left: number;
  right: number;
}

/** Means of reference and test per side, each over the rows where both of that side are finite. */
export interface SideMeans {
  reference: Sides;
  test: Sides;
  /** Rows used per side. */
  n: Sides;
}

const SIDE_COLUMNS = {
  total: ['ref_power', 'test_power'],
  left: ['ref_left', 'test_left'],
  right: ['ref_right', 'test_right'],
} as const;

/**
 * Mean reference and test power for the total and each leg over a selection of a
 * paired table, each side over the rows where both devices have it (so a dropout on
 * one device removes that second from both means). O(n).
 *
 * @example
 * sideMeans(paired, buildSelection(paired, { frontTeeth: 50 })).test.left
 */
export function sideMeans(table: Table, mask?: Uint8Array): SideMeans {
  const out: SideMeans = {
    reference: { total: NaN, left: NaN, right: NaN },
    test: { total: NaN, left: NaN, right: NaN },
    n: { total: 0, left: 0, right: 0 },
  };
  for (const side of ['total', 'left', 'right'] as const) {
    const [refName, testName] = SIDE_COLUMNS[side];
    const ref = table.columns[refName];
    const test = table.columns[testName];
    if (ref === undefined || test === undefined) continue;
    let sr = 0;
    let st = 0;
    let m = 0;
    for (let i = 0; i < ref.length; i++) {
      if (mask !== undefined && mask[i] === 0) continue;
      const r = ref[i]!;
      const t = test[i]!;
      if (!Number.isFinite(r) || !Number.isFinite(t)) continue;
      sr += r;
      st += t;
      m++;
    }
    out.n[side] = m;
    if (m > 0) {
      out.reference[side] = sr / m;
      out.test[side] = st / m;
    }
  }
  return out;
}

/** Applies `f` to each side of two {@link Sides}. */
export function mapSides(a: Sides, b: Sides, f: (x: number, y: number) => number): Sides {
  return { total: f(a.total, b.total), left: f(a.left, b.left), right: f(a.right, b.right) };
}
