import { COLUMN_NAMES, type BalanceSide, type DeviceIdentity, type Recording } from './recording.js';

/** What the import cell shows about a recording. */
export interface RecordingSummary {
  fileName: string;
  format: 'fit' | 'csv';
  device: DeviceIdentity;
  /** ISO 8601 start (UTC), or undefined when the file has no absolute time. */
  startIso: string | undefined;
  durationS: number;
  pausedS: number;
  samples: number;
  sampleIntervalS: number;
  /** Samples with power missing. */
  dropouts: number;
  /** Spans longer than 1.5 sampling intervals with no sample, outside timer pauses. */
  gaps: number;
  /** Seconds inside those gaps beyond the normal spacing. */
  gapS: number;
  balanceSide: BalanceSide;
  /** Whether power per leg is available (given or derived from a sided balance). */
  hasLegs: boolean;
  /** Columns present, in model order. */
  columns: string[];
  /** Chainring and cog states seen, with the seconds spent in each, sorted by time spent. */
  gears: { front: number; frontTeeth: number; rear: number; rearTeeth: number; seconds: number }[];
  laps: number;
  warnings: number;
}

/**
 * Summarises a recording for display: duration, samples, dropouts and gaps, balance side, gears
 * seen and device identity.
 */
export function summarizeRecording(recording: Recording): RecordingSummary {
  const { meta, time, columns } = recording;
  const n = time.length;
  const interval = meta.sampleIntervalS;
  const pauses = pauseSpans(recording);
  let gaps = 0;
  let gapS = 0;
  for (let i = 1; i < n; i++) {
    const d = time[i]! - time[i - 1]!;
    if (d > 1.5 * interval && !pauses.some(([a, b]) => time[i - 1]! >= a - interval && time[i]! <= b + interval)) {
      gaps++;
      gapS += d - interval;
    }
  }
  const gearTime = new Map<string, RecordingSummary['gears'][number]>();
  const { frontGear, frontGearTeeth, rearGear, rearGearTeeth } = columns;
  if (frontGear && frontGearTeeth && rearGear && rearGearTeeth) {
    for (let i = 0; i < n; i++) {
      if (Number.isNaN(frontGear[i]!) && Number.isNaN(rearGear[i]!)) continue;
      const key = `${frontGear[i]}|${rearGear[i]}`;
      const entry = gearTime.get(key) ?? { front: frontGear[i]!, frontTeeth: frontGearTeeth[i]!, rear: rearGear[i]!, rearTeeth: rearGearTeeth[i]!, seconds: 0 };
      entry.seconds += i + 1 < n ? Math.min(time[i + 1]! - time[i]!, 1.5 * interval) : interval;
      gearTime.set(key, entry);
    }
  }
  return {
    fileName: meta.fileName,
    format: meta.format,
    device: meta.device,
    startIso: Number.isFinite(meta.startMs) ? new Date(meta.startMs).toISOString() : undefined,
    durationS: meta.totalS,
    pausedS: meta.pausedS,
    samples: n,
    sampleIntervalS: interval,
    dropouts: meta.dropouts,
    gaps,
    gapS,
    balanceSide: meta.balanceSide,
    hasLegs: columns.leftPower !== undefined && columns.rightPower !== undefined,
    columns: COLUMN_NAMES.filter((c) => columns[c] !== undefined),
    gears: [...gearTime.values()].sort((a, b) => b.seconds - a.seconds),
    laps: recording.events.filter((e) => e.kind === 'lap').length,
    warnings: recording.warnings.length,
  };
}

function pauseSpans(recording: Recording): [number, number][] {
  const spans: [number, number][] = [];
  let stop = NaN;
  for (const e of recording.events) {
    if (e.kind === 'timer_stop' && Number.isNaN(stop)) stop = e.t;
    if (e.kind === 'timer_start' && !Number.isNaN(stop)) {
      spans.push([stop, e.t]);
      stop = NaN;
    }
  }
  return spans;
}
