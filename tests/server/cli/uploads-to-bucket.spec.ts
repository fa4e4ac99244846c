import { execFile } from 'node:child_process';
import { createHash } from 'node:crypto';
import { cpSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { PutObjectCommand } from '@aws-sdk/client-s3';
import { eq, sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openDatabase, pgliteDirOf, type Database } from '../../../server/db/client.js';
import { acquireDataDirLock } from '../../../server/db/data-lock.js';
import { readUploadBytes, storeUpload } from '../../../server/db/repositories/uploads.js';
import { upload, user, workspace } from '../../../server/db/schema.js';
import { openBlobStore } from '../../../server/storage/open-blob-store.js';
import { fitBytes } from '../helpers/fixtures.js';
import { S3RVER_CREDENTIALS, startTestBucket, type TestBucket } from '../helpers/s3-bucket.js';
import { ROOT_DIR } from '../helpers/test-app.js';

// `npm run uploads:to-bucket` on an embedded database with uploads kept in their rows, moving
// them into a bucket on s3rver: every object is checked before a row's copy is cleared, a run
// stopped half-way is finished by the next one, and a second run finds nothing to do.

const BUCKET = 'cogbook-moved';
const PREFIX = 'uploads/';
const MIGRATIONS = join(ROOT_DIR, 'drizzle');

interface Run {
  code: number;
  stdout: string;
  stderr: string;
}

let s3: TestBucket;
let endpoint: string;
/** A migrated embedded database with an account and a workspace, copied for each test (creating one costs seconds). */
let template: string;
let workspaceId: string;
const scratch: string[] = [];

const sha = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');

function runMove(dataDir: string, args: string[] = [], env: Record<string, string> = {}): Promise<Run> {
  return new Promise((resolve) => {
    execFile(
      process.execPath,
      ['--import', 'tsx', 'server/cli/uploads-to-bucket.ts', ...args],
      {
        cwd: ROOT_DIR,
        timeout: 120_000,
        env: { ...process.env, ...S3RVER_CREDENTIALS, DATABASE_URL: '', DATA_DIR: dataDir, COGBOOK_S3_BUCKET: BUCKET, COGBOOK_S3_ENDPOINT: endpoint, COGBOOK_S3_PREFIX: PREFIX, ...env },
      },
      (error, stdout, stderr) => resolve({ code: error === null ? 0 : typeof error.code === 'number' ? error.code : -1, stdout, stderr }),
    );
  });
}

/** A fresh embedded database in its own data folder with these uploads stored in their rows. */
async function dataDirWith(files: Uint8Array[]): Promise<{ dataDir: string; ids: string[] }> {
  const dataDir = mkdtempSync(join(tmpdir(), 'cogbook-move-'));
  scratch.push(dataDir);
  cpSync(template, dataDir, { recursive: true });
  const ids = await withDatabase(dataDir, async ({ db }) => {
    const stored: string[] = [];
    for (const [i, bytes] of files.entries()) {
      const { record } = await storeUpload(db, { sha256: sha(bytes), fileName: `ride-${i}.fit`, format: 'fit', bytes, warnings: [], uploadedBy: 'u1', workspaceId });
      stored.push(record.id);
    }
    return stored;
  });
  return { dataDir, ids };
}

async function withDatabase<T>(dataDir: string, use: (database: Database) => Promise<T>): Promise<T> {
  const database = await openDatabase({ pgliteDir: pgliteDirOf(dataDir) });
  try {
    return await use(database);
  } finally {
    await database.close();
  }
}

/** Upload ids whose bytes are still in their row. */
const heldIds = (database: Database) =>
  database.db.select({ id: upload.id }).from(upload).where(sql`${upload.bytes} is not null`).then((rows) => rows.map((r) => r.id).sort());

beforeAll(async () => {
  s3 = await startTestBucket(BUCKET);
  endpoint = s3.endpoint;
  template = mkdtempSync(join(tmpdir(), 'cogbook-move-template-'));
  scratch.push(template);
  const database = await openDatabase({ pgliteDir: pgliteDirOf(template), migrationsFolder: MIGRATIONS });
  try {
    await database.db.insert(user).values({ id: 'u1', name: 'Lab analyst', email: 'a@lab.test' });
    workspaceId = (await database.db.insert(workspace).values({ name: 'Lab' }).returning({ id: workspace.id }))[0]!.id;
  } finally {
    await database.close();
  }
});

afterAll(async () => {
  await s3?.close();
  for (const dir of scratch) rmSync(dir, { recursive: true, force: true });
});

describe('uploads:to-bucket', () => {
  it('moves every upload into the bucket, checked, and a second run finds nothing to move', async () => {
    const files = [fitBytes(10, 150), fitBytes(20, 160), fitBytes(30, 170)];
    const { dataDir, ids } = await dataDirWith(files);

    const dry = await runMove(dataDir, ['--dry-run']);
    expect(dry.stderr).toBe('');
    expect(dry.code).toBe(0);
    expect(dry.stdout).toContain('would move: 3 (');
    expect(await s3.keys()).toEqual([]);
    expect(await withDatabase(dataDir, heldIds)).toEqual([...ids].sort());

    const first = await runMove(dataDir);
    expect(first.stderr).toBe('');
    expect(first.code).toBe(0);
    expect(first.stdout).toContain('before: 3 in the database');
    expect(first.stdout).toContain('moved: 3 (');
    expect(first.stdout).toContain('already in the bucket, checked: 0; failed: 0');
    expect(first.stdout).toContain('after: 0 in the database, 3 in the bucket');
    expect(await s3.keys()).toEqual(files.map((f) => `${PREFIX}${sha(f)}`).sort());
    for (const f of files) expect(sha(await s3.object(`${PREFIX}${sha(f)}`))).toBe(sha(f));

    // The app reads each upload from the bucket now, byte for byte.
    await withDatabase(dataDir, async (database) => {
      expect(await heldIds(database)).toEqual([]);
      await openBlobStore(database.db, { bucket: BUCKET, endpoint, region: 'us-east-1', prefix: PREFIX });
      for (const [i, id] of ids.entries()) expect(sha((await readUploadBytes(database.db, id))!)).toBe(sha(files[i]!));
    });

    const second = await runMove(dataDir);
    expect(second.code).toBe(0);
    expect(second.stdout).toContain('moved: 0 (0.0 MB); already in the bucket, checked: 0; failed: 0');
    expect(second.stdout).toContain('after: 0 in the database, 3 in the bucket');
  }, 180_000);

  it('finishes a run stopped half-way: a whole object is checked and kept, a cut-off one is sent again', async () => {
    const whole = fitBytes(12, 180);
    const cut = fitBytes(14, 190);
    const untouched = fitBytes(16, 200);
    const { dataDir } = await dataDirWith([whole, cut, untouched]);
    // As a stopped run leaves it: one object put but its row not yet cleared, one cut short.
    await s3.client.send(new PutObjectCommand({ Bucket: BUCKET, Key: `${PREFIX}${sha(whole)}`, Body: whole }));
    await s3.client.send(new PutObjectCommand({ Bucket: BUCKET, Key: `${PREFIX}${sha(cut)}`, Body: cut.subarray(0, 40) }));

    const run = await runMove(dataDir);
    expect(run.stderr).toBe('');
    expect(run.code).toBe(0);
    expect(run.stdout).toContain('moved: 2 (');
    expect(run.stdout).toContain('already in the bucket, checked: 1; failed: 0');
    expect(run.stdout).toContain('after: 0 in the database, 3 in the bucket');
    for (const f of [whole, cut, untouched]) expect(sha(await s3.object(`${PREFIX}${sha(f)}`))).toBe(sha(f));
  }, 180_000);

  it('leaves an upload whose database copy does not match its sha256 where it is, names it and exits 1', async () => {
    const good = fitBytes(11, 210);
    const bad = fitBytes(13, 220);
    const { dataDir, ids } = await dataDirWith([good, bad]);
    const damaged = new Uint8Array(bad);
    damaged[20] = damaged[20]! ^ 0xff;
    await withDatabase(dataDir, (database) => database.db.update(upload).set({ bytes: damaged }).where(eq(upload.id, ids[1]!)));

    const run = await runMove(dataDir);
    expect(run.code).toBe(1);
    expect(run.stderr).toContain(`upload ${ids[1]} (ride-1.fit) stays in the database: its database copy`);
    expect(run.stdout).toContain('moved: 1 (');
    expect(run.stdout).toContain('failed: 1');
    expect(run.stdout).toContain('after: 1 in the database');
    expect(await s3.keys()).not.toContain(`${PREFIX}${sha(bad)}`);
    expect(await s3.keys()).toContain(`${PREFIX}${sha(good)}`);
    expect(await withDatabase(dataDir, heldIds)).toEqual([ids[1]]);
  }, 180_000);

  it('refuses without a bucket, with a bucket that does not exist, and while a server holds the data folder', async () => {
    const { dataDir } = await dataDirWith([fitBytes(9, 230)]);
    const unset = await runMove(dataDir, [], { COGBOOK_S3_BUCKET: '' });
    expect(unset.code).toBe(2);
    expect(unset.stderr).toMatch(/^uploads:to-bucket: COGBOOK_S3_BUCKET is not set/);

    const missing = await runMove(dataDir, [], { COGBOOK_S3_BUCKET: 'no-such-bucket' });
    expect(missing.code).toBe(2);
    expect(missing.stderr).toContain('the bucket does not exist (404)');

    const lock = acquireDataDirLock(dataDir);
    try {
      // The lock names this (live) test process as the server.
      const locked = await runMove(dataDir);
      expect(locked.code).toBe(2);
      expect(locked.stderr).toContain(`pid ${process.pid}`);
    } finally {
      lock.release();
    }
    expect(await withDatabase(dataDir, heldIds)).toHaveLength(1);
  }, 180_000);
});
