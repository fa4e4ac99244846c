import { describe, expect, it } from 'vitest';
import type { SnapshotCell } from '../../../../shared/api/snapshots.js';
import { snapshotNumbers } from '@/components/snapshot/snapshotNumbers';
import { showValue } from '@/components/snapshot/showValue';

function cell(name: string, result: SnapshotCell['result']): SnapshotCell {
  return { cellId: name, name, kind: 'formula', state: 'fresh', durationMs: 1, result, warnings: [] };
}

describe('snapshotNumbers', () => {
  it('lists single numbers by the paths the run comparison reads, leaving out lists and text', () => {
    const cells: SnapshotCell[] = [
      cell('legs', {
        type: 'values',
        values: {
          left_big: 8.06,
          mean_w: { quantity: true, value: 251.5, unit: 'W' },
          per_leg: { left: 1.2, right: -0.3 },
          on_big: [true, false],
          series: { list: true, length: 3300, n: 3300, mean: 1, min: 0, max: 2, head: [] },
          verdict: 'outside',
          missing: null,
        },
      }),
      {
        ...cell('aligned', {
          type: 'table',
          table: { rows: 10, startS: 0, endS: 9, columns: [], facts: { offsetS: 2.5, method: 'xcorr' } },
          head: { columns: [], rows: [] },
        }),
        kind: 'transform',
      },
      cell('note', { type: 'note', markdown: 'x = 1' }),
    ];

    expect(snapshotNumbers(cells)).toEqual([
      { path: 'legs.left_big', value: 8.06 },
      { path: 'legs.mean_w', value: 251.5, unit: 'W' },
      { path: 'legs.per_leg.left', value: 1.2 },
      { path: 'legs.per_leg.right', value: -0.3 },
      { path: 'aligned.facts.offsetS', value: 2.5 },
    ]);
  });
});

describe('showValue', () => {
  it('reads lists in their JSON forms and quantities with their unit', () => {
    expect(showValue({ 0: 1.5, 1: 2, 2: null })).toBe('[1.5, 2, –]');
    expect(showValue({ quantity: true, value: 251.456, unit: 'W' })).toBe('251.5 W');
    expect(showValue(Array.from({ length: 14 }, (_, i) => i))).toBe('[0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, … 14 in all]');
    expect(showValue(true)).toBe('yes');
  });
});
