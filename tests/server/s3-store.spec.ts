import { createHash } from 'node:crypto';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { DeleteObjectCommand } from '@aws-sdk/client-s3';
import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { runResponseSchema } from '../../shared/api/runs.js';
import { upload } from '../../server/db/schema.js';
import { openBlobStore } from '../../server/storage/open-blob-store.js';
import type { S3Settings } from '../../server/storage/s3-store.js';
import { fitBytes } from './helpers/fixtures.js';
import { recipeDoc } from './helpers/recipe-notebook.js';
import { S3RVER_CREDENTIALS, startTestBucket, type TestBucket } from './helpers/s3-bucket.js';
import { freePort, runToExit } from './helpers/spawn-server.js';
import { createTestApp, personalWorkspaceOf, signUp, type Agent, type TestApp } from './helpers/test-app.js';

const BUCKET = 'cogbook-uploads';

let s3: TestBucket;
let endpoint: string;
let settings: S3Settings;
let t: TestApp;
let analyst: Agent;
let workspaceId: string;
const scratch: string[] = [];
const scratchDir = () => {
  const dir = mkdtempSync(join(tmpdir(), 'cogbook-s3-start-'));
  scratch.push(dir);
  return dir;
};

const sha = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');

beforeAll(async () => {
  s3 = await startTestBucket(BUCKET);
  endpoint = s3.endpoint;
  settings = { bucket: BUCKET, endpoint, region: 'us-east-1', prefix: 'rides/' };
  t = await createTestApp();
  const store = await openBlobStore(t.database.db, settings);
  expect(store.kind).toBe('s3');
});
afterAll(async () => {
  await t?.close();
  await s3?.close();
  for (const dir of scratch) rmSync(dir, { recursive: true, force: true });
});
beforeEach(async () => {
  await t.reset();
  await s3.empty();
  analyst = (await signUp(t, 'analyst@lab.test')).agent;
  workspaceId = await personalWorkspaceOf(analyst);
});

async function post(bytes: Uint8Array, name: string, agent = analyst, ws = workspaceId) {
  return agent.post('/api/uploads').field('workspaceId', ws).attach('file', Buffer.from(bytes), name).expect(201);
}

describe('uploads in an S3-compatible bucket', () => {
  it('puts the bytes in the bucket under prefix + sha256 and keeps only metadata in the row', async () => {
    const bytes = fitBytes(20, 240);
    const res = await post(bytes, 'reference.fit');
    const meta = res.body.uploads[0];
    expect(meta).toMatchObject({ sha256: sha(bytes), size: bytes.byteLength, format: 'fit', duplicate: false });
    expect(await s3.keys()).toEqual([`rides/${sha(bytes)}`]);
    const stored = await s3.object(`rides/${sha(bytes)}`);
    expect(Buffer.from(stored).equals(Buffer.from(bytes))).toBe(true);
    const [row] = await t.database.db.select({ bytes: upload.bytes, size: upload.size }).from(upload).where(eq(upload.id, meta.id));
    expect(row).toEqual({ bytes: null, size: bytes.byteLength });
  });

  it('stores the same bytes once: a second upload, also from another workspace, gets the same id', async () => {
    const bytes = fitBytes(15, 300);
    const first = (await post(bytes, 'a.fit')).body.uploads[0];
    const again = (await post(bytes, 'a-again.fit')).body.uploads[0];
    const other = await signUp(t, 'other@lab.test');
    const fromOther = (await post(bytes, 'theirs.fit', other.agent, await personalWorkspaceOf(other.agent))).body.uploads[0];
    expect(again).toMatchObject({ id: first.id, duplicate: true });
    expect(fromOther).toMatchObject({ id: first.id, duplicate: true });
    expect(await s3.keys()).toEqual([`rides/${sha(bytes)}`]);
    expect(await t.database.db.select({ id: upload.id }).from(upload)).toHaveLength(1);
  });

  it('streams the original bytes back from the bucket', async () => {
    const bytes = fitBytes(30, 180);
    const id = (await post(bytes, 'long ride.fit')).body.uploads[0].id;
    const res = await analyst.get(`/api/uploads/${id}/content`).buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    }).expect(200);
    expect(res.headers['content-length']).toBe(String(bytes.byteLength));
    expect(res.headers['content-disposition']).toContain('long%20ride.fit');
    expect(sha(new Uint8Array(res.body as Buffer))).toBe(sha(bytes));
  });

  it('a notebook run reads its recordings from the bucket', async () => {
    const reference = (await post(fitBytes(30, 200), 'reference.fit')).body.uploads[0].id;
    const test = (await post(fitBytes(30, 220), 'crank.fit')).body.uploads[0].id;
    const nb = await analyst.post('/api/notebooks').send({ workspaceId, document: recipeDoc({ reference, test }) }).expect(201);
    const run = runResponseSchema.parse((await analyst.post(`/api/notebooks/${nb.body.notebook.id}/runs`).send({}).expect(201)).body);
    const stats = run.snapshot.cells.find((c) => c.name === 'stats')!.result as { values: Record<string, number> };
    // fitBytes writes watts, watts+1, ...: mean = (first + last) / 2 = 214.5 and 234.5.
    expect(stats.values['ref_mean']).toBeCloseTo(214.5, 9);
    expect(stats.values['dut_mean']).toBeCloseTo(234.5, 9);
    expect(run.failedCells).toBe(0);
  });

  it('a missing object answers an error, not someone else’s bytes', async () => {
    const bytes = fitBytes(12, 150);
    const id = (await post(bytes, 'gone.fit')).body.uploads[0].id;
    await s3.client.send(new DeleteObjectCommand({ Bucket: BUCKET, Key: `rides/${sha(bytes)}` }));
    await analyst.get(`/api/uploads/${id}/content`).expect(404);
  });
});

describe('start-up with an object store', () => {
  it('refuses to start, in one line, when the bucket does not exist', async () => {
    const { code, output } = await runToExit({
      ...S3RVER_CREDENTIALS,
      DATA_DIR: scratchDir(),
      PORT: String(await freePort()),
      SEED_DEMO: '0',
      COGBOOK_S3_BUCKET: 'no-such-bucket',
      COGBOOK_S3_ENDPOINT: endpoint,
    });
    expect(code).toBe(1);
    expect(output).toMatch(/could not start: the upload store s3:\/\/no-such-bucket\/ at http:\/\/127\.0\.0\.1:\d+ cannot be used: the bucket does not exist \(404\)/);
    expect(output).toContain('COGBOOK_S3_ENDPOINT');
  }, 120_000);

  it('refuses to start when nothing answers at the endpoint', async () => {
    const { code, output } = await runToExit({
      ...S3RVER_CREDENTIALS,
      DATA_DIR: scratchDir(),
      PORT: String(await freePort()),
      SEED_DEMO: '0',
      COGBOOK_S3_BUCKET: BUCKET,
      COGBOOK_S3_ENDPOINT: `http://127.0.0.1:${await freePort()}`,
    });
    expect(code).toBe(1);
    expect(output).toMatch(/could not start: the upload store s3:\/\/cogbook-uploads\/ at .* cannot be used: ECONNREFUSED/);
  }, 120_000);
});
