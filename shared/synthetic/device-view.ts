import type { Recording, RecordingColumns, RecordingEvent } from '../recording/recording.js';
import { splitPower } from '../recording/split-power.js';
import { createRandom } from './random.js';
import type { RideTruth } from './synthesize-ride.js';

/** An invented power meter with known errors, as it would record a {@link RideTruth}. */
export interface SyntheticDevice {
  /** Shown as the device label and used for the file name (`<label>.fit`). */
  label: string;
  serialNumber?: number;
  /** FIT manufacturer id; default 255 ("development", not a brand). */
  manufacturerId?: number;
  productId?: number;
  product?: string;
  softwareVersion?: string;
  /** Scale per leg per chainring index (array index 0 = chainring 1); default 1. */
  gains?: { left?: readonly number[]; right?: readonly number[] };
  /** Whether gains follow where the chain physically is (load path) or the reported gear (firmware). Default 'physical'. */
  gainFollows?: 'physical' | 'reported';
  /** Constant offset on the total while pedalling, W (split evenly over the legs). */
  offsetW?: number;
  /** Offset growth while pedalling, W per hour of ride time. */
  driftWPerH?: number;
  /** SD of white noise on the total, W. */
  noiseSdW?: number;
  /** Trailing moving-average window, s (0 = none). */
  smoothingS?: number;
  /** Measures one leg and doubles it. */
  singleSided?: 'left' | 'right';
  /** Device clock minus reference clock, s. */
  clockOffsetS?: number;
  /** Random link losses: starts per hour, mean length in s, and whether records stay (NaN) or vanish (time gap). */
  dropouts?: { perHour: number; meanLengthS: number; style?: 'missing' | 'gap' };
  /** How balance is reported: right share with the FIT side bit, a percent of unknown side, or not at all. Default 'right'. */
  balance?: 'right' | 'unknown' | 'none';
  /** Recording interval, s (a whole number of base samples; default 1). */
  intervalS?: number;
  /** Which extra channels the device records (defaults: cadence, speed, heart rate, gears on; pedal metrics off). */
  channels?: { cadence?: boolean; speed?: boolean; heartRate?: boolean; pedalMetrics?: boolean; gears?: boolean };
  /** Seed of the device's own noise and dropouts (default derived from the ride seed and serial). */
  seed?: number;
}

/** What {@link deviceView} returns: the recording plus the exact quantities tests compare with. */
export interface DeviceView {
  recording: Recording;
  /** Noise-free, unsmoothed device reading at each recorded sample (gains, offset and drift applied), W. */
  expected: { power: Float64Array; leftPower: Float64Array; rightPower: Float64Array };
  /** Index into the truth arrays of each recorded sample. */
  truthIndex: Int32Array;
  /** Samples lost to dropouts (NaN or removed). */
  dropoutSamples: number;
}

/**
 * Records a ride as `device` would: leg gains per chainring, offset, drift, noise, smoothing,
 * single-sided doubling, clock offset, dropouts, balance reporting and recording interval.
 * The result is a {@link Recording} (power rounded to whole W, balance to whole %) that
 * `writeFit`/`writeCsv` turn into files.
 *
 * @example deviceView(synthesizeRide({ seed: 1 }), { label: 'Test crank', gains: { left: [1.02, 1.02] } })
 */
export function deviceView(ride: RideTruth, device: SyntheticDevice): DeviceView {
  const n = ride.time.length;
  const rate = ride.rateHz;
  const rnd = createRandom(device.seed ?? (ride.seed * 7919 + (device.serialNumber ?? 1)) >>> 0);
  const gearOf = device.gainFollows === 'reported' ? ride.frontGear : ride.physicalFrontGear;
  const noiseSd = device.noiseSdW ?? 0;
  const legL = new Float64Array(n);
  const legR = new Float64Array(n);
  const clean = { left: new Float64Array(n), right: new Float64Array(n) };
  for (let i = 0; i < n; i++) {
    if (ride.cadence[i] === 0) continue; // no crank rotation: a power meter reads exactly 0
    const ring = gearOf[i]! - 1;
    const shift = ((device.offsetW ?? 0) + ((device.driftWPerH ?? 0) * ride.time[i]!) / 3600) / 2;
    let l = (device.gains?.left?.[ring] ?? 1) * ride.leftPower[i]! + shift;
    let r = (device.gains?.right?.[ring] ?? 1) * ride.rightPower[i]! + shift;
    if (device.singleSided === 'left') r = l;
    if (device.singleSided === 'right') l = r;
    clean.left[i] = l;
    clean.right[i] = r;
    const noise = (noiseSd / Math.SQRT2) * (device.singleSided ? Math.SQRT1_2 : 1);
    const nl = noise * rnd.gaussian();
    legL[i] = l + nl;
    legR[i] = device.singleSided ? legL[i]! : r + noise * rnd.gaussian();
  }
  const window = Math.max(1, Math.round((device.smoothingS ?? 0) * rate));
  const smoothL = trailingMean(legL, window);
  const smoothR = trailingMean(legR, window);

  const step = Math.max(1, Math.round((device.intervalS ?? 1) * rate));
  const picked: number[] = [];
  for (let i = 0; i < n; i += step) if (ride.recording[i] === 1) picked.push(i);
  const lost = pickDropouts(picked.length, step / rate, device.dropouts, rnd);
  const gap = device.dropouts?.style === 'gap';
  const kept = gap ? picked.filter((_, k) => !lost[k]) : picked;
  const m = kept.length;
  const first = kept[0] ?? 0;
  const t0 = ride.time[first] ?? 0;
  const channels = { cadence: true, speed: true, heartRate: true, pedalMetrics: false, gears: true, ...device.channels };
  const side = device.singleSided ? 'none' : (device.balance ?? 'right');

  const time = new Float64Array(m);
  const power = new Float64Array(m);
  const balance = new Float64Array(m);
  const expected = { power: new Float64Array(m), leftPower: new Float64Array(m), rightPower: new Float64Array(m) };
  const truthIndex = Int32Array.from(kept);
  const lostAt = new Uint8Array(m);
  if (!gap) kept.forEach((_, k) => (lostAt[k] = lost[k] ? 1 : 0));
  for (let k = 0; k < m; k++) {
    const i = kept[k]!;
    time[k] = ride.time[i]! - t0;
    const l = Math.max(0, smoothL[i]!);
    const r = Math.max(0, smoothR[i]!);
    const total = Math.round(l + r);
    power[k] = lostAt[k] ? NaN : total;
    const rightPct = side === 'unknown' ? Math.round((100 * l) / (l + r)) : Math.round((100 * r) / (l + r));
    balance[k] = lostAt[k] || total === 0 ? NaN : rightPct;
    expected.leftPower[k] = clean.left[i]!;
    expected.rightPower[k] = clean.right[i]!;
    expected.power[k] = clean.left[i]! + clean.right[i]!;
  }
  const columns: RecordingColumns = { power };
  const pick = (src: Float64Array, dropsWithPower: boolean): Float64Array =>
    Float64Array.from(kept, (i, k) => (dropsWithPower && lostAt[k] ? NaN : src[i]!));
  if (side !== 'none') {
    columns.balance = balance;
    const left = new Float64Array(m);
    const right = new Float64Array(m);
    if (splitPower(power, balance, side, left, right)) Object.assign(columns, { leftPower: left, rightPower: right });
  }
  if (channels.cadence) columns.cadence = pick(ride.cadence, true).map(Math.round);
  if (channels.speed) columns.speed = pick(ride.speed, false).map((v) => Math.round(v * 1000) / 1000);
  if (channels.heartRate) columns.heartRate = pick(ride.heartRate, false).map(Math.round);
  if (channels.pedalMetrics) {
    // FIT stores these percents with scale 2 (0.5 % steps).
    const half = (v: number): number => Math.round(v * 2) / 2;
    columns.leftTorqueEffectiveness = pick(ride.leftTorqueEffectiveness, true).map(half);
    columns.rightTorqueEffectiveness = pick(ride.rightTorqueEffectiveness, true).map(half);
    columns.leftPedalSmoothness = pick(ride.leftPedalSmoothness, true).map(half);
    columns.rightPedalSmoothness = pick(ride.rightPedalSmoothness, true).map(half);
  }
  const events = deviceEvents(ride, t0, time[m - 1] ?? 0, channels.gears);
  if (channels.gears) {
    columns.frontGear = pick(ride.frontGear, false);
    columns.frontGearTeeth = pick(ride.frontGearTeeth, false);
    columns.rearGear = pick(ride.rearGear, false);
    columns.rearGearTeeth = pick(ride.rearGearTeeth, false);
  }
  let dropouts = 0;
  for (let k = 0; k < m; k++) if (Number.isNaN(power[k]!)) dropouts++;
  const pausedS = ride.blocks.filter((b) => b.kind === 'pause' && b.startS >= t0).reduce((s, b) => s + (b.endS - b.startS), 0);
  const recording: Recording = {
    meta: {
      fileName: `${device.label}.fit`,
      format: 'fit',
      device: {
        label: device.label,
        manufacturerId: device.manufacturerId ?? 255,
        manufacturer: 'development',
        ...(device.product !== undefined && { product: device.product }),
        productId: device.productId ?? 1,
        serialNumber: device.serialNumber ?? 1,
        softwareVersion: device.softwareVersion ?? '1.00',
      },
      startMs: ride.startMs + (t0 + (device.clockOffsetS ?? 0)) * 1000,
      sampleIntervalS: step / rate,
      totalS: time[m - 1] ?? 0,
      pausedS,
      balanceSide: side,
      dropouts,
    },
    time,
    columns,
    events,
    warnings: [],
  };
  return { recording, expected, truthIndex, dropoutSamples: lost.reduce((s, v) => s + (v ? 1 : 0), 0) };
}

function trailingMean(values: Float64Array, window: number): Float64Array {
  if (window <= 1) return values;
  const out = new Float64Array(values.length);
  let sum = 0;
  for (let i = 0; i < values.length; i++) {
    sum += values[i]!;
    if (i >= window) sum -= values[i - window]!;
    out[i] = sum / Math.min(window, i + 1);
  }
  return out;
}

function pickDropouts(count: number, intervalS: number, spec: SyntheticDevice['dropouts'], rnd: ReturnType<typeof createRandom>): boolean[] {
  const lost = new Array<boolean>(count).fill(false);
  if (!spec || spec.perHour <= 0) return lost;
  const startChance = (spec.perHour * intervalS) / 3600;
  const meanSamples = Math.max(1, spec.meanLengthS / intervalS);
  // Never lose the first and last samples, so the recording's span matches the ride.
  for (let k = 1; k < count - 1; k++) {
    if (rnd.next() >= startChance) continue;
    const length = Math.max(1, Math.round(-Math.log(1 - rnd.next()) * meanSamples));
    for (let j = k; j < Math.min(count - 1, k + length); j++) lost[j] = true;
    k += length;
  }
  return lost;
}

function deviceEvents(ride: RideTruth, t0: number, endS: number, gears: boolean): RecordingEvent[] {
  const events: RecordingEvent[] = [{ kind: 'timer_start', t: 0 }];
  for (const block of ride.blocks) {
    if (block.startS < t0) continue;
    if (block.kind === 'pause') {
      events.push({ kind: 'timer_stop', t: block.startS - t0 }, { kind: 'timer_start', t: block.endS - t0 });
    } else {
      events.push({ kind: 'lap', t: Math.min(endS, block.endS - t0), startS: block.startS - t0, endS: Math.min(endS, block.endS - t0) });
    }
  }
  if (gears) {
    for (const ev of ride.gearEvents) {
      if (ev.t < t0) continue;
      events.push({ kind: 'gear', t: ev.t - t0, front: ev.front, rear: ev.rear, source: ev.source });
    }
  }
  events.push({ kind: 'timer_stop', t: endS });
  return events.sort((a, b) => a.t - b.t);
}
