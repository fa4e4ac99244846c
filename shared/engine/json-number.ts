/**
 * A number as JSON can hold it: NaN and ±Infinity (unknown, not computable) become null.
 *
 * @example jsonNumber(NaN) // null
 */
export function jsonNumber(x: number): number | null {
  return Number.isFinite(x) ? x : null;
}

/**
 * {@link jsonNumber} applied to every value of a flat record of numbers.
 *
 * @example jsonNumbers({ total: 1, left: NaN }) // { total: 1, left: null }
 */
export function jsonNumbers<K extends string>(record: Record<K, number>): Record<K, number | null> {
  const out = {} as Record<K, number | null>;
  for (const key of Object.keys(record) as K[]) out[key] = jsonNumber(record[key]);
  return out;
}
