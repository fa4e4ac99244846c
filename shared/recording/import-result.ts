import type { EngineErrorData, EngineWarning } from '../errors.js';
import type { CsvMapping } from './csv-mapping.js';
import type { Recording } from './recording.js';

/** The outcome of reading one file: a recording with warnings, or a typed error. Never thrown. */
export type ImportResult = { ok: true; recording: Recording; warnings: EngineWarning[] } | { ok: false; error: EngineErrorData };

/** Options of `importRecording`, `parseFit` and `parseCsv`. */
export interface ImportOptions {
  /** Read a FIT file whose checksum fails or that is cut short, keeping what is intact (with a warning). */
  readDamaged?: boolean;
  /** Accept a file without power (it cannot be compared, but may carry cadence or gears). */
  allowNoPower?: boolean;
  /** Refuse files larger than this many bytes (`too_large`). */
  maxBytes?: number;
  /** Fewest samples a usable recording has (default {@link MIN_SAMPLES}). */
  minSamples?: number;
  /** Column mapping for CSV files; guessed from the header when absent. */
  csvMapping?: CsvMapping;
  /** A label for the device, kept in `meta.device.label`. */
  label?: string;
}

/**
 * Default fewest samples: fewer than 10 cannot hold a steady section or a lag search, so such a
 * file is almost always a mistake (a test export, a cut file).
 */
export const MIN_SAMPLES = 10;
