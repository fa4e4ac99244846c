import { describe, expect, it } from 'vitest';
import { detectSteadyBlocks, STEADY_BLOCK_DEFAULTS } from '../../../shared/engine/detect-steady-blocks.js';
import { pairRecordings } from '../../../shared/engine/pair-recordings.js';
import { segmentsFromLaps } from '../../../shared/engine/segments-from-laps.js';
import { segmentsFromRanges } from '../../../shared/engine/segments-from-ranges.js';
import { deviceView } from '../../../shared/synthetic/device-view.js';
import { synthesizeRide } from '../../../shared/synthetic/synthesize-ride.js';

describe('detectSteadyBlocks', () => {
  const ride = synthesizeRide({ seed: 21 });
  const reference = deviceView(ride, { label: 'ref', serialNumber: 1, noiseSdW: 5, dropouts: { perHour: 10, meanLengthS: 3 } }).recording;
  const paired = pairRecordings(reference, reference, { offsetSeconds: 0 });
  const blocks = detectSteadyBlocks(paired.timeS, paired.columns.ref_power);
  const trim = STEADY_BLOCK_DEFAULTS.trimS;

  it('finds every steady block of the protocol within a few seconds of its trimmed edges', () => {
    const truth = ride.blocks.filter((b) => b.kind === 'steady');
    for (const t of truth) {
      const found = blocks.find((b) => b.startS < t.endS && b.endS > t.startS);
      expect(found, `block ${t.label}`).toBeDefined();
      // Edges blur by half the smoothing window; the trim is on purpose.
      expect(Math.abs(found!.startS - (t.startS + trim))).toBeLessThanOrEqual(6);
      expect(Math.abs(found!.endS - (t.endS - trim))).toBeLessThanOrEqual(6);
      expect(found!.meanW!).toBeCloseTo(t.powerW, -1);
    }
  });

  it('finds blocks only where power is held: steady blocks, the cadence sweep (fixed power) or the slow warm-up', () => {
    for (const b of blocks) {
      const hit = ride.blocks.find((t) => t.startS <= b.startS && t.endS >= b.endS);
      expect(hit, `block ${b.startS}-${b.endS}`).toBeDefined();
      expect(['steady', 'cadence_sweep', 'warmup']).toContain(hit!.kind);
    }
  });

  it('finds nothing in a ramp steeper than the band allows, nor in coasting', () => {
    const timeS = Float64Array.from({ length: 1200 }, (_, i) => i);
    // 1 W/s: at 400 W a ±5% band holds for well under a minute.
    const ramp = Float64Array.from(timeS, (t) => (t < 300 ? 0 : t < 600 ? 100 + (t - 300) : 0));
    expect(detectSteadyBlocks(timeS, ramp)).toEqual([]);
  });

  it('keeps a block whole across short dropouts', () => {
    const timeS = Float64Array.from({ length: 400 }, (_, i) => i);
    const power = Float64Array.from(timeS, (t) => (t >= 100 && t < 300 ? (t % 50 >= 20 && t % 50 < 24 ? NaN : 250 + 5 * Math.sin(t)) : 30));
    const found = detectSteadyBlocks(timeS, power);
    expect(found).toHaveLength(1);
    // The centred smoothing blurs each edge by up to half its window.
    expect(Math.abs(found[0]!.startS - (100 + trim))).toBeLessThanOrEqual(3);
    expect(Math.abs(found[0]!.endS - (300 - trim))).toBeLessThanOrEqual(3);
    expect(found[0]!.meanW).toBeCloseTo(250, 0);
  });

  it('honours a longer minimum duration', () => {
    const long = detectSteadyBlocks(paired.timeS, paired.columns.ref_power, { minDurationS: 260 });
    expect(long.every((b) => b.endS - b.startS >= 260)).toBe(true);
    expect(long.length).toBeLessThan(blocks.length);
  });
});

describe('segments from laps and ranges', () => {
  it('turns a recording\'s laps into segments on the reference axis', () => {
    const ride = synthesizeRide({ seed: 2 });
    const rec = deviceView(ride, { label: 'ref' }).recording;
    const laps = segmentsFromLaps(rec, 10);
    expect(laps[0]).toMatchObject({ startS: -10, endS: 590, kind: 'lap', label: 'Lap 1' });
  });

  it('sorts manual ranges and refuses reversed ones', () => {
    expect(segmentsFromRanges([{ startS: 50, endS: 60 }, { startS: 10, endS: 20, label: 'a' }])).toEqual([
      { startS: 10, endS: 20, kind: 'manual', label: 'a' },
      { startS: 50, endS: 60, kind: 'manual' },
    ]);
    expect(() => segmentsFromRanges([{ startS: 60, endS: 50 }])).toThrow(expect.objectContaining({ code: 'bad_range' }));
  });
});
