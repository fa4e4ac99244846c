import type { Table } from '../../shared/engine/table.js';

/**
 * A table as CSV: `time_s` then each column, one row per grid time; a missing sample
 * is an empty field (never 0, which would read as real zero power).
 */
export function tableCsv(table: Table): string {
  const names = Object.keys(table.columns);
  const lines = [['time_s', ...names].map(quote).join(',')];
  const columns = names.map((n) => table.columns[n]!);
  for (let i = 0; i < table.timeS.length; i++) {
    let line = fmt(table.timeS[i]!);
    for (const c of columns) line += `,${fmt(c[i]!)}`;
    lines.push(line);
  }
  return `${lines.join('\n')}\n`;
}

function fmt(x: number): string {
  return Number.isFinite(x) ? String(Math.round(x * 1e6) / 1e6) : '';
}

function quote(name: string): string {
  return /[",\n]/.test(name) ? `"${name.replace(/"/g, '""')}"` : name;
}
