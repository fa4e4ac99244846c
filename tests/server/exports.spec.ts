import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { importResponseSchema } from '../../shared/api/exports.js';
import { NOTEBOOK_EXPORT_VERSION, notebookExportSchema } from '../../shared/notebook/export-format.js';
import { createHash } from 'node:crypto';
import { fitBytes } from './helpers/fixtures.js';
import { recipeDoc } from './helpers/recipe-notebook.js';
import { createTestApp, personalWorkspaceOf, signUp, type Agent, type TestApp } from './helpers/test-app.js';

let t: TestApp;
let analyst: Agent;
let ws: string;
let notebookId: string;
let uploadIds: string[];

async function count(table: 'notebook' | 'upload' | 'notebook_revision' | 'upload_link'): Promise<number> {
  const res = await t.database.db.execute(sql.raw(`select count(*)::int as n from ${table}`));
  return (res as unknown as { rows: { n: number }[] }).rows[0]!.n;
}

beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => t.close());
beforeEach(async () => {
  await t.reset();
  analyst = (await signUp(t, 'analyst@lab.test')).agent;
  ws = await personalWorkspaceOf(analyst);
  const up = async (watts: number, name: string) =>
    (await analyst.post('/api/uploads').field('workspaceId', ws).attach('file', Buffer.from(fitBytes(20, watts)), name).expect(201)).body.uploads[0].id as string;
  uploadIds = [await up(200, 'reference.fit'), await up(215, 'crank.fit')];
  notebookId = (await analyst.post('/api/notebooks').send({ workspaceId: ws, document: recipeDoc({ reference: uploadIds[0]!, test: uploadIds[1]! }) }).expect(201)).body.notebook.id;
});

async function exported(recordings: boolean) {
  const res = await analyst.get(`/api/notebooks/${notebookId}/export`).query(recordings ? { recordings: 1 } : {}).expect(200);
  expect(res.headers['content-disposition']).toMatch(/attachment; filename\*=UTF-8''Mean%20power/);
  return notebookExportSchema.parse(res.body);
}

describe('export and import', () => {
  it('exports the document with its recordings, checksummed', async () => {
    const file = await exported(true);
    expect(file.format).toBe('cogbook-notebook');
    expect(file.formatVersion).toBe(1);
    expect(file.recordings!.map((r) => [r.slot, r.fileName, r.size])).toEqual([
      ['reference', 'reference.fit', fitBytes(20, 200).byteLength],
      ['test', 'crank.fit', fitBytes(20, 215).byteLength],
    ]);
    const bytes = Buffer.from(file.recordings![0]!.base64, 'base64');
    expect(createHash('sha256').update(bytes).digest('hex')).toBe(file.recordings![0]!.sha256);
    expect((await exported(false)).recordings).toBeUndefined();
  });

  it('round trip: export -> import gives an equal notebook that computes the same numbers', async () => {
    const file = await exported(true);
    const original = (await analyst.get(`/api/notebooks/${notebookId}`)).body;
    const { agent: other } = await signUp(t, 'other@else.test');
    const theirs = await personalWorkspaceOf(other);
    const res = importResponseSchema.parse(
      (await other.post('/api/notebooks/import').field('workspaceId', theirs).attach('file', Buffer.from(JSON.stringify(file)), 'nb.cogbook.json').expect(201)).body,
    );
    expect(res.notebook.workspace.id).toBe(theirs);
    expect(res.document).toEqual(original.document);
    // Same bytes -> the same stored uploads (deduplicated by sha256), now readable by the importer.
    expect(res.imported.recordings.map((r) => [r.slot, r.uploadId, r.duplicate])).toEqual([
      ['reference', uploadIds[0], true],
      ['test', uploadIds[1], true],
    ]);
    await other.get(`/api/uploads/${uploadIds[0]}/content`).expect(200);
    const a = (await analyst.post(`/api/notebooks/${notebookId}/runs`).send({}).expect(201)).body.snapshot;
    const b = (await other.post(`/api/notebooks/${res.notebook.id}/runs`).send({}).expect(201)).body.snapshot;
    const values = (s: { cells: { name: string; result?: unknown }[] }) => s.cells.map((c) => [c.name, c.result]);
    expect(values(b)).toEqual(values(a));
  });

  it('imports recordings new to this server as uploads and binds them', async () => {
    const file = await exported(true);
    const fresh = fitBytes(25, 180);
    file.recordings![1] = {
      ...file.recordings![1]!,
      fileName: 'fresh.fit',
      size: fresh.byteLength,
      sha256: createHash('sha256').update(fresh).digest('hex'),
      base64: Buffer.from(fresh).toString('base64'),
    };
    const before = await count('upload');
    const res = importResponseSchema.parse((await analyst.post('/api/notebooks/import').send({ workspaceId: ws, file }).expect(201)).body);
    expect(await count('upload')).toBe(before + 1);
    const added = res.imported.recordings.find((r) => r.slot === 'test')!;
    expect(added).toMatchObject({ fileName: 'fresh.fit', duplicate: false });
    expect(res.document.slots.find((s) => s.name === 'test')!.uploadId).toBe(added.uploadId);
  });

  it('a newer export format is refused with both versions named', async () => {
    const file = { ...(await exported(false)), formatVersion: NOTEBOOK_EXPORT_VERSION + 1 };
    const res = await analyst.post('/api/notebooks/import').send({ workspaceId: ws, file }).expect(400);
    expect(res.body.error.code).toBe('import_too_new');
    expect(res.body.error.message).toContain(`version ${NOTEBOOK_EXPORT_VERSION + 1}`);
    expect(res.body.error.message).toContain(`up to version ${NOTEBOOK_EXPORT_VERSION}`);
  });

  it('a damaged file -> 400 with a clear message and no notebook or upload rows added', async () => {
    const file = await exported(true);
    const fresh = fitBytes(25, 170);
    // The first recording is new and sound; the second is corrupted: nothing at all may be stored.
    file.recordings![0] = { ...file.recordings![0]!, fileName: 'fresh.fit', size: fresh.byteLength, sha256: createHash('sha256').update(fresh).digest('hex'), base64: Buffer.from(fresh).toString('base64') };
    const bytes = Buffer.from(file.recordings![1]!.base64, 'base64');
    bytes[bytes.length - 10] ^= 0xff;
    file.recordings![1]!.base64 = bytes.toString('base64');
    const counts = async () => [await count('notebook'), await count('notebook_revision'), await count('upload'), await count('upload_link')];
    const before = await counts();
    const res = await analyst.post('/api/notebooks/import').send({ workspaceId: ws, file }).expect(400);
    expect(res.body.error).toMatchObject({ code: 'import_invalid' });
    expect(res.body.error.message).toMatch(/crank\.fit.*sha256/);
    const notJson = await analyst.post('/api/notebooks/import').field('workspaceId', ws).attach('file', Buffer.from('{"format": "cogbook-notebook", '), 'cut.json').expect(400);
    expect(notJson.body.error.message).toMatch(/not valid JSON/);
    const badDoc = await analyst.post('/api/notebooks/import').send({ workspaceId: ws, file: { ...file, recordings: [], notebook: { schemaVersion: 2, title: '' } } }).expect(400);
    expect(badDoc.body.error.message).toMatch(/notebook in the export file/);
    expect(await counts()).toEqual(before);
  });

  it('viewers may export but not import; outsiders get 404', async () => {
    const { agent: viewer } = await signUp(t, 'viewer@lab.test');
    await analyst.post(`/api/workspaces/${ws}/members`).send({ email: 'viewer@lab.test', role: 'viewer' }).expect(201);
    const file = (await viewer.get(`/api/notebooks/${notebookId}/export?recordings=1`).expect(200)).body;
    expect(file.recordings).toHaveLength(2);
    await viewer.post('/api/notebooks/import').send({ workspaceId: ws, file }).expect(403);
    const { agent: outsider } = await signUp(t, 'outsider@else.test');
    await outsider.get(`/api/notebooks/${notebookId}/export`).expect(404);
  });
});

describe('older documents', () => {
  it('a revision stored in format 1 is read, exported and run through the migration', async () => {
    const v1 = {
      schemaVersion: 1,
      title: 'Old notebook',
      parameters: [],
      slots: [{ id: 'reference', name: 'reference', label: 'Reference', uploadId: uploadIds[0] }],
      cells: [
        { id: 'a', name: 'ref', kind: 'import', config: { slot: 'reference' } },
        { id: 'b', name: 'm', kind: 'formula', config: { expression: 'mean(ref.power)' } },
        { id: 'c', name: 'n', kind: 'note', config: { text: 'written long ago' } },
      ],
    };
    await t.database.db.execute(sql`update notebook_revision set document = ${JSON.stringify(v1)}::jsonb where notebook_id = ${notebookId}`);
    const got = (await analyst.get(`/api/notebooks/${notebookId}`).expect(200)).body;
    expect(got.document.schemaVersion).toBe(2);
    expect(got.document.cells[1].config.source).toBe('mean(ref.power)');
    expect((await analyst.get(`/api/notebooks/${notebookId}/export`).expect(200)).body.notebook.schemaVersion).toBe(2);
    const run = (await analyst.post(`/api/notebooks/${notebookId}/runs`).send({}).expect(201)).body;
    // Mean of 200..219: (200 + 219) / 2.
    expect(run.snapshot.cells.find((c: { name: string }) => c.name === 'm').result.last).toBeCloseTo(209.5, 9);
  });
});
