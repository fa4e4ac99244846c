import { createRequire } from 'node:module';
import type { LoadFigures } from './figures.js';
import { describeError } from './server.js';

/** The part of autocannon's result this driver reads (the package ships no types). */
interface AutocannonResult {
  duration: number;
  errors: number;
  timeouts: number;
  non2xx: number;
  requests: { total: number };
  latency: { p50: number; p99: number };
  statusCodeStats?: Record<string, { count: number }>;
}

interface AutocannonOptions {
  url: string;
  connections: number;
  duration: number;
  timeout: number;
  headers?: Record<string, string>;
}

type Autocannon = (options: AutocannonOptions) => Promise<AutocannonResult>;

const autocannon = createRequire(import.meta.url)('autocannon') as Autocannon;

export interface ReaderOptions {
  /** Base URL of the server, e.g. http://127.0.0.1:4321. */
  url: string;
  /** Route to GET, e.g. /api/published/some-slug. */
  path: string;
  /** Concurrent connections, each sending its next request when the last one is answered. */
  connections: number;
  durationS: number;
  /** Request headers; default {@link READER_HEADERS}. */
  headers?: Record<string, string>;
}

/** What a browser sends with the published page's request: JSON, compressed as it takes it. */
export const READER_HEADERS = { accept: 'application/json', 'accept-encoding': 'gzip, deflate, br' } as const;

/**
 * Anonymous readers hammering one GET route with autocannon: each connection keeps one
 * request in flight for the whole run (no pipelining), as many readers reloading a page,
 * with a browser's Accept-Encoding (the server compresses what it can). No reader sends
 * If-None-Match: every answer is the whole page, as for first-time visitors.
 */
export async function runReaders(options: ReaderOptions): Promise<LoadFigures> {
  const result = await autocannon({
    url: `${options.url}${options.path}`,
    connections: options.connections,
    duration: options.durationS,
    timeout: 60,
    headers: { ...(options.headers ?? READER_HEADERS) },
  });
  const statuses: Record<string, number> = {};
  for (const [code, { count }] of Object.entries(result.statusCodeStats ?? {})) statuses[code] = Number(count);
  return {
    requests: result.requests.total,
    perSecond: result.requests.total / result.duration,
    p50Ms: result.latency.p50,
    p99Ms: result.latency.p99,
    errors: result.errors,
    non2xx: result.non2xx,
    statuses,
  };
}

/** The slug of a published notebook (the demo lab publishes one), from GET /api/published. */
export async function findPublishedSlug(url: string): Promise<string> {
  const res = await fetch(`${url}/api/published`, { signal: AbortSignal.timeout(30_000) }).catch((error: unknown) => {
    throw new Error(`GET /api/published: ${describeError(error)}`, { cause: error });
  });
  if (!res.ok) throw new Error(`GET /api/published answered ${res.status}`);
  const body = (await res.json()) as { publications: { slug: string }[] };
  const slug = body.publications[0]?.slug;
  if (!slug) throw new Error('no published notebook: is the demo lab seeded (SEED_DEMO=1)?');
  return slug;
}
