import { Decoder, Stream } from '@garmin/fitsdk';
import { describe, expect, it } from 'vitest';
import { parseFit } from '../../../shared/recording/parse-fit.js';
import type { Recording } from '../../../shared/recording/recording.js';
import { FIXTURE_DEVICES, fixtureRide, generateFixtures } from '../../fixtures/generate.js';
import { fitSeconds, handmadeFit, records } from './fit-helpers.js';

const fixtures = generateFixtures();
const byName = (name: string) => fixtures.find((f) => f.name === name)!;

async function read(bytes: Uint8Array, name = 'ride.fit', options = {}): Promise<Recording> {
  const result = await parseFit(bytes, name, options);
  if (!result.ok) throw new Error(result.error.message);
  return result.recording;
}

describe('parseFit agrees with the FIT SDK decoder on the same bytes', () => {
  for (const name of ['reference.fit', 'crank.fit', 'pedals.fit']) {
    it(`${name}: every record field, event, lap and the device identity`, async () => {
      const { bytes } = byName(name);
      const sdk = new Decoder(Stream.fromByteArray(bytes)).read();
      expect(sdk.errors).toEqual([]);
      const { recordMesgs = [], eventMesgs = [], lapMesgs = [], fileIdMesgs = [], deviceInfoMesgs = [] } = sdk.messages;
      const rec = await read(bytes, name);
      const sdkRecords = recordMesgs;
      expect(rec.time.length).toBe(sdkRecords.length);
      const t0 = (sdkRecords[0]!.timestamp as Date).getTime();
      expect(rec.meta.startMs).toBe(t0);
      sdkRecords.forEach((r, i) => {
        expect(rec.time[i]).toBe(((r.timestamp as Date).getTime() - t0) / 1000);
        const same = (col: Float64Array | undefined, v: unknown): void => {
          if (v === undefined) expect(col === undefined || Number.isNaN(col[i]!)).toBe(true);
          else expect(col?.[i]).toBeCloseTo(v as number, 9);
        };
        same(rec.columns.power, r.power);
        same(rec.columns.cadence, r.cadence);
        same(rec.columns.speed, r.speed);
        same(rec.columns.heartRate, r.heartRate);
        same(rec.columns.leftTorqueEffectiveness, r.leftTorqueEffectiveness);
        same(rec.columns.leftPedalSmoothness, r.leftPedalSmoothness);
        same(rec.columns.rightPedalSmoothness, r.rightPedalSmoothness);
        const raw = r.leftRightBalance as number | undefined;
        if (raw === undefined) expect(rec.columns.balance === undefined || Number.isNaN(rec.columns.balance[i]!)).toBe(true);
        else {
          // FIT profile type left_right_balance: 0x7F = percent, 0x80 = "right" (garmin/fit-javascript-sdk src/profile.js).
          expect(rec.columns.balance?.[i]).toBe(raw & 0x7f);
          expect(rec.meta.balanceSide).toBe(raw & 0x80 ? 'right' : 'unknown');
        }
      });
      const sdkGears = eventMesgs.filter((e) => e.event === 'frontGearChange' || e.event === 'rearGearChange');
      const gears = rec.events.filter((e) => e.kind === 'gear');
      expect(gears.length).toBe(sdkGears.length);
      gears.forEach((g, k) => {
        const e = sdkGears[k]!;
        expect(g.t).toBe(((e.timestamp as Date).getTime() - t0) / 1000);
        expect(g.front).toEqual({ index: e.frontGearNum, teeth: e.frontGear });
        expect(g.rear).toEqual({ index: e.rearGearNum, teeth: e.rearGear });
      });
      const timers = eventMesgs.filter((e) => e.event === 'timer');
      expect(rec.events.filter((e) => e.kind === 'timer_start' || e.kind === 'timer_stop').map((e) => e.kind)).toEqual(
        timers.map((e) => (e.eventType === 'start' ? 'timer_start' : 'timer_stop')),
      );
      const laps = rec.events.filter((e) => e.kind === 'lap');
      expect(laps.map((l) => [l.startS, l.endS])).toEqual(
        lapMesgs.map((l) => [((l.startTime as Date).getTime() - t0) / 1000, ((l.timestamp as Date).getTime() - t0) / 1000]),
      );
      const fileId = fileIdMesgs[0]!;
      const info = deviceInfoMesgs[0]!;
      expect(rec.meta.device.serialNumber).toBe(fileId.serialNumber);
      expect(rec.meta.device.productId).toBe(fileId.product);
      expect(rec.meta.device.manufacturer).toBe(fileId.manufacturer); // 'development' (id 255) in both
      expect(rec.meta.device.manufacturerId).toBe(255);
      expect(rec.meta.device.softwareVersion).toBe((info.softwareVersion as number).toFixed(2));
      expect(rec.meta.device.product).toBe(info.productName);
    });
  }
});

describe('parseFit against the synthetic truth', () => {
  const ride = fixtureRide();
  it('keeps the sample count, pause, dropouts, sides and the device clock of the crank', async () => {
    const { view, bytes } = byName('crank.fit');
    const rec = await read(bytes, 'crank.fit');
    const recorded = ride.recording.reduce((s, v) => s + v, 0);
    expect(rec.time.length).toBe(recorded); // 'missing' dropouts keep their records
    expect(rec.meta.pausedS).toBe(60);
    expect(rec.meta.dropouts).toBe(view.dropoutSamples);
    expect(view.dropoutSamples).toBeGreaterThan(0);
    expect(rec.meta.balanceSide).toBe('right');
    expect(rec.meta.startMs).toBe(ride.startMs + FIXTURE_DEVICES.crank.clockOffsetS * 1000);
    expect(rec.meta.sampleIntervalS).toBe(1);
    // Legs: left = power * (100 - right%) / 100 exactly where both are known.
    const { power, balance, leftPower, rightPower } = rec.columns;
    for (let i = 0; i < rec.time.length; i++) {
      if (Number.isNaN(power![i]!)) expect(Number.isNaN(leftPower![i]!)).toBe(true);
      else if (power![i] === 0) expect([leftPower![i], rightPower![i]]).toEqual([0, 0]);
      else {
        expect(leftPower![i]).toBeCloseTo((power![i]! * (100 - balance![i]!)) / 100, 9);
        expect(leftPower![i]! + rightPower![i]!).toBeCloseTo(power![i]!, 9);
      }
    }
  });

  it('holds the reported gear state between events, including a shift reported without chain movement', async () => {
    const rec = await read(byName('crank.fit').bytes, 'crank.fit');
    const { frontGear, frontGearTeeth, rearGear, rearGearTeeth } = rec.columns;
    const truthIndex = byName('crank.fit').view.truthIndex;
    for (let k = 0; k < rec.time.length; k++) {
      const i = truthIndex[k]!;
      expect([frontGear![k], frontGearTeeth![k], rearGear![k], rearGearTeeth![k]]).toEqual([ride.frontGear[i], ride.frontGearTeeth[i], ride.rearGear[i], ride.rearGearTeeth[i]]);
    }
    const ghost = ride.blocks.find((b) => b.reportedFront !== undefined)!;
    const k = rec.time.findIndex((t) => t >= ghost.startS + 1);
    expect(frontGearTeeth![k]).toBe(50); // reported big ring
    expect(ride.physicalFrontGearTeeth[truthIndex[k]!]).toBe(34); // chain on the small ring
  });

  it('keeps gaps as gaps (no invented samples) for dropouts that remove records', async () => {
    const { view, bytes } = byName('pedals.fit');
    const rec = await read(bytes, 'pedals.fit');
    expect(rec.time.length).toBe(view.recording.time.length);
    expect(rec.time.length).toBeLessThan(ride.recording.reduce((s, v) => s + v, 0));
    expect(rec.meta.dropouts).toBe(0);
    expect(rec.meta.balanceSide).toBe('unknown');
    expect(rec.columns.leftPower).toBeUndefined();
    expect(rec.columns.balance).toBeDefined();
  });

  it('leaves single-sided or balance-less files without balance or legs', async () => {
    const rec = await read(byName('reference.fit').bytes, 'reference.fit');
    expect(rec.meta.balanceSide).toBe('none');
    expect(rec.columns.balance).toBeUndefined();
    expect(rec.columns.leftPower).toBeUndefined();
  });
});

describe('parseFit on hand-made files', () => {
  const start = Date.UTC(2026, 0, 5, 8);

  it('reads FIT time as seconds since 1989-12-31T00:00:00Z', async () => {
    // Published example, garmin/fit-javascript-sdk test/utils.test.js: FIT 1000000000 = 2021-09-08T01:46:40Z.
    const example = { fit_seconds: 1000000000, expected_utc: '2021-09-08T01:46:40Z' };
    const bytes = handmadeFit(Array.from({ length: 12 }, (_, i) => ({ record: { timestamp: example.fit_seconds + i, power: 100 } })));
    const rec = await read(bytes);
    expect(new Date(rec.meta.startMs).toISOString().replace('.000', '')).toBe(example.expected_utc);
  });

  it('decodes the balance byte: side bit, unknown side, invalid 0xFF', async () => {
    // FIT profile type left_right_balance (garmin/fit-javascript-sdk src/profile.js: 0x7F mask, 0x80 right): 0xB5 = right 53 % (left 47 %), 0x34 = 52 % unknown side, 0xFF invalid.
    const right = await read(handmadeFit(records(12, start, (i) => ({ power: 300, leftRightBalance: i === 5 ? 0xff : 0xb5 }))));
    expect(right.meta.balanceSide).toBe('right');
    expect(right.columns.balance![0]).toBe(53);
    expect(right.columns.leftPower![0]).toBeCloseTo(300 * 0.47, 9);
    expect(right.columns.rightPower![0]).toBeCloseTo(300 * 0.53, 9);
    expect(Number.isNaN(right.columns.balance![5]!)).toBe(true);
    expect(Number.isNaN(right.columns.leftPower![5]!)).toBe(true);
    const unknown = await read(handmadeFit(records(12, start, () => ({ power: 300, leftRightBalance: 0x34 }))));
    expect(unknown.meta.balanceSide).toBe('unknown');
    expect(unknown.columns.balance![0]).toBe(52);
    expect(unknown.columns.leftPower).toBeUndefined();
  });

  it('keeps real zeros and makes missing power NaN', async () => {
    const rec = await read(handmadeFit(records(12, start, (i) => (i === 3 ? { cadence: 0 } : { power: i === 4 ? 0 : 150, cadence: 80 }))));
    expect(Number.isNaN(rec.columns.power![3]!)).toBe(true);
    expect(rec.columns.power![4]).toBe(0);
    expect(rec.columns.cadence![3]).toBe(0);
    expect(rec.meta.dropouts).toBe(1);
  });

  it('unpacks gear data from the event data field and holds it; NaN before the first gear event', async () => {
    const t = fitSeconds(start);
    // data = rear_num | rear_teeth << 8 | front_num << 16 | front_teeth << 24 (FIT profile, event.gear_change_data components)
    const data = (5 | (19 << 8) | (2 << 16) | (50 << 24)) >>> 0;
    const bytes = handmadeFit([...records(4, start), { event: { timestamp: t + 4, event: 'rearGearChange', eventType: 'marker', data } }, ...records(8, start + 4000).map((r) => r)]);
    const rec = await read(bytes);
    expect(Array.from(rec.columns.rearGearTeeth!.slice(0, 5))).toEqual([NaN, NaN, NaN, NaN, 19]);
    expect(rec.columns.frontGearTeeth![11]).toBe(50);
    expect(rec.columns.frontGear![11]).toBe(2);
    expect(rec.columns.rearGear![11]).toBe(5);
    expect(rec.events.find((e) => e.kind === 'gear')).toMatchObject({ t: 4, source: 'rear_gear_change' });
  });

  it('merges repeated timestamps and drops backward ones, with warnings naming the record', async () => {
    const base = records(12, start);
    base[6] = { record: { timestamp: fitSeconds(start) + 5, cadence: 77 } }; // repeats record 5
    base[9] = { record: { timestamp: fitSeconds(start) + 2, power: 999 } }; // goes back
    const result = await parseFit(handmadeFit(base), 'clock.fit');
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    const rec = result.recording;
    expect(rec.time.length).toBe(10);
    expect(Array.from(rec.time)).toEqual([0, 1, 2, 3, 4, 5, 7, 8, 10, 11]);
    expect(rec.columns.power![5]).toBe(205); // first record's value kept
    expect(rec.columns.cadence![5]).toBe(77); // gap filled from the repeat
    expect(rec.columns.power).not.toContain(999);
    const codes = result.warnings.map((w) => w.code);
    expect(codes).toEqual(['fit_repeated_timestamp', 'fit_backward_timestamp']);
    expect(result.warnings[0]!.where).toMatchObject({ file: 'clock.fit', record: 6, field: 'timestamp' });
    expect(result.warnings[1]!.message).toContain('record 9');
    expect(result.warnings[1]!.message).toContain('clock.fit');
  });

  it('drops a lone timestamp that jumps far ahead instead of every record after it', async () => {
    const base = records(15, start);
    base[7] = { record: { timestamp: fitSeconds(start) + 7 + 2 ** 20, power: 1 } }; // one flipped bit
    const result = await parseFit(handmadeFit(base), 'jump.fit');
    expect(result.ok && result.recording.time.length).toBe(14);
    expect(result.ok && Array.from(result.recording.columns.power!)).not.toContain(1);
    expect(result.ok && result.warnings.map((w) => [w.code, w.where?.record])).toEqual([['fit_timestamp_jump', 7]]);
  });

  it('counts paused time from timer stop/start pairs', async () => {
    const t = fitSeconds(start);
    const bytes = handmadeFit([
      { event: { timestamp: t, event: 'timer', eventType: 'start' } },
      ...records(6, start),
      { event: { timestamp: t + 6, event: 'timer', eventType: 'stopAll' } },
      { event: { timestamp: t + 36, event: 'timer', eventType: 'start' } },
      ...records(6, start + 36000),
      { event: { timestamp: t + 42, event: 'timer', eventType: 'stopAll' } },
    ]);
    const rec = await read(bytes);
    expect(rec.meta.pausedS).toBe(30);
    expect(rec.meta.totalS).toBe(41);
  });
});
