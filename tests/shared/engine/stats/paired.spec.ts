import { describe, expect, it } from 'vitest';
import { EngineError } from '../../../../shared/errors.js';
import { pairedIndices } from '../../../../shared/engine/stats/paired.js';

describe('pairedIndices', () => {
  it('keeps the samples where both columns are finite', () => {
    const a = new Float64Array([100, NaN, 120, 130, Infinity]);
    const b = new Float64Array([101, 110, NaN, 131, 140]);
    expect(Array.from(pairedIndices(a, b))).toEqual([0, 3]);
  });

  it('also requires the mask to be set', () => {
    const a = new Float64Array([1, 2, 3, 4]);
    const mask = new Uint8Array([1, 0, 1, 0]);
    expect(Array.from(pairedIndices(a, a, mask))).toEqual([0, 2]);
  });

  it('returns an empty Int32Array when nothing pairs', () => {
    const out = pairedIndices(new Float64Array([NaN]), new Float64Array([1]));
    expect(out).toBeInstanceOf(Int32Array);
    expect(out.length).toBe(0);
  });

  it('refuses columns of different lengths with an EngineError naming both lengths', () => {
    expect(() => pairedIndices([1, 2], [1])).toThrow(EngineError);
    expect(() => pairedIndices([1, 2], [1])).toThrow(/2 and 1/);
    expect(() => pairedIndices([1, 2], [1, 2], new Uint8Array(3))).toThrow(/mask has 3/);
  });
});
