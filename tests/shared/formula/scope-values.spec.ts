import { describe, expect, it } from 'vitest';
import { columnSourceOf, toMathValue } from '../../../shared/formula/index.js';
import { engine, run } from './formula-helpers.js';

describe('values handed to formulas', () => {
  it('converts a table’s columns only when a formula reads them', () => {
    const table = { power: Float64Array.of(100, 200, 300), cadence: Float64Array.of(80, 90, 100) };
    const scoped = toMathValue(engine.math, table) as Record<string, unknown>;
    expect(Object.getOwnPropertyDescriptor(scoped, 'power')?.get).toBeTypeOf('function');
    expect(scoped['power']).toEqual([100, 200, 300]);
    // Read once: now a plain value, and the other column is still unconverted.
    expect(Object.getOwnPropertyDescriptor(scoped, 'power')?.value).toEqual([100, 200, 300]);
    expect(Object.getOwnPropertyDescriptor(scoped, 'cadence')?.get).toBeTypeOf('function');
    expect(Object.keys(scoped)).toEqual(['power', 'cadence']);
  });

  it('knows the column a list came from while the list is unchanged', () => {
    const column = Float64Array.of(1, 2, NaN, 4, 5);
    const list = toMathValue(engine.math, column) as number[];
    expect(columnSourceOf(list)).toBe(column);
    expect(columnSourceOf([1, 2, NaN, 4, 5])).toBeUndefined();
    list[0] = 9;
    expect(columnSourceOf(list)).toBeUndefined();
  });

  it('computes from a derived list’s own values; lists cannot be changed in place', () => {
    const t = { power: Float64Array.of(100, 100, 100, 100) };
    const r = { power: Float64Array.of(100, 100, 100, 100) };
    const out = run('a = t.power * 1.25\nd = pctdiff(a, r.power)\nsame = pctdiff(t.power, r.power)', { t, r });
    expect(out.ok ? '' : out.error.message).toBe('');
    expect(out.ok && out.values['d']).toBeCloseTo(25, 10);
    expect(out.ok && out.values['same']).toBeCloseTo(0, 10);
    // What makes reading the original column safe: a formula cannot change a list in place.
    const refused = run('a = t.power\na[2] = 200', { t });
    expect(refused.ok ? '' : refused.error.message).toMatch(/only plain names can be assigned/);
    expect([...t.power]).toEqual([100, 100, 100, 100]);
  });
});
