import { describe, expect, it } from 'vitest';
import { isQuantity } from '../../../shared/formula/index.js';
import { errorOf, run } from './formula-helpers.js';

describe('formula errors', () => {
  it('gives the line and column of a syntax error', () => {
    // "b = (1 + " ends at column 10 of line 2: the parser wants a value there.
    const e = errorOf('a = 1\nb = (1 + ');
    expect(e.code).toBe('formula_syntax');
    expect(e.where).toEqual({ cell: 'c1', line: 2, column: 10 });
    expect(e.message).toContain('line 2, column 10');
  });

  it('gives the line and column of an unknown name', () => {
    const e = errorOf('a = 1\nb = a + powr * 2');
    expect(e.code).toBe('formula_unknown_name');
    expect(e.where).toEqual({ cell: 'c1', line: 2, column: 9 });
    expect(e.message).toContain('"powr"');
  });

  it('points at the forbidden field itself', () => {
    expect(errorOf('x = 1\ny = cos.constructor').where).toEqual({ cell: 'c1', line: 2, column: 9 });
  });

  it('names the line of a runtime error', () => {
    const e = errorOf('a = [1, 2]\nb = [1, 2, 3]\nc = a + b');
    expect(e.where?.line).toBe(3);
  });

  it('flags NaN and infinite results as warnings, not errors', () => {
    const r = run('a = 1 / 0\nb = avg([NaN, NaN])\nc = 2');
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.warnings.map((w) => [w.code, w.where?.line])).toEqual([
      ['formula_infinite', 1],
      ['formula_nan', 2],
    ]);
  });

  it('does not warn about dropouts inside a list', () => {
    const r = run('a = [1, NaN, 3] * 2');
    expect(r.ok && r.warnings).toEqual([]);
  });
});

describe('formula units', () => {
  it('refuses to add W to rpm with a message that says why', () => {
    const e = errorOf('x = 5 W + 90 rpm');
    expect(e.code).toBe('formula_units');
    expect(e.message).toMatch(/units do not match/);
    expect(e.message).toMatch(/W and rpm/);
  });

  it('refuses to add a plain number to a power', () => {
    expect(errorOf('x = 5 W + 2').code).toBe('formula_units');
  });

  it('converts km/h to m/s', () => {
    // 36 km/h = 36000 m / 3600 s = 10 m/s (definition of the units).
    const r = run('v = 36 km/h to m/s');
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const v = r.values['v'];
    expect(isQuantity(v) && v.value).toBeCloseTo(10, 12);
    expect(isQuantity(v) && v.unit).toBe('m / s');
  });

  it('knows rpm, N m and % so torque times cadence is power', () => {
    // P = T * 2 pi * cadence / 60 (DOMAIN.md physics): 40 N m at 90 rpm = 376.99 W.
    const r = run('p = 40 N m * 90 rpm * 2 pi to W\nshare = 2%');
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const p = r.values['p'];
    expect(isQuantity(p) && p.value).toBeCloseTo((40 * 2 * Math.PI * 90) / 60, 9);
    expect(r.values['share']).toBeCloseTo(0.02, 15);
  });
});

describe('formula reads and writes', () => {
  it('lists assigned names as writes and free names as reads, units apart', () => {
    const r = run('d = tab.a - tab.b\nf(x) = x * k\nbias = avg(f(d)) W', { tab: { a: Float64Array.of(1), b: Float64Array.of(1) }, k: 2 });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.analysis.writes).toEqual(['d', 'bias']);
    expect(r.analysis.reads.sort()).toEqual(['k', 'tab']);
    expect(r.analysis.unitNames).toEqual(['W']);
    expect(r.analysis.functions).toEqual(['f']);
  });

  it('lets a value in scope win over a unit of the same name (t is also tonne)', () => {
    const r = run('x = t * 2', { t: 3 });
    expect(r.ok && r.analysis.unitNames).toEqual(['t']);
    expect(r.ok && r.values['x']).toBe(6);
  });

  it('shows the last expression when it is not an assignment', () => {
    const r = run('a = 2\na * 3');
    expect(r.ok && r.last).toBe(6);
  });
});
