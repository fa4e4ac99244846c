import { createHash } from 'node:crypto';
import { eq, sql } from 'drizzle-orm';
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { storeUpload } from '../../server/db/repositories/uploads.js';
import { upload, uploadLink, user, workspace } from '../../server/db/schema.js';
import { useBlobStore, type BlobStore } from '../../server/storage/blob-store.js';
import { bindBlobStore, openObjectStore } from '../../server/storage/open-blob-store.js';
import { fitBytes } from './helpers/fixtures.js';
import { startTestBucket, type TestBucket } from './helpers/s3-bucket.js';
import { createTestApp, personalWorkspaceOf, signUp, type TestApp } from './helpers/test-app.js';

// An upload is two writes: the upload row (metadata, and the bytes with the database store)
// and its workspace link, plus the object itself with a bucket. A failure in any of them
// must leave nothing behind: no row, no link, no object.

const BUCKET = 'cogbook-atomic';

let t: TestApp;
let s3: TestBucket;
let bucket: BlobStore;
let ws1: string;
let ws2: string;

const sha = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');
const rows = () => t.database.db.select({ id: upload.id, sha256: upload.sha256 }).from(upload);
const links = () => t.database.db.select({ uploadId: uploadLink.uploadId, workspaceId: uploadLink.workspaceId }).from(uploadLink);
const input = (bytes: Uint8Array, workspaceId = ws1) => ({ sha256: sha(bytes), fileName: 'ride.fit', format: 'fit' as const, bytes, warnings: [], uploadedBy: 'u1', workspaceId });

/** Makes every insert into `table` fail inside the database, as a full disk or a lost connection would. */
async function refuseWritesTo(table: 'upload' | 'upload_link'): Promise<void> {
  await t.database.db.execute(sql.raw(`create or replace function cogbook_test_refuse() returns trigger language plpgsql as $$ begin raise exception 'write to % refused by the test', tg_table_name; end $$`));
  await t.database.db.execute(sql.raw(`create trigger cogbook_test_refuse before insert on ${table} for each row execute function cogbook_test_refuse()`));
}

/** The store's rejection, by the database's own words (Drizzle wraps them as the cause of "Failed query"). */
async function refusal(stored: Promise<unknown>): Promise<string> {
  const error = (await stored.then(() => new Error('the upload was stored'), (e: unknown) => e)) as Error & { cause?: Error };
  return `${error.message} / ${error.cause?.message ?? ''}`;
}

async function allowWrites(): Promise<void> {
  for (const table of ['upload', 'upload_link']) await t.database.db.execute(sql.raw(`drop trigger if exists cogbook_test_refuse on ${table}`));
  await t.database.db.execute(sql.raw('drop function if exists cogbook_test_refuse()'));
}

beforeAll(async () => {
  s3 = await startTestBucket(BUCKET);
  bucket = (await openObjectStore({ bucket: BUCKET, endpoint: s3.endpoint, region: 'us-east-1', prefix: '' }))!;
  t = await createTestApp();
});

afterAll(async () => {
  await t?.close();
  await s3?.close();
});

beforeEach(async () => {
  await t.reset();
  await s3.empty();
  await t.database.db.insert(user).values({ id: 'u1', name: 'Lab analyst', email: 'a@lab.test' });
  [ws1, ws2] = (await t.database.db.insert(workspace).values([{ name: 'Bench' }, { name: 'Road' }]).returning({ id: workspace.id })).map((w) => w.id);
});

afterEach(allowWrites);

describe('with the bytes in the database', () => {
  beforeEach(() => {
    bindBlobStore(t.database.db, undefined);
  });

  it('a failed link write leaves no upload row behind', async () => {
    const bytes = fitBytes(10, 200);
    await refuseWritesTo('upload_link');
    expect(await refusal(storeUpload(t.database.db, input(bytes)))).toMatch(/write to upload_link refused by the test/);
    expect(await rows()).toEqual([]);
    expect(await links()).toEqual([]);

    // Nothing half-written is found the next time: the same bytes are new, not a duplicate.
    await allowWrites();
    const again = await storeUpload(t.database.db, input(bytes));
    expect(again.duplicate).toBe(false);
    expect(await links()).toEqual([{ uploadId: again.record.id, workspaceId: ws1 }]);
  });

  it('the API answers 500 and the workspace lists no upload', async () => {
    const { agent } = await signUp(t, 'analyst@lab.test');
    const own = await personalWorkspaceOf(agent);
    await refuseWritesTo('upload_link');
    await agent.post('/api/uploads').field('workspaceId', own).attach('file', Buffer.from(fitBytes(8, 180)), 'ride.fit').expect(500);
    const listed = await agent.get('/api/uploads').query({ workspace: own }).expect(200);
    expect(listed.body).toMatchObject({ uploads: [], total: 0 });
    expect(await rows()).toEqual([]);
  });
});

describe('with the bytes in an S3-compatible bucket', () => {
  beforeEach(() => {
    useBlobStore(t.database.db, bucket);
  });

  it('a failed link write leaves no row and no object behind', async () => {
    const bytes = fitBytes(12, 210);
    await refuseWritesTo('upload_link');
    expect(await refusal(storeUpload(t.database.db, input(bytes)))).toMatch(/write to upload_link refused by the test/);
    expect(await rows()).toEqual([]);
    expect(await links()).toEqual([]);
    expect(await s3.keys()).toEqual([]);
  });

  it('a failed row write removes the object put just before', async () => {
    const bytes = fitBytes(12, 220);
    await refuseWritesTo('upload');
    expect(await refusal(storeUpload(t.database.db, input(bytes)))).toMatch(/write to upload refused by the test/);
    expect(await rows()).toEqual([]);
    expect(await s3.keys()).toEqual([]);
  });

  it('a failed second upload of stored bytes keeps the first one’s row and object', async () => {
    const bytes = fitBytes(12, 230);
    const first = await storeUpload(t.database.db, input(bytes, ws1));
    await refuseWritesTo('upload_link');
    expect(await refusal(storeUpload(t.database.db, input(bytes, ws2)))).toMatch(/refused by the test/);
    expect(await rows()).toEqual([{ id: first.record.id, sha256: sha(bytes) }]);
    expect(await links()).toEqual([{ uploadId: first.record.id, workspaceId: ws1 }]);
    expect(await s3.keys()).toEqual([sha(bytes)]);
  });

  it('a new row is written only with its object in place, even if the object went missing after the put', async () => {
    const bytes = fitBytes(12, 240);
    // The first put "succeeds" without storing: as if a failed upload of the same bytes removed it meanwhile.
    let puts = 0;
    useBlobStore(t.database.db, { ...bucket, put: async (key, b) => (++puts === 1 ? undefined : bucket.put(key, b)) });
    const stored = await storeUpload(t.database.db, input(bytes));
    expect(puts).toBe(2);
    expect(stored.duplicate).toBe(false);
    const body = await s3.object(sha(bytes));
    expect(sha(body)).toBe(sha(bytes));
  });

  it('concurrent uploads of the same bytes end with one row, one object and a link per workspace', async () => {
    const bytes = fitBytes(12, 250);
    const results = await Promise.all([storeUpload(t.database.db, input(bytes, ws1)), storeUpload(t.database.db, input(bytes, ws2)), storeUpload(t.database.db, input(bytes, ws1))]);
    expect(new Set(results.map((r) => r.record.id)).size).toBe(1);
    expect(results.filter((r) => !r.duplicate)).toHaveLength(1);
    const [row] = await t.database.db.select({ bytes: upload.bytes }).from(upload).where(eq(upload.sha256, sha(bytes)));
    expect(row).toEqual({ bytes: null });
    expect((await links()).map((l) => l.workspaceId).sort()).toEqual([ws1, ws2].sort());
    expect(await s3.keys()).toEqual([sha(bytes)]);
  });
});
