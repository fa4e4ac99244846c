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
}

// Record fields copied as they are (fit-file-parser already applies scale: speed in m/s, percents),
// in the order the hot loop reads them.
const PLAIN_FIELDS: readonly (readonly [string, ColumnName])[] = [
  ['power', 'power'],
  ['cadence', 'cadence'],
  ['speed', 'speed'],
  ['heart_rate', 'heartRate'],
  ['left_torque_effectiveness', 'leftTorqueEffectiveness'],
  ['right_torque_effectiveness', 'rightTorqueEffectiveness'],
  ['left_pedal_smoothness', 'leftPedalSmoothness'],
  ['right_pedal_smoothness', 'rightPedalSmoothness'],
];

/**
 * Builds a {@link Recording} from parsed FIT messages. Samples keep their real timestamps (a gap
 * in time stays a gap); a record whose timestamp repeats the previous one is merged into it (its
 * fields fill the gaps of the first), one that goes backwards is dropped; both with a warning
 * naming the first record. Missing fields are NaN, never 0.
 */
export function fitToRecording(
  parsed: ParsedFitLike,
  fileName: string,
  warnings: EngineWarning[],
  recordBytes: (k: number) => number | undefined,
  fileIdNumbers?: { manufacturerId?: number; productId?: number },
): Recording {
  const records = parsed.records ?? [];
  const n = records.length;
  const time = new Float64Array(n);
  // A column is made when its field first appears: a file rarely has all eight.
  const cols: (Float64Array | undefined)[] = PLAIN_FIELDS.map(() => undefined);
  const balance = new Float64Array(n).fill(NaN);
  let rightCount = 0;
  let unknownCount = 0;
  const keptRecord = new Int32Array(n);
  const issues = { repeated: [] as number[], backwards: [] as number[], untimed: [] as number[], jumps: [] as number[] };
  let t0 = NaN;
  let last = -Infinity;
  let m = 0;
  for (let r = 0; r < n; r++) {
    const rec = records[r]!;
    const stamp = rec.timestamp;
    // fit-file-parser gives a Date; the generic helper covers numbers and anything else.
    const ms = stamp instanceof Date ? stamp.getTime() : timestampMs(stamp);
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
    // Named reads (not a loop over field names) keep the property loads monomorphic in this hot loop.
    const speed = rec.speed ?? rec.enhanced_speed;
    take(cols, 0, n, k, rec.power);
    take(cols, 1, n, k, rec.cadence);
    take(cols, 2, n, k, speed);
    take(cols, 3, n, k, rec.heart_rate);
    take(cols, 4, n, k, rec.left_torque_effectiveness);
    take(cols, 5, n, k, rec.right_torque_effectiveness);
    take(cols, 6, n, k, rec.left_pedal_smoothness);
    take(cols, 7, n, k, rec.right_pedal_smoothness);
    const lrb = rec.left_right_balance as { value?: unknown; right?: unknown } | number | undefined;
    if (lrb !== undefined && Number.isNaN(balance[k]!)) {
      const value = typeof lrb === 'number' ? lrb & 0x7f : Number(lrb.value);
      const right = typeof lrb === 'number' ? (lrb & 0x80) !== 0 : lrb.right === true;
      // 0xFF (127 with the side bit) is the invalid value; a share above 100 % is not a share.
      if (value >= 0 && value <= 100) {
        balance[k] = right ? value : -1 - value; // negative marks "side unknown" until the side is settled
        if (right) rightCount++;
        else unknownCount++;
      }
    }
  }
  reportTimeIssues(issues, fileName, warnings, recordBytes);
  const columns: RecordingColumns = {};
  PLAIN_FIELDS.forEach(([, name], f) => {
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
 * Stores a numeric field in column `f` (made, all NaN, on the field's first value) unless the
 * sample already has a value (a merged repeat fills gaps only).
 */
function take(cols: (Float64Array | undefined)[], f: number, n: number, k: number, v: unknown): void {
  if (typeof v !== 'number') return;
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

function reportTimeIssues(issues: { repeated: number[]; backwards: number[]; untimed: number[]; jumps: number[] }, fileName: string, warnings: EngineWarning[], recordBytes: (k: number) => number | undefined): void {
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
