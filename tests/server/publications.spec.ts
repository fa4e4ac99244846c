import supertest from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { publicationResponseSchema, publicationSchema, publishedListResponseSchema, publishedNotebookResponseSchema } from '../../shared/api/publications.js';
import { fitBytes } from './helpers/fixtures.js';
import { recipeDoc } from './helpers/recipe-notebook.js';
import { createTestApp, personalWorkspaceOf, signUp, type Agent, type TestApp } from './helpers/test-app.js';

let t: TestApp;
let editor: Agent;
let notebookId: string;
let uploadIds: string[];

beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => t.close());
beforeEach(async () => {
  await t.reset();
  editor = (await signUp(t, 'editor@lab.test')).agent;
  const ws = await personalWorkspaceOf(editor);
  const up = async (watts: number, name: string) =>
    (await editor.post('/api/uploads').field('workspaceId', ws).attach('file', Buffer.from(fitBytes(20, watts)), name).expect(201)).body.uploads[0].id as string;
  uploadIds = [await up(200, 'reference.fit'), await up(220, 'crank.fit')];
  notebookId = (await editor.post('/api/notebooks').send({ workspaceId: ws, document: recipeDoc({ reference: uploadIds[0]!, test: uploadIds[1]! }) }).expect(201)).body.notebook.id;
});

describe('publishing', () => {
  it('publishes a server-computed snapshot readable signed out, without upload ids or bytes', async () => {
    const pub = publicationSchema.parse((await editor.post(`/api/notebooks/${notebookId}/publication`).send({}).expect(200)).body);
    expect(pub.allowDownloads).toBe(false);
    const anon = supertest(t.app);
    const res = await anon.get(`/api/published/${pub.slug}`).expect(200);
    const page = publishedNotebookResponseSchema.parse(res.body);
    expect(page.title).toBe('Mean power, reference vs device');
    expect(page.publishedBy).toEqual({ name: 'editor' });
    expect(page.revision).toBe(1);
    expect(page.files).toBeNull();
    const stats = page.snapshot.cells.find((c) => c.name === 'stats')!.result as { values: Record<string, number> };
    // Means of 200..219 and 220..239: (first + last) / 2.
    expect(stats.values['ref_mean']).toBeCloseTo(209.5, 9);
    expect(stats.values['dut_mean']).toBeCloseTo(229.5, 9);
    for (const id of uploadIds) expect(res.text).not.toContain(id);
    await anon.get(`/api/published/${pub.slug}/files/${uploadIds[0]}`).expect(404);
    const list = publishedListResponseSchema.parse((await anon.get('/api/published').expect(200)).body);
    expect(list.publications.map((p) => p.slug)).toEqual([pub.slug]);
  });

  it('with downloads allowed, names the files and serves their bytes', async () => {
    const pub = (await editor.post(`/api/notebooks/${notebookId}/publication`).send({ allowDownloads: true }).expect(200)).body;
    const page = publishedNotebookResponseSchema.parse((await supertest(t.app).get(`/api/published/${pub.slug}`).expect(200)).body);
    expect(page.files!.map((f) => [f.slot, f.fileName, f.uploadId])).toEqual([
      ['reference', 'reference.fit', uploadIds[0]],
      ['test', 'crank.fit', uploadIds[1]],
    ]);
    const file = await supertest(t.app).get(`/api/published/${pub.slug}/files/${uploadIds[1]}`).buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    }).expect(200);
    expect(new Uint8Array(file.body as Buffer)).toEqual(fitBytes(20, 220));
  });

  it('republishing keeps the slug and takes the new revision; after unpublishing the page is gone', async () => {
    const first = (await editor.post(`/api/notebooks/${notebookId}/publication`).send({}).expect(200)).body;
    const current = (await editor.get(`/api/notebooks/${notebookId}`)).body;
    await editor.put(`/api/notebooks/${notebookId}`).send({ baseRevision: 1, document: { ...current.document, title: 'Renamed' } }).expect(200);
    const second = (await editor.post(`/api/notebooks/${notebookId}/publication`).send({}).expect(200)).body;
    expect(second.slug).toBe(first.slug);
    expect(second.revision).toBe(2);
    expect((await supertest(t.app).get(`/api/published/${first.slug}`).expect(200)).body.title).toBe('Renamed');
    expect((await editor.get(`/api/notebooks/${notebookId}/publication`).expect(200)).body.slug).toBe(first.slug);
    await editor.delete(`/api/notebooks/${notebookId}/publication`).expect(204);
    await supertest(t.app).get(`/api/published/${first.slug}`).expect(404);
    // Not published is a state, not an error: 200 with null (the publish dialog asks before every publish).
    const after = await editor.get(`/api/notebooks/${notebookId}/publication`).expect(200);
    expect(after.headers['content-type']).toMatch(/json/);
    expect(publicationResponseSchema.parse(after.body)).toBeNull();
    await editor.delete(`/api/notebooks/${notebookId}/publication`).expect(404);
  });

  it('answers null for a never-published notebook and 404 for an unknown or unreadable one', async () => {
    const never = await editor.get(`/api/notebooks/${notebookId}/publication`).expect(200);
    expect(never.text).toBe('null');
    await editor.get('/api/notebooks/00000000-0000-4000-8000-000000000000/publication').expect(404);
    const stranger = (await signUp(t, 'stranger@lab.test')).agent;
    await stranger.get(`/api/notebooks/${notebookId}/publication`).expect(404);
    await editor.post(`/api/notebooks/${notebookId}/publication`).send({}).expect(200);
    await stranger.get(`/api/notebooks/${notebookId}/publication`).expect(404);
    await supertest(t.app).get(`/api/notebooks/${notebookId}/publication`).expect(401);
  });
});
