import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { mean, sampleStandardDeviation, sum as ssSum } from 'simple-statistics';
import { summary } from '../../../../shared/engine/stats/summary.js';
import { createRandom } from '../../../../shared/synthetic/random.js';
import lew from '../../../fixtures/reference/strd_univariate_lew.json';
import michelso from '../../../fixtures/reference/strd_univariate_michelso.json';
import numacc1 from '../../../fixtures/reference/strd_univariate_numacc1.json';
import numacc3 from '../../../fixtures/reference/strd_univariate_numacc3.json';
import { correctDigits, expectDigits, numbers } from './digits.js';

describe('summary against NIST StRD Univariate Summary Statistics (certified values)', () => {
  it.each([
    ['Lew', lew, 12],
    ['Michelso', michelso, 12],
    ['NumAcc1', numacc1, 12],
  ] as const)('%s: mean and SD to 12+ significant digits', (_name, set, digits) => {
    const s = summary(numbers(set.data));
    expect(s.n).toBe(set.certified.n);
    expectDigits(s.mean, set.certified.mean, digits);
    expectDigits(s.sd, set.certified.sd_n_minus_1, digits);
  });

  it('NumAcc3 (1001 eight-digit values differing in the 7th digit): mean 12+ digits, SD 9+ digits', () => {
    // Source: NIST StRD NumAcc3, certified mean 1000000.2, SD 0.1. The inputs 1000000.1 etc.
    // are not exact in binary; that representation error alone limits the SD to ~9.5 digits.
    const s = summary(numbers(numacc3.data));
    expect(s.n).toBe(1001);
    expectDigits(s.mean, numacc3.certified.mean, 12);
    expectDigits(s.sd, numacc3.certified.sd_n_minus_1, 9);
  });

  it('a naive one-pass variance would fail NumAcc3, the two-pass result does not', () => {
    // Source: NIST StRD NumAcc3 (certified SD 0.1); shows why the algorithm matters.
    const x = numbers(numacc3.data);
    let s1 = 0;
    let s2 = 0;
    for (const v of x) {
      s1 += v;
      s2 += v * v;
    }
    const naive = Math.sqrt((s2 - (s1 * s1) / x.length) / (x.length - 1));
    expect(correctDigits(naive, 0.1)).toBeLessThan(3);
    expect(correctDigits(summary(x).sd, 0.1)).toBeGreaterThan(9);
  });

  it('min, max and sum of Lew match the data (checked against simple-statistics)', () => {
    const x = numbers(lew.data);
    const s = summary(x);
    expect(s.min).toBe(-579);
    expect(s.max).toBe(300);
    expect(s.sum).toBe(ssSum(Array.from(x)));
  });
});

describe('summary against simple-statistics as a second implementation', () => {
  it('mean and sample SD agree to 1e-10 relative on seeded random power-like data', () => {
    const random = createRandom(7);
    for (let trial = 0; trial < 20; trial++) {
      const n = 2 + random.int(0, 500);
      const x = new Float64Array(n);
      for (let i = 0; i < n; i++) x[i] = 250 + 40 * random.gaussian();
      const s = summary(x);
      const values = Array.from(x);
      expect(Math.abs(s.mean - mean(values)) / Math.abs(mean(values))).toBeLessThan(1e-12);
      expect(Math.abs(s.sd - sampleStandardDeviation(values)) / sampleStandardDeviation(values)).toBeLessThan(1e-10);
    }
  });
});

describe('summary edge cases', () => {
  it('skips NaN and infinities as missing samples', () => {
    const s = summary(new Float64Array([200, NaN, 210, Infinity, 190, -Infinity]));
    expect(s).toEqual({ n: 3, mean: 200, sd: 10, min: 190, max: 210, sum: 600 });
  });

  it('all NaN gives n = 0 and NaN statistics without throwing', () => {
    const s = summary(new Float64Array([NaN, NaN]));
    expect(s.n).toBe(0);
    expect(s.mean).toBeNaN();
    expect(s.sd).toBeNaN();
    expect(s.min).toBeNaN();
    expect(s.sum).toBe(0);
  });

  it('an empty column gives n = 0', () => {
    expect(summary([]).n).toBe(0);
  });

  it('one value has a mean but no SD', () => {
    const s = summary([42]);
    expect(s.n).toBe(1);
    expect(s.mean).toBe(42);
    expect(s.sd).toBeNaN();
  });

  it('a constant column has SD exactly 0', () => {
    expect(summary(new Float64Array(100).fill(1000000.1)).sd).toBe(0);
  });
});

describe('summary properties (fast-check)', () => {
  it('adding a large offset moves the mean by the offset and leaves the SD (two-pass keeps the digits)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.integer({ min: -1000, max: 1000 }), { minLength: 2, maxLength: 60 }),
        fc.integer({ min: -1e9, max: 1e9 }),
        (values, offset) => {
          // Integers (in tenths of a watt) stay exact after the shift, so any loss is the algorithm's.
          const base = summary(values);
          const shifted = summary(values.map((v) => v + offset));
          expect(shifted.mean - offset).toBeCloseTo(base.mean, 6);
          if (base.sd > 0) expect(Math.abs(shifted.sd - base.sd) / base.sd).toBeLessThan(1e-6);
          else expect(shifted.sd).toBe(0);
        },
      ),
      { seed: 17, numRuns: 300 },
    );
  });
});
