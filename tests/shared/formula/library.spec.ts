import * as ss from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { FORMULA_LIBRARY, createFormulaEngine } from '../../../shared/formula/index.js';
import { create, all } from 'mathjs';
import { run } from './formula-helpers.js';

const ref = Float64Array.of(200, 210, 190, 250, 300, 305, NaN, 180);
const test = Float64Array.of(204, 213, 195, 252, 306, 311, 260, NaN);
const pairedRef = [200, 210, 190, 250, 300, 305];
const pairedTest = [204, 213, 195, 252, 306, 311];

function values(source: string) {
  const r = run(source, { t: { ref, test } });
  if (!r.ok) throw new Error(r.error.message);
  return r.values;
}

describe('formula library', () => {
  it('documents every function it adds, and adds every function it documents', () => {
    const engine = createFormulaEngine();
    const plain = create(all);
    for (const f of FORMULA_LIBRARY) {
      expect(typeof (engine.math as unknown as Record<string, unknown>)[f.name], f.name).toBe('function');
      expect(f.signature.startsWith(`${f.name}(`)).toBe(true);
      // Cogbook names must not shadow a mathjs function of the same name.
      expect((plain as unknown as Record<string, unknown>)[f.name], f.name).toBeUndefined();
    }
  });

  it('avg, med and sdev skip missing samples and honour a mask', () => {
    const v = values('a = avg(t.ref)\nm = med(t.ref)\ns = sdev(t.ref)\nhi = avg(t.ref, t.ref > 220)');
    const finite = Array.from(ref).filter(Number.isFinite);
    // Outside source: simple-statistics.
    expect(v['a']).toBeCloseTo(ss.mean(finite), 12);
    expect(v['m']).toBeCloseTo(ss.median(finite), 12);
    expect(v['s']).toBeCloseTo(ss.sampleStandardDeviation(finite), 12);
    expect(v['hi']).toBeCloseTo(ss.mean([250, 300, 305]), 12);
  });

  it('pctdiff and ratio use the paired samples only', () => {
    const v = values('p = pctdiff(t.test, t.ref)\nr = ratio(t.test, t.ref)');
    const mt = ss.mean(pairedTest);
    const mr = ss.mean(pairedRef);
    expect(v['p']).toBeCloseTo(100 * (mt / mr - 1), 10);
    expect(v['r']).toBeCloseTo(mt / mr, 12);
  });

  it('agreement gives bias and 95% limits of test - reference', () => {
    const v = values('ba = agreement(t.test, t.ref)');
    const d = pairedTest.map((x, i) => x - pairedRef[i]!);
    const ba = v['ba'] as Record<string, number>;
    // Bland & Altman 1986: bias = mean difference, limits = bias +/- 1.96 SD.
    expect(ba['n']).toBe(6);
    expect(ba['bias']).toBeCloseTo(ss.mean(d), 12);
    expect(ba['lower']).toBeCloseTo(ss.mean(d) - 1.96 * ss.sampleStandardDeviation(d), 10);
    expect(ba['upper']).toBeCloseTo(ss.mean(d) + 1.96 * ss.sampleStandardDeviation(d), 10);
  });

  it('gainfit is the least-squares line of test on reference', () => {
    const fit = values('g = gainfit(t.test, t.ref)')['g'] as Record<string, number>;
    const expected = ss.linearRegression(pairedRef.map((x, i) => [x, pairedTest[i]!]));
    expect(fit['slope']).toBeCloseTo(expected.m, 10);
    expect(fit['intercept']).toBeCloseTo(expected.b, 8);
  });

  it('persegment and pergear group by a label column', () => {
    const r = run('s = persegment(x, seg)\nmx = persegment(x, seg, "max")\ng = pergear(x, gear)', {
      x: Float64Array.of(1, 2, 3, 4, 5, 6),
      seg: Float64Array.of(1, 1, NaN, 2, 2, 2),
      gear: Float64Array.of(50, 50, 34, 34, 50, NaN),
    });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(Array.from(r.values['s'] as Float64Array)).toEqual([1.5, 5]);
    expect(Array.from(r.values['mx'] as Float64Array)).toEqual([2, 6]);
    const g = r.values['g'] as Record<string, Float64Array>;
    expect(Array.from(g['gear']!)).toEqual([34, 50]);
    expect(Array.from(g['mean']!)).toEqual([3.5, (1 + 2 + 5) / 3]);
  });

  it('withintol gives the share inside the band in percent, rollavg smooths', () => {
    const r = run('w = withintol([0.5, -1.5, 2.5, 1], 2)\nr = rollavg([1, 2, 3, 4], 2)');
    expect(r.ok && r.values['w']).toBe(75);
    expect(r.ok && Array.from(r.values['r'] as Float64Array)).toEqual([1, 1.5, 2.5, 3.5]);
  });

  it('says which argument is wrong', () => {
    const r = run('x = avg(5 W)');
    expect(!r.ok && r.error.message).toMatch(/avg: values/);
  });
});
