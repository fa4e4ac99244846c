/** Where the messages of a FIT file start, found from record headers and definitions alone. */
export interface FitFrames {
  /** Byte offset of every data message, in file order. */
  dataStarts: number[];
  /** Global message number of every data message (same order). */
  dataGlobals: number[];
  /** Byte just after the last complete message. */
  end: number;
  /** Manufacturer and product numbers of the first file_id message (the parser turns them into names). */
  fileId?: { manufacturerId?: number; productId?: number };
  /** Why framing stopped before `dataEnd`, with the byte where it stopped. */
  failure?: { byte: number; reason: string };
}

/**
 * Walks the record headers of a FIT file between `headerSize` and `dataEnd` without decoding field
 * values, so a damaged or cut file can be read up to its last complete message, and a problem
 * can be placed at a byte and a record number.
 */
export function frameFit(bytes: Uint8Array, headerSize: number, dataEnd: number): FitFrames {
  const sizes = new Map<number, { size: number; global: number; fieldsAt: number; fields: number; littleEndian: boolean }>();
  let fileId: FitFrames['fileId'];
  const dataStarts: number[] = [];
  const dataGlobals: number[] = [];
  let at = headerSize;
  const stop = (reason: string): FitFrames => ({ dataStarts, dataGlobals, end: at, ...(fileId && { fileId }), failure: { byte: at, reason } });
  while (at < dataEnd) {
    const header = bytes[at]!;
    const compressed = (header & 0x80) !== 0;
    const local = compressed ? (header >>> 5) & 0x03 : header & 0x0f;
    if (!compressed && (header & 0x40) !== 0) {
      if (at + 6 > dataEnd) return stop('a message definition is cut short');
      const littleEndian = bytes[at + 2] === 0;
      const global = littleEndian ? bytes[at + 3]! | (bytes[at + 4]! << 8) : (bytes[at + 3]! << 8) | bytes[at + 4]!;
      const fields = bytes[at + 5]!;
      let next = at + 6 + fields * 3;
      if (next > dataEnd) return stop('a message definition is cut short');
      let size = 0;
      for (let f = 0; f < fields; f++) size += bytes[at + 6 + f * 3 + 1]!;
      if ((header & 0x20) !== 0) {
        if (next + 1 > dataEnd) return stop('a developer field definition is cut short');
        const devFields = bytes[next]!;
        const devEnd = next + 1 + devFields * 3;
        if (devEnd > dataEnd) return stop('a developer field definition is cut short');
        for (let f = 0; f < devFields; f++) size += bytes[next + 1 + f * 3 + 1]!;
        next = devEnd;
      }
      sizes.set(local, { size, global, fieldsAt: at + 6, fields, littleEndian });
      at = next;
      continue;
    }
    const def = sizes.get(local);
    if (!def) return stop(`a data message uses local type ${local}, which was never defined`);
    if (at + 1 + def.size > dataEnd) return stop('a data message is cut short');
    if (def.global === FILE_ID && !fileId) fileId = readFileIdNumbers(bytes, def, at + 1);
    dataStarts.push(at);
    dataGlobals.push(def.global);
    at += 1 + def.size;
  }
  return { dataStarts, dataGlobals, end: at, ...(fileId && { fileId }) };
}

const FILE_ID = 0;

/** file_id field 1 = manufacturer (uint16), field 2 = product (uint16), per the FIT profile. */
function readFileIdNumbers(bytes: Uint8Array, def: { fieldsAt: number; fields: number; littleEndian: boolean }, dataAt: number): FitFrames['fileId'] {
  const out: NonNullable<FitFrames['fileId']> = {};
  let offset = dataAt;
  for (let f = 0; f < def.fields; f++) {
    const num = bytes[def.fieldsAt + f * 3]!;
    const size = bytes[def.fieldsAt + f * 3 + 1]!;
    if ((num === 1 || num === 2) && size === 2) {
      const v = def.littleEndian ? bytes[offset]! | (bytes[offset + 1]! << 8) : (bytes[offset]! << 8) | bytes[offset + 1]!;
      if (v !== 0xffff) out[num === 1 ? 'manufacturerId' : 'productId'] = v;
    }
    offset += size;
  }
  return out;
}
