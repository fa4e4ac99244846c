import type { SnapshotCell } from './snapshotTypes';

/** One number a snapshot shows, addressed by cell name and value name (`findings.left_big`). */
export interface SnapshotNumber {
  path: string;
  value: number;
  unit?: string;
}

function isQuantity(v: unknown): v is { quantity: true; value: number; unit: string } {
  return typeof v === 'object' && v !== null && (v as { quantity?: unknown }).quantity === true && typeof (v as { value?: unknown }).value === 'number';
}

function collect(path: string, v: unknown, out: SnapshotNumber[], depth: number): void {
  if (typeof v === 'number') {
    if (Number.isFinite(v)) out.push({ path, value: v });
    return;
  }
  if (isQuantity(v)) {
    if (Number.isFinite(v.value)) out.push({ path, value: v.value, unit: v.unit });
    return;
  }
  // Records one level deep (e.g. a gain per leg) are still single numbers; lists are not.
  if (depth < 2 && typeof v === 'object' && v !== null && !Array.isArray(v) && !ArrayBuffer.isView(v) && (v as { list?: unknown }).list !== true) {
    for (const [k, x] of Object.entries(v)) collect(`${path}.${k}`, x, out, depth + 1);
  }
}

/**
 * Every single number in a snapshot: formula values (plain or with a unit, and inside
 * small records) and the facts a transform reported (`cell.facts.name`). The paths are
 * the ones the server's run comparison takes. These are what runs can be
 * compared by, because the same recipe gives the same paths on every run.
 */
export function snapshotNumbers(cells: readonly SnapshotCell[]): SnapshotNumber[] {
  const out: SnapshotNumber[] = [];
  for (const cell of cells) {
    const r = cell.result;
    if (!r) continue;
    if (r.type === 'values') for (const [k, v] of Object.entries(r.values)) collect(`${cell.name}.${k}`, v, out, 1);
    else if (r.type === 'table' && r.table.facts) {
      for (const [k, v] of Object.entries(r.table.facts)) collect(`${cell.name}.facts.${k}`, v, out, 2);
    }
  }
  return out;
}
