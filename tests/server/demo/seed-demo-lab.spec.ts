import { createHash } from 'node:crypto';
import supertest from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { notebookListResponseSchema, notebookResponseSchema } from '../../../shared/api/notebooks.js';
import { generateDemoFiles } from '../../../shared/demo/demo-files.js';
import { buildDemoNotebook } from '../../../shared/demo/demo-notebooks.js';
import { DEMO_SAMPLE_FILES, sampleUploadIds } from '../../../shared/demo/sample-files.js';
import { DEMO_SCENARIOS, listDemoScenarios } from '../../../shared/demo/scenarios.js';
import { createLogger } from '../../../server/logger.js';
import { DEMO_PASSWORD, DEMO_WORKSPACE_NAME, seedDemo, type DemoSeed } from '../../../server/services/seed.js';
import { createTestApp, signUp, type Agent, type TestApp } from '../helpers/test-app.js';

let t: TestApp;
let seed: DemoSeed | null;

const sha = (bytes: Uint8Array): string => createHash('sha256').update(bytes).digest('hex');

async function signIn(email: string): Promise<Agent> {
  const agent = supertest.agent(t.app);
  await agent.post('/api/auth/sign-in/email').send({ email, password: DEMO_PASSWORD }).expect(200);
  return agent;
}

beforeAll(async () => {
  t = await createTestApp();
  seed = await seedDemo({ db: t.database.db, auth: t.auth, logger: createLogger('silent') });
}, 120_000);
afterAll(async () => t.close());

describe('demo lab seed', () => {
  it('creates the three demo notebooks in the lab, owned by the analyst, at revision 1', async () => {
    expect(seed).not.toBeNull();
    const analyst = await signIn('analyst@ridgeline.test');
    const list = notebookListResponseSchema.parse((await analyst.get('/api/notebooks').expect(200)).body);
    expect(list.notebooks.map((n) => n.title).sort()).toEqual(listDemoScenarios().map((s) => s.title).sort());
    for (const n of list.notebooks) {
      expect(n).toMatchObject({ revision: 1, role: 'owner', workspace: { name: DEMO_WORKSPACE_NAME }, owner: { id: seed!.users.analyst } });
    }
  });

  it('binds each notebook to its own stored files, whose bytes are the generated ones', async () => {
    const analyst = await signIn('analyst@ridgeline.test');
    const list = notebookListResponseSchema.parse((await analyst.get('/api/notebooks').expect(200)).body);
    for (const scenario of listDemoScenarios()) {
      const meta = list.notebooks.find((n) => n.title === scenario.title)!;
      const { document } = notebookResponseSchema.parse((await analyst.get(`/api/notebooks/${meta.id}`).expect(200)).body);
      const ids = sampleUploadIds(document);
      expect(document).toEqual(buildDemoNotebook(scenario.key, ids));
      for (const file of generateDemoFiles(scenario)) {
        const res = await analyst.get(`/api/uploads/${ids[file.slot]}/content`).buffer(true).parse(binary).expect(200);
        expect(sha(res.body as Uint8Array)).toBe(sha(file.bytes));
        expect(res.headers['content-disposition']).toContain(encodeURIComponent(file.fileName));
      }
    }
  });

  it('lets a viewer of the lab download the sample files, and nobody outside it', async () => {
    const analyst = await signIn('analyst@ridgeline.test');
    const list = notebookListResponseSchema.parse((await analyst.get('/api/notebooks').expect(200)).body);
    const sampleNotebook = list.notebooks.find((n) => n.title === DEMO_SAMPLE_FILES[0]!.notebookTitle)!;
    const { document } = notebookResponseSchema.parse((await analyst.get(`/api/notebooks/${sampleNotebook.id}`).expect(200)).body);
    const ids = sampleUploadIds(document);
    const viewer = await signIn('viewer@ridgeline.test');
    const outsider = (await signUp(t, 'someone@elsewhere.test')).agent;
    for (const sample of DEMO_SAMPLE_FILES) {
      const meta = await viewer.get(`/api/uploads/${ids[sample.slot]}`).expect(200);
      expect(meta.body).toMatchObject({ fileName: sample.fileName, format: sample.format });
      await viewer.get(`/api/uploads/${ids[sample.slot]}/content`).expect(200);
      await outsider.get(`/api/uploads/${ids[sample.slot]}/content`).expect(404);
    }
  });

  it('does nothing on a database that already has accounts', async () => {
    expect(await seedDemo({ db: t.database.db, auth: t.auth, logger: createLogger('silent') })).toBeNull();
    const analyst = await signIn('analyst@ridgeline.test');
    expect((await analyst.get('/api/notebooks').expect(200)).body.notebooks).toHaveLength(3);
    expect(DEMO_SCENARIOS['chainring-gain'].title).toBe(DEMO_SAMPLE_FILES[0]!.notebookTitle);
  });
});

/** Collects a response body as bytes (supertest would otherwise decode it as text). */
function binary(res: supertest.Response, done: (err: Error | null, body: Uint8Array) => void): void {
  const stream = res as unknown as NodeJS.ReadableStream;
  const chunks: Buffer[] = [];
  stream.on('data', (c: Buffer) => chunks.push(c));
  stream.on('end', () => done(null, new Uint8Array(Buffer.concat(chunks))));
}
