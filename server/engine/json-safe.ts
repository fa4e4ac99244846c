/**
 * A value as JSON can hold it: typed arrays become plain arrays, NaN and infinities
 * become null (JSON.stringify would write null for them anyway, but jsonb and zod see
 * the value before that), undefined fields are dropped.
 */
export function jsonSafe(value: unknown): unknown {
  if (typeof value === 'number') return Number.isFinite(value) ? value : null;
  if (value === null || typeof value === 'string' || typeof value === 'boolean') return value;
  if (ArrayBuffer.isView(value) && !(value instanceof DataView)) {
    return Array.from(value as unknown as ArrayLike<number>, (x) => (Number.isFinite(x) ? x : null));
  }
  if (Array.isArray(value)) return value.map((x) => (x === undefined ? null : jsonSafe(x)));
  if (value instanceof Date) return value.toISOString();
  if (typeof value === 'object') {
    const out: Record<string, unknown> = {};
    for (const [k, x] of Object.entries(value as Record<string, unknown>)) if (x !== undefined && typeof x !== 'function') out[k] = jsonSafe(x);
    return out;
  }
  return null;
}
