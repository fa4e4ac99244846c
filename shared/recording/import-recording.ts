import { EngineError } from '../errors.js';
import { importFailure } from './import-failure.js';
import type { ImportOptions, ImportResult } from './import-result.js';
import { sniffRecordingBytes } from './sniff.js';
import { decodeUtf8 } from './text-decode.js';

/**
 * Reads one uploaded file into a recording, choosing FIT or CSV by content (not by name).
 * Never throws and never rejects: every problem becomes `{ ok: false, error }` with a stable code
 * (`empty_file`, `too_large`, `not_recording`, `fit_truncated`, `fit_crc`, `fit_malformed`,
 * `no_power`, `too_short`, `header_only`, `no_numeric_columns`, `no_time_column`, `mixed_units`, ...)
 * and a message naming the file and where in it.
 *
 * The FIT and CSV readers are loaded on first use of their format, so reading one CSV file never
 * loads the FIT decoder; fit-file-parser itself loads only for a FIT file Cogbook's own decoder
 * leaves to it (see `parseFit`).
 *
 * @example
 * const result = await importRecording(bytes, 'reference.fit', { maxBytes: 50e6 });
 * if (!result.ok) show(result.error.message);
 */
export async function importRecording(bytes: Uint8Array, fileName: string, options: ImportOptions = {}): Promise<ImportResult> {
  try {
    if (options.maxBytes !== undefined && bytes.length > options.maxBytes) {
      throw new EngineError('too_large', `${fileName} is ${formatBytes(bytes.length)}, over the limit of ${formatBytes(options.maxBytes)}.`, { file: fileName });
    }
    const sniff = sniffRecordingBytes(bytes, fileName, options);
    if (sniff.format === 'fit') {
      const { readFit } = await import('./parse-fit.js');
      const recording = await readFit(bytes, fileName, options, sniff.warnings);
      return { ok: true, recording, warnings: recording.warnings };
    }
    const { parseCsv } = await import('./parse-csv.js');
    const result = parseCsv(decodeUtf8(bytes) ?? '', fileName, options.csvMapping, options);
    if (result.ok) result.warnings.unshift(...sniff.warnings);
    return result;
  } catch (error) {
    return importFailure(error, fileName);
  }
}

function formatBytes(n: number): string {
  return n >= 1e6 ? `${(n / 1e6).toFixed(1)} MB` : n >= 1e3 ? `${(n / 1e3).toFixed(1)} kB` : `${n} bytes`;
}
