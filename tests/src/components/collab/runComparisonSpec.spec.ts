import { describe, expect, it } from 'vitest';
import type { RunCompareRow } from '../../../../shared/api/runs.js';
import { runComparisonSpec } from '@/components/collab/runComparisonSpec';

const rows: RunCompareRow[] = [
  { runId: 'r1', label: 'First ride', createdAt: '2026-03-01T10:00:00Z', revision: 1, value: 8.1, unit: '%' },
  { runId: 'r2', label: null, createdAt: '2026-03-02T10:00:00Z', revision: 2, value: null, problem: 'failed' },
  { runId: 'r3', label: 'First ride', createdAt: '2026-03-03T10:00:00Z', revision: 2, value: 0.4 },
];

describe('runComparisonSpec', () => {
  it('plots one point per run with a number, in run order, keeping failed runs as places on the axis', () => {
    const spec = runComparisonSpec('legs.left_big', rows, '%') as unknown as {
      data: { values: { run: string; value: number }[] };
      encoding: { x: { sort: string[] }; y: { title: string } };
    };

    expect(spec.data.values.map((v) => v.value)).toEqual([8.1, 0.4]);
    // Two runs share a label: the position keeps them apart and in order.
    expect(spec.encoding.x.sort[0]).toBe('1 · First ride');
    expect(spec.encoding.x.sort[2]).toBe('3 · First ride');
    expect(spec.encoding.x.sort).toHaveLength(3);
    expect(spec.encoding.y.title).toBe('legs.left_big (%)');
  });
});
