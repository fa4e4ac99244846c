import { describe, expect, it } from 'vitest';
import { diagnose } from '../../../shared/engine/diagnose.js';
import { pairRecordings } from '../../../shared/engine/pair-recordings.js';
import { deviceView, type SyntheticDevice } from '../../../shared/synthetic/device-view.js';
import { twoRingRide } from './rides.js';

const ride = twoRingRide(31);
const reference = deviceView(ride, { label: 'reference', serialNumber: 1, noiseSdW: 3 }).recording;
const diagnoseDevice = (device: Omit<SyntheticDevice, 'label'>) =>
  diagnose(pairRecordings(reference, deviceView(ride, { label: 'test', serialNumber: 2, noiseSdW: 4, ...device }).recording, { offsetSeconds: 0 }), { seed: 3 });
const cell = (d: ReturnType<typeof diagnose>, leg: string, teeth: number | null) => d.gains.find((g) => g.leg === leg && g.frontTeeth === teeth)!;

describe('diagnose', () => {
  it('recovers per-leg per-chainring gains within 0.3 percentage points', () => {
    // Chainring index 1 = 34T, index 2 = 50T.
    const gains = { left: [0.98, 1.03], right: [1.01, 0.995] };
    const d = diagnoseDevice({ gains, dropouts: { perHour: 20, meanLengthS: 4 } });
    const truth = { left: { 34: -2, 50: 3 }, right: { 34: 1, 50: -0.5 } } as const;
    for (const leg of ['left', 'right'] as const) {
      for (const teeth of [34, 50] as const) {
        const c = cell(d, leg, teeth);
        expect(Math.abs(c.diffPct - truth[leg][teeth]), `${leg} on ${teeth}T: ${c.diffPct}`).toBeLessThanOrEqual(0.3);
        expect(c.lowPct).toBeLessThan(c.diffPct);
        expect(c.highPct).toBeGreaterThan(c.diffPct);
      }
    }
  });

  it('pins a +8% left-leg error on the 50T chainring and says the total agrees once it is removed', () => {
    const d = diagnoseDevice({ gains: { left: [1, 1.08] } });
    expect(d.explained).toHaveLength(1);
    expect(d.explained[0]).toMatchObject({ leg: 'left', frontTeeth: [50] });
    expect(Math.abs(d.explained[0]!.diffPct - 8)).toBeLessThanOrEqual(0.3);
    expect(d.explained[0]!.lowPct).toBeLessThan(8);
    expect(d.explained[0]!.highPct).toBeGreaterThan(8);
    expect(Math.abs(d.residualTotalPct)).toBeLessThan(0.3);
    expect(d.withinLegs.find((w) => w.leg === 'right')!.maxAbsPct).toBeLessThan(0.3);
    expect(d.findings[0]).toMatch(/^Left leg reads \+[78]\.\d% \(95% CI \d\.\d to \d\.\d\) on the 50T chainring only; right leg within 0\.\d%; with that gain removed the total agrees within 0\.\d%\.$/);
    expect(d.zeroOffset.detected).toBe(false);
    expect(d.drift.detected).toBe(false);
    expect(d.singleSided.detected).toBe(false);
  });

  it('detects a constant offset (missing zero offset) rather than a gain', () => {
    const d = diagnoseDevice({ offsetW: 12 });
    expect(d.zeroOffset.detected).toBe(true);
    expect(d.zeroOffset.interceptW).toBeCloseTo(12, 0);
    expect(Math.abs(d.zeroOffset.slope - 1)).toBeLessThan(0.01);
    expect(d.explained).toEqual([]);
    expect(d.findings.join(' ')).toMatch(/Constant offset: the device reads \+1\d\.\d W/);
  });

  it('measures drift in W per hour', () => {
    const d = diagnoseDevice({ driftWPerH: 24 });
    expect(d.drift.detected).toBe(true);
    expect(Math.abs(d.drift.wPerHour - 24)).toBeLessThan(2);
    expect(d.findings.join(' ')).toMatch(/drifts by \+2\d\.\d W per hour/);
    // With the drift taken out, no leg or chainring is blamed for it.
    expect(d.explained).toEqual([]);
  });

  it('recognises a single-sided meter that doubles the left leg', () => {
    const d = diagnoseDevice({ singleSided: 'left' });
    expect(d.singleSided.detected).toBe(true);
    expect(d.singleSided.side).toBe('left');
    expect(d.singleSided.shareSlope).toBeCloseTo(2, 0);
  });

  it('finds nothing in a device that agrees', () => {
    const d = diagnoseDevice({});
    expect(d.explained).toEqual([]);
    expect(d.zeroOffset.detected || d.drift.detected || d.singleSided.detected).toBe(false);
    expect(d.findings[0]).toMatch(/^No leg, chainring, offset or drift effect stands out/);
  });
});
