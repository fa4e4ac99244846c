import { describe, expect, it } from 'vitest';
import { estimateOffset } from '../../../shared/engine/estimate-offset.js';
import { shiftForOffset } from '../../../shared/engine/shift-for-offset.js';
import { deviceView } from '../../../shared/synthetic/device-view.js';
import { synthesizeRide } from '../../../shared/synthetic/synthesize-ride.js';
import { recordingOf } from './builders.js';

const ride = synthesizeRide({ seed: 11 });
const reference = deviceView(ride, { label: 'reference', serialNumber: 1, noiseSdW: 3 }).recording;

describe('estimateOffset', () => {
  it.each([37, -52, 0, 240])('recovers a clock offset of %i s exactly through noise and dropouts', (clockOffsetS) => {
    const test = deviceView(ride, {
      label: 'test', serialNumber: 2, noiseSdW: 6, clockOffsetS,
      gains: { left: [1.0, 1.05] },
      dropouts: { perHour: 30, meanLengthS: 5 },
    }).recording;
    const found = estimateOffset(reference, test);
    expect(found.offsetSeconds).toBe(clockOffsetS);
    expect(found.method).toBe('auto');
    expect(found.correlation).toBeGreaterThan(0.95);
    expect(found.confidence).toBeGreaterThan(0.5);
  });

  it('recovers the offset when dropouts remove records (time gaps) instead of leaving NaN', () => {
    const test = deviceView(ride, {
      label: 'test', serialNumber: 3, noiseSdW: 5, clockOffsetS: -8,
      dropouts: { perHour: 40, meanLengthS: 6, style: 'gap' },
    }).recording;
    expect(estimateOffset(reference, test).offsetSeconds).toBe(-8);
  });

  it('aligns a 10 Hz device against a 1 Hz reference', () => {
    const fast = synthesizeRide({ seed: 4, rateHz: 10 });
    const ref1 = deviceView(fast, { label: 'ref', serialNumber: 1, noiseSdW: 3, intervalS: 1 }).recording;
    const test10 = deviceView(fast, { label: 'test', serialNumber: 2, noiseSdW: 8, intervalS: 0.1, clockOffsetS: 19 }).recording;
    expect(estimateOffset(ref1, test10).offsetSeconds).toBe(19);
  });

  it('works on the recordings\' own time axes when a file has no absolute time', () => {
    const test = deviceView(ride, { label: 'test', serialNumber: 4, noiseSdW: 4, clockOffsetS: 30 }).recording;
    const noClock = { ...test, meta: { ...test.meta, startMs: NaN } };
    // Both devices start at the ride's start, so on their own axes the test is 0 s apart.
    expect(estimateOffset(reference, noClock).offsetSeconds).toBe(0);
  });

  it('follows the sign convention: offset = test clock minus reference clock', () => {
    // The same power pattern; the test's clock reads 5 s more than the reference's at the same moment.
    const pattern = Array.from({ length: 400 }, (_, i) => 200 + 80 * Math.sin(i / 7) + 40 * Math.sin(i / 3.1) + (i % 50 === 0 ? 300 : 0));
    const startMs = Date.UTC(2026, 0, 1);
    const ref = recordingOf({ power: pattern, startMs, fileName: 'ref.fit' });
    const test = recordingOf({ power: pattern, startMs: startMs + 5000, fileName: 'test.fit' });
    const found = estimateOffset(ref, test);
    expect(found.offsetSeconds).toBe(5);
    // The test sample stamped c + offset is the reference sample stamped c: on the files'
    // own axes both are sample i, so the shift between the axes is 0.
    expect(shiftForOffset(ref, test, found.offsetSeconds)).toBe(0);
  });

  it('finds a delay on the files\' own axes as a positive offset when the test lags', () => {
    const pattern = Array.from({ length: 600 }, (_, i) => 220 + 90 * Math.sin(i / 9) + 50 * Math.cos(i / 2.3));
    const ref = recordingOf({ power: pattern });
    // The test's record i holds what the reference recorded at i - 12: the test clock is 12 s ahead.
    const test = recordingOf({ power: pattern.map((_, i) => pattern[i - 12] ?? NaN) });
    expect(estimateOffset(ref, test).offsetSeconds).toBe(12);
  });

  it('reports the correlation at a manual offset', () => {
    const test = deviceView(ride, { label: 'test', serialNumber: 5, noiseSdW: 4, clockOffsetS: 14 }).recording;
    const manual = estimateOffset(reference, test, { manualOffsetS: 14 });
    const wrong = estimateOffset(reference, test, { manualOffsetS: 40 });
    expect(manual.method).toBe('manual');
    expect(manual.offsetSeconds).toBe(14);
    expect(Number.isNaN(manual.confidence)).toBe(true);
    expect(manual.correlation).toBeGreaterThan(0.95);
    expect(wrong.correlation).toBeLessThan(manual.correlation - 0.1);
  });

  it('throws no_power when a recording has no power column', () => {
    const noPower = recordingOf({ power: [1, 2, 3] });
    delete noPower.columns.power;
    expect(() => estimateOffset(reference, noPower)).toThrow(expect.objectContaining({ code: 'no_power' }));
  });
});
