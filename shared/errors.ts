/**
 * Where in the input a problem sits. Every field is optional; fill in what is known
 * so a message can say "file ride.fit, record 1834, field power".
 */
export interface Where {
  file?: string;
  /** 0-based record (FIT data message) index. */
  record?: number;
  /** 1-based row number as a spreadsheet shows it (header is row 1). */
  row?: number;
  field?: string;
  /** Notebook cell id. */
  cell?: string;
  /** 1-based line and column inside a cell's source text. */
  line?: number;
  column?: number;
  /** Byte offset inside a binary file. */
  byte?: number;
}

/** A non-fatal problem: the operation produced a result, but the user should know. */
export interface EngineWarning {
  code: string;
  message: string;
  where?: Where;
}

/** Plain-data form of an {@link EngineError}, safe to send through postMessage or JSON. */
export interface EngineErrorData {
  code: string;
  message: string;
  where?: Where;
}

/**
 * The one error type of the engine: a stable `code`, a message that says what is
 * wrong and where, and the location as data.
 *
 * @example
 * throw new EngineError('fit_truncated', 'ride.fit ends inside record 1834', { file: 'ride.fit', record: 1834 });
 */
export class EngineError extends Error {
  override readonly name = 'EngineError';
  constructor(
    readonly code: string,
    message: string,
    readonly where?: Where,
    options?: { cause?: unknown },
  ) {
    super(message, options);
  }

  /** Plain data for crossing a worker or HTTP boundary. */
  toData(): EngineErrorData {
    return this.where ? { code: this.code, message: this.message, where: this.where } : { code: this.code, message: this.message };
  }
}

/** True when `value` is an {@link EngineError} (works across realms by shape). */
export function isEngineError(value: unknown): value is EngineError {
  return value instanceof EngineError || (value instanceof Error && value.name === 'EngineError' && 'code' in value);
}
