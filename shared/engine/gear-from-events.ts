import type { GearEvent, Recording } from '../recording/recording.js';

/** Gear state per sample on a recording's time axis; NaN where it is unknown. */
export interface GearColumns {
  frontTeeth: Float64Array;
  frontIndex: Float64Array;
  rearTeeth: Float64Array;
  rearIndex: Float64Array;
}

/**
 * The gear state the recording reports at every sample. Uses the recording's gear
 * columns when the parser filled them; otherwise replays its gear events (front and
 * rear change independently; a state holds until the next event). Before the first
 * event the state is unknown (NaN). O(n + events).
 *
 * This is the gear the shifting system *reported*, which can differ from where the
 * chain physically is; see applyGearOverrides.
 *
 * @example
 * gearFromEvents(recording).frontTeeth // e.g. [NaN, 50, 50, 34, ...]
 */
export function gearFromEvents(recording: Recording): GearColumns {
  const n = recording.time.length;
  const c = recording.columns;
  const events = recording.events
    .filter((e): e is GearEvent => e.kind === 'gear')
    .sort((a, b) => a.t - b.t);
  const fromColumns = c.frontGearTeeth !== undefined || c.rearGearTeeth !== undefined;
  if (fromColumns || events.length === 0) {
    return {
      frontTeeth: c.frontGearTeeth?.slice() ?? nanArray(n),
      frontIndex: c.frontGear?.slice() ?? nanArray(n),
      rearTeeth: c.rearGearTeeth?.slice() ?? nanArray(n),
      rearIndex: c.rearGear?.slice() ?? nanArray(n),
    };
  }
  const out: GearColumns = { frontTeeth: nanArray(n), frontIndex: nanArray(n), rearTeeth: nanArray(n), rearIndex: nanArray(n) };
  let e = 0;
  let front = { teeth: NaN, index: NaN };
  let rear = { teeth: NaN, index: NaN };
  for (let i = 0; i < n; i++) {
    const t = recording.time[i]!;
    while (e < events.length && events[e]!.t <= t + 1e-9) {
      const event = events[e]!;
      if (event.front) front = { teeth: event.front.teeth, index: event.front.index };
      if (event.rear) rear = { teeth: event.rear.teeth, index: event.rear.index };
      e++;
    }
    out.frontTeeth[i] = front.teeth;
    out.frontIndex[i] = front.index;
    out.rearTeeth[i] = rear.teeth;
    out.rearIndex[i] = rear.index;
  }
  return out;
}

function nanArray(n: number): Float64Array {
  return new Float64Array(n).fill(NaN);
}
