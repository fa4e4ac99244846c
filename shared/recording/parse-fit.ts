import { EngineError, type EngineWarning } from '../errors.js';
import { checkUsable } from './check-usable.js';
import { decodeFit } from './decode-fit.js';
import { frameFit, type FitFrames } from './frame-fit.js';
import { fitRecordColumns, fitToRecording, type ParsedFitLike } from './fit-to-recording.js';
import { importFailure } from './import-failure.js';
import type { ImportOptions, ImportResult } from './import-result.js';
import type { Recording } from './recording.js';
import { sniffRecordingBytes } from './sniff.js';

const RECORD = 20;

/**
 * Who decodes the messages: `own` = Cogbook's decoder ({@link decodeFit}: records straight into
 * typed arrays), falling back to fit-file-parser for a file it declines; `library` =
 * fit-file-parser always (for tests and the import benchmark). Both give the same recording.
 */
export type FitDecoder = 'own' | 'library';

/**
 * Reads a FIT activity file into a {@link Recording}: records (timestamp, power, cadence, speed,
 * heart rate, balance, pedal metrics), laps, events (timer, gear changes), file_id and
 * device_info. Cogbook's own decoder reads them unless the file has something it leaves to
 * fit-file-parser (mode 'list'; loaded only then), which then reads the whole file, with the same
 * result. Checks the header, length and CRC first;
 * `options.readDamaged` reads a damaged or cut file up to its last intact message.
 * Never throws: problems come back as `{ ok: false, error }` with a code and a located message.
 *
 * @example const result = await parseFit(bytes, 'ride.fit'); if (result.ok) result.recording.columns.power
 */
export async function parseFit(bytes: Uint8Array, fileName: string, options: ImportOptions = {}, decoder: FitDecoder = 'own'): Promise<ImportResult> {
  try {
    const sniff = sniffRecordingBytes(bytes, fileName, options);
    if (sniff.format !== 'fit') throw new EngineError('not_fit', `${fileName} is not a FIT file: it has no ".FIT" signature at bytes 8-11.`, { file: fileName, byte: 8 });
    const recording = await readFit(bytes, fileName, options, sniff.warnings, decoder);
    return { ok: true, recording, warnings: recording.warnings };
  } catch (error) {
    return importFailure(error, fileName);
  }
}

/** Reads FIT bytes that {@link sniffRecordingBytes} accepted. Throws EngineError. */
export async function readFit(bytes: Uint8Array, fileName: string, options: ImportOptions, warnings: EngineWarning[], decoder: FitDecoder = 'own'): Promise<Recording> {
  const headerSize = bytes[0]!;
  const dataSize = (bytes[4]! | (bytes[5]! << 8) | (bytes[6]! << 16) | (bytes[7]! << 24)) >>> 0;
  const announcedEnd = headerSize + dataSize;
  const frames = frameFit(bytes, headerSize, Math.min(announcedEnd, bytes.length));
  if (frames.failure && frames.end < announcedEnd) {
    const { byte, reason } = frames.failure;
    const where = { file: fileName, byte, record: frames.dataStarts.length };
    const message = `${fileName}: the FIT messages stop making sense at byte ${byte} (${reason}), after ${frames.dataStarts.length} complete messages.`;
    if (!options.readDamaged) throw new EngineError('fit_malformed', `${message} Reading it anyway ("read damaged file") keeps the messages before that byte.`, where);
    if (byte < bytes.length) warnings.push({ code: 'fit_malformed', message: `${message} Read up to there.`, where });
  }
  const own = decoder === 'own' ? decodeFit(bytes, frames) : undefined;
  const parsed = own ? own.parsed : await readWithLibrary(bytes, fileName, options, warnings, headerSize, announcedEnd, frames);
  let recordStarts: Int32Array | undefined;
  const recordBytes = (k: number): number | undefined => {
    recordStarts ??= frames.dataStarts.filter((_, i) => frames.dataGlobals[i] === RECORD);
    return recordStarts[k];
  };
  const records = own ? own.records : fitRecordColumns(parsed.records ?? []);
  const recording = fitToRecording(records, parsed, fileName, warnings, recordBytes, frames.fileId);
  if (options.label) recording.meta.device.label = options.label;
  checkUsable(recording, options);
  return recording;
}

/** fit-file-parser reads every message; on failure with `readDamaged`, the longest prefix it accepts. */
async function readWithLibrary(bytes: Uint8Array, fileName: string, options: ImportOptions, warnings: EngineWarning[], headerSize: number, announcedEnd: number, frames: FitFrames): Promise<ParsedFitLike> {
  try {
    return await runParser(frames.end === announcedEnd ? bytes : prefix(bytes, headerSize, frames.end));
  } catch (error) {
    if (!options.readDamaged) {
      throw new EngineError('fit_malformed', `${fileName}: the FIT decoder failed (${describe(error)}). Reading it anyway ("read damaged file") keeps the messages it can decode.`, { file: fileName }, { cause: error });
    }
    const readable = await longestReadablePrefix(bytes, headerSize, frames);
    warnings.push({
      code: 'fit_malformed',
      message: `${fileName}: the FIT decoder failed (${describe(error)}); read the first ${readable.messages} messages, up to byte ${readable.end}.`,
      where: { file: fileName, byte: readable.end, record: readable.messages },
    });
    return readable.parsed;
  }
}

async function runParser(bytes: Uint8Array): Promise<ParsedFitLike> {
  const { default: FitParser } = await import('fit-file-parser');
  const parser = new FitParser({ mode: 'list' });
  // fit-file-parser accepts any Uint8Array view (it reads buffer/byteOffset/byteLength), not just Node's Buffer.
  return (await parser.parseAsync(bytes as unknown as ArrayBuffer)) as unknown as ParsedFitLike;
}

/** A copy holding the header and the messages before `end`, with the data size patched to match. */
function prefix(bytes: Uint8Array, headerSize: number, end: number): Uint8Array {
  const copy = new Uint8Array(end + 2);
  copy.set(bytes.subarray(0, end));
  const size = end - headerSize;
  copy[4] = size & 255;
  copy[5] = (size >>> 8) & 255;
  copy[6] = (size >>> 16) & 255;
  copy[7] = (size >>> 24) & 255;
  return copy;
}

/** Bisects over message boundaries for the longest prefix the decoder accepts. */
async function longestReadablePrefix(bytes: Uint8Array, headerSize: number, frames: FitFrames): Promise<{ parsed: ParsedFitLike; end: number; messages: number }> {
  let lo = 0;
  let hi = frames.dataStarts.length;
  let best: ParsedFitLike = {};
  let bestEnd = headerSize;
  while (lo < hi) {
    const mid = (lo + hi + 1) >>> 1;
    const end = mid < frames.dataStarts.length ? frames.dataStarts[mid]! : frames.end;
    try {
      best = await runParser(prefix(bytes, headerSize, end));
      bestEnd = end;
      lo = mid;
    } catch {
      hi = mid - 1;
    }
  }
  if (lo === 0) best = await runParser(prefix(bytes, headerSize, headerSize)).catch(() => ({}));
  return { parsed: best, end: bestEnd, messages: lo };
}

function describe(error: unknown): string {
  return error instanceof Error ? error.message : String(error);
}
