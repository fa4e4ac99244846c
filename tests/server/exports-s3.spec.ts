import { createHash } from 'node:crypto';
import { sql } from 'drizzle-orm';
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { importResponseSchema } from '../../shared/api/exports.js';
import { notebookExportSchema } from '../../shared/notebook/export-format.js';
import { storeUpload } from '../../server/db/repositories/uploads.js';
import { upload, uploadLink } from '../../server/db/schema.js';
import { useBlobStore, type BlobStore } from '../../server/storage/blob-store.js';
import { openBlobStore } from '../../server/storage/open-blob-store.js';
import { fitBytes } from './helpers/fixtures.js';
import { recipeDoc } from './helpers/recipe-notebook.js';
import { startTestBucket, type TestBucket } from './helpers/s3-bucket.js';
import { createTestApp, personalWorkspaceOf, signUp, type Agent, type TestApp } from './helpers/test-app.js';

// Importing an export file with its recordings embedded, while uploads live in an
// S3-compatible bucket: the recordings' bytes go to the bucket like any upload's, and
// an import that fails leaves neither rows nor objects behind.

const BUCKET = 'cogbook-imports';
const PREFIX = 'rides/';

let s3: TestBucket;
let bucket: BlobStore;
let t: TestApp;

const sha = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');

async function count(table: 'notebook' | 'notebook_revision' | 'upload' | 'upload_link'): Promise<number> {
  const res = await t.database.db.execute(sql.raw(`select count(*)::int as n from ${table}`));
  return (res as unknown as { rows: { n: number }[] }).rows[0]!.n;
}
const counts = async () => ({ notebook: await count('notebook'), revision: await count('notebook_revision'), upload: await count('upload'), link: await count('upload_link') });

/** Makes every insert into `table` fail inside the database, as a full disk or a lost connection would. */
async function refuseWritesTo(table: 'notebook_revision' | 'upload_link'): Promise<void> {
  await t.database.db.execute(sql.raw(`create or replace function cogbook_test_refuse() returns trigger language plpgsql as $$ begin raise exception 'write to % refused by the test', tg_table_name; end $$`));
  await t.database.db.execute(sql.raw(`create trigger cogbook_test_refuse before insert on ${table} for each row execute function cogbook_test_refuse()`));
}

async function allowWrites(): Promise<void> {
  for (const table of ['notebook_revision', 'upload_link']) await t.database.db.execute(sql.raw(`drop trigger if exists cogbook_test_refuse on ${table}`));
  await t.database.db.execute(sql.raw('drop function if exists cogbook_test_refuse()'));
}

/** Counts the objects the app puts (the bucket itself still stores them). */
function countingPuts(): { puts: string[] } {
  const seen = { puts: [] as string[] };
  useBlobStore(t.database.db, { ...bucket, put: async (key, bytes) => (seen.puts.push(key), bucket.put(key, bytes)) });
  return seen;
}

beforeAll(async () => {
  s3 = await startTestBucket(BUCKET);
  t = await createTestApp();
  bucket = await openBlobStore(t.database.db, { bucket: BUCKET, endpoint: s3.endpoint, region: 'us-east-1', prefix: PREFIX });
  expect(bucket.kind).toBe('s3');
});

afterAll(async () => {
  await t?.close();
  await s3?.close();
});

/** Empties the database and the bucket, as on a server that has never seen these recordings. */
async function emptyServer(): Promise<void> {
  await t.reset();
  await s3.empty();
  useBlobStore(t.database.db, bucket);
}

let exportFile: ReturnType<typeof notebookExportSchema.parse>;
const recorded = [fitBytes(20, 200), fitBytes(20, 215)];

beforeEach(async () => {
  // The export file is made on this server (recordings read back from the bucket), which is then emptied.
  await emptyServer();
  const { agent } = await signUp(t, 'source@lab.test');
  const ws = await personalWorkspaceOf(agent);
  const up = async (bytes: Uint8Array, name: string) =>
    (await agent.post('/api/uploads').field('workspaceId', ws).attach('file', Buffer.from(bytes), name).expect(201)).body.uploads[0].id as string;
  const [reference, test] = [await up(recorded[0]!, 'reference.fit'), await up(recorded[1]!, 'crank.fit')];
  const nb = (await agent.post('/api/notebooks').send({ workspaceId: ws, document: recipeDoc({ reference, test }) }).expect(201)).body.notebook.id;
  exportFile = notebookExportSchema.parse((await agent.get(`/api/notebooks/${nb}/export`).query({ recordings: 1 }).expect(200)).body);
  expect(exportFile.recordings!.map((r) => r.sha256)).toEqual(recorded.map(sha));
  await emptyServer();
});

afterEach(allowWrites);

async function importer(): Promise<{ agent: Agent; ws: string }> {
  const { agent } = await signUp(t, 'importer@lab.test');
  return { agent, ws: await personalWorkspaceOf(agent) };
}

function importFile(agent: Agent, ws: string, file: unknown) {
  return agent.post('/api/notebooks/import').field('workspaceId', ws).attach('file', Buffer.from(JSON.stringify(file)), 'nb.cogbook.json');
}

describe('importing embedded recordings with a bucket configured', () => {
  it('puts the recordings’ bytes in the bucket and none in the database', async () => {
    const { agent, ws } = await importer();
    const seen = countingPuts();
    const res = importResponseSchema.parse((await importFile(agent, ws, exportFile).expect(201)).body);
    expect(res.imported.recordings.map((r) => [r.slot, r.duplicate])).toEqual([
      ['reference', false],
      ['test', false],
    ]);
    expect(seen.puts.sort()).toEqual(recorded.map(sha).sort());
    expect(await s3.keys()).toEqual(recorded.map((b) => `${PREFIX}${sha(b)}`).sort());
    for (const bytes of recorded) expect(sha(await s3.object(`${PREFIX}${sha(bytes)}`))).toBe(sha(bytes));
    const rows = await t.database.db.select({ sha256: upload.sha256, bytes: upload.bytes, size: upload.size }).from(upload);
    expect(rows.sort((a, b) => a.sha256.localeCompare(b.sha256))).toEqual(
      recorded.map((b) => ({ sha256: sha(b), bytes: null, size: b.byteLength })).sort((a, b) => a.sha256.localeCompare(b.sha256)),
    );
    // The imported notebook's slots name the new uploads, and their bytes come back from the bucket.
    const bound = res.document.slots.map((s) => s.uploadId);
    expect(bound).toEqual(res.imported.recordings.map((r) => r.uploadId));
    const content = await agent.get(`/api/uploads/${bound[1]}/content`).buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    }).expect(200);
    expect(sha(new Uint8Array(content.body as Buffer))).toBe(sha(recorded[1]!));
  });

  it('the same recording in two slots is one row and one object', async () => {
    const { agent, ws } = await importer();
    const [first, second] = exportFile.recordings!;
    const file = { ...exportFile, recordings: [first!, { ...first!, slot: second!.slot }] };
    const res = importResponseSchema.parse((await importFile(agent, ws, file).expect(201)).body);
    expect(res.imported.recordings.map((r) => [r.slot, r.duplicate])).toEqual([
      ['reference', false],
      ['test', true],
    ]);
    expect(new Set(res.imported.recordings.map((r) => r.uploadId)).size).toBe(1);
    expect(await s3.keys()).toEqual([`${PREFIX}${sha(recorded[0]!)}`]);
    expect(await counts()).toMatchObject({ notebook: 1, upload: 1, link: 1 });
  });

  it('a recording this server already holds is linked, not put again', async () => {
    const { agent, ws } = await importer();
    await agent.post('/api/uploads').field('workspaceId', ws).attach('file', Buffer.from(recorded[0]!), 'mine.fit').expect(201);
    const seen = countingPuts();
    const res = importResponseSchema.parse((await importFile(agent, ws, exportFile).expect(201)).body);
    expect(res.imported.recordings.map((r) => [r.slot, r.duplicate])).toEqual([
      ['reference', true],
      ['test', false],
    ]);
    expect(seen.puts).toEqual([sha(recorded[1]!)]);
    expect(await s3.keys()).toEqual(recorded.map((b) => `${PREFIX}${sha(b)}`).sort());
  });

  it('two imports of the same recordings at once both land, sharing one row and one object per recording', async () => {
    const { agent, ws } = await importer();
    const [first, second] = exportFile.recordings!;
    const swapped = { ...exportFile, recordings: [{ ...second!, slot: first!.slot }, { ...first!, slot: second!.slot }] };
    const results = await Promise.all([importFile(agent, ws, exportFile), importFile(agent, ws, swapped)]);
    expect(results.map((r) => r.status)).toEqual([201, 201]);
    const ids = results.map((r) => importResponseSchema.parse(r.body).imported.recordings.map((x) => x.uploadId).sort());
    expect(ids[0]).toEqual(ids[1]);
    expect(await counts()).toMatchObject({ notebook: 2, upload: 2, link: 2 });
    expect(await s3.keys()).toEqual(recorded.map((b) => `${PREFIX}${sha(b)}`).sort());
  });
});

describe('a failed import with a bucket configured', () => {
  it('a damaged file is refused before anything is put: no rows, no objects', async () => {
    const { agent, ws } = await importer();
    const seen = countingPuts();
    const before = await counts();
    // The first recording is sound, the second is corrupted.
    const bytes = Buffer.from(exportFile.recordings![1]!.base64, 'base64');
    bytes[bytes.length - 10]! ^= 0xff;
    const file = { ...exportFile, recordings: [exportFile.recordings![0]!, { ...exportFile.recordings![1]!, base64: bytes.toString('base64') }] };
    const res = await importFile(agent, ws, file).expect(400);
    expect(res.body.error).toMatchObject({ code: 'import_invalid' });
    expect(res.body.error.message).toMatch(/crank\.fit.*sha256/);
    expect(seen.puts).toEqual([]);
    expect(await counts()).toEqual(before);
    expect(await s3.keys()).toEqual([]);
  });

  it('a write refused inside the import’s transaction leaves no rows and removes the objects it put', async () => {
    const { agent, ws } = await importer();
    const before = await counts();
    const seen = countingPuts();
    // The notebook's revision is the last write, after both uploads' rows and links.
    await refuseWritesTo('notebook_revision');
    await importFile(agent, ws, exportFile).expect(500);
    expect(seen.puts.sort()).toEqual(recorded.map(sha).sort());
    expect(await counts()).toEqual(before);
    expect(await s3.keys()).toEqual([]);

    // Nothing half-written is found the next time: both recordings are new again.
    await allowWrites();
    const res = importResponseSchema.parse((await importFile(agent, ws, exportFile).expect(201)).body);
    expect(res.imported.recordings.map((r) => r.duplicate)).toEqual([false, false]);
    expect(await s3.keys()).toEqual(recorded.map((b) => `${PREFIX}${sha(b)}`).sort());
  });

  it('keeps the row and object of a recording another upload stored, removing only the one it put', async () => {
    const { agent, ws } = await importer();
    const earlier = (await agent.post('/api/uploads').field('workspaceId', ws).attach('file', Buffer.from(recorded[0]!), 'mine.fit').expect(201)).body.uploads[0].id as string;
    const before = await counts();
    const seen = countingPuts();
    await refuseWritesTo('upload_link');
    await importFile(agent, ws, exportFile).expect(500);
    expect(seen.puts).toEqual([sha(recorded[1]!)]);
    expect(await counts()).toEqual(before);
    expect(await t.database.db.select({ uploadId: uploadLink.uploadId }).from(uploadLink)).toEqual([{ uploadId: earlier }]);
    expect(await s3.keys()).toEqual([`${PREFIX}${sha(recorded[0]!)}`]);
    expect(sha(await s3.object(`${PREFIX}${sha(recorded[0]!)}`))).toBe(sha(recorded[0]!));
  });
});

describe('storing an upload', () => {
  it('is refused inside a transaction opened elsewhere, where the bucket would not be found', async () => {
    const { agent, userId } = await signUp(t, 'importer@lab.test');
    const bytes = recorded[0]!;
    const input = { sha256: sha(bytes), fileName: 'ride.fit', format: 'fit' as const, bytes, warnings: [], uploadedBy: userId, workspaceId: await personalWorkspaceOf(agent) };
    await expect(t.database.db.transaction((tx) => storeUpload(tx, input))).rejects.toThrow(/transaction/);
    expect(await count('upload')).toBe(0);
    expect(await s3.keys()).toEqual([]);
  });
});
