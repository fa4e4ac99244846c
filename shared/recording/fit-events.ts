import type { GearEvent, GearState, LapEvent, RecordingColumns, RecordingEvent, TimerEvent } from './recording.js';

/** An event, lap or timestamped message as fit-file-parser gives it (mode 'list'). */
export interface FitParsedMessage {
  timestamp?: Date | number;
  [field: string]: unknown;
}

const GEAR_EVENTS = new Set(['front_gear_change', 'rear_gear_change', 'gear_change']);
const STOP_TYPES = new Set(['stop', 'stop_all', 'stop_disable', 'stop_disable_all']);

/** Milliseconds of a fit-file-parser timestamp, or NaN. */
export function timestampMs(value: unknown): number {
  if (value instanceof Date) return value.getTime();
  return typeof value === 'number' ? value : NaN;
}

/**
 * Gear, timer and lap events on the recording's time axis (`t0Ms` = first sample).
 * Gear data is unpacked from the event's 32-bit `data` field when the four gear fields are absent:
 * rear_gear_num = d & 255, rear_gear = d >>> 8 & 255, front_gear_num = d >>> 16 & 255, front_gear = d >>> 24.
 */
export function fitEvents(events: readonly FitParsedMessage[], laps: readonly FitParsedMessage[], t0Ms: number): RecordingEvent[] {
  const out: RecordingEvent[] = [];
  for (const ev of events) {
    const ms = timestampMs(ev.timestamp);
    if (Number.isNaN(ms)) continue;
    const t = (ms - t0Ms) / 1000;
    const name = String(ev.event);
    if (name === 'timer') {
      const type = String(ev.event_type);
      if (type === 'start') out.push({ kind: 'timer_start', t } satisfies TimerEvent);
      else if (STOP_TYPES.has(type)) out.push({ kind: 'timer_stop', t } satisfies TimerEvent);
    } else if (GEAR_EVENTS.has(name)) {
      const gear = unpackGear(ev);
      if (gear.front || gear.rear) out.push({ kind: 'gear', t, ...gear, source: name } satisfies GearEvent);
    }
  }
  for (const lap of laps) {
    const endMs = timestampMs(lap.timestamp);
    const startMs = timestampMs(lap.start_time);
    if (Number.isNaN(endMs)) continue;
    const endS = (endMs - t0Ms) / 1000;
    const elapsed = typeof lap.total_elapsed_time === 'number' ? lap.total_elapsed_time : NaN;
    const startS = Number.isNaN(startMs) ? endS - (Number.isNaN(elapsed) ? 0 : elapsed) : (startMs - t0Ms) / 1000;
    out.push({ kind: 'lap', t: endS, startS, endS } satisfies LapEvent);
  }
  return out.sort((a, b) => a.t - b.t);
}

function unpackGear(ev: FitParsedMessage): { front?: GearState; rear?: GearState } {
  const d = typeof ev.data === 'number' ? ev.data >>> 0 : NaN;
  const field = (name: string, fromData: number): number => (typeof ev[name] === 'number' ? (ev[name] as number) : fromData);
  const rearIndex = field('rear_gear_num', d & 255);
  const rearTeeth = field('rear_gear', (d >>> 8) & 255);
  const frontIndex = field('front_gear_num', (d >>> 16) & 255);
  const frontTeeth = field('front_gear', d >>> 24);
  // 0 and 255 are "not known" in practice (uint8z / uint8 invalid).
  const state = (index: number, teeth: number): GearState | undefined =>
    index > 0 && index < 255 && teeth > 0 && teeth < 255 ? { index, teeth } : undefined;
  const front = state(frontIndex, frontTeeth);
  const rear = state(rearIndex, rearTeeth);
  return { ...(front && { front }), ...(rear && { rear }) };
}

/**
 * Step columns of gear state from gear events: each sample holds the last state at or before its
 * time; NaN before the first known state. Adds nothing when there are no gear events.
 */
export function gearColumns(time: Float64Array, events: readonly RecordingEvent[], columns: RecordingColumns): void {
  const gears = events.filter((e): e is GearEvent => e.kind === 'gear');
  if (gears.length === 0) return;
  const n = time.length;
  const frontGear = new Float64Array(n);
  const frontGearTeeth = new Float64Array(n);
  const rearGear = new Float64Array(n);
  const rearGearTeeth = new Float64Array(n);
  let fi = NaN;
  let ft = NaN;
  let ri = NaN;
  let rt = NaN;
  let e = 0;
  for (let k = 0; k < n; k++) {
    while (e < gears.length && gears[e]!.t <= time[k]!) {
      const g = gears[e++]!;
      if (g.front) ((fi = g.front.index), (ft = g.front.teeth));
      if (g.rear) ((ri = g.rear.index), (rt = g.rear.teeth));
    }
    frontGear[k] = fi;
    frontGearTeeth[k] = ft;
    rearGear[k] = ri;
    rearGearTeeth[k] = rt;
  }
  Object.assign(columns, { frontGear, frontGearTeeth, rearGear, rearGearTeeth });
}

/** Seconds with the timer stopped: each stop followed by a start. A final stop without a start adds nothing. */
export function pausedSeconds(events: readonly RecordingEvent[]): number {
  let paused = 0;
  let stoppedAt = NaN;
  for (const ev of events) {
    if (ev.kind === 'timer_stop' && Number.isNaN(stoppedAt)) stoppedAt = ev.t;
    else if (ev.kind === 'timer_start' && !Number.isNaN(stoppedAt)) {
      paused += ev.t - stoppedAt;
      stoppedAt = NaN;
    }
  }
  return paused;
}
