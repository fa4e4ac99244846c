import { Decoder, Stream } from '@garmin/fitsdk';
import { getFitManufacturerName } from 'fit-file-parser/profile';
import { describe, expect, it } from 'vitest';
import { generateDemoFiles, listDemoScenarios } from '../../../shared/demo/index.js';
import { decodeFit } from '../../../shared/recording/decode-fit.js';
import { frameFit } from '../../../shared/recording/frame-fit.js';
import type { ImportResult } from '../../../shared/recording/import-result.js';
import { parseFit } from '../../../shared/recording/parse-fit.js';
import { generateFixtures } from '../../fixtures/generate.js';
import { fitSeconds, rawFit, text, u16, u32, type RawData, type RawDefinition } from './fit-helpers.js';

// Base type bytes (FIT profile fit_base_type).
const ENUM = 0x00;
const UINT8 = 0x02;
const STRING = 0x07;
const UINT8Z = 0x0a;
const BYTE = 0x0d;
const UINT16 = 0x84;
const UINT16Z = 0x8b;
const UINT32 = 0x86;
const UINT32Z = 0x8c;

/** Every FIT file the project ships or tests with: the fixtures and the demo lab's rides. */
const FIT_FILES: { name: string; bytes: Uint8Array }[] = [
  ...generateFixtures().filter((f) => f.name.endsWith('.fit')),
  ...listDemoScenarios().flatMap((s) => generateDemoFiles(s).filter((f) => f.format === 'fit').map((f) => ({ name: f.fileName, bytes: f.bytes }))),
];

function decode(bytes: Uint8Array): ReturnType<typeof decodeFit> {
  const headerSize = bytes[0]!;
  const dataSize = (bytes[4]! | (bytes[5]! << 8) | (bytes[6]! << 16) | (bytes[7]! << 24)) >>> 0;
  return decodeFit(bytes, frameFit(bytes, headerSize, Math.min(headerSize + dataSize, bytes.length)));
}

/** A result as text with NaN spelled out, so two results compare exactly (typed arrays, NaN, -0 as 0 aside). */
function canonical(result: ImportResult): string {
  return JSON.stringify(result, (_k, v: unknown) =>
    v instanceof Float64Array ? Array.from(v, (x) => (Number.isNaN(x) ? 'NaN' : x)) : typeof v === 'number' && !Number.isFinite(v) ? String(v) : v,
  );
}

/**
 * Reads `bytes` with the own decoder and with fit-file-parser alone, expects the same result, and
 * that the own decoder read the file itself (`own`) or declined it; returns the result.
 */
async function sameBothWays(bytes: Uint8Array, own: boolean, options = {}): Promise<ImportResult> {
  expect(decode(bytes) !== undefined).toBe(own);
  const mine = await parseFit(bytes, 'raw.fit', options, 'own');
  const library = await parseFit(bytes, 'raw.fit', options, 'library');
  expect(canonical(mine)).toBe(canonical(library));
  return mine;
}

const snake = (s: unknown): unknown => (typeof s === 'string' ? s.replace(/[A-Z]/g, (c) => `_${c.toLowerCase()}`) : s);
const ms = (d: unknown): number => (d as Date).getTime();

describe('decodeFit agrees with the FIT SDK decoder field by field', () => {
  for (const { name, bytes } of FIT_FILES) {
    it(name, () => {
      const sdk = new Decoder(Stream.fromByteArray(bytes)).read();
      expect(sdk.errors).toEqual([]);
      const { recordMesgs = [], eventMesgs = [], lapMesgs = [], fileIdMesgs = [], deviceInfoMesgs = [] } = sdk.messages;
      const decoded = decode(bytes)!;
      expect(decoded).toBeDefined();
      const { records, parsed } = decoded;
      expect(records.count).toBe(recordMesgs.length);
      // One array per field (NaN where the SDK has none), compared whole: the scaled values are the same doubles.
      const column = (col: Float64Array | undefined): number[] => (col === undefined ? recordMesgs.map(() => NaN) : Array.from(col));
      const sdkColumn = (get: (r: (typeof recordMesgs)[number]) => unknown): number[] => recordMesgs.map((r) => (get(r) as number | undefined) ?? NaN);
      expect(Array.from(records.ms)).toEqual(recordMesgs.map((r) => ms(r.timestamp)));
      const [power, cadence, speed, heartRate, leftTe, rightTe, leftPs, rightPs] = records.values;
      expect(column(power)).toEqual(sdkColumn((r) => r.power));
      expect(column(cadence)).toEqual(sdkColumn((r) => r.cadence));
      expect(column(speed)).toEqual(sdkColumn((r) => r.speed ?? r.enhancedSpeed));
      expect(column(heartRate)).toEqual(sdkColumn((r) => r.heartRate));
      expect(column(leftTe)).toEqual(sdkColumn((r) => r.leftTorqueEffectiveness));
      expect(column(rightTe)).toEqual(sdkColumn((r) => r.rightTorqueEffectiveness));
      expect(column(leftPs)).toEqual(sdkColumn((r) => r.leftPedalSmoothness));
      expect(column(rightPs)).toEqual(sdkColumn((r) => r.rightPedalSmoothness));
      // Raw byte in the SDK: bits 0-6 the share, bit 7 "right" (FIT profile type left_right_balance).
      const lrb = sdkColumn((r) => r.leftRightBalance);
      expect(column(records.balanceValue)).toEqual(lrb.map((b) => (Number.isNaN(b) ? NaN : b & 0x7f)));
      expect(records.balanceRight === undefined ? lrb.map(() => 0) : Array.from(records.balanceRight)).toEqual(lrb.map((b) => (Number.isNaN(b) ? 0 : b >> 7)));
      expect(parsed.events!.length).toBe(eventMesgs.length);
      parsed.events!.forEach((e, k) => {
        const s = eventMesgs[k]!;
        expect([ms(e.timestamp), e.event, e.event_type, e.data]).toEqual([ms(s.timestamp), snake(s.event), snake(s.eventType), s.data]);
      });
      expect(parsed.laps!.map((l) => [ms(l.timestamp), ms(l.start_time), l.total_elapsed_time])).toEqual(
        lapMesgs.map((l) => [ms(l.timestamp), ms(l.startTime), l.totalElapsedTime]),
      );
      expect(parsed.file_ids!.map((f) => [f.manufacturer, f.product, f.serial_number])).toEqual(fileIdMesgs.map((f) => [f.manufacturer, f.product, f.serialNumber]));
      expect(parsed.device_infos!.map((d) => [d.device_index, d.manufacturer, d.serial_number, d.software_version, d.product_name])).toEqual(
        deviceInfoMesgs.map((d) => [d.deviceIndex, d.manufacturer, d.serialNumber, d.softwareVersion, d.productName]),
      );
    }, 30_000);
  }
});

describe('the own decoder gives the recording fit-file-parser gives', () => {
  for (const { name, bytes } of FIT_FILES) {
    it(`${name}, read whole and read damaged`, async () => {
      for (const readDamaged of [false, true]) {
        const result = await sameBothWays(bytes, true, { readDamaged });
        expect(result.ok).toBe(true);
      }
    }, 30_000);
  }

  it('takes manufacturer names from fit-file-parser\'s own profile table', () => {
    expect(getFitManufacturerName(1)).toBe('garmin');
    expect(getFitManufacturerName(255)).toBe('development');
    expect(getFitManufacturerName(65000)).toBeNull();
  });
});

describe('hand-built files: the own decoder reads what it can reproduce and declines the rest', () => {
  const t0 = fitSeconds(Date.UTC(2026, 0, 5, 8)) - (fitSeconds(Date.UTC(2026, 0, 5, 8)) % 32) + 28; // low 5 bits 28: rolls over after 3 s
  const fileId: RawDefinition = { local: 0, global: 0, fields: [[0, 1, ENUM], [1, 2, UINT16], [2, 2, UINT16], [3, 4, UINT32Z]] };
  const fileIdData = (manufacturer = 255): RawData => ({ local: 0, bytes: [4, ...u16(manufacturer), ...u16(5), ...u32(77)] });
  const recordDef: RawDefinition = { local: 1, global: 20, fields: [[253, 4, UINT32], [7, 2, UINT16], [4, 1, UINT8]] };
  const record = (i: number, power = 200 + i): RawData => ({ local: 1, bytes: [...u32(t0 + i), ...u16(power), 90] });
  const head = [{ def: fileId }, { data: fileIdData() }, { def: recordDef }];
  const records = (from: number, to: number) => Array.from({ length: to - from }, (_, k) => ({ data: record(from + k) }));

  it('compressed timestamp headers, across the 5-bit rollover', async () => {
    const untimed: RawDefinition = { local: 2, global: 20, fields: [[7, 2, UINT16], [4, 1, UINT8]] };
    const compressed = Array.from({ length: 11 }, (_, k) => ({ data: { local: 2, compressed: (28 + 1 + k) & 31, bytes: [...u16(300 + k), 91] } }));
    const result = await sameBothWays(rawFit([...head, ...records(0, 1), { def: untimed }, ...compressed]), true);
    expect(result.ok && Array.from(result.recording.time)).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11]);
  });

  it('a compressed header before any timestamp leaves its record untimed', async () => {
    const untimed: RawDefinition = { local: 2, global: 20, fields: [[7, 2, UINT16]] };
    const result = await sameBothWays(rawFit([...head, { def: untimed }, { data: { local: 2, compressed: 3, bytes: u16(150) } }, ...records(0, 12)]), true);
    expect(result.ok && result.warnings.map((w) => w.code)).toEqual(['fit_missing_timestamp']);
  });

  it('declines a compressed header on an event or on a message that also has a timestamp field', async () => {
    const event: RawDefinition = { local: 3, global: 21, fields: [[0, 1, ENUM], [1, 1, ENUM]] };
    await sameBothWays(rawFit([...head, ...records(0, 6), { def: event }, { data: { local: 3, compressed: 7, bytes: [0, 4] } }, ...records(6, 12)]), false);
    await sameBothWays(rawFit([...head, ...records(0, 6), { data: { local: 1, compressed: 7, bytes: [...u32(t0 + 6), ...u16(1), 2] } }, ...records(7, 12)]), false);
  });

  it('declines reserved header bits on a data message (fit-file-parser refuses the file)', async () => {
    const result = await sameBothWays(rawFit([...head, ...records(0, 6), { data: { ...record(6), header: 0x21 } }, ...records(7, 12)]), false);
    expect(!result.ok && result.error.code).toBe('fit_malformed');
  });

  it('declines a timestamp field that is not a 4-byte uint32', async () => {
    const odd: RawDefinition = { local: 1, global: 20, fields: [[253, 4, UINT32Z], [7, 2, UINT16], [4, 1, UINT8]] };
    await sameBothWays(rawFit([{ def: fileId }, { data: fileIdData() }, { def: odd }, ...records(0, 12)]), false);
  });

  it('developer fields on records: read unless one is named like a record field', async () => {
    const devId: RawDefinition = { local: 4, global: 207, fields: [[3, 1, UINT8]] };
    const description: RawDefinition = { local: 5, global: 206, fields: [[0, 1, UINT8], [1, 1, UINT8], [2, 1, UINT8], [3, 16, STRING]] };
    const withDev: RawDefinition = { ...recordDef, dev: [[0, 2, 0]] };
    const file = (name: string) =>
      rawFit([
        { def: fileId }, { data: fileIdData() }, { def: devId }, { data: { local: 4, bytes: [0] } },
        { def: description }, { data: { local: 5, bytes: [0, 0, UINT16, ...text(name, 16)] } },
        { def: withDev }, ...Array.from({ length: 12 }, (_, i) => ({ data: { local: 1, bytes: [...record(i).bytes, ...u16(999)] } })),
      ]);
    const plain = await sameBothWays(file('pedal_torque'), true);
    expect(plain.ok && plain.recording.columns.power![0]).toBe(200);
    const clash = await sameBothWays(file('power'), false);
    expect(clash.ok && clash.recording.columns.power![0]).toBe(999); // fit-file-parser lets the developer field win
  });

  it('speed from enhanced_speed where speed is absent or invalid', async () => {
    const def: RawDefinition = { local: 1, global: 20, fields: [[253, 4, UINT32], [7, 2, UINT16], [6, 2, UINT16], [73, 4, UINT32]] };
    const data = (i: number): RawData => ({ local: 1, bytes: [...u32(t0 + i), ...u16(200), ...u16(i % 3 === 0 ? 0xffff : 8000 + i), ...u32(9000 + i)] });
    const result = await sameBothWays(rawFit([{ def: fileId }, { data: fileIdData() }, { def }, ...Array.from({ length: 12 }, (_, i) => ({ data: data(i) }))]), true);
    expect(result.ok && Array.from(result.recording.columns.speed!.slice(0, 4))).toEqual([9, 8.001, 8.002, 9.003]);
  });

  it('base types and sizes: enum/byte for uint8, uint16z for uint16 (nameless there), arrays, big-endian, repeated fields', async () => {
    const def: RawDefinition = {
      local: 1, global: 20, bigEndian: true,
      // timestamp; power as two uint16 (an array: first element); cadence as enum; heart rate as byte;
      // torque effectiveness declared uint16z (not read under its name); power again, invalid (the first stays).
      fields: [[253, 4, UINT32], [7, 4, UINT16], [4, 1, ENUM], [3, 1, BYTE], [43, 2, UINT16Z], [7, 2, UINT16]],
    };
    const data = (i: number): RawData => ({ local: 1, bytes: [...u32(t0 + i, true), ...u16(210 + i, true), ...u16(1, true), 88, i === 4 ? 0xff : 140, ...u16(90, true), 0xff, 0xff] });
    const result = await sameBothWays(rawFit([{ def: fileId }, { data: fileIdData() }, { def }, ...Array.from({ length: 12 }, (_, i) => ({ data: data(i) }))]), true);
    expect(result.ok && result.recording.columns.power![3]).toBe(213);
    expect(result.ok && result.recording.columns.heartRate![4]).toBeNaN();
    expect(result.ok && result.recording.columns.leftTorqueEffectiveness).toBeUndefined();
  });

  it('a second timestamp field that is invalid: the record keeps the first, a compressed header after it has none', async () => {
    const twice: RawDefinition = { local: 3, global: 20, fields: [[253, 4, UINT32], [7, 2, UINT16], [253, 4, UINT32]] };
    const untimed: RawDefinition = { local: 2, global: 20, fields: [[7, 2, UINT16]] };
    const result = await sameBothWays(
      rawFit([...head, ...records(0, 11), { def: twice }, { data: { local: 3, bytes: [...u32(t0 + 11), ...u16(5), ...u32(0xffffffff)] } }, { def: untimed }, { data: { local: 2, compressed: 1, bytes: u16(6) } }]),
      true,
    );
    expect(result.ok && result.recording.time.length).toBe(12);
  });

  it('device identity: names, text with zero bytes, an empty product name, the last file_creator, unknown manufacturers', async () => {
    const info: RawDefinition = { local: 6, global: 23, fields: [[253, 4, UINT32], [0, 1, UINT8], [2, 2, UINT16], [3, 4, UINT32Z], [5, 2, UINT16], [27, 12, STRING]] };
    const creator: RawDefinition = { local: 7, global: 49, fields: [[0, 2, UINT16]] };
    const named: RawDefinition = { local: 0, global: 0, fields: [...fileId.fields, [8, 8, STRING]] };
    const file = (productName: number[], manufacturer: number, software = 231) =>
      rawFit([
        { def: named }, { data: { local: 0, bytes: [...fileIdData(manufacturer).bytes, ...text('Spindle', 8)] } },
        { def: info }, { data: { local: 6, bytes: [...u32(t0), 0, ...u16(manufacturer), ...u32(0), ...u16(software), ...productName] } },
        { def: creator }, { data: { local: 7, bytes: u16(11) } }, { data: { local: 7, bytes: u16(12) } },
        { def: recordDef }, ...records(0, 12),
      ]);
    const garmin = await sameBothWays(file([65, 98, 0, 99, ...text('', 8)], 1), true);
    expect(garmin.ok && garmin.recording.meta.device).toMatchObject({ manufacturer: 'garmin', product: 'Abc', softwareVersion: '2.31' });
    const empty = await sameBothWays(file(text('', 12), 65000), true);
    expect(empty.ok && empty.recording.meta.device.product).toBeUndefined(); // an empty device_info name hides file_id's
    expect(empty.ok && empty.recording.meta.device.manufacturerId).toBe(65000);
    const creator12 = await sameBothWays(file(text('X', 12), 1, 0xffff), true);
    expect(creator12.ok && creator12.recording.meta.device.softwareVersion).toBe('12'); // the last file_creator
    await sameBothWays(file([0x52, 0xc3, 0xa9, ...text('', 9)], 1), false); // "Ré": left to fit-file-parser
  });

  it('events: timer types, explicit gear fields (0 = invalid for uint8z), unknown event numbers; laps without a start time', async () => {
    const event: RawDefinition = { local: 3, global: 21, fields: [[253, 4, UINT32], [0, 1, ENUM], [1, 1, ENUM], [3, 4, UINT32], [9, 1, UINT8Z], [10, 1, UINT8Z], [11, 1, UINT8Z], [12, 1, UINT8Z]] };
    const lap: RawDefinition = { local: 4, global: 19, fields: [[253, 4, UINT32], [2, 4, UINT32], [7, 4, UINT32]] };
    const ev = (t: number, e: number, type: number, gears: number[], data = 0xffffffff): { data: RawData } => ({ data: { local: 3, bytes: [...u32(t0 + t), e, type, ...u32(data), ...gears] } });
    const result = await sameBothWays(
      rawFit([
        ...head, { def: event }, ev(0, 0, 0, [0, 0, 0, 0]), ev(1, 42, 3, [2, 50, 0, 0], (3 | (17 << 8) | (2 << 16) | (50 << 24)) >>> 0), ev(1, 200, 3, [1, 1, 1, 1]),
        ...records(0, 6), ev(6, 0, 9, [0, 0, 0, 0]), ev(8, 0, 0, [0, 0, 0, 0]), ...records(8, 14),
        { def: lap }, { data: { local: 4, bytes: [...u32(t0 + 13), ...u32(0xffffffff), ...u32(13000)] } },
      ]),
      true,
    );
    expect(result.ok && result.recording.meta.pausedS).toBe(2);
    expect(result.ok && result.recording.events.find((e) => e.kind === 'gear')).toMatchObject({ front: { index: 2, teeth: 50 }, rear: { index: 3, teeth: 17 } });
    expect(result.ok && result.recording.events.find((e) => e.kind === 'lap')).toMatchObject({ startS: 0, endS: 13 });
  });
});
