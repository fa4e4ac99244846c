import { EngineError, type EngineWarning } from '../errors.js';
import { fitCrc } from './fit-crc.js';

/** What {@link sniffRecordingBytes} found: the format by content, and any non-fatal findings. */
export interface SniffResult {
  format: 'fit' | 'csv';
  warnings: EngineWarning[];
}

/** Options of {@link sniffRecordingBytes}. */
export interface SniffOptions {
  /** Accept a FIT file whose checksum fails or that is cut short, with a warning (default false: error). */
  readDamaged?: boolean;
}

const SNIFF_TEXT_BYTES = 64 * 1024;

/**
 * Decides by content (never by file name) whether bytes are a FIT file or CSV text, and checks
 * a FIT file's header, length and CRCs.
 *
 * @throws EngineError with code `empty_file`, `fit_header`, `fit_truncated`, `fit_crc` or `not_recording`.
 * @example sniffRecordingBytes(bytes, 'ride.fit') // { format: 'fit', warnings: [] }
 */
export function sniffRecordingBytes(bytes: Uint8Array, fileName: string, options: SniffOptions = {}): SniffResult {
  const warnings: EngineWarning[] = [];
  if (bytes.length === 0) {
    throw new EngineError('empty_file', `${fileName} is empty (0 bytes): there is nothing to read.`, { file: fileName });
  }
  if (hasFitSignature(bytes)) {
    checkFit(bytes, fileName, options, warnings);
    if (!/\.fit$/i.test(fileName)) {
      warnings.push({ code: 'extension_mismatch', message: `${fileName} holds FIT data although its name does not end in .fit; read as FIT.`, where: { file: fileName } });
    }
    return { format: 'fit', warnings };
  }
  const binaryAt = firstBinaryByte(bytes);
  if (binaryAt >= 0) {
    const what = /\.fit$/i.test(fileName)
      ? `${fileName} is named .fit but is not a FIT file: a FIT file has the signature ".FIT" at bytes 8-11, and this one has none`
      : `${fileName} is neither a FIT file (no ".FIT" signature at bytes 8-11) nor CSV text`;
    throw new EngineError('not_recording', `${what} (binary byte 0x${bytes[binaryAt]!.toString(16).padStart(2, '0')} at byte ${binaryAt}).`, {
      file: fileName,
      byte: binaryAt,
    });
  }
  if (/\.fit$/i.test(fileName)) {
    warnings.push({ code: 'extension_mismatch', message: `${fileName} is named .fit but holds text; read as CSV.`, where: { file: fileName } });
  }
  return { format: 'csv', warnings };
}

function hasFitSignature(bytes: Uint8Array): boolean {
  return bytes.length >= 12 && bytes[8] === 0x2e && bytes[9] === 0x46 && bytes[10] === 0x49 && bytes[11] === 0x54;
}

function checkFit(bytes: Uint8Array, fileName: string, options: SniffOptions, warnings: EngineWarning[]): void {
  const headerSize = bytes[0]!;
  if (headerSize !== 12 && headerSize !== 14) {
    throw new EngineError('fit_header', `${fileName} has a FIT signature but a header size of ${headerSize} bytes (expected 12 or 14, byte 0).`, {
      file: fileName,
      byte: 0,
    });
  }
  const damaged = (code: string, message: string, byte: number): void => {
    if (!options.readDamaged) {
      throw new EngineError(code, `${message} Reading it anyway ("read damaged file") keeps whatever records are intact.`, { file: fileName, byte });
    }
    warnings.push({ code, message: `${message} Read anyway: records after the damage may be missing or wrong.`, where: { file: fileName, byte } });
  };
  if (headerSize === 14 && bytes.length >= 14) {
    const stored = bytes[12]! | (bytes[13]! << 8);
    if (stored !== 0 && stored !== fitCrc(bytes, 0, 12)) {
      damaged('fit_crc', `${fileName}: the FIT header checksum fails (bytes 12-13), so the file is damaged.`, 12);
    }
  }
  const dataSize = (bytes[4]! | (bytes[5]! << 8) | (bytes[6]! << 16) | (bytes[7]! << 24)) >>> 0;
  const crcAt = headerSize + dataSize;
  if (crcAt + 2 > bytes.length) {
    damaged(
      'fit_truncated',
      `${fileName} is cut short: its FIT header announces ${dataSize} bytes of records plus a 2-byte checksum, but the file ends at byte ${bytes.length} (expected ${crcAt + 2}).`,
      bytes.length,
    );
    return;
  }
  const stored = bytes[crcAt]! | (bytes[crcAt + 1]! << 8);
  if (stored !== fitCrc(bytes, 0, crcAt)) {
    damaged('fit_crc', `${fileName}: the FIT file checksum fails (bytes ${crcAt}-${crcAt + 1}), so some bytes changed after it was written.`, crcAt);
  }
  if (crcAt + 2 < bytes.length) {
    warnings.push({
      code: 'fit_trailing_bytes',
      message: `${fileName} has ${bytes.length - crcAt - 2} bytes after the FIT checksum (byte ${crcAt + 2}); only the first FIT file was read.`,
      where: { file: fileName, byte: crcAt + 2 },
    });
  }
}

/** Index of the first byte that CSV text cannot hold (NUL, most control bytes, invalid UTF-8), or -1. */
function firstBinaryByte(bytes: Uint8Array): number {
  const n = Math.min(bytes.length, SNIFF_TEXT_BYTES);
  let i = 0;
  while (i < n) {
    const b = bytes[i]!;
    if (b < 0x80) {
      if (b < 0x09 || (b > 0x0d && b < 0x20 && b !== 0x1b) || b === 0x7f) return i;
      i++;
      continue;
    }
    const extra = b >= 0xc2 && b <= 0xdf ? 1 : b >= 0xe0 && b <= 0xef ? 2 : b >= 0xf0 && b <= 0xf4 ? 3 : -1;
    if (extra < 0) return i;
    for (let k = 1; k <= extra; k++) {
      // A character cut by the end of the sniff window is not an error; one cut by the end of the file is.
      if (i + k >= bytes.length) return i;
      if (i + k >= n) return -1;
      if ((bytes[i + k]! & 0xc0) !== 0x80) return i;
    }
    i += extra + 1;
  }
  return -1;
}
