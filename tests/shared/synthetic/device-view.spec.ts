import { describe, expect, it } from 'vitest';
import { deviceView } from '../../../shared/synthetic/device-view.js';
import { synthesizeRide } from '../../../shared/synthetic/synthesize-ride.js';

const ride = synthesizeRide({ seed: 21 });

describe('deviceView', () => {
  it('applies leg gains per chainring (physical), offset and drift exactly in the noise-free reading', () => {
    const v = deviceView(ride, { label: 'A', gains: { left: [0.98, 1.03], right: [1, 1.01] }, offsetW: 5, driftWPerH: 4 });
    v.truthIndex.forEach((i, k) => {
      if (ride.cadence[i] === 0) return expect(v.expected.power[k]).toBe(0);
      const ring = ride.physicalFrontGear[i]! - 1;
      const shift = 5 + (4 * ride.time[i]!) / 3600;
      const want = [0.98, 1.03][ring]! * ride.leftPower[i]! + [1, 1.01][ring]! * ride.rightPower[i]! + shift;
      expect(v.expected.power[k]).toBeCloseTo(want, 9);
      // No noise and no smoothing: the file holds the reading rounded to whole watts.
      expect(v.recording.columns.power![k]).toBe(Math.round(want));
    });
  });

  it('can follow the reported gear instead of the physical one', () => {
    const v = deviceView(ride, { label: 'B', gains: { left: [1, 1.1], right: [1, 1.1] }, gainFollows: 'reported' });
    const ghost = ride.blocks.find((b) => b.reportedFront !== undefined)!;
    const k = v.recording.time.findIndex((t) => t === ghost.startS + 10);
    expect(v.expected.power[k]).toBeCloseTo(1.1 * ride.power[v.truthIndex[k]!]!, 9);
  });

  it('doubles one leg when single-sided and reports no balance', () => {
    const v = deviceView(ride, { label: 'C', singleSided: 'left' });
    const k = 100;
    expect(v.expected.power[k]).toBeCloseTo(2 * ride.leftPower[v.truthIndex[k]!]!, 9);
    expect(v.recording.meta.balanceSide).toBe('none');
    expect(v.recording.columns.balance).toBeUndefined();
  });

  it('shifts the clock, skips pauses, records at its interval and loses samples to dropouts', () => {
    const v = deviceView(ride, { label: 'D', clockOffsetS: -7, intervalS: 2, dropouts: { perHour: 40, meanLengthS: 4 } });
    expect(v.recording.meta.startMs).toBe(ride.startMs - 7000);
    expect(v.recording.meta.sampleIntervalS).toBe(2);
    const pause = ride.blocks.find((b) => b.kind === 'pause')!;
    expect(v.recording.time.some((t) => t > pause.startS && t < pause.endS)).toBe(false);
    expect(v.recording.meta.pausedS).toBe(pause.endS - pause.startS);
    const nan = v.recording.columns.power!.filter(Number.isNaN).length;
    expect(nan).toBe(v.dropoutSamples);
    expect(v.recording.meta.dropouts).toBe(nan);
    expect(nan).toBeGreaterThan(0);
    const gap = deviceView(ride, { label: 'E', dropouts: { perHour: 40, meanLengthS: 4, style: 'gap' } });
    expect(gap.recording.time.length + gap.dropoutSamples).toBe(ride.recording.reduce((s, x) => s + x, 0));
  });

  it('reports the right share with the side known, or a percent of unknown side', () => {
    const right = deviceView(ride, { label: 'F' });
    const k = 200;
    const i = right.truthIndex[k]!;
    expect(right.recording.columns.balance![k]).toBe(Math.round((100 * ride.rightPower[i]!) / ride.power[i]!));
    const unknown = deviceView(ride, { label: 'G', balance: 'unknown' });
    expect(unknown.recording.meta.balanceSide).toBe('unknown');
    expect(unknown.recording.columns.leftPower).toBeUndefined();
  });
});
