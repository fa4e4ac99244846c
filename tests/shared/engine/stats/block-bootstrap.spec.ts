import { describe, expect, it } from 'vitest';
import { blockBootstrapCi, gainCi, ratioCi } from '../../../../shared/engine/stats/block-bootstrap.js';
import { optimalBlockLength } from '../../../../shared/engine/stats/optimal-block-length.js';
import { createRandom } from '../../../../shared/synthetic/random.js';

/** A stationary AR(1) series x_i = phi x_(i-1) + e_i with standard normal e (mean 0). */
function ar1(n: number, phi: number, seed: number): Float64Array {
  const random = createRandom(seed);
  const x = new Float64Array(n);
  x[0] = random.gaussian() / Math.sqrt(1 - phi * phi);
  for (let i = 1; i < n; i++) x[i] = phi * x[i - 1]! + random.gaussian();
  return x;
}

const meanOf = (x: Float64Array) => (ix: Int32Array): number => {
  let s = 0;
  for (let k = 0; k < ix.length; k++) s += x[ix[k]!]!;
  return s / ix.length;
};

describe('blockBootstrapCi', () => {
  const x = ar1(300, 0.5, 9);

  it('is reproducible: the same seed gives the same interval, another seed a different one', () => {
    const a = blockBootstrapCi(x.length, meanOf(x), { seed: 42, replicates: 500 });
    const b = blockBootstrapCi(x.length, meanOf(x), { seed: 42, replicates: 500 });
    const c = blockBootstrapCi(x.length, meanOf(x), { seed: 43, replicates: 500 });
    expect(b).toEqual(a);
    expect(c.low).not.toBe(a.low);
  });

  it('reports the statistic on the original order as the estimate, and the defaults it used', () => {
    const ci = blockBootstrapCi(x.length, meanOf(x), { replicates: 300 });
    const direct = x.reduce((s, v) => s + v, 0) / x.length;
    expect(ci.estimate).toBeCloseTo(direct, 14);
    expect(ci.blockLength).toBe(Math.ceil(Math.cbrt(300)));
    expect(ci.replicates).toBe(300);
    expect(ci.low).toBeLessThan(ci.estimate);
    expect(ci.high).toBeGreaterThan(ci.estimate);
  });

  it('a wider level gives a wider interval', () => {
    const narrow = blockBootstrapCi(x.length, meanOf(x), { level: 0.5, replicates: 500 });
    const wide = blockBootstrapCi(x.length, meanOf(x), { level: 0.99, replicates: 500 });
    expect(wide.high - wide.low).toBeGreaterThan(2 * (narrow.high - narrow.low));
  });

  it('a constant series gives a zero-width interval; no samples gives NaN', () => {
    const flat = new Float64Array(50).fill(250);
    const ci = blockBootstrapCi(50, meanOf(flat), { replicates: 100 });
    expect(ci.low).toBe(250);
    expect(ci.high).toBe(250);
    const none = blockBootstrapCi(0, () => 1);
    expect(none.low).toBeNaN();
    expect(none.replicates).toBe(0);
  });

  it('drops replicates whose statistic is not finite', () => {
    let calls = 0;
    const ci = blockBootstrapCi(20, () => (calls++ % 2 === 0 ? NaN : 1), { replicates: 100 });
    expect(ci.replicates).toBe(50);
  });

  it('on AR(1) series (phi = 0.9) blocks cover the true mean near the nominal rate, single samples clearly do not', () => {
    // 200 seeded series of 500 samples; the true mean is 0. Blocks from optimalBlockLength.
    // Percentile block intervals run a little short for such strong dependence (about 90%
    // here for 95% nominal); resampling single samples ignores it and covers about 35%.
    let coveredBlock = 0;
    let coveredSingle = 0;
    const series = 200;
    for (let s = 0; s < series; s++) {
      const y = ar1(500, 0.9, 1000 + s);
      const statistic = meanOf(y);
      const blocks = blockBootstrapCi(y.length, statistic, { blockLength: optimalBlockLength(y), replicates: 500, seed: s });
      const single = blockBootstrapCi(y.length, statistic, { blockLength: 1, replicates: 500, seed: s });
      if (blocks.low <= 0 && blocks.high >= 0) coveredBlock++;
      if (single.low <= 0 && single.high >= 0) coveredSingle++;
    }
    expect(coveredBlock / series).toBeGreaterThan(0.8);
    expect(coveredBlock / series).toBeLessThanOrEqual(1);
    expect(coveredSingle / series).toBeLessThan(0.5);
  }, 60_000);
});

describe('optimalBlockLength (Politis & White 2004, Patton, Politis & White 2009)', () => {
  it('is short for white noise and long for a strongly autocorrelated series', () => {
    const random = createRandom(4);
    const noise = Float64Array.from({ length: 2000 }, () => random.gaussian());
    expect(optimalBlockLength(noise)).toBeLessThanOrEqual(5);
    // For AR(1) with phi = 0.9 the rule's population value is (2 G^2/D)^(1/3) n^(1/3) with
    // G = 2 sum k phi^k gamma0 = 180 gamma0 and D = (4/3)(19 gamma0)^2: about 5.1 n^(1/3) = 64 at n = 2000.
    const b = optimalBlockLength(ar1(2000, 0.9, 8));
    expect(b).toBeGreaterThan(20);
    expect(b).toBeLessThan(130);
  });

  it('is 1 for short or constant series and ignores missing values', () => {
    expect(optimalBlockLength([1, 2, 3])).toBe(1);
    expect(optimalBlockLength(new Float64Array(100).fill(3))).toBe(1);
    const y = ar1(1000, 0.9, 8);
    const withGaps = new Float64Array(1000 + 10).fill(NaN);
    withGaps.set(y, 10);
    expect(optimalBlockLength(withGaps)).toBe(optimalBlockLength(y));
  });

  it('never exceeds min(3 sqrt(n), n/3)', () => {
    const trend = Float64Array.from({ length: 100 }, (_, i) => i);
    expect(optimalBlockLength(trend)).toBeLessThanOrEqual(30);
  });
});

describe('ratioCi and gainCi', () => {
  const n = 1800;
  const random = createRandom(21);
  const reference = new Float64Array(n);
  const test = new Float64Array(n);
  let wander = 0;
  for (let i = 0; i < n; i++) {
    wander = 0.95 * wander + random.gaussian();
    reference[i] = 220 + 30 * Math.sin(i / 120) + 5 * wander;
    test[i] = 1.015 * reference[i]! + 2 * random.gaussian();
  }
  test[100] = NaN;

  it('ratio of means test/reference with an interval around the true 1.015', () => {
    const ci = ratioCi(test, reference, undefined, { replicates: 500 });
    expect(ci.estimate).toBeCloseTo(1.015, 3);
    expect(ci.low).toBeLessThan(1.015);
    expect(ci.high).toBeGreaterThan(1.015);
    expect(ci.high - ci.low).toBeLessThan(0.01);
    expect(ci.blockLength).toBeGreaterThanOrEqual(1);
  });

  it('gain through the origin with an interval around the true 1.015', () => {
    const ci = gainCi(test, reference, undefined, { replicates: 500, blockLength: 20 });
    expect(ci.estimate).toBeCloseTo(1.015, 3);
    expect(ci.low).toBeLessThan(1.015);
    expect(ci.high).toBeGreaterThan(1.015);
    expect(ci.blockLength).toBe(20);
  });

  it('uses only the masked samples', () => {
    const mask = new Uint8Array(n);
    mask.fill(1, 0, 900);
    const doubled = Float64Array.from(test, (v, i) => (i < 900 ? v : 2 * v));
    const ci = ratioCi(doubled, reference, mask, { replicates: 200 });
    expect(ci.estimate).toBeCloseTo(1.015, 3);
  });
});
