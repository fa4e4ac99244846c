import type { ColumnName, Recording } from './recording.js';

/** Options of {@link writeCsv}. */
export interface WriteCsvOptions {
  delimiter?: ',' | ';' | '\t';
  /** Time column: seconds from the start (default), h:mm:ss, or ISO 8601 UTC (needs meta.startMs). */
  time?: 'seconds' | 'clock' | 'iso';
  speedUnit?: 'm/s' | 'km/h' | 'mph';
  /** Leave out the derived leg power columns (default false). */
  omitLegs?: boolean;
}

const HEADERS: Readonly<Record<ColumnName, string>> = {
  power: 'power (W)',
  leftPower: 'left power (W)',
  rightPower: 'right power (W)',
  balance: 'balance',
  cadence: 'cadence (rpm)',
  speed: 'speed',
  heartRate: 'heart rate (bpm)',
  leftTorqueEffectiveness: 'left torque effectiveness (%)',
  rightTorqueEffectiveness: 'right torque effectiveness (%)',
  leftPedalSmoothness: 'left pedal smoothness (%)',
  rightPedalSmoothness: 'right pedal smoothness (%)',
  frontGear: 'front gear',
  frontGearTeeth: 'front gear teeth',
  rearGear: 'rear gear',
  rearGearTeeth: 'rear gear teeth',
};

const SPEED_FACTOR = { 'm/s': 1, 'km/h': 3.6, mph: 1 / 0.44704 } as const;

/**
 * Writes a recording as CSV text with a header that `parseCsv` recognises ("power (W)",
 * "balance (% right)", "speed (km/h)", ...). Missing samples are empty cells.
 *
 * @example writeCsv(recording, { time: 'clock', speedUnit: 'km/h' })
 */
export function writeCsv(recording: Recording, options: WriteCsvOptions = {}): string {
  const d = options.delimiter ?? ',';
  const speedUnit = options.speedUnit ?? 'm/s';
  const side = recording.meta.balanceSide;
  const names = (Object.keys(HEADERS) as ColumnName[]).filter(
    (c) => recording.columns[c] !== undefined && !(options.omitLegs && (c === 'leftPower' || c === 'rightPower')) && !(c === 'balance' && side === 'none'),
  );
  const header = names.map((c) =>
    c === 'balance' ? `balance (% ${side === 'unknown' ? 'unknown side' : side})` : c === 'speed' ? `speed (${speedUnit})` : HEADERS[c],
  );
  const timeHeader = options.time === 'iso' ? 'timestamp' : options.time === 'clock' ? 'time' : 'time (s)';
  const lines = [[timeHeader, ...header].join(d)];
  const cols = names.map((c) => recording.columns[c]!);
  const speedAt = names.indexOf('speed');
  const { time, meta } = recording;
  for (let i = 0; i < time.length; i++) {
    const cells = [formatTime(time[i]!, meta.startMs, options.time ?? 'seconds')];
    for (let j = 0; j < cols.length; j++) {
      const v = cols[j]![i]!;
      cells.push(Number.isNaN(v) ? '' : String(j === speedAt ? Math.round(v * SPEED_FACTOR[speedUnit] * 1e4) / 1e4 : v));
    }
    lines.push(cells.join(d));
  }
  return `${lines.join('\n')}\n`;
}

function formatTime(t: number, startMs: number, format: 'seconds' | 'clock' | 'iso'): string {
  if (format === 'iso') return new Date(startMs + t * 1000).toISOString();
  if (format === 'seconds') return String(Math.round(t * 1000) / 1000);
  const h = Math.floor(t / 3600);
  const m = Math.floor((t % 3600) / 60);
  const s = Math.round((t % 60) * 1000) / 1000;
  return `${h}:${String(m).padStart(2, '0')}:${s < 10 ? '0' : ''}${s}`;
}
