import { createHash } from 'node:crypto';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { uploadMetaSchema, uploadResponseSchema } from '../../shared/api/uploads.js';
import { createTestApp, personalWorkspaceOf, signUp, type Agent, type TestApp } from './helpers/test-app.js';
import { fitBytes } from './helpers/fixtures.js';

let t: TestApp;
let agent: Agent;
let workspaceId: string;

beforeAll(async () => {
  t = await createTestApp({ UPLOAD_LIMIT_MB: '1' });
});
afterAll(async () => t.close());
beforeEach(async () => {
  await t.reset();
  agent = (await signUp(t, 'tester@lab.test')).agent;
  workspaceId = await personalWorkspaceOf(agent);
});

const sha256 = (b: Uint8Array) => createHash('sha256').update(b).digest('hex');

describe('uploads', () => {
  it('stores a FIT file by content, keyed by its sha256, and gives the same bytes back', async () => {
    const fit = fitBytes(30);
    const res = await agent.post('/api/uploads').attach('file', Buffer.from(fit), 'ride.fit').expect(201);
    const [meta] = uploadResponseSchema.parse(res.body).uploads;
    expect(meta).toMatchObject({ format: 'fit', fileName: 'ride.fit', size: fit.byteLength, sha256: sha256(fit), workspaceId, duplicate: false });

    const got = await agent.get(`/api/uploads/${meta!.id}`).expect(200);
    expect(uploadMetaSchema.parse(got.body).sha256).toBe(sha256(fit));
    const content = await agent.get(`/api/uploads/${meta!.id}/content`).buffer(true).parse((res, cb) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    expect(content.status).toBe(200);
    expect(content.headers['content-type']).toBe('application/octet-stream');
    expect(sha256(new Uint8Array(content.body as Buffer))).toBe(sha256(fit));
  });

  it('stores the same file once: a second upload gets the same id', async () => {
    const fit = fitBytes(12);
    const a = await agent.post('/api/uploads').attach('file', Buffer.from(fit), 'a.fit').expect(201);
    const b = await agent.post('/api/uploads').attach('file', Buffer.from(fit), 'renamed.fit').expect(201);
    expect(b.body.uploads[0].id).toBe(a.body.uploads[0].id);
    expect(b.body.uploads[0].duplicate).toBe(true);
    // Someone in another workspace uploading the same bytes may then read it too.
    const other = await signUp(t, 'other@lab.test');
    await other.agent.get(`/api/uploads/${a.body.uploads[0].id}`).expect(404);
    const c = await other.agent.post('/api/uploads').attach('file', Buffer.from(fit), 'mine.fit').expect(201);
    expect(c.body.uploads[0].id).toBe(a.body.uploads[0].id);
    await other.agent.get(`/api/uploads/${a.body.uploads[0].id}`).expect(200);
  });

  it('accepts several files in one request, CSV included', async () => {
    const csv = Buffer.from('time,power,cadence\n0,250,90\n1,251,91\n', 'utf8');
    const res = await agent
      .post('/api/uploads')
      .field('workspaceId', workspaceId)
      .attach('file', Buffer.from(fitBytes(8)), 'dut.fit')
      .attach('file', csv, 'reference.csv')
      .expect(201);
    expect(res.body.uploads.map((u: { format: string }) => u.format)).toEqual(['fit', 'csv']);
  });

  it('refuses a file larger than the limit with 413 naming the limit in MB', async () => {
    const big = Buffer.alloc(1024 * 1024 + 10, 0x41);
    const res = await agent.post('/api/uploads').attach('file', big, 'huge.csv').expect(413);
    expect(res.body.error.code).toBe('payload_too_large');
    expect(res.body.error.message).toContain('1 MB');
    expect(res.body.error.details.limitMb).toBe(1);
  });

  it('refuses a file named .fit that is not FIT, saying so', async () => {
    const png = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52]);
    const res = await agent.post('/api/uploads').attach('file', png, 'ride.fit').expect(415);
    expect(res.body.error.code).toBe('unsupported_file');
    expect(res.body.error.message).toContain('ride.fit');
    expect(res.body.error.message).toMatch(/not a FIT file/);
  });

  it('refuses a FIT file whose checksum does not match', async () => {
    const fit = fitBytes(10);
    fit[fit.length - 5] = fit[fit.length - 5]! ^ 0xff;
    const res = await agent.post('/api/uploads').attach('file', Buffer.from(fit), 'damaged.fit').expect(415);
    expect(res.body.error.details.reason).toBe('fit_crc');
  });

  it('keeps a FIT file whose checksum fails when the person chose to read it anyway, with the damage as a warning', async () => {
    const fit = fitBytes(10);
    fit[fit.length - 5] = fit[fit.length - 5]! ^ 0xff;
    const res = await agent.post('/api/uploads').field('readDamaged', 'true').attach('file', Buffer.from(fit), 'damaged-kept.fit').expect(201);
    expect(res.body.uploads[0].fileName).toBe('damaged-kept.fit');
    expect(res.body.uploads[0].warnings).toEqual([expect.objectContaining({ code: 'fit_crc', message: expect.stringContaining('damaged-kept.fit: the FIT file checksum fails') })]);
  });

  it('asks for a file when none is attached', async () => {
    const res = await agent.post('/api/uploads').field('workspaceId', workspaceId).expect(400);
    expect(res.body.error.code).toBe('no_file');
  });
});
