import { describe, expect, it } from 'vitest';
import { rollingMean } from '../../../shared/engine/rolling-mean.js';
import { createRandom } from '../../../shared/synthetic/random.js';

/** The definition, window by window, as an independent check. */
function naive(x: Float64Array, w: number, centred: boolean): Float64Array {
  const before = centred ? Math.floor((w - 1) / 2) : w - 1;
  return Float64Array.from(x, (_, i) => {
    const part = Array.from(x.slice(Math.max(0, i - before), Math.min(x.length, i - before + w))).filter(Number.isFinite);
    return part.length > 0 ? part.reduce((s, v) => s + v, 0) / part.length : NaN;
  });
}

describe('rollingMean', () => {
  it('averages the trailing window, skipping NaN', () => {
    expect(Array.from(rollingMean(Float64Array.of(1, 2, NaN, 4), 2))).toEqual([1, 1.5, 2, 4]);
  });

  it('matches the window-by-window definition, trailing and centred, with gaps', () => {
    const rnd = createRandom(9);
    const x = Float64Array.from({ length: 500 }, (_, i) => (i % 37 < 3 ? NaN : 200 + 50 * rnd.gaussian()));
    for (const centred of [false, true]) {
      for (const w of [1, 4, 5, 30]) {
        const got = rollingMean(x, w, { align: centred ? 'centred' : 'trailing' });
        const want = naive(x, w, centred);
        want.forEach((v, i) => (Number.isNaN(v) ? expect(got[i]).toBeNaN() : expect(got[i]).toBeCloseTo(v, 9)));
      }
    }
  });

  it('gives NaN where a window has fewer finite samples than minCount', () => {
    const out = rollingMean(Float64Array.of(NaN, NaN, 3, 4), 3, { minCount: 2 });
    expect(Array.from(out, (v) => (Number.isNaN(v) ? null : v))).toEqual([null, null, null, 3.5]);
  });
});
