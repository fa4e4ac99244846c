import type { EngineWarning } from '../errors.js';
import { fitDeviceIdentity } from './fit-device.js';
import { fitEvents, gearColumns, pausedSeconds, timestampMs, type FitParsedMessage } from './fit-events.js';
import type { BalanceSide, ColumnName, Recording, RecordingColumns } from './recording.js';
import { sampleInterval } from './sample-interval.js';
import { splitPower } from './split-power.js';

/** The parts of fit-file-parser's output (mode 'list') a recording is built from. */
export interface ParsedFitLike {
  records?: FitParsedMessage[];
  events?: FitParsedMessage[];
  laps?: FitParsedMessage[];
  file_ids?: FitParsedMessage[];
  device_infos?: FitParsedMessage[];
  file_creator?: FitParsedMessage;
  field_descriptions?: FitParsedMessage[];
}

/**
 * The record (global message 20) fields a recording is built from, one entry per record message
 * in file order, as typed-array columns. NaN marks a field the record lacks or holds as invalid.
 */
export interface FitRecordColumns {
  /** Number of record messages. */
  count: number;
  /** Each record's timestamp in Unix ms; NaN when it has none. */
  ms: Float64Array;
  /**
   * In {@link RECORD_VALUE_FIELDS} order; a field no record holds is undefined. Values are as
   * fit-file-parser gives them (scale applied: speed in m/s, percents), and speed falls back to
   * enhanced_speed where a record has no speed.
   */
  values: (Float64Array | undefined)[];
  /** left_right_balance: the share in percent (bits 0-6), NaN when absent. */
  balanceValue?: Float64Array;
  /** left_right_balance: 1 when bit 7 ("right") is set. */
  balanceRight?: Uint8Array;
}

/** The numeric record fields of {@link FitRecordColumns.values}, by their FIT profile names. */
export const RECORD_VALUE_FIELDS = [
  'power',
  'cadence',
  'speed',
  'heart_rate',
  'left_torque_effectiveness',
  'right_torque_effectiveness',
  'left_pedal_smoothness',
  'right_pedal_smoothness',
] as const;

// The recording column of each of RECORD_VALUE_FIELDS (fit-file-parser already applies scale:
// speed in m/s, percents), in the order the hot loop reads them.
const COLUMN_OF_FIELD: readonly ColumnName[] = [
  'power',
  'cadence',
  'speed',
  'heartRate',
  'leftTorqueEffectiveness',
  'rightTorqueEffectiveness',
  'leftPedalSmoothness',
  'rightPedalSmoothness',
];

/**
 * fit-file-parser's record objects as {@link FitRecordColumns}: the same columns the own decoder
 * gives, so one loop builds the recording from either. A field that is not a number is absent.
 */
export function fitRecordColumns(records: readonly FitParsedMessage[]): FitRecordColumns {
  const count = records.length;
  const ms = new Float64Array(count);
  const values: (Float64Array | undefined)[] = RECORD_VALUE_FIELDS.map(() => undefined);
  let balanceValue: Float64Array | undefined;
  let balanceRight: Uint8Array | undefined;
  const put = (f: number, r: number, v: unknown): void => {
    if (typeof v !== 'number' || v !== v) return;
    (values[f] ??= new Float64Array(count).fill(NaN))[r] = v;
  };
  for (let r = 0; r < count; r++) {
    const rec = records[r]!;
    const stamp = rec.timestamp;
    // fit-file-parser gives a Date; the generic helper covers numbers and anything else.
    ms[r] = stamp instanceof Date ? stamp.getTime() : timestampMs(stamp);
    // Named reads (not a loop over field names) keep the property loads monomorphic.
    put(0, r, rec.power);
    put(1, r, rec.cadence);
    put(2, r, rec.speed ?? rec.enhanced_speed);
    put(3, r, rec.heart_rate);
    put(4, r, rec.left_torque_effectiveness);
    put(5, r, rec.right_torque_effectiveness);
    put(6, r, rec.left_pedal_smoothness);
    put(7, r, rec.right_pedal_smoothness);
    const lrb = rec.left_right_balance as { value?: unknown; right?: unknown } | number | undefined | null;
    if (lrb === undefined || lrb === null) continue;
    balanceValue ??= new Float64Array(count).fill(NaN);
    balanceRight ??= new Uint8Array(count);
    balanceValue[r] = typeof lrb === 'number' ? lrb & 0x7f : Number(lrb.value);
    balanceRight[r] = (typeof lrb === 'number' ? (lrb & 0x80) !== 0 : lrb.right === true) ? 1 : 0;
  }
  return { count, ms, values, ...(balanceValue && { balanceValue, balanceRight }) };
}

/**
 * Builds a {@link Recording} from the record columns of a FIT file and its other parsed messages
 * (events, laps, file_id, device_info; `parsed.records` is not read). Samples keep their real
 * timestamps (a gap in time stays a gap); a record whose timestamp repeats the previous one is
 * merged into it (its fields fill the gaps of the first), one that goes backwards is dropped; both
 * with a warning naming the first record. Missing fields are NaN, never 0.
 */
export function fitToRecording(
  records: FitRecordColumns,
  parsed: ParsedFitLike,
  fileName: string,
  warnings: EngineWarning[],
  recordBytes: (k: number) => number | undefined,
  fileIdNumbers?: { manufacturerId?: number; productId?: number },
): Recording {
  const n = records.count;
  const stamps = records.ms;
  const values = records.values;
  const balanceValue = records.balanceValue;
  const balanceRight = records.balanceRight;
  const time = new Float64Array(n);
  // A column is made when its field first appears: a file rarely has all eight.
  const cols: (Float64Array | undefined)[] = COLUMN_OF_FIELD.map(() => undefined);
  const balance = new Float64Array(n).fill(NaN);
  let rightCount = 0;
  let unknownCount = 0;
  const issues: TimeIssues = { repeated: [], backwards: [], untimed: [], jumps: [] };
  let t0 = NaN;
  let m = 0;
  if (timeAxis(stamps, time)) {
    // The usual file: every record later than the one before, so record r is sample r, and a
    // field's column is its record column as it is (made only when some record holds the field).
    t0 = stamps[0]!;
    m = n;
    for (let f = 0; f < values.length; f++) cols[f] = values[f];
    if (balanceValue !== undefined) ({ rightCount, unknownCount } = signedBalance(balanceValue, balanceRight!, balance));
  } else {
    ({ t0, m, rightCount, unknownCount } = mergeRecords(records, time, cols, balance, issues));
  }
  reportTimeIssues(issues, fileName, warnings, recordBytes);
  const columns: RecordingColumns = {};
  COLUMN_OF_FIELD.forEach((name, f) => {
    const col = cols[f];
    if (col) columns[name] = m < n ? col.slice(0, m) : col;
  });
  const side = settleBalance(balance, m, rightCount, unknownCount, fileName, warnings);
  if (side !== 'none') {
    columns.balance = m < n ? balance.slice(0, m) : balance;
    const left = new Float64Array(m);
    const right = new Float64Array(m);
    if (columns.power && splitPower(columns.power, columns.balance, side, left, right)) Object.assign(columns, { leftPower: left, rightPower: right });
  }
  const axis = m < n ? time.slice(0, m) : time;
  const events = fitEvents(parsed.events ?? [], parsed.laps ?? [], t0);
  gearColumns(axis, events, columns);
  let dropouts = 0;
  const power = columns.power;
  if (power) for (let i = 0; i < m; i++) if (Number.isNaN(power[i]!)) dropouts++;
  return {
    meta: {
      fileName,
      format: 'fit',
      device: fitDeviceIdentity(parsed.file_ids ?? [], parsed.device_infos ?? [], fileIdNumbers, parsed.file_creator),
      startMs: t0,
      sampleIntervalS: wholeSecondInterval(axis) ?? sampleInterval(axis),
      totalS: m > 0 ? axis[m - 1]! : 0,
      pausedS: pausedSeconds(events),
      balanceSide: side,
      dropouts,
    },
    time: axis,
    columns,
    events,
    warnings,
  };
}

/**
 * Records onto the time axis when some timestamp is missing, repeats or goes back: merged into the
 * sample they repeat, dropped (with the lone jump ahead) or left out, as {@link fitToRecording} says.
 */
function mergeRecords(
  records: FitRecordColumns,
  time: Float64Array,
  cols: (Float64Array | undefined)[],
  balance: Float64Array,
  issues: TimeIssues,
): { t0: number; m: number; rightCount: number; unknownCount: number } {
  const { count: n, ms: stamps, values, balanceValue, balanceRight } = records;
  const keptRecord = new Int32Array(n);
  let rightCount = 0;
  let unknownCount = 0;
  let t0 = NaN;
  let last = -Infinity;
  let m = 0;
  for (let r = 0; r < n; r++) {
    const ms = stamps[r]!;
    if (Number.isNaN(ms)) {
      issues.untimed.push(r);
      continue;
    }
    let k = m;
    if (ms === last) {
      k = m - 1;
      issues.repeated.push(r);
    } else if (ms < last) {
      // A lone timestamp far ahead (a flipped bit) would make every later record look backwards:
      // when this record fits after the sample before that one, the jumping sample is the one dropped.
      if (m >= 2 && ms > t0 + time[m - 2]! * 1000) {
        m--;
        issues.jumps.push(keptRecord[m]!);
        for (const col of cols) if (col) col[m] = NaN;
        balance[m] = NaN;
        k = m;
        time[m++] = (ms - t0) / 1000;
        keptRecord[m - 1] = r;
        last = ms;
      } else {
        issues.backwards.push(r);
        continue;
      }
    } else {
      if (Number.isNaN(t0)) t0 = ms;
      keptRecord[m] = r;
      time[m++] = (ms - t0) / 1000;
      last = ms;
    }
    for (let f = 0; f < values.length; f++) {
      const source = values[f];
      if (source !== undefined) take(cols, f, n, k, source[r]!);
    }
    const value = balanceValue === undefined ? NaN : balanceValue[r]!;
    if (value === value && Number.isNaN(balance[k]!)) {
      const right = balanceRight![r] === 1;
      // 0xFF (127 with the side bit) is the invalid value; a share above 100 % is not a share.
      if (value >= 0 && value <= 100) {
        balance[k] = right ? value : -1 - value; // negative marks "side unknown" until the side is settled
        if (right) rightCount++;
        else unknownCount++;
      }
    }
  }
  return { t0, m, rightCount, unknownCount };
}

/**
 * Seconds from the first timestamp into `time`, when every timestamp is a number later than the one
 * before (and there is at least one); false otherwise (then `time` is left for {@link mergeRecords}).
 * Small loops in functions of their own: each runs once per import, mostly before the JIT is warm.
 */
function timeAxis(stamps: Float64Array, time: Float64Array): boolean {
  const n = stamps.length;
  const t0 = stamps[0]!;
  if (n === 0 || Number.isNaN(t0)) return false;
  let previous = -Infinity;
  for (let r = 0; r < n; r++) {
    const ms = stamps[r]!;
    if (!(ms > previous)) return false;
    time[r] = (ms - t0) / 1000;
    previous = ms;
  }
  return true;
}

/**
 * Balance shares into `balance` (record r = sample r): the share where the side is "right", -1 - share
 * where it is not stated (settled later), NaN where absent or not a share; with the count of each.
 */
function signedBalance(values: Float64Array, right: Uint8Array, balance: Float64Array): { rightCount: number; unknownCount: number } {
  let rightCount = 0;
  let unknownCount = 0;
  for (let r = 0; r < values.length; r++) {
    const value = values[r]!;
    // 0xFF (127 with the side bit) is the invalid value; a share above 100 % is not a share.
    if (!(value >= 0 && value <= 100)) continue;
    if (right[r] === 1) {
      balance[r] = value;
      rightCount++;
    } else {
      balance[r] = -1 - value;
      unknownCount++;
    }
  }
  return { rightCount, unknownCount };
}

// Spacings up to this many whole seconds are counted one by one; longer ones (pauses) together.
const MAX_COUNTED_STEP_S = 64;

/**
 * {@link sampleInterval} for the usual FIT axis, whose steps are whole seconds (FIT timestamps
 * are whole seconds): the same answer (most common step, the shorter on a tie) from a count per
 * step in a typed array instead of a Map entry per distinct step. undefined (ask sampleInterval)
 * when some step is not a whole number of seconds, when the long steps together are as common
 * as the winner (one of them might be the answer), or for fewer than two samples.
 */
function wholeSecondInterval(time: Float64Array): number | undefined {
  if (time.length < 2) return undefined;
  const counts = new Int32Array(MAX_COUNTED_STEP_S + 1);
  let long = 0;
  for (let i = 1; i < time.length; i++) {
    const step = time[i]! - time[i - 1]!;
    // (step | 0) === step holds only for whole numbers in int32 range (never for NaN).
    if ((step | 0) !== step || step < 1) return undefined;
    if (step > MAX_COUNTED_STEP_S) long++;
    else counts[step]++;
  }
  let best = 1;
  for (let step = 2; step <= MAX_COUNTED_STEP_S; step++) if (counts[step]! > counts[best]!) best = step;
  return long < counts[best]! ? best : undefined;
}

/**
 * Stores a field's value (NaN: absent) in column `f` (made, all NaN, on the field's first value)
 * unless the sample already has a value (a merged repeat fills gaps only).
 */
function take(cols: (Float64Array | undefined)[], f: number, n: number, k: number, v: number): void {
  if (v !== v) return;
  let col = cols[f];
  if (col === undefined) {
    col = new Float64Array(n).fill(NaN);
    cols[f] = col;
  }
  if (col[k] === col[k]) return;
  col[k] = v;
}

function settleBalance(balance: Float64Array, m: number, rightCount: number, unknownCount: number, fileName: string, warnings: EngineWarning[]): BalanceSide {
  if (rightCount + unknownCount === 0) return 'none';
  const side: BalanceSide = rightCount > 0 ? 'right' : 'unknown';
  for (let k = 0; k < m; k++) {
    const b = balance[k]!;
    if (b < 0) balance[k] = side === 'right' ? NaN : -1 - b;
  }
  if (rightCount > 0 && unknownCount > 0) {
    warnings.push({
      code: 'balance_side_mixed',
      message: `${fileName}: ${unknownCount} records give left_right_balance without the "right" bit while ${rightCount} set it; those ${unknownCount} balance values were left out (side unknown).`,
      where: { file: fileName, field: 'left_right_balance' },
    });
  }
  return side;
}

/** Record numbers of each kind of timestamp problem, in file order. */
interface TimeIssues {
  repeated: number[];
  backwards: number[];
  untimed: number[];
  jumps: number[];
}

function reportTimeIssues(issues: TimeIssues, fileName: string, warnings: EngineWarning[], recordBytes: (k: number) => number | undefined): void {
  const say = (code: string, list: number[], what: string): void => {
    if (list.length === 0) return;
    const first = list[0]!;
    const byte = recordBytes(first);
    const at = byte === undefined ? `record ${first}` : `record ${first} (byte ${byte})`;
    warnings.push({
      code,
      message: `${fileName}: ${list.length} record${list.length > 1 ? 's' : ''} ${what}, first at ${at}.`,
      where: { file: fileName, record: first, field: 'timestamp', ...(byte !== undefined && { byte }) },
    });
  };
  say('fit_repeated_timestamp', issues.repeated, 'repeat the previous timestamp and were merged into it (missing fields filled, existing values kept)');
  say('fit_backward_timestamp', issues.backwards, 'have a timestamp earlier than the one before and were dropped');
  say('fit_missing_timestamp', issues.untimed, 'have no timestamp and were dropped');
  say('fit_timestamp_jump', issues.jumps, 'jump ahead of the records around them and were dropped');
}
