import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { z } from 'zod';
import type { S3Settings } from './storage/s3-store.js';

const LOG_LEVELS = ['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent'] as const;

/**
 * Environment variables the server reads, parsed once at start.
 *
 * HOST defaults to 127.0.0.1: a fresh install is reachable from this machine only.
 * Set HOST=0.0.0.0 (usually with TRUST_PROXY and an https BASE_URL) to serve a network.
 */
const envSchema = z.object({
  PORT: z.coerce.number().int().min(0).max(65535).default(3000),
  HOST: z.string().min(1).default('127.0.0.1'),
  DATA_DIR: z.string().min(1).default('./data'),
  DATABASE_URL: z
    .string()
    .regex(/^postgres(ql)?:\/\//, 'DATABASE_URL must start with postgres:// or postgresql://')
    .optional()
    .or(z.literal('').transform(() => undefined)),
  BASE_URL: z.url().optional(),
  TRUSTED_ORIGINS: z.string().optional(),
  AUTH_SECRET: z.string().min(32, 'AUTH_SECRET must be at least 32 characters').optional(),
  SMTP_URL: z.string().optional().or(z.literal('').transform(() => undefined)),
  MAIL_FROM: z.string().default('Cogbook <cogbook@localhost>'),
  UPLOAD_LIMIT_MB: z.coerce.number().positive().max(2048).default(50),
  LOG_LEVEL: z.enum(LOG_LEVELS).default('info'),
  /** Express "trust proxy": false, true, a hop count, or a list of addresses/subnets. */
  TRUST_PROXY: z.string().default('false'),
  /** Sign-in attempts allowed per client address per 15 minutes. */
  SIGN_IN_LIMIT: z.coerce.number().int().positive().default(30),
  /** Create the demo lab and its accounts when the database is empty (set to 0 to skip). */
  SEED_DEMO: z.enum(['0', '1']).default('1'),
  /** Keep uploads' bytes in this S3-compatible bucket instead of the database (credentials: the usual AWS_* variables). */
  COGBOOK_S3_BUCKET: z.string().optional().or(z.literal('').transform(() => undefined)),
  /** An S3-compatible server's URL (path-style requests); unset = AWS S3. */
  COGBOOK_S3_ENDPOINT: z.url().optional().or(z.literal('').transform(() => undefined)),
  COGBOOK_S3_REGION: z.string().min(1).default('us-east-1'),
  /** Key prefix inside the bucket, e.g. "cogbook/". */
  COGBOOK_S3_PREFIX: z.string().default(''),
  /** Warm worker threads for server-side runs and snapshots (default: two, one on a single core). */
  WORKER_THREADS: z.coerce.number().int().min(1).max(64).optional(),
});

export interface Config {
  port: number;
  host: string;
  dataDir: string;
  databaseUrl: string | undefined;
  baseUrl: string;
  trustedOrigins: string[];
  authSecret: string;
  smtpUrl: string | undefined;
  mailFrom: string;
  uploadLimitMb: number;
  logLevel: (typeof LOG_LEVELS)[number];
  trustProxy: boolean | number | string;
  signInLimit: number;
  seedDemo: boolean;
  /** Object store for uploads' bytes; undefined = in the database. */
  s3: S3Settings | undefined;
  /** Size of the compute pool; undefined = the engine's default. */
  workerThreads: number | undefined;
  /** Repository root (holds drizzle/ and dist/client/), found from this file's location. */
  rootDir: string;
}

/** Reads and checks the environment. Throws one error naming every bad variable. */
export function loadConfig(env: NodeJS.ProcessEnv = process.env): Config {
  const parsed = envSchema.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`);
    throw new Error(`Invalid configuration:\n  ${lines.join('\n  ')}`);
  }
  const e = parsed.data;
  const dataDir = resolve(e.DATA_DIR);
  const baseUrl = (e.BASE_URL ?? `http://localhost:${e.PORT}`).replace(/\/$/, '');
  return {
    port: e.PORT,
    host: e.HOST,
    dataDir,
    databaseUrl: e.DATABASE_URL,
    baseUrl,
    trustedOrigins: trustedOriginsFor(baseUrl, e.TRUSTED_ORIGINS),
    authSecret: e.AUTH_SECRET ?? storedSecret(dataDir),
    smtpUrl: e.SMTP_URL,
    mailFrom: e.MAIL_FROM,
    uploadLimitMb: e.UPLOAD_LIMIT_MB,
    logLevel: e.LOG_LEVEL,
    trustProxy: parseTrustProxy(e.TRUST_PROXY),
    signInLimit: e.SIGN_IN_LIMIT,
    seedDemo: e.SEED_DEMO === '1',
    s3: e.COGBOOK_S3_BUCKET
      ? { bucket: e.COGBOOK_S3_BUCKET, endpoint: e.COGBOOK_S3_ENDPOINT, region: e.COGBOOK_S3_REGION, prefix: e.COGBOOK_S3_PREFIX }
      : undefined,
    workerThreads: e.WORKER_THREADS,
    rootDir: findRootDir(),
  };
}

/** The base URL's origin, its localhost/127.0.0.1 twin, and any extra listed origins. */
function trustedOriginsFor(baseUrl: string, extra: string | undefined): string[] {
  const origins = new Set<string>([new URL(baseUrl).origin]);
  const url = new URL(baseUrl);
  const twin = url.hostname === 'localhost' ? '127.0.0.1' : url.hostname === '127.0.0.1' ? 'localhost' : undefined;
  if (twin) {
    url.hostname = twin;
    origins.add(url.origin);
  }
  for (const o of (extra ?? '').split(',').map((s) => s.trim()).filter(Boolean)) origins.add(new URL(o).origin);
  return [...origins];
}

function parseTrustProxy(value: string): boolean | number | string {
  if (value === 'true') return true;
  if (value === 'false' || value === '') return false;
  if (/^\d+$/.test(value)) return Number(value);
  return value;
}

/** Without AUTH_SECRET, a random secret is made once and kept in DATA_DIR/secret (mode 600). */
function storedSecret(dataDir: string): string {
  const file = join(dataDir, 'secret');
  if (existsSync(file)) return readFileSync(file, 'utf8').trim();
  mkdirSync(dataDir, { recursive: true });
  const secret = randomBytes(32).toString('hex');
  writeFileSync(file, `${secret}\n`, { mode: 0o600, flag: 'wx' });
  return secret;
}

function findRootDir(): string {
  let dir = dirname(fileURLToPath(import.meta.url));
  for (let i = 0; i < 6; i++) {
    if (existsSync(join(dir, 'package.json')) && existsSync(join(dir, 'drizzle'))) return dir;
    dir = dirname(dir);
  }
  throw new Error('Cannot find the Cogbook folder (package.json and drizzle/) above the server code.');
}
