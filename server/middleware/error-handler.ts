import type { ErrorRequestHandler, RequestHandler } from 'express';
import multer from 'multer';
import { ZodError } from 'zod';
import type { ApiError } from '../../shared/api/errors.js';
import { AppError } from '../errors.js';
import type { Logger } from '../logger.js';

function body(code: string, message: string, details?: unknown): ApiError {
  return details === undefined ? { error: { code, message } } : { error: { code, message, details } };
}

/** Any /api or /assets path no route answered. */
export const notFoundHandler: RequestHandler = (req, res) => {
  res.status(404).json(body('not_found', `Nothing at ${req.method} ${req.originalUrl.split("?")[0]}.`));
};

/**
 * The one error middleware: every failure leaves as `{ error: { code, message, details? } }`.
 * Unknown errors are logged with their stack and answered 500 without it.
 */
export function errorHandler(logger: Logger, uploadLimitMb: number): ErrorRequestHandler {
  return (err: unknown, req, res, next) => {
    if (res.headersSent) return next(err);
    // pino-http's per-request logger, so the line carries the request id.
    const log = (req as { log?: Logger }).log ?? logger;
    const sent = (status: number, payload: ApiError) => res.status(status).json(payload);
    if (err instanceof AppError) return sent(err.status, body(err.code, err.message, err.details));
    if (err instanceof ZodError) {
      const fields = err.issues.map((i) => ({ path: i.path.map(String).join('.'), message: i.message }));
      const first = fields[0];
      const message = first ? `Invalid request: ${first.path ? `${first.path}: ` : ''}${first.message}` : 'Invalid request.';
      return sent(400, body('validation_failed', message, { fields }));
    }
    if (err instanceof multer.MulterError) {
      if (err.code === 'LIMIT_FILE_SIZE') {
        return sent(413, body('payload_too_large', `A file is larger than the upload limit of ${uploadLimitMb} MB.`, { limitMb: uploadLimitMb, file: err.field }));
      }
      return sent(400, body('bad_upload', `Upload refused: ${err.message}${err.field ? ` (field "${err.field}")` : ''}.`));
    }
    const bodyParser = err as { type?: string; status?: number; limit?: number };
    if (bodyParser.type === 'entity.parse.failed') return sent(400, body('malformed_json', 'The request body is not valid JSON.'));
    if (bodyParser.type === 'entity.too.large') {
      const limitMb = bodyParser.limit ? Math.round((bodyParser.limit / 1024 / 1024) * 10) / 10 : undefined;
      return sent(413, body('payload_too_large', `The request body is larger than the limit${limitMb ? ` of ${limitMb} MB` : ''}.`, limitMb ? { limitMb } : undefined));
    }
    if (typeof bodyParser.status === 'number' && bodyParser.status >= 400 && bodyParser.status < 500) {
      return sent(bodyParser.status, body('bad_request', (err as Error).message || 'Bad request.'));
    }
    if (/^22/.test(databaseErrorCode(err) ?? '')) {
      // SQLSTATE class 22 "data exception": the request carried a value the database refuses (e.g. NUL in text).
      log.warn({ err, method: req.method, path: req.path }, 'value refused by the database');
      return sent(400, body('unstorable_value', 'The request holds a value that cannot be stored (for example a NUL character).'));
    }
    log.error({ err, method: req.method, path: req.path }, 'unhandled error');
    return sent(500, body('internal', 'Something went wrong on the server. The error was logged.'));
  };
}

/** The SQLSTATE of a database error, also when Drizzle wrapped it (DrizzleQueryError keeps it as `cause`). */
function databaseErrorCode(err: unknown): string | undefined {
  for (let e = err, i = 0; e && typeof e === 'object' && i < 3; e = (e as { cause?: unknown }).cause, i++) {
    const code = (e as { code?: unknown }).code;
    if (typeof code === 'string' && /^[0-9A-Z]{5}$/.test(code)) return code;
  }
  return undefined;
}
