import { formatNumber } from '@/components/notebook/format';

const LIST_SHOWN = 12;

/** A list as stored in JSON: an array, or a typed array that became `{ "0": …, "1": … }`. */
function asList(v: object): unknown[] | null {
  if (Array.isArray(v)) return v;
  if (ArrayBuffer.isView(v)) return Array.from(v as unknown as ArrayLike<number>);
  const keys = Object.keys(v);
  if (keys.length > 0 && keys.every((k, i) => k === String(i))) return Object.values(v);
  return null;
}

/** True for a list value in any stored form (array, typed array turned object, or a long list's summary). */
export function isListValue(v: unknown): boolean {
  if (typeof v !== 'object' || v === null) return false;
  return (v as { list?: unknown }).list === true || asList(v) !== null;
}

/**
 * A stored formula value as one line of text: numbers to four significant digits,
 * quantities with their unit, long lists by their summary. Works on the JSON form of
 * a value, where typed arrays may have become plain objects.
 */
export function showValue(v: unknown, depth = 0): string {
  if (v === null || v === undefined) return '–';
  if (typeof v === 'number') return formatNumber(v);
  if (typeof v === 'string') return v;
  if (typeof v === 'boolean') return v ? 'yes' : 'no';
  if (typeof v !== 'object') return String(v);
  const o = v as Record<string, unknown>;
  if (o['quantity'] === true) return `${formatNumber(o['value'] as number)} ${String(o['unit'] ?? '')}`.trim();
  if (o['list'] === true) {
    return `list of ${String(o['length'])} · mean ${formatNumber(o['mean'] as number)} · min ${formatNumber(o['min'] as number)} · max ${formatNumber(o['max'] as number)}`;
  }
  const list = asList(v);
  if (list) {
    const shown = list.slice(0, LIST_SHOWN).map((x) => showValue(x, depth + 1));
    return `[${shown.join(', ')}${list.length > LIST_SHOWN ? `, … ${list.length} in all` : ''}]`;
  }
  if (depth > 1) return '{…}';
  return `{ ${Object.entries(o).map(([k, x]) => `${k}: ${showValue(x, depth + 1)}`).join(', ')} }`;
}
