import { describe, expect, it } from 'vitest';
import { pairRecordings } from '../../../shared/engine/pair-recordings.js';
import { recordingOf } from './builders.js';

const startMs = Date.UTC(2026, 0, 1, 8);

describe('pairRecordings', () => {
  it('pairs on the reference grid over the overlap after applying the clock offset', () => {
    const ref = recordingOf({ power: [100, 101, 102, 103, 104, 105, 106, 107], startMs, fileName: 'ref.fit' });
    // Started 2 s after the reference by the reference's clock, and its clock runs 1 s ahead.
    const test = recordingOf({ power: [202, 203, 204, 205, 206, 207, 208, 209], startMs: startMs + 3000, fileName: 'test.fit' });
    const paired = pairRecordings(ref, test, { offsetSeconds: 1 });
    expect(Array.from(paired.timeS)).toEqual([2, 3, 4, 5, 6, 7]);
    expect(Array.from(paired.columns.ref_power)).toEqual([102, 103, 104, 105, 106, 107]);
    expect(Array.from(paired.columns.test_power)).toEqual([202, 203, 204, 205, 206, 207]);
    expect(paired.shiftS).toBe(-2);
    expect(paired.overlapSeconds).toBe(6);
  });

  it('takes legs from each recording, cadence and speed from the reference, gears from whichever reports them', () => {
    const ref = recordingOf({
      power: [200, 200, 200, 200],
      columns: { leftPower: Float64Array.of(104, 104, 104, 104), rightPower: Float64Array.of(96, 96, 96, 96), cadence: Float64Array.of(90, 90, 91, 91) },
    });
    const test = recordingOf({
      power: [210, 210, 210, 210],
      columns: { cadence: Float64Array.of(70, 70, 70, 70) },
      events: [{ kind: 'gear', t: 0, front: { index: 2, teeth: 50 }, rear: { index: 5, teeth: 17 } }, { kind: 'gear', t: 2, front: { index: 1, teeth: 34 } }],
    });
    const paired = pairRecordings(ref, test, { offsetSeconds: 0 });
    expect(Array.from(paired.columns.ref_left!)).toEqual([104, 104, 104, 104]);
    expect(paired.columns.test_left).toBeUndefined();
    expect(Array.from(paired.columns.cadence!)).toEqual([90, 90, 91, 91]);
    expect(Array.from(paired.columns.front_teeth!)).toEqual([50, 50, 34, 34]);
    expect(Array.from(paired.columns.rear_teeth!)).toEqual([17, 17, 17, 17]);
    expect(paired.meta?.gearSource).toBe('test');
  });

  it('throws no_overlap when the recordings do not overlap at that offset', () => {
    const ref = recordingOf({ power: [1, 2, 3], startMs });
    const test = recordingOf({ power: [1, 2, 3], startMs: startMs + 60_000, fileName: 'late.fit' });
    expect(() => pairRecordings(ref, test, { offsetSeconds: 0 })).toThrow(expect.objectContaining({ code: 'no_overlap' }));
  });
});
