import type { ApiError as ApiErrorBody } from '../../shared/api/errors.js';

/**
 * A failed API call. `code` is the server's stable error code (see shared/api/errors.ts)
 * or one of the client's own: `network` (no answer), `bad_response` (answer not in the
 * agreed shape).
 */
export class ApiError extends Error {
  override readonly name = 'ApiError';

  constructor(
    readonly code: string,
    message: string,
    readonly status: number,
    readonly details?: unknown,
  ) {
    super(message);
  }

  /** True when the caller is not signed in (any more). */
  get isUnauthenticated(): boolean {
    return this.status === 401;
  }
}

export type HttpMethod = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';

export interface RequestOptions {
  method?: HttpMethod;
  /** Sent as JSON unless it is FormData. */
  body?: unknown;
  query?: Record<string, string | number | undefined>;
  signal?: AbortSignal;
}

/** Adds a query string, leaving out undefined values. */
export function withQuery(path: string, query?: RequestOptions['query']): string {
  if (!query) return path;
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(query)) {
    if (value !== undefined) params.set(key, String(value));
  }
  const qs = params.toString();
  return qs ? `${path}?${qs}` : path;
}

// A hand-written check of shared/api/errors.ts's shape: importing the zod schema here
// would pull zod into the first page load for a two-field test.
function isErrorBody(body: unknown): body is ApiErrorBody {
  if (typeof body !== 'object' || body === null || !('error' in body)) return false;
  const error = (body as { error: unknown }).error;
  return (
    typeof error === 'object' &&
    error !== null &&
    typeof (error as { code?: unknown }).code === 'string' &&
    typeof (error as { message?: unknown }).message === 'string'
  );
}

/**
 * Turns a non-2xx answer into an ApiError. The server's `{ error: { code, message } }`
 * body is used when present; anything else (a proxy's HTML page, an empty body) still
 * gives a readable message with the HTTP status.
 */
export function toApiError(status: number, statusText: string, body: unknown): ApiError {
  if (isErrorBody(body)) {
    const { code, message, details } = body.error;
    return new ApiError(code, message, status, details);
  }
  const fallback = statusText ? `${status} ${statusText}` : `HTTP ${status}`;
  return new ApiError(status >= 500 ? 'internal' : 'bad_response', `The server answered ${fallback}.`, status);
}

async function readBody(response: Response): Promise<unknown> {
  if (response.status === 204) return undefined;
  const text = await response.text();
  if (!text) return undefined;
  const type = response.headers.get('content-type') ?? '';
  if (!type.includes('json')) return text;
  try {
    return JSON.parse(text) as unknown;
  } catch {
    return text;
  }
}

/**
 * The one way the app talks to its API: JSON in and out, the session cookie sent
 * along, and every failure thrown as an ApiError.
 */
export async function request<T>(path: string, options: RequestOptions = {}): Promise<T> {
  const { method = 'GET', body, query, signal } = options;
  const headers: Record<string, string> = { accept: 'application/json' };
  let payload: BodyInit | undefined;
  if (body instanceof FormData) {
    payload = body;
  } else if (body !== undefined) {
    headers['content-type'] = 'application/json';
    payload = JSON.stringify(body);
  }

  let response: Response;
  try {
    response = await fetch(withQuery(path, query), {
      method,
      headers,
      body: payload,
      credentials: 'same-origin',
      signal,
    });
  } catch (cause) {
    if (cause instanceof DOMException && cause.name === 'AbortError') throw cause;
    throw new ApiError('network', 'Cogbook could not reach its server. Check your connection and try again.', 0);
  }

  const data = await readBody(response);
  if (!response.ok) throw toApiError(response.status, response.statusText, data);
  return data as T;
}
