import { describe, expect, it } from 'vitest';
import { compareRecordings } from '../../../shared/engine/compare.js';
import { compareReportSchema } from '../../../shared/engine/compare-report.js';
import { DEFAULT_COGS } from '../../../shared/synthetic/protocol.js';
import { deviceView } from '../../../shared/synthetic/device-view.js';
import { synthesizeRide } from '../../../shared/synthetic/synthesize-ride.js';
import { twoRingRide } from './rides.js';

const ride = twoRingRide(41);
const reference = deviceView(ride, { label: 'reference', serialNumber: 1, noiseSdW: 3 }).recording;
const bigRingLeft = deviceView(ride, { label: 'big-ring-left', serialNumber: 2, noiseSdW: 4, clockOffsetS: 9, gains: { left: [1, 1.08] } }).recording;
const good = deviceView(ride, { label: 'good', serialNumber: 3, noiseSdW: 4, clockOffsetS: -4, gains: { left: [1.005, 1.005], right: [1.005, 1.005] } }).recording;

describe('compareRecordings', () => {
  const report = compareRecordings(reference, [bigRingLeft, good], { seed: 5, replicates: 400 });

  it('produces JSON that the report schema accepts, one comparison per device', () => {
    const parsed = compareReportSchema.parse(JSON.parse(JSON.stringify(report)));
    expect(parsed.comparisons.map((c) => c.test.fileName)).toEqual(['big-ring-left.fit', 'good.fit']);
    expect(parsed.reference.fileName).toBe('reference.fit');
    expect(parsed.options).toMatchObject({ tolerancePct: 2, referenceTolerancePct: 1, intervalS: 1, offset: 'auto', seed: 5 });
  });

  it('fails a device +8% on the left leg in the big ring only, although its total is within 2%', () => {
    const c = report.comparisons[0]!;
    expect(c.alignment.offsetSeconds).toBe(9);
    expect(Math.abs(c.overall.diffPct.total!)).toBeLessThan(2);
    expect(c.verdict.pass).toBe(false);
    const big = c.byFrontGear.find((g) => g.teeth === 50)!;
    expect(big.share).toBeGreaterThanOrEqual(0.1);
    expect(big.diffPct.left!).toBeCloseTo(8, 0);
    expect(Math.abs(c.byFrontGear.find((g) => g.teeth === 34)!.diffPct.left!)).toBeLessThan(0.3);
    expect(c.verdict.checks.find((x) => x.what === 'left leg on 50T')).toMatchObject({ within: false, decides: true });
    expect(c.diagnosis.explained).toEqual([expect.objectContaining({ leg: 'left', frontTeeth: [50] })]);
    expect(c.diagnosis.findings[0]).toMatch(/^Left leg reads \+[78]\.\d% .* on the 50T chainring only/);
  });

  it('passes a device 0.5% high on both legs and reports the means per steady block', () => {
    const c = report.comparisons[1]!;
    expect(c.alignment.offsetSeconds).toBe(-4);
    expect(c.verdict.pass).toBe(true);
    expect(c.overall.diffPct.total!).toBeCloseTo(0.5, 0);
    const ci = c.overall.ratioCi.total!;
    expect(ci.low!).toBeLessThan(1.005);
    expect(ci.high!).toBeGreaterThan(1.005);
    // Every 300 s block of this protocol holds a constant power, the warm-up included.
    const steady = ride.blocks.filter((b) => b.durationS === 300);
    expect(c.segments).toHaveLength(steady.length);
    c.segments.forEach((s, i) => {
      expect(s.kind).toBe('steady');
      expect(s.reference.total!).toBeCloseTo(steady[i]!.powerW, -1);
      expect(Math.abs(s.diffPct.total! - 0.5)).toBeLessThan(0.5);
    });
    expect(c.segmentation).toMatchObject({ source: 'steady', params: { tolerancePct: 5, minDurationS: 60 } });
    const covered = c.segments.reduce((sum, s) => sum + s.seconds, 0);
    expect(c.sectionsPooled.seconds).toBe(covered);
    expect(Math.abs(c.sectionsPooled.diffPct.total! - 0.5)).toBeLessThan(0.2);
    expect(Math.abs(c.sectionsPooled.meanOfSectionRatiosPct.left! - 0.5)).toBeLessThan(0.3);
  });

  it('writes null, not NaN, for legs a device does not report', () => {
    const totalOnly = deviceView(ride, { label: 'spider', serialNumber: 4, balance: 'none' }).recording;
    const c = compareRecordings(reference, [totalOnly], { replicates: 100 }).comparisons[0]!;
    expect(c.overall.test.left).toBeNull();
    expect(c.overall.diffPct.right).toBeNull();
    expect(c.overall.ratioCi.left).toBeNull();
    expect(() => compareReportSchema.parse(JSON.parse(JSON.stringify({ ...report, comparisons: [c] })))).not.toThrow();
  });

  it('infers chainrings from speed and cadence when no file reports gears', () => {
    const noGears = { channels: { gears: false } } as const;
    const ref = deviceView(ride, { label: 'ref', serialNumber: 1, noiseSdW: 3, ...noGears }).recording;
    const test = deviceView(ride, { label: 'test', serialNumber: 5, noiseSdW: 3, gains: { left: [1, 1.08] }, ...noGears }).recording;
    const c = compareRecordings(ref, [test], { chainrings: [50, 34], cogs: [...DEFAULT_COGS], wheel: '25-622', replicates: 100 }).comparisons[0]!;
    expect(c.gearSource).toBe('inferred');
    expect(c.byFrontGear.map((g) => g.teeth)).toEqual([50, 34]);
    expect(c.byFrontGear[0]!.diffPct.left!).toBeCloseTo(8, 0);
  });

  it('uses the tester\'s gear overrides where the reported chainring was not the physical one', () => {
    const full = synthesizeRide({ seed: 6 });
    const ref = deviceView(full, { label: 'ref', serialNumber: 1, noiseSdW: 3 }).recording;
    const test = deviceView(full, { label: 'test', serialNumber: 2, noiseSdW: 3, gains: { left: [1, 1.08] } }).recording;
    const trick = full.blocks.find((b) => b.reportedFront !== undefined && b.reportedFront !== b.front)!;
    const plain = compareRecordings(ref, [test], { replicates: 100 }).comparisons[0]!;
    const fixed = compareRecordings(ref, [test], { replicates: 100, gearOverrides: [{ startS: trick.startS, endS: trick.endS, frontTeeth: 34 }] }).comparisons[0]!;
    const left50 = (c: typeof plain) => c.diagnosis.gains.find((g) => g.leg === 'left' && g.frontTeeth === 50)!.diffPct!;
    // Without the override the block with the chain on 34T counts as 50T and dilutes the gain,
    // and the report points at that block.
    expect(left50(plain)).toBeLessThan(7.7);
    const flagged = plain.diagnosis.gearMismatches;
    expect(flagged).toHaveLength(1);
    expect(flagged[0]).toMatchObject({ leg: 'left', reportedTeeth: 50, readsLikeTeeth: 34 });
    expect(flagged[0]!.startS).toBeGreaterThanOrEqual(trick.startS);
    expect(flagged[0]!.endS).toBeLessThanOrEqual(trick.endS);
    expect(plain.diagnosis.findings.join(' ')).toMatch(/is reported on 50T, but the left leg reads [+-]0\.\d% there, like 34T/);
    expect(fixed.diagnosis.gearMismatches).toEqual([]);
    expect(Math.abs(left50(fixed) - 8)).toBeLessThanOrEqual(0.3);
  });

  it('compares over the reference\'s laps or at a fixed offset when asked', () => {
    const c = compareRecordings(reference, [bigRingLeft], { segments: 'laps', offset: 9, replicates: 50 }).comparisons[0]!;
    expect(c.alignment).toMatchObject({ offsetSeconds: 9, method: 'manual', confidence: null });
    expect(c.segmentation.source).toBe('laps');
    expect(c.segments[0]).toMatchObject({ startS: 0, endS: 300, kind: 'lap' });
  });
});
