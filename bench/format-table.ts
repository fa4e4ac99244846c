import type { Machine } from './machine.js';
import type { BenchRow } from './types.js';

const HEADERS = ['name', 'value', 'unit', 'baseline', 'ratio', 'note'] as const;

/** A number for the table: 3 significant figures, no exponent for ordinary sizes; "-" when missing. */
export function formatFigure(x: number): string {
  if (!Number.isFinite(x)) return '-';
  const a = Math.abs(x);
  if (a >= 1000) return String(Math.round(x));
  if (a === 0) return '0';
  return String(Number(x.toPrecision(3)));
}

/** The rows as a fixed-width text table, numbers right-aligned, with the machine on top. */
export function formatTable(machine: Machine, rows: readonly BenchRow[]): string {
  const cells = rows.map((r) => [r.name, formatFigure(r.value), r.unit, formatFigure(r.baseline), formatFigure(r.ratio), r.note ?? '']);
  const widths = HEADERS.map((h, c) => Math.max(h.length, ...cells.map((row) => row[c]!.length)));
  const numeric = new Set([1, 3, 4]);
  const line = (row: readonly string[]): string =>
    row.map((cell, c) => (c === row.length - 1 ? cell : numeric.has(c) ? cell.padStart(widths[c]!) : cell.padEnd(widths[c]!))).join('  ').trimEnd();
  const head = `${machine.cpus} x ${machine.model}, ${machine.memory} GB, Node ${machine.node}, ${machine.os}, ${machine.date}`;
  return [head, '', line(HEADERS), line(widths.map((w) => '-'.repeat(w))), ...cells.map(line)].join('\n');
}
