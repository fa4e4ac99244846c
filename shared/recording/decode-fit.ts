import { getFitManufacturerName } from 'fit-file-parser/profile';
import type { FitParsedMessage } from './fit-events.js';
import { RECORD_VALUE_FIELDS, type FitRecordColumns, type ParsedFitLike } from './fit-to-recording.js';
import type { FitFrames } from './frame-fit.js';

/** What {@link decodeFit} read: the record columns and the other messages a recording uses. */
export interface DecodedFit {
  records: FitRecordColumns;
  /** file_id, device_info, file_creator, event and lap messages, shaped as fit-file-parser gives them. */
  parsed: ParsedFitLike;
}

// Global message numbers (FIT profile).
const FILE_ID = 0;
const LAP = 19;
const RECORD = 20;
const EVENT = 21;
const DEVICE_INFO = 23;
const FILE_CREATOR = 49;
const FIELD_DESCRIPTION = 206;
const TIMESTAMP = 253;
/** 1989-12-31T00:00:00Z, the FIT epoch, in Unix ms. */
const FIT_EPOCH_MS = 631065600000;

// Base type bytes (FIT profile fit_base_type).
const ENUM = 0x00;
const UINT8 = 0x02;
const STRING = 0x07;
const UINT8Z = 0x0a;
const BYTE = 0x0d;
const UINT16 = 0x84;
const UINT32 = 0x86;
const UINT32Z = 0x8c;
const INVALID_UINT32 = 0xffffffff;

/** Bytes of a base type this decoder reads (0: string). */
function widthOf(base: number): number {
  return base === UINT16 ? 2 : base === UINT32 || base === UINT32Z ? 4 : base === STRING ? 0 : 1;
}

/** The invalid value of a base type this decoder reads (the z types: 0). */
function invalidOf(base: number): number {
  return base === UINT8Z || base === UINT32Z ? 0 : base === UINT16 ? 0xffff : base === UINT32 ? INVALID_UINT32 : 0xff;
}

/**
 * Whether fit-file-parser reads a field whose profile base type is `profile` under its profile
 * name when the file declares `wire`: the same type, or enum, uint8 and byte for one another.
 * Any other declared type leaves the field nameless there (absent from its output), so here too.
 */
function readsAs(profile: number, wire: number): boolean {
  const u8 = (b: number): boolean => b === ENUM || b === UINT8 || b === BYTE;
  return wire === profile || (u8(profile) && u8(wire));
}

// ---- record fields, read into typed-array columns ----

// Record field number -> slot: 0-7 RECORD_VALUE_FIELDS, 8 enhanced_speed, 9 left_right_balance.
const ENHANCED_SPEED = 8;
const BALANCE = 9;
const SLOTS = 10;
const SLOT_OF_FIELD = new Int8Array(256).fill(-1);
SLOT_OF_FIELD[7] = 0; // power, uint16
SLOT_OF_FIELD[4] = 1; // cadence, uint8
SLOT_OF_FIELD[6] = 2; // speed, uint16, scale 1000 (m/s)
SLOT_OF_FIELD[3] = 3; // heart_rate, uint8
SLOT_OF_FIELD[43] = 4; // left_torque_effectiveness, uint8, scale 2
SLOT_OF_FIELD[44] = 5; // right_torque_effectiveness, uint8, scale 2
SLOT_OF_FIELD[45] = 6; // left_pedal_smoothness, uint8, scale 2
SLOT_OF_FIELD[46] = 7; // right_pedal_smoothness, uint8, scale 2
SLOT_OF_FIELD[73] = ENHANCED_SPEED; // enhanced_speed, uint32, scale 1000
SLOT_OF_FIELD[30] = BALANCE; // left_right_balance, uint8: bits 0-6 percent, bit 7 right
const SLOT_BASE = Uint8Array.of(UINT16, UINT8, UINT16, UINT8, UINT8, UINT8, UINT8, UINT8, UINT32, UINT8);
const SLOT_SCALE = Float64Array.of(1, 1, 1000, 1, 2, 2, 2, 2, 1000, 1);

/** Record field names the columns come from: a developer field by one of these names would replace it in fit-file-parser. */
const RECORD_FIELD_NAMES: ReadonlySet<string> = new Set(['timestamp', ...RECORD_VALUE_FIELDS, 'enhanced_speed', 'left_right_balance']);

// ---- the other messages a recording uses, read into fit-file-parser's shape ----

type Format = 'number' | 'date' | 'string' | 'manufacturer' | 'event' | 'event_type' | 'device_index';

interface FieldSpec {
  name: string;
  /** Base type byte of the profile. */
  base: number;
  format: Format;
  scale: number;
}

const spec = (name: string, base: number, format: Format = 'number', scale = 1): FieldSpec => ({ name, base, format, scale });

/** Per global message number, the fields read (FIT profile numbers, types and scales). */
const MESSAGE_FIELDS = new Map<number, ReadonlyMap<number, FieldSpec>>([
  [
    FILE_ID,
    new Map([
      [1, spec('manufacturer', UINT16, 'manufacturer')],
      [2, spec('product', UINT16)],
      [3, spec('serial_number', UINT32Z)],
      [8, spec('product_name', STRING, 'string')],
    ]),
  ],
  [
    DEVICE_INFO,
    new Map([
      [0, spec('device_index', UINT8, 'device_index')],
      [2, spec('manufacturer', UINT16, 'manufacturer')],
      [3, spec('serial_number', UINT32Z)],
      [5, spec('software_version', UINT16, 'number', 100)],
      [27, spec('product_name', STRING, 'string')],
    ]),
  ],
  [FILE_CREATOR, new Map([[0, spec('software_version', UINT16)]])],
  [
    EVENT,
    new Map([
      [TIMESTAMP, spec('timestamp', UINT32, 'date')],
      [0, spec('event', ENUM, 'event')],
      [1, spec('event_type', ENUM, 'event_type')],
      [3, spec('data', UINT32)],
      [9, spec('front_gear_num', UINT8Z)],
      [10, spec('front_gear', UINT8Z)],
      [11, spec('rear_gear_num', UINT8Z)],
      [12, spec('rear_gear', UINT8Z)],
    ]),
  ],
  [
    LAP,
    new Map([
      [TIMESTAMP, spec('timestamp', UINT32, 'date')],
      [2, spec('start_time', UINT32, 'date')],
      [7, spec('total_elapsed_time', UINT32, 'number', 1000)],
    ]),
  ],
  [FIELD_DESCRIPTION, new Map([[3, spec('field_name', STRING, 'string')]])],
]);

// FIT profile types event, event_type and device_index: value -> name (unlisted values stay numbers).
const EVENT_NAMES: Readonly<Record<number, string>> = {
  0: 'timer', 3: 'workout', 4: 'workout_step', 5: 'power_down', 6: 'power_up', 7: 'off_course', 8: 'session', 9: 'lap', 10: 'course_point',
  11: 'battery', 12: 'virtual_partner_pace', 13: 'hr_high_alert', 14: 'hr_low_alert', 15: 'speed_high_alert', 16: 'speed_low_alert',
  17: 'cad_high_alert', 18: 'cad_low_alert', 19: 'power_high_alert', 20: 'power_low_alert', 21: 'recovery_hr', 22: 'battery_low',
  23: 'time_duration_alert', 24: 'distance_duration_alert', 25: 'calorie_duration_alert', 26: 'activity', 27: 'fitness_equipment',
  28: 'length', 32: 'user_marker', 33: 'sport_point', 36: 'calibration', 42: 'front_gear_change', 43: 'rear_gear_change',
  44: 'rider_position_change', 45: 'elev_high_alert', 46: 'elev_low_alert', 47: 'comm_timeout', 54: 'auto_activity_detect',
  56: 'dive_alert', 57: 'dive_gas_switched', 71: 'tank_pressure_reserve', 72: 'tank_pressure_critical', 73: 'tank_lost',
  75: 'radar_threat_alert', 76: 'tank_battery_low', 81: 'tank_pod_connected', 82: 'tank_pod_disconnected',
};
const EVENT_TYPE_NAMES: Readonly<Record<number, string>> = {
  0: 'start', 1: 'stop', 2: 'consecutive_depreciated', 3: 'marker', 4: 'stop_all', 5: 'begin_depreciated', 6: 'end_depreciated',
  7: 'end_all_depreciated', 8: 'stop_disable', 9: 'stop_disable_all',
};
const DEVICE_INDEX_NAMES: Readonly<Record<number, string>> = { 0: 'creator' };

function format(raw: number, field: FieldSpec): unknown {
  switch (field.format) {
    case 'date':
      return new Date(raw * 1000 + FIT_EPOCH_MS);
    case 'manufacturer':
      return getFitManufacturerName(raw) ?? raw;
    case 'event':
      return EVENT_NAMES[raw] ?? raw;
    case 'event_type':
      return EVENT_TYPE_NAMES[raw] ?? raw;
    case 'device_index':
      return DEVICE_INDEX_NAMES[raw] ?? raw;
    default:
      return field.scale === 1 ? raw : raw / field.scale;
  }
}

/** The fields of one definition message, as the decoder reads them. */
interface Layout {
  littleEndian: boolean;
  global: number;
  /** Offsets (from the content start, after the header byte) of the timestamp fields, in field order. */
  timestampAt: number[];
  /** False when a timestamp field is not a plain 4-byte uint32 (the decoder declines). */
  plainTimestamps: boolean;
  hasDeveloperFields: boolean;
  /** Record fields: content offset and slot, for fields fit-file-parser reads under their names. */
  slotAt: number[];
  slot: number[];
  /** Fields of the other messages read: content offset, size, declared base type and spec. */
  fieldAt: number[];
  fieldSize: number[];
  fieldBase: number[];
  field: FieldSpec[];
}

function readLayout(bytes: Uint8Array, at: number): Layout {
  const littleEndian = bytes[at + 2] === 0;
  const global = littleEndian ? bytes[at + 3]! | (bytes[at + 4]! << 8) : (bytes[at + 3]! << 8) | bytes[at + 4]!;
  const count = bytes[at + 5]!;
  const specs = MESSAGE_FIELDS.get(global);
  const layout: Layout = {
    littleEndian, global, timestampAt: [], plainTimestamps: true, hasDeveloperFields: false, slotAt: [], slot: [], fieldAt: [], fieldSize: [], fieldBase: [], field: [],
  };
  let offset = 0;
  for (let f = 0; f < count; f++) {
    const num = bytes[at + 6 + f * 3]!;
    const size = bytes[at + 7 + f * 3]!;
    const wire = bytes[at + 8 + f * 3]!;
    if (num === TIMESTAMP) {
      layout.timestampAt.push(offset);
      if (wire !== UINT32 || size !== 4) layout.plainTimestamps = false;
    }
    if (global === RECORD) {
      const slot = num === TIMESTAMP ? -1 : SLOT_OF_FIELD[num]!;
      const width = slot < 0 ? 0 : widthOf(SLOT_BASE[slot]!);
      // A field narrower than its type, or not a whole number of elements, reads as invalid: left out.
      if (slot >= 0 && readsAs(SLOT_BASE[slot]!, wire) && size >= width && size % width === 0) {
        layout.slotAt.push(offset);
        layout.slot.push(slot);
      }
    } else {
      const field = specs?.get(num);
      const width = field ? widthOf(field.base) : 0;
      if (field && readsAs(field.base, wire) && (width === 0 || (size >= width && size % width === 0))) {
        layout.fieldAt.push(offset);
        layout.fieldSize.push(size);
        layout.fieldBase.push(wire);
        layout.field.push(field);
      }
    }
    offset += size;
  }
  layout.hasDeveloperFields = (bytes[at]! & 0x20) !== 0 && bytes[at + 6 + count * 3]! > 0;
  return layout;
}

/**
 * Reads a framed FIT file without fit-file-parser: the record messages straight from the bytes
 * into typed-array columns (timestamp, also from compressed timestamp headers; power, cadence,
 * speed and enhanced_speed, heart_rate, left_right_balance, torque effectiveness, pedal
 * smoothness), and file_id, device_info, file_creator, event and lap into objects shaped like
 * fit-file-parser 6's output (mode 'list'), with the same values: its field names, scales, enum
 * and manufacturer names (from its own profile tables), invalid values left out, and fields
 * declared with a base type it does not read under the profile's name left out too.
 *
 * Returns undefined wherever fit-file-parser behaves in a way this decoder does not reproduce, so
 * the caller has fit-file-parser read the whole file: a data message with reserved header bits
 * set (it throws), a timestamp field that is not a 4-byte uint32, a compressed timestamp header
 * on anything but a record or on a message that also has a timestamp field, a compressed timestamp
 * past the uint32 range (it throws), developer fields on the messages above other than records,
 * a developer field named like a record field read here (it would replace that field), or a text
 * field with bytes outside ASCII.
 *
 * @example const decoded = decodeFit(bytes, frameFit(bytes, 14, end)); // undefined: use fit-file-parser
 */
export function decodeFit(bytes: Uint8Array, frames: FitFrames): DecodedFit | undefined {
  const { dataStarts, dataGlobals, dataDefs } = frames;
  let count = 0;
  for (let i = 0; i < dataGlobals.length; i++) if (dataGlobals[i] === RECORD) count++;
  const layouts = new Map<number, Layout>();
  const scan: Scan = { ms: new Float64Array(count).fill(NaN), recordAt: new Int32Array(count), recordDef: new Int32Array(count), others: [] };
  if (!scanMessages(bytes, dataStarts, dataDefs, layouts, scan)) return undefined;
  const parsed = readOtherMessages(bytes, dataStarts, dataDefs, scan.others, layouts);
  if (parsed === undefined) return undefined;
  const recordLayouts = [...layouts].filter(([, l]) => l.global === RECORD);
  const names = parsed.field_descriptions!;
  if (recordLayouts.some(([, l]) => l.hasDeveloperFields) && names.some((d) => RECORD_FIELD_NAMES.has(d.field_name as string))) return undefined;
  const slots: (Float64Array | undefined)[] = new Array<Float64Array | undefined>(SLOTS).fill(undefined);
  for (const [defAt, l] of recordLayouts) {
    const only = recordLayouts.length === 1 ? undefined : scan.recordDef;
    // In field order, so of a field repeated in one definition the last valid copy wins.
    for (let f = 0; f < l.slotAt.length; f++) {
      const slot = l.slot[f]!;
      const at = l.slotAt[f]!;
      // Direct calls (not through a variable) keep each call site to one target.
      if (SLOT_BASE[slot] === UINT16) slots[slot] = readUint16Column(bytes, scan.recordAt, only, defAt, at, l.littleEndian, SLOT_SCALE[slot]!, slots[slot]);
      else if (SLOT_BASE[slot] === UINT32) slots[slot] = readUint32Column(bytes, scan.recordAt, only, defAt, at, l.littleEndian, SLOT_SCALE[slot]!, slots[slot]);
      else slots[slot] = readUint8Column(bytes, scan.recordAt, only, defAt, at, SLOT_SCALE[slot]!, slots[slot]);
    }
  }
  return { records: recordColumns(slots, scan.ms, count), parsed };
}

/** The layout of the definition at `defAt`, read once per file. */
function layoutOf(layouts: Map<number, Layout>, bytes: Uint8Array, defAt: number): Layout {
  let layout = layouts.get(defAt);
  if (layout === undefined) {
    layout = readLayout(bytes, defAt);
    layouts.set(defAt, layout);
  }
  return layout;
}

/** What {@link scanMessages} fills: per record its timestamp, content offset and definition; the other messages wanted. */
interface Scan {
  ms: Float64Array;
  recordAt: Int32Array;
  recordDef: Int32Array;
  /** Indexes (in the frames) of file_id, device_info, file_creator, event, lap and field_description messages. */
  others: number[];
}

/**
 * One pass over the data messages: timestamps (compressed headers from the last timestamp of any
 * message, as fit-file-parser keeps it) and where each record starts. False: decline the file.
 * Kept small, as it runs once per message before the JIT has warmed up.
 */
function scanMessages(bytes: Uint8Array, dataStarts: Int32Array, dataDefs: Int32Array, layouts: Map<number, Layout>, scan: Scan): boolean {
  const { ms, recordAt, recordDef, others } = scan;
  let last = -1; // the last timestamp, -1: none
  let r = 0;
  let defAt = -1;
  let stamps: number[] = [];
  let littleEndian = true;
  let isRecord = false;
  let wanted = false;
  for (let i = 0; i < dataStarts.length; i++) {
    if (dataDefs[i] !== defAt) {
      defAt = dataDefs[i]!;
      const layout = layoutOf(layouts, bytes, defAt);
      if (!layout.plainTimestamps) return false;
      stamps = layout.timestampAt;
      littleEndian = layout.littleEndian;
      isRecord = layout.global === RECORD;
      wanted = MESSAGE_FIELDS.has(layout.global);
    }
    const at = dataStarts[i]!;
    const header = bytes[at]!;
    let stamp = -1;
    if (header >= 0x80) {
      if (!isRecord || stamps.length > 0) return false;
      if (last >= 0) {
        const offset = header & 0x1f;
        const previous = last & 0x1f;
        const t = last - previous + offset + (offset < previous ? 0x20 : 0);
        if (t >= INVALID_UINT32) return false;
        last = t;
        stamp = t;
      }
    } else {
      if ((header & 0x30) !== 0) return false;
      for (let s = 0; s < stamps.length; s++) {
        const v = readUint32(bytes, at + 1 + stamps[s]!, littleEndian);
        // An invalid timestamp forgets the last one (a later compressed header then has none).
        last = v === INVALID_UINT32 ? -1 : v;
        if (last >= 0) stamp = v;
      }
    }
    if (isRecord) {
      if (stamp >= 0) ms[r] = stamp * 1000 + FIT_EPOCH_MS;
      recordAt[r] = at + 1;
      recordDef[r++] = defAt;
    } else if (wanted) {
      others.push(i);
    }
  }
  return true;
}

function readUint32(bytes: Uint8Array, p: number, littleEndian: boolean): number {
  return (littleEndian ? bytes[p]! | (bytes[p + 1]! << 8) | (bytes[p + 2]! << 16) | (bytes[p + 3]! << 24) : (bytes[p]! << 24) | (bytes[p + 1]! << 16) | (bytes[p + 2]! << 8) | bytes[p + 3]!) >>> 0;
}

/** file_id, device_info, file_creator, event, lap and field_description messages in fit-file-parser's shape; undefined: decline. */
function readOtherMessages(bytes: Uint8Array, dataStarts: Int32Array, dataDefs: Int32Array, others: readonly number[], layouts: Map<number, Layout>): ParsedFitLike | undefined {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const lists = new Map<number, FitParsedMessage[]>([FILE_ID, DEVICE_INFO, FILE_CREATOR, EVENT, LAP, FIELD_DESCRIPTION].map((g) => [g, []]));
  for (const i of others) {
    const layout = layoutOf(layouts, bytes, dataDefs[i]!);
    if (layout.hasDeveloperFields) return undefined;
    const message = readMessage(bytes, view, dataStarts[i]! + 1, layout);
    if (message === undefined) return undefined;
    lists.get(layout.global)!.push(message);
  }
  const creators = lists.get(FILE_CREATOR)!;
  return {
    file_ids: lists.get(FILE_ID)!,
    device_infos: lists.get(DEVICE_INFO)!,
    events: lists.get(EVENT)!,
    laps: lists.get(LAP)!,
    field_descriptions: lists.get(FIELD_DESCRIPTION)!,
    // fit-file-parser keeps the last file_creator message.
    ...(creators.length > 0 && { file_creator: creators[creators.length - 1]! }),
  };
}

/**
 * A record field of one byte (uint8, enum, byte) into its slot's column, for the records that use
 * the definition at `defAt` (every record when `recordDef` is undefined): the column is made, all
 * NaN, on the first valid value. A field longer than its type (an array) is read as its first
 * element, as fit-file-parser does. One function per width keeps each loop small and monomorphic.
 */
function readUint8Column(bytes: Uint8Array, recordAt: Int32Array, recordDef: Int32Array | undefined, defAt: number, offset: number, scale: number, col: Float64Array | undefined): Float64Array | undefined {
  for (let r = 0; r < recordAt.length; r++) {
    if (recordDef !== undefined && recordDef[r] !== defAt) continue;
    const raw = bytes[recordAt[r]! + offset]!;
    if (raw === 0xff) continue;
    col ??= new Float64Array(recordAt.length).fill(NaN);
    col[r] = raw / scale;
  }
  return col;
}

/** {@link readUint8Column} for uint16 fields. */
function readUint16Column(bytes: Uint8Array, recordAt: Int32Array, recordDef: Int32Array | undefined, defAt: number, offset: number, le: boolean, scale: number, col: Float64Array | undefined): Float64Array | undefined {
  const lo = le ? 0 : 1;
  for (let r = 0; r < recordAt.length; r++) {
    if (recordDef !== undefined && recordDef[r] !== defAt) continue;
    const p = recordAt[r]! + offset;
    const raw = bytes[p + lo]! | (bytes[p + 1 - lo]! << 8);
    if (raw === 0xffff) continue;
    col ??= new Float64Array(recordAt.length).fill(NaN);
    col[r] = raw / scale;
  }
  return col;
}

/** {@link readUint8Column} for uint32 fields. */
function readUint32Column(bytes: Uint8Array, recordAt: Int32Array, recordDef: Int32Array | undefined, defAt: number, offset: number, le: boolean, scale: number, col: Float64Array | undefined): Float64Array | undefined {
  for (let r = 0; r < recordAt.length; r++) {
    if (recordDef !== undefined && recordDef[r] !== defAt) continue;
    const raw = readUint32(bytes, recordAt[r]! + offset, le);
    if (raw === INVALID_UINT32) continue;
    col ??= new Float64Array(recordAt.length).fill(NaN);
    col[r] = raw / scale;
  }
  return col;
}

/** One message of the other kinds as an object; undefined (decline) for a text field with bytes outside ASCII. */
function readMessage(bytes: Uint8Array, view: DataView, content: number, layout: Layout): FitParsedMessage | undefined {
  const message: FitParsedMessage = {};
  const { fieldAt, fieldSize, fieldBase, field, littleEndian } = layout;
  for (let f = 0; f < fieldAt.length; f++) {
    const spec = field[f]!;
    const p = content + fieldAt[f]!;
    if (spec.format === 'string') {
      // fit-file-parser keeps every non-zero byte of the field and decodes them as UTF-8.
      let text = '';
      for (let b = p; b < p + fieldSize[f]!; b++) {
        const c = bytes[b]!;
        if (c >= 0x80) return undefined;
        if (c !== 0) text += String.fromCharCode(c);
      }
      message[spec.name] = text;
      continue;
    }
    const width = widthOf(spec.base);
    const raw = width === 1 ? bytes[p]! : width === 2 ? view.getUint16(p, littleEndian) : view.getUint32(p, littleEndian);
    if (raw === invalidOf(fieldBase[f]!)) continue;
    message[spec.name] = format(raw, spec);
  }
  return message;
}

/** The slots as {@link FitRecordColumns}: speed falls back to enhanced_speed, balance split into share and side. */
function recordColumns(slots: (Float64Array | undefined)[], ms: Float64Array, count: number): FitRecordColumns {
  const values = slots.slice(0, RECORD_VALUE_FIELDS.length);
  const enhanced = slots[ENHANCED_SPEED];
  if (enhanced) {
    const speed = values[2];
    if (speed === undefined) values[2] = enhanced;
    else for (let k = 0; k < count; k++) if (Number.isNaN(speed[k]!)) speed[k] = enhanced[k]!;
  }
  const columns: FitRecordColumns = { count, ms, values };
  const balance = slots[BALANCE];
  if (balance) {
    const right = new Uint8Array(count);
    for (let k = 0; k < count; k++) {
      const raw = balance[k]!;
      if (Number.isNaN(raw)) continue;
      right[k] = raw >= 0x80 ? 1 : 0;
      balance[k] = raw & 0x7f;
    }
    columns.balanceValue = balance;
    columns.balanceRight = right;
  }
  return columns;
}
