import supertest from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { uploadListResponseSchema } from '../../shared/api/uploads.js';
import { createTestApp, personalWorkspaceOf, signUp, type Agent, type TestApp } from './helpers/test-app.js';
import { fitBytes } from './helpers/fixtures.js';

let t: TestApp;
let analyst: Agent;
let workspaceId: string;

beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => t.close());
beforeEach(async () => {
  await t.reset();
  analyst = (await signUp(t, 'analyst@lab.test', 'Ana Lyst')).agent;
  workspaceId = await personalWorkspaceOf(analyst);
});

async function upload(agent: Agent, bytes: Uint8Array | string, name: string, workspace = workspaceId): Promise<string> {
  const res = await agent.post('/api/uploads').field('workspaceId', workspace).attach('file', Buffer.from(bytes), name).expect(201);
  return res.body.uploads[0].id as string;
}

describe('GET /api/uploads (earlier uploads of a workspace)', () => {
  it('lists uploads newest first with size, kind, the device and start time the file states, and who uploaded it', async () => {
    const fit = fitBytes(20, 180);
    const first = await upload(analyst, fit, 'reference.fit');
    const second = await upload(analyst, 'time,power\n0,200\n1,201\n', 'crank.csv');
    const res = await analyst.get('/api/uploads').query({ workspace: workspaceId }).expect(200);
    const body = uploadListResponseSchema.parse(res.body);
    expect(body.total).toBe(2);
    expect(body.uploads.map((u) => u.id)).toEqual([second, first]);
    const [csv, ride] = body.uploads;
    expect(csv).toMatchObject({ fileName: 'crank.csv', format: 'csv', device: null, uploadedBy: { name: 'Ana Lyst' } });
    expect(ride).toMatchObject({ fileName: 'reference.fit', format: 'fit', size: fit.byteLength });
    // fitBytes writes file_id serial 4242, first record at 2026-03-01T09:00:00Z with the FIT SDK's encoder.
    expect(ride!.device?.serialNumber).toBe(4242);
    expect(ride!.device?.name).toContain('serial 4242');
    expect(ride!.startedAt).toBe('2026-03-01T09:00:00.000Z');
    expect(Date.parse(ride!.uploadedAt)).toBeLessThanOrEqual(Date.parse(csv!.uploadedAt));
  });

  it('pages with limit and offset and reports the total', async () => {
    const ids: string[] = [];
    for (let i = 0; i < 5; i++) ids.push(await upload(analyst, fitBytes(5, 100 + i), `ride-${i}.fit`));
    const newestFirst = [...ids].reverse();
    const page1 = uploadListResponseSchema.parse((await analyst.get('/api/uploads').query({ workspace: workspaceId, limit: 2 }).expect(200)).body);
    const page3 = uploadListResponseSchema.parse((await analyst.get('/api/uploads').query({ workspace: workspaceId, limit: 2, offset: 4 }).expect(200)).body);
    expect(page1).toMatchObject({ total: 5, limit: 2, offset: 0 });
    expect(page1.uploads.map((u) => u.id)).toEqual(newestFirst.slice(0, 2));
    expect(page3.uploads.map((u) => u.id)).toEqual(newestFirst.slice(4));
  });

  it('shows the same bytes in a second workspace as uploaded there, by its uploader', async () => {
    const other = await signUp(t, 'other@lab.test', 'Otto Other');
    const otherWs = await personalWorkspaceOf(other.agent);
    const fit = fitBytes(8, 150);
    const id = await upload(analyst, fit, 'shared.fit');
    expect(await upload(other.agent, fit, 'mine.fit', otherWs)).toBe(id);
    const theirs = uploadListResponseSchema.parse((await other.agent.get('/api/uploads').query({ workspace: otherWs }).expect(200)).body);
    expect(theirs.uploads).toHaveLength(1);
    expect(theirs.uploads[0]).toMatchObject({ id, uploadedBy: { name: 'Otto Other' } });
  });

  it('answers 404 for a workspace the caller is not a member of, 400 without a workspace, 401 signed out', async () => {
    await upload(analyst, fitBytes(5), 'private.fit');
    const outsider = await signUp(t, 'outsider@lab.test');
    const res = await outsider.agent.get('/api/uploads').query({ workspace: workspaceId }).expect(404);
    expect(JSON.stringify(res.body)).not.toContain('private.fit');
    await analyst.get('/api/uploads').expect(400);
    await analyst.get('/api/uploads').query({ workspace: workspaceId, limit: 1000 }).expect(400);
    await supertest(t.app).get('/api/uploads').query({ workspace: workspaceId }).expect(401);
  });
});
