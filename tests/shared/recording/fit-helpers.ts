import { Encoder, Profile, type EventMesg, type FileIdMesg, type RecordMesg } from '@garmin/fitsdk';
import { fitCrc } from '../../../shared/recording/fit-crc.js';

/** FIT seconds of a Unix ms time. 631065600 s = 1989-12-31T00:00:00Z (FIT SDK utils.js FIT_EPOCH_MS). */
export const fitSeconds = (ms: number): number => ms / 1000 - 631065600;

/** A tiny hand-made FIT activity: the given records and events, in the order given. */
export function handmadeFit(messages: ({ record: RecordMesg } | { event: EventMesg })[], fileId: FileIdMesg = { type: 'activity', manufacturer: 255, product: 5, serialNumber: 77 }): Uint8Array {
  const encoder = new Encoder();
  encoder.writeMesg({ mesgNum: Profile.MesgNum.FILE_ID!, ...fileId });
  for (const m of messages) {
    if ('record' in m) encoder.writeMesg({ mesgNum: Profile.MesgNum.RECORD!, ...m.record });
    else encoder.writeMesg({ mesgNum: Profile.MesgNum.EVENT!, ...m.event });
  }
  return encoder.close();
}

/** `count` records one second apart from `startMs`, with fields from `fill(i)`. */
export function records(count: number, startMs: number, fill: (i: number) => RecordMesg = (i) => ({ power: 200 + i })): { record: RecordMesg }[] {
  return Array.from({ length: count }, (_, i) => ({ record: { timestamp: fitSeconds(startMs) + i, ...fill(i) } }));
}

/** A definition message of a hand-built FIT file: fields as [number, size, base type byte]; developer fields as [number, size, developer data index]. */
export interface RawDefinition {
  local: number;
  global: number;
  fields: [num: number, size: number, base: number][];
  dev?: [num: number, size: number, index: number][];
  bigEndian?: boolean;
}

/** A data message: its content bytes, with a normal header, a compressed timestamp header (`compressed` = the 5-bit offset) or a header byte given outright. */
export interface RawData {
  local: number;
  bytes: number[];
  compressed?: number;
  header?: number;
}

/**
 * A FIT file built byte by byte (FIT protocol: 14-byte header, definition and data messages, CRC),
 * for what the SDK's Encoder never writes: compressed timestamp headers, developer fields, odd
 * base types and sizes, reserved header bits.
 */
export function rawFit(messages: ({ def: RawDefinition } | { data: RawData })[]): Uint8Array {
  const body: number[] = [];
  for (const m of messages) {
    if ('def' in m) {
      const { local, global, fields, dev = [], bigEndian = false } = m.def;
      body.push(0x40 | (dev.length > 0 ? 0x20 : 0) | local, 0, bigEndian ? 1 : 0, ...u16(global, bigEndian), fields.length);
      for (const f of fields) body.push(...f);
      if (dev.length > 0) {
        body.push(dev.length);
        for (const f of dev) body.push(...f);
      }
    } else {
      const { local, bytes, compressed, header } = m.data;
      body.push(header ?? (compressed === undefined ? local : 0x80 | (local << 5) | compressed), ...bytes);
    }
  }
  const out = new Uint8Array(14 + body.length + 2);
  out.set([14, 0x20, 0x08, 0x52, ...u32(body.length), 0x2e, 0x46, 0x49, 0x54, 0, 0]);
  out.set(body, 14);
  const crc = fitCrc(out, 0, 14 + body.length);
  out[14 + body.length] = crc & 255;
  out[15 + body.length] = crc >>> 8;
  return out;
}

/** Little-endian (or big-endian) bytes of a uint16 / uint32. */
export const u16 = (v: number, bigEndian = false): number[] => (bigEndian ? [(v >>> 8) & 255, v & 255] : [v & 255, (v >>> 8) & 255]);
export const u32 = (v: number, bigEndian = false): number[] => {
  const le = [v & 255, (v >>> 8) & 255, (v >>> 16) & 255, (v >>> 24) & 255];
  return bigEndian ? le.reverse() : le;
};
/** A text field of `size` bytes, zero-padded. */
export const text = (s: string, size: number): number[] => Array.from({ length: size }, (_, i) => (i < s.length ? s.charCodeAt(i) : 0));
