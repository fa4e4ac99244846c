import { describe, expect, it } from 'vitest';
import { blockBootstrapCi, gainCi, ratioCi } from '../../../../shared/engine/stats/block-bootstrap.js';
import { sumRatioBootstrapCi } from '../../../../shared/engine/stats/sum-ratio-bootstrap.js';
import { createRandom } from '../../../../shared/synthetic/random.js';

/** A power-like series: steady levels with slow wander and noise, and a device reading it ~1.5% high. */
function ride(n: number, seed: number): { reference: Float64Array; test: Float64Array } {
  const random = createRandom(seed);
  const reference = new Float64Array(n);
  const test = new Float64Array(n);
  let wander = 0;
  for (let i = 0; i < n; i++) {
    wander = 0.95 * wander + random.gaussian();
    reference[i] = 220 + 60 * Math.sign(Math.sin(i / 300)) + 5 * wander;
    test[i] = 1.015 * reference[i]! + 3 * random.gaussian();
  }
  return { reference, test };
}

/**
 * The circular block bootstrap written out sample by sample, as the engine did before block
 * sums: mulberry32 draws starts in [0, n), blocks wrap, the last is cut, type-7 percentiles.
 * An independent statement of the draw scheme, so the fast path is checked against it and
 * not against code it shares.
 */
function sampleBySample(num: Float64Array, den: Float64Array, blockLength: number, replicates: number, seed: number): { low: number; high: number; estimate: number } {
  const n = num.length;
  const random = createRandom(seed);
  const values: number[] = [];
  for (let r = 0; r < replicates; r++) {
    let pos = 0;
    let a = 0;
    let b = 0;
    while (pos < n) {
      let j = random.int(0, n - 1);
      const end = Math.min(n, pos + blockLength);
      while (pos < end) {
        a += num[j]!;
        b += den[j]!;
        pos++;
        j = j + 1 === n ? 0 : j + 1;
      }
    }
    if (Number.isFinite(a / b)) values.push(a / b);
  }
  values.sort((x, y) => x - y);
  const q = (p: number): number => {
    const h = (values.length - 1) * p;
    const lo = Math.floor(h);
    const hi = Math.min(values.length - 1, lo + 1);
    return values[lo]! + (h - lo) * (values[hi]! - values[lo]!);
  };
  let a = 0;
  let b = 0;
  for (let i = 0; i < n; i++) (a += num[i]!), (b += den[i]!);
  return { estimate: a / b, low: q(0.025), high: q(0.975) };
}

const relative = (a: number, b: number): number => Math.abs(a - b) / Math.abs(b);

describe('sumRatioBootstrapCi', () => {
  const { reference, test } = ride(3000, 5);

  it.each([1, 7, 40, 333, 2999, 3000])('matches the sample-by-sample bootstrap within 1e-12 (block length %i)', (blockLength) => {
    const fast = sumRatioBootstrapCi(test, reference, { blockLength, replicates: 400, seed: 11 });
    const slow = sampleBySample(test, reference, blockLength, 400, 11);
    expect(fast.estimate).toBe(slow.estimate);
    expect(relative(fast.low, slow.low)).toBeLessThan(1e-12);
    expect(relative(fast.high, slow.high)).toBeLessThan(1e-12);
    expect(fast.replicates).toBe(400);
    expect(fast.blockLength).toBe(blockLength);
  });

  it('matches blockBootstrapCi with the same statistic, seed and defaults', () => {
    const statistic = (ix: Int32Array): number => {
      let a = 0;
      let b = 0;
      for (let k = 0; k < ix.length; k++) (a += test[ix[k]!]!), (b += reference[ix[k]!]!);
      return a / b;
    };
    for (const seed of [1, 2, 99]) {
      const generic = blockBootstrapCi(test.length, statistic, { seed, replicates: 300, level: 0.9 });
      const fast = sumRatioBootstrapCi(test, reference, { seed, replicates: 300, level: 0.9 });
      expect(fast.estimate).toBe(generic.estimate);
      expect(fast.blockLength).toBe(generic.blockLength);
      expect(relative(fast.low, generic.low)).toBeLessThan(1e-12);
      expect(relative(fast.high, generic.high)).toBeLessThan(1e-12);
    }
  });

  it('ratioCi and gainCi give what the generic path gives on the paired, masked samples', () => {
    const t = test.slice();
    t[17] = NaN;
    t[2000] = Infinity;
    const mask = new Uint8Array(t.length).fill(1);
    mask.fill(0, 500, 800);
    const keep: number[] = [];
    for (let i = 0; i < t.length; i++) if (mask[i] && Number.isFinite(t[i]!) && Number.isFinite(reference[i]!)) keep.push(i);
    const tk = Float64Array.from(keep, (i) => t[i]!);
    const rk = Float64Array.from(keep, (i) => reference[i]!);
    const ratio = ratioCi(t, reference, mask, { seed: 3, replicates: 500 });
    const ratioSlow = sampleBySample(tk, rk, ratio.blockLength, 500, 3);
    expect(ratio.estimate).toBe(ratioSlow.estimate);
    expect(relative(ratio.low, ratioSlow.low)).toBeLessThan(1e-12);
    expect(relative(ratio.high, ratioSlow.high)).toBeLessThan(1e-12);

    const gain = gainCi(t, reference, mask, { seed: 3, replicates: 500, blockLength: 25 });
    const gainSlow = sampleBySample(Float64Array.from(keep, (i) => t[i]! * reference[i]!), Float64Array.from(rk, (r) => r * r), 25, 500, 3);
    expect(relative(gain.estimate, gainSlow.estimate)).toBeLessThan(1e-15);
    expect(relative(gain.low, gainSlow.low)).toBeLessThan(1e-12);
    expect(relative(gain.high, gainSlow.high)).toBeLessThan(1e-12);
  });

  it('skips replicates whose ratio is not finite and refuses columns of different lengths', () => {
    // A zero denominator everywhere: every replicate is 0/0.
    const ci = sumRatioBootstrapCi(Float64Array.of(1, 2, 3), new Float64Array(3), { replicates: 50 });
    expect(ci.replicates).toBe(0);
    expect(ci.low).toBeNaN();
    expect(() => sumRatioBootstrapCi(new Float64Array(3), new Float64Array(4))).toThrow(/differ in length/);
    expect(sumRatioBootstrapCi(new Float64Array(0), new Float64Array(0)).replicates).toBe(0);
  });
});
