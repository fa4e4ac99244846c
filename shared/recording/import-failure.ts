import type { EngineErrorData } from '../errors.js';
import { isEngineError } from '../errors.js';

/** Turns anything thrown while reading a file into the typed error of an ImportResult. */
export function importFailure(error: unknown, fileName: string): { ok: false; error: EngineErrorData } {
  if (isEngineError(error)) return { ok: false, error: error.toData() };
  const reason = error instanceof Error ? error.message : String(error);
  return { ok: false, error: { code: 'unreadable', message: `${fileName} could not be read: ${reason}.`, where: { file: fileName } } };
}
