/** Where the messages of a FIT file start, found from record headers and definitions alone. */
export interface FitFrames {
  /** Byte offset of every complete data message, in file order. */
  dataStarts: Int32Array;
  /** Global message number of every data message (same order). */
  dataGlobals: Int32Array;
  /** Byte offset of the definition message each data message uses (same order). */
  dataDefs: Int32Array;
  /** Byte just after the last complete message. */
  end: number;
  /** Manufacturer and product numbers of the first file_id message (the parser turns them into names). */
  fileId?: { manufacturerId?: number; productId?: number };
  /** Why framing stopped before `dataEnd`, with the byte where it stopped. */
  failure?: { byte: number; reason: string };
}

const LOCAL_TYPES = 16;
// First guess of the bytes per data message (a 1 Hz record is ~10-20): the arrays double when it is wrong.
const GUESS_MESSAGE_BYTES = 8;

/**
 * Walks the record headers of a FIT file between `headerSize` and `dataEnd` without decoding field
 * values, so a damaged or cut file can be read up to its last complete message, and a problem
 * can be placed at a byte and a record number.
 */
export function frameFit(bytes: Uint8Array, headerSize: number, dataEnd: number): FitFrames {
  // Definitions by local type in flat arrays (no object per definition): size < 0 = never defined.
  const defSize = new Int32Array(LOCAL_TYPES).fill(-1);
  const defGlobal = new Int32Array(LOCAL_TYPES);
  const defFieldsAt = new Int32Array(LOCAL_TYPES);
  let fileId: FitFrames['fileId'];
  // Typed arrays sized from the byte count, doubled when full and cut to the count at the end.
  let dataStarts = new Int32Array(Math.max(16, Math.ceil((dataEnd - headerSize) / GUESS_MESSAGE_BYTES)));
  let dataGlobals = new Int32Array(dataStarts.length);
  let dataDefs = new Int32Array(dataStarts.length);
  let count = 0;
  let at = headerSize;
  let failure: FitFrames['failure'];
  while (at < dataEnd) {
    const header = bytes[at]!;
    const compressed = (header & 0x80) !== 0;
    const local = compressed ? (header >>> 5) & 0x03 : header & 0x0f;
    if (!compressed && (header & 0x40) !== 0) {
      const next = readDefinition(bytes, at, dataEnd, local, defSize, defGlobal, defFieldsAt);
      if (next < 0) {
        failure = { byte: at, reason: next === CUT_DEVELOPER ? 'a developer field definition is cut short' : 'a message definition is cut short' };
        break;
      }
      at = next;
      continue;
    }
    const size = defSize[local]!;
    if (size < 0) {
      failure = { byte: at, reason: `a data message uses local type ${local}, which was never defined` };
      break;
    }
    if (at + 1 + size > dataEnd) {
      failure = { byte: at, reason: 'a data message is cut short' };
      break;
    }
    const global = defGlobal[local]!;
    if (count === dataStarts.length) {
      dataStarts = grow(dataStarts);
      dataGlobals = grow(dataGlobals);
      dataDefs = grow(dataDefs);
    }
    if (global === FILE_ID && !fileId) fileId = readFileIdNumbers(bytes, defFieldsAt[local]!, at + 1);
    dataStarts[count] = at;
    dataDefs[count] = defFieldsAt[local]!;
    dataGlobals[count++] = global;
    at += 1 + size;
  }
  return {
    dataStarts: dataStarts.subarray(0, count),
    dataGlobals: dataGlobals.subarray(0, count),
    dataDefs: dataDefs.subarray(0, count),
    end: at,
    ...(fileId && { fileId }),
    ...(failure && { failure }),
  };
}

const FILE_ID = 0;
const CUT = -1;
const CUT_DEVELOPER = -2;

/**
 * Records the definition message at `at` for its local type (content size, global number, where it
 * is) and returns the byte after it, or {@link CUT} / {@link CUT_DEVELOPER} when it runs past `dataEnd`.
 * Apart from the framing loop, which runs once per message: definitions are few.
 */
function readDefinition(bytes: Uint8Array, at: number, dataEnd: number, local: number, defSize: Int32Array, defGlobal: Int32Array, defFieldsAt: Int32Array): number {
  if (at + 6 > dataEnd) return CUT;
  const littleEndian = bytes[at + 2] === 0;
  const global = littleEndian ? bytes[at + 3]! | (bytes[at + 4]! << 8) : (bytes[at + 3]! << 8) | bytes[at + 4]!;
  const fields = bytes[at + 5]!;
  let next = at + 6 + fields * 3;
  if (next > dataEnd) return CUT;
  let size = 0;
  for (let f = 0; f < fields; f++) size += bytes[at + 6 + f * 3 + 1]!;
  if ((bytes[at]! & 0x20) !== 0) {
    const devEnd = next + 1 > dataEnd ? Infinity : next + 1 + bytes[next]! * 3;
    if (devEnd > dataEnd) return CUT_DEVELOPER;
    for (let f = next + 1; f < devEnd; f += 3) size += bytes[f + 1]!;
    next = devEnd;
  }
  defSize[local] = size;
  defGlobal[local] = global;
  defFieldsAt[local] = at;
  return next;
}

function grow(a: Int32Array<ArrayBuffer>): Int32Array<ArrayBuffer> {
  const b = new Int32Array(a.length * 2);
  b.set(a);
  return b;
}

/** file_id field 1 = manufacturer (uint16), field 2 = product (uint16), per the FIT profile. `defAt` = its definition message. */
function readFileIdNumbers(bytes: Uint8Array, defAt: number, dataAt: number): FitFrames['fileId'] {
  const out: NonNullable<FitFrames['fileId']> = {};
  const littleEndian = bytes[defAt + 2] === 0;
  const fields = bytes[defAt + 5]!;
  let offset = dataAt;
  for (let f = 0; f < fields; f++) {
    const num = bytes[defAt + 6 + f * 3]!;
    const size = bytes[defAt + 6 + f * 3 + 1]!;
    if ((num === 1 || num === 2) && size === 2) {
      const v = littleEndian ? bytes[offset]! | (bytes[offset + 1]! << 8) : (bytes[offset]! << 8) | bytes[offset + 1]!;
      if (v !== 0xffff) out[num === 1 ? 'manufacturerId' : 'productId'] = v;
    }
    offset += size;
  }
  return out;
}
