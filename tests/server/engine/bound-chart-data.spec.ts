import { describe, expect, it } from 'vitest';
import { FULL_SERIES_KEY } from '../../../shared/charts/reduce-range.js';
import { tracesSpec } from '../../../shared/charts/traces.js';
import { boundChartData } from '../../../server/engine/bound-chart-data.js';

describe('boundChartData', () => {
  it('leaves the zoom-only full series out of a snapshot chart and keeps the drawn rows', () => {
    const t = Array.from({ length: 5000 }, (_, i) => i);
    const spec = tracesSpec({ timeS: t, series: [{ label: 'Reference', colourIndex: 0, values: t }] }) as unknown as Record<string, unknown>;
    expect((spec['usermeta'] as Record<string, unknown>)[FULL_SERIES_KEY]).toBeDefined();
    const bounded = boundChartData(spec);
    expect(bounded['usermeta']).toBeUndefined();
    expect((bounded['data'] as { values: unknown[] }).values).toEqual((spec['data'] as { values: unknown[] }).values);
  });

  it('keeps other user metadata', () => {
    const bounded = boundChartData({ usermeta: { note: 'kept', [FULL_SERIES_KEY]: { x: [] } }, mark: 'point' });
    expect(bounded['usermeta']).toEqual({ note: 'kept' });
  });
});
