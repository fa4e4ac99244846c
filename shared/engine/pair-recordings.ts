import type { Recording } from '../recording/recording.js';
import { EngineError } from '../errors.js';
import { gearFromEvents, type GearColumns } from './gear-from-events.js';
import { resampleColumn, type ResampleMode } from './resample-column.js';
import { shiftForOffset } from './shift-for-offset.js';
import type { Table } from './table.js';

/** Options of {@link pairRecordings}. */
export interface PairRecordingsOptions {
  /** Test clock minus reference clock, seconds (see estimateOffset). */
  offsetSeconds: number;
  /** Grid spacing, seconds (default 1). */
  intervalS?: number;
  /** Longest gap bridged by interpolation, seconds (default 3). */
  maxGapS?: number;
}

/**
 * Column names of a paired table. `ref_*` and `test_*` come from each recording;
 * `cadence` and `speed` from the reference when it has them, else the test; gear
 * columns (`front_teeth`, `front_gear`, `rear_teeth`, `rear_gear`) from whichever
 * recording reports gears (the reference first), see `meta.gearSource`.
 */
export const PAIRED_COLUMNS = [
  'ref_power', 'test_power', 'ref_left', 'ref_right', 'test_left', 'test_right',
  'ref_balance', 'test_balance', 'ref_cadence', 'test_cadence', 'cadence', 'speed',
  'front_teeth', 'front_gear', 'rear_teeth', 'rear_gear',
] as const;

/** A name of {@link PAIRED_COLUMNS}. */
export type PairedColumn = (typeof PAIRED_COLUMNS)[number];

/** A table of one test recording against the reference on the reference's grid. */
export interface PairedTable extends Table {
  columns: Partial<Record<PairedColumn, Float64Array>> & { ref_power: Float64Array; test_power: Float64Array };
  /** Seconds both recordings cover (last minus first grid time plus one step). */
  overlapSeconds: number;
  /** Shift applied to the test: test time = reference time + shiftS. */
  shiftS: number;
}

/**
 * Puts a test recording and the reference on the reference's time grid over the span
 * both cover, after applying the alignment. Times are seconds from the reference's
 * first sample. O(n + m).
 *
 * @throws EngineError `no_power` when either has no power, `no_overlap` when they do not overlap.
 * @example
 * const paired = pairRecordings(reference, test, { offsetSeconds: estimateOffset(reference, test).offsetSeconds });
 */
export function pairRecordings(reference: Recording, test: Recording, options: PairRecordingsOptions): PairedTable {
  const dt = options.intervalS ?? 1;
  const maxGapS = options.maxGapS ?? 3;
  for (const r of [reference, test]) {
    if (r.columns.power === undefined) {
      throw new EngineError('no_power', `${r.meta.fileName} has no power column`, { file: r.meta.fileName });
    }
  }
  const shiftS = shiftForOffset(reference, test, options.offsetSeconds);
  const rt = reference.time;
  const tt = test.time;
  const refStart = rt.length > 0 ? rt[0]! : 0;
  const fromS = Math.max(refStart, tt.length > 0 ? tt[0]! - shiftS : Infinity);
  const toS = Math.min(rt.length > 0 ? rt[rt.length - 1]! : -Infinity, tt.length > 0 ? tt[tt.length - 1]! - shiftS : -Infinity);
  const startS = refStart + Math.ceil((fromS - refStart) / dt - 1e-9) * dt;
  if (!(toS >= startS)) {
    throw new EngineError(
      'no_overlap',
      `${test.meta.fileName} does not overlap ${reference.meta.fileName} at an offset of ${options.offsetSeconds} s`,
      { file: test.meta.fileName },
    );
  }
  const count = Math.floor((toS - startS) / dt + 1e-9) + 1;
  const timeS = new Float64Array(count);
  for (let k = 0; k < count; k++) timeS[k] = startS + k * dt;
  const read = (r: Recording, values: Float64Array | undefined, shift: number, mode: ResampleMode = 'linear'): Float64Array | undefined =>
    values === undefined
      ? undefined
      : resampleColumn(r.time, values, { startS: startS + shift, intervalS: dt, count, maxGapS, mode, sourceIntervalS: r.meta.sampleIntervalS });
  const rc = reference.columns;
  const tc = test.columns;
  const columns: PairedTable['columns'] = {
    ref_power: read(reference, rc.power, 0)!,
    test_power: read(test, tc.power, shiftS)!,
  };
  const put = (name: PairedColumn, values: Float64Array | undefined): void => {
    if (values !== undefined) columns[name] = values;
  };
  put('ref_left', read(reference, rc.leftPower, 0));
  put('ref_right', read(reference, rc.rightPower, 0));
  put('test_left', read(test, tc.leftPower, shiftS));
  put('test_right', read(test, tc.rightPower, shiftS));
  put('ref_balance', read(reference, rc.balance, 0));
  put('test_balance', read(test, tc.balance, shiftS));
  put('ref_cadence', read(reference, rc.cadence, 0));
  put('test_cadence', read(test, tc.cadence, shiftS));
  put('cadence', columns.ref_cadence ?? columns.test_cadence);
  put('speed', read(reference, rc.speed, 0) ?? read(test, tc.speed, shiftS));

  const refGears = gearFromEvents(reference);
  const testGears = gearFromEvents(test);
  const gearSource = hasAny(refGears) ? 'reference' : hasAny(testGears) ? 'test' : 'none';
  if (gearSource !== 'none') {
    const [r, g, shift] = gearSource === 'reference' ? [reference, refGears, 0] : [test, testGears, shiftS];
    put('front_teeth', read(r, g.frontTeeth, shift, 'step'));
    put('front_gear', read(r, g.frontIndex, shift, 'step'));
    put('rear_teeth', read(r, g.rearTeeth, shift, 'step'));
    put('rear_gear', read(r, g.rearIndex, shift, 'step'));
  }
  return {
    timeS,
    columns,
    overlapSeconds: count * dt,
    shiftS,
    meta: { intervalS: dt, maxGapS, shiftS, gearSource },
  };
}

function hasAny(g: GearColumns): boolean {
  for (const column of [g.frontTeeth, g.rearTeeth]) {
    for (let i = 0; i < column.length; i++) if (Number.isFinite(column[i]!)) return true;
  }
  return false;
}
