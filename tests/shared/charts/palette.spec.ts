import { describe, expect, it } from 'vitest';
import { DEVICE_PALETTE, deviceColour } from '../../../shared/charts/palette.js';

// The eight colours as published by Okabe & Ito, "Color Universal Design (CUD):
// how to make figures and presentations that are friendly to colorblind people" (2008),
// given there as RGB triplets.
const OKABE_ITO_RGB: Array<[number, number, number]> = [
  [0, 0, 0],
  [230, 159, 0],
  [86, 180, 233],
  [0, 158, 115],
  [240, 228, 66],
  [0, 114, 178],
  [213, 94, 0],
  [204, 121, 167],
];

function rgb(hex: string): [number, number, number] {
  const v = Number.parseInt(hex.slice(1), 16);
  return [(v >> 16) & 255, (v >> 8) & 255, v & 255];
}

describe('deviceColour', () => {
  it('uses exactly the eight published Okabe-Ito colours, each once', () => {
    const got = DEVICE_PALETTE.map(rgb).map((c) => c.join(',')).sort();
    const want = OKABE_ITO_RGB.map((c) => c.join(',')).sort();
    expect(got).toEqual(want);
  });

  it('gives the first devices different colours and repeats after eight', () => {
    expect(new Set([0, 1, 2, 3].map(deviceColour)).size).toBe(4);
    expect(deviceColour(8)).toBe(deviceColour(0));
    expect(deviceColour(11)).toBe(deviceColour(3));
  });

  it('wraps negative and fractional indices instead of returning undefined', () => {
    expect(deviceColour(-1)).toBe(DEVICE_PALETTE[7]);
    expect(deviceColour(1.7)).toBe(deviceColour(1));
    expect(deviceColour(Number.NaN)).toBe(deviceColour(0));
  });
});
