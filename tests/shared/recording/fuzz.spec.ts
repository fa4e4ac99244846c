import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { decodeFit } from '../../../shared/recording/decode-fit.js';
import { fitCrc } from '../../../shared/recording/fit-crc.js';
import { frameFit } from '../../../shared/recording/frame-fit.js';
import { importRecording } from '../../../shared/recording/import-recording.js';
import type { ImportResult } from '../../../shared/recording/import-result.js';
import { parseFit } from '../../../shared/recording/parse-fit.js';
import { writeCsv } from '../../../shared/recording/write-csv.js';
import { writeFit } from '../../../shared/recording/write-fit.js';
import { deviceView } from '../../../shared/synthetic/device-view.js';
import { synthesizeRide } from '../../../shared/synthetic/synthesize-ride.js';

const ride = synthesizeRide({
  seed: 8,
  blocks: [
    { kind: 'steady', durationS: 40, powerW: 200, cadenceRpm: 90, front: 2, rear: 6 },
    { kind: 'pause', durationS: 5, powerW: 0, cadenceRpm: 0, front: 2, rear: 6 },
    { kind: 'steady', durationS: 20, powerW: 250, cadenceRpm: 90, front: 1, rear: 4 },
  ],
});
const view = deviceView(ride, { label: 'Fuzz crank', channels: { pedalMetrics: true }, dropouts: { perHour: 200, meanLengthS: 2 } });
const fit = writeFit(view.recording);
const csv = new TextEncoder().encode(writeCsv(view.recording, { time: 'clock', speedUnit: 'km/h' }));

type Mutation = { kind: 'flip'; at: number; mask: number } | { kind: 'cut'; at: number } | { kind: 'insert'; at: number; bytes: number[] } | { kind: 'set'; at: number; value: number };

const mutation = fc.oneof(
  fc.record({ kind: fc.constant('flip' as const), at: fc.nat(), mask: fc.integer({ min: 1, max: 255 }) }),
  fc.record({ kind: fc.constant('cut' as const), at: fc.nat() }),
  fc.record({ kind: fc.constant('insert' as const), at: fc.nat(), bytes: fc.array(fc.integer({ min: 0, max: 255 }), { minLength: 1, maxLength: 8 }) }),
  fc.record({ kind: fc.constant('set' as const), at: fc.nat(), value: fc.constantFrom(0, 0x0a, 0x2c, 0x3a, 0x40, 0x7f, 0x80, 0xff) }),
);

function mutate(bytes: Uint8Array, mutations: Mutation[]): Uint8Array {
  let out = bytes.slice();
  for (const m of mutations) {
    const at = out.length === 0 ? 0 : m.at % out.length;
    if (m.kind === 'flip' && out.length > 0) out[at]! ^= m.mask;
    else if (m.kind === 'set' && out.length > 0) out[at] = m.value;
    else if (m.kind === 'cut') out = out.slice(0, at);
    else if (m.kind === 'insert') out = Uint8Array.from([...out.subarray(0, at), ...m.bytes, ...out.subarray(at)]);
  }
  return out;
}

/** Re-stamps the FIT data size and checksums so the mutation reaches the decoder instead of failing the CRC. */
function resealFit(bytes: Uint8Array): Uint8Array {
  if (bytes.length < 16) return bytes;
  const out = bytes.slice();
  const size = out.length - 14 - 2;
  out[0] = 14;
  out.set([size & 255, (size >>> 8) & 255, (size >>> 16) & 255, size >>> 24], 4);
  out.set([0x2e, 0x46, 0x49, 0x54], 8);
  const headerCrc = fitCrc(out, 0, 12);
  out[12] = headerCrc & 255;
  out[13] = headerCrc >>> 8;
  const crc = fitCrc(out, 0, out.length - 2);
  out[out.length - 2] = crc & 255;
  out[out.length - 1] = crc >>> 8;
  return out;
}

async function expectTyped(bytes: Uint8Array, name: string, readDamaged: boolean): Promise<void> {
  const result = await importRecording(bytes, name, { readDamaged });
  if (result.ok) {
    expect(result.recording.time.length).toBeGreaterThanOrEqual(10);
    for (const col of Object.values(result.recording.columns)) expect(col.length).toBe(result.recording.time.length);
  } else {
    expect(typeof result.error.code).toBe('string');
    expect(result.error.message).toContain(name);
    expect(result.error.code).not.toBe('unreadable'); // every failure has a specific code
  }
}

describe('importRecording on mutated files always resolves to a recording or a typed error', () => {
  it('the unmutated files import', async () => {
    expect((await importRecording(fit, 'fuzz.fit')).ok).toBe(true);
    expect((await importRecording(csv, 'fuzz.csv')).ok).toBe(true);
  });

  it('FIT with byte flips, cuts and insertions (CRC checked, and read damaged)', async () => {
    await fc.assert(
      fc.asyncProperty(fc.array(mutation, { minLength: 1, maxLength: 4 }), fc.boolean(), async (ms, readDamaged) => {
        await expectTyped(mutate(fit, ms), 'fuzz.fit', readDamaged);
      }),
      { numRuns: 1000, seed: 20260302 },
    );
  }, 60_000);

  it('FIT mutated and resealed, so the decoder itself meets the damage', async () => {
    await fc.assert(
      fc.asyncProperty(fc.array(mutation.filter((m) => m.kind !== 'cut'), { minLength: 1, maxLength: 3 }), fc.boolean(), async (ms, readDamaged) => {
        await expectTyped(resealFit(mutate(fit, ms)), 'sealed.fit', readDamaged);
      }),
      { numRuns: 1000, seed: 7 },
    );
  }, 60_000);

  it('FIT mutated and resealed: the own decoder gives exactly what fit-file-parser alone gives, or leaves the file to it', async () => {
    // Mutations that hit definitions change base types, sizes and field numbers; the own decoder must
    // reproduce fit-file-parser on each, or decline the file (then fit-file-parser reads it, as before).
    const canonical = (r: ImportResult): string =>
      JSON.stringify(r, (_k, v: unknown) => (v instanceof Float64Array ? Array.from(v, (x) => (Number.isNaN(x) ? 'NaN' : x)) : typeof v === 'number' && !Number.isFinite(v) ? String(v) : v));
    let ownPath = 0;
    await fc.assert(
      fc.asyncProperty(fc.array(mutation.filter((m) => m.kind !== 'cut'), { minLength: 1, maxLength: 3 }), fc.boolean(), async (ms, readDamaged) => {
        const bytes = resealFit(mutate(fit, ms));
        const headerSize = bytes[0]!;
        const dataSize = (bytes[4]! | (bytes[5]! << 8) | (bytes[6]! << 16) | (bytes[7]! << 24)) >>> 0;
        if ((headerSize === 12 || headerSize === 14) && decodeFit(bytes, frameFit(bytes, headerSize, Math.min(headerSize + dataSize, bytes.length)))) ownPath++;
        const own = await parseFit(bytes, 'sealed.fit', { readDamaged }, 'own');
        const library = await parseFit(bytes, 'sealed.fit', { readDamaged }, 'library');
        expect(canonical(own)).toBe(canonical(library));
      }),
      { numRuns: 1000, seed: 13 },
    );
    expect(ownPath).toBeGreaterThan(500); // most mutated files still take the own decoder
  }, 120_000);

  it('CSV with byte flips, cuts and insertions', async () => {
    await fc.assert(
      fc.asyncProperty(fc.array(mutation, { minLength: 1, maxLength: 6 }), async (ms) => {
        await expectTyped(mutate(csv, ms), 'fuzz.csv', false);
      }),
      { numRuns: 1500, seed: 11 },
    );
  }, 60_000);
});
