import { mkdir, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { Recording, RecordingColumns } from '../../shared/recording/recording.js';
import { writeCsv } from '../../shared/recording/write-csv.js';
import { writeFit } from '../../shared/recording/write-fit.js';
import { defaultProtocol, deviceView, synthesizeRide, type RideBlock, type SyntheticDevice } from '../../shared/synthetic/index.js';

/** The reference and device-under-test files of one benchmark ride. */
export interface RideFiles {
  reference: string;
  test: string;
  /** Samples per file. */
  samples: number;
}

/** Seconds the device under test starts after the reference: the offset the comparison must find. */
export const TEST_STARTS_LATER_S = 37;

const REFERENCE: SyntheticDevice = {
  label: 'Bench reference hub', serialNumber: 7001, balance: 'none', noiseSdW: 2, channels: { gears: true },
};

const DEVICE: SyntheticDevice = {
  label: 'Bench test crank', serialNumber: 7002, balance: 'right', noiseSdW: 3, smoothingS: 2,
  gains: { left: [1.0, 1.03], right: [1.0, 1.0] }, offsetW: 4, driftWPerH: 1.5,
  dropouts: { perHour: 30, meanLengthS: 3, style: 'missing' }, channels: { gears: false },
};

/** A 6-minute ride: long enough to align and find a block per chainring, short enough that start-up is nearly all of the time. */
export const SHORT_RIDE: readonly RideBlock[] = [
  { kind: 'warmup', durationS: 60, powerW: 150, cadenceRpm: 85, front: 2, rear: 6 },
  { kind: 'steady', durationS: 120, powerW: 250, cadenceRpm: 90, front: 2, rear: 8 },
  { kind: 'steady', durationS: 120, powerW: 200, cadenceRpm: 90, front: 1, rear: 4 },
  { kind: 'recovery', durationS: 60, powerW: 120, cadenceRpm: 85, front: 1, rear: 4 },
];

/**
 * Writes a seeded ride of `hours` (the default protocol repeated) as a reference and a
 * device under test, CSV or FIT, into `dir`. The device starts {@link TEST_STARTS_LATER_S}
 * later, reads 3% high on the left leg on the large chainring, +4 W, drifts and drops out.
 * Same seed, same bytes. FIT holds whole seconds, so FIT is 1 Hz only.
 */
export async function writeRideFiles(dir: string, options: { hours: number; rateHz: 1 | 10; format: 'csv' | 'fit'; seed?: number; blocks?: readonly RideBlock[] }): Promise<RideFiles> {
  const { hours, rateHz, format } = options;
  if (format === 'fit' && rateHz !== 1) throw new Error('FIT timestamps are whole seconds: write FIT at 1 Hz');
  const protocol = defaultProtocol();
  const oneHourS = protocol.reduce((s, b) => s + b.durationS, 0);
  const blocks = options.blocks ?? Array.from({ length: Math.max(1, Math.round((hours * 3600) / oneHourS)) }, () => protocol).flat();
  const ride = synthesizeRide({ seed: options.seed ?? 20260302, rateHz, blocks });
  const interval = 1 / rateHz;
  const reference = deviceView(ride, { ...REFERENCE, intervalS: interval }).recording;
  const test = startLater(deviceView(ride, { ...DEVICE, intervalS: interval }).recording, TEST_STARTS_LATER_S);
  await mkdir(dir, { recursive: true });
  const stem = options.blocks === undefined ? `${hours}h-${rateHz}hz` : `short-${rateHz}hz`;
  const paths = { reference: join(dir, `${stem}-reference.${format}`), test: join(dir, `${stem}-test.${format}`) };
  const encode = (r: Recording): Uint8Array | string => (format === 'fit' ? writeFit(r) : writeCsv(r));
  await writeFile(paths.reference, encode(reference));
  await writeFile(paths.test, encode(test));
  return { ...paths, samples: reference.time.length };
}

/** Drops the first `seconds` of a recording, as if its head unit had been started later. */
function startLater(recording: Recording, seconds: number): Recording {
  const { time } = recording;
  let from = 0;
  while (from < time.length && time[from]! < seconds - 1e-9) from++;
  const t0 = time[from] ?? 0;
  const columns: RecordingColumns = {};
  for (const [name, values] of Object.entries(recording.columns) as [keyof RecordingColumns, Float64Array | undefined][]) {
    if (values !== undefined) columns[name] = values.slice(from);
  }
  const shifted = time.slice(from).map((t) => t - t0);
  return {
    ...recording,
    meta: { ...recording.meta, startMs: recording.meta.startMs + t0 * 1000, totalS: shifted[shifted.length - 1] ?? 0 },
    time: shifted,
    columns,
    events: [{ kind: 'timer_start' as const, t: 0 }, ...recording.events.filter((e) => e.t >= t0 && e.kind !== 'timer_start').map((e) => (e.kind === 'lap' ? { ...e, t: e.t - t0, startS: Math.max(0, e.startS - t0), endS: e.endS - t0 } : { ...e, t: e.t - t0 }))],
  };
}
