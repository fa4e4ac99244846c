import { afterAll, beforeAll, expect, it } from 'vitest';
import type { Db } from '../../server/db/client.js';
import { restoreRevision, saveNotebook } from '../../server/services/notebooks.js';
import { notebookResponseSchema } from '../../shared/api/notebooks.js';
import { notebookDoc } from './helpers/fixtures.js';
import { createTestApp, personalWorkspaceOf, signUp, type Agent, type TestApp } from './helpers/test-app.js';

/**
 * Under load the time between a save's commit and its answer grows, and a collaborator's
 * save can land in between. The answer must still describe the save it acknowledges:
 * otherwise the editor takes the collaborator's revision as its next base and its next
 * autosave overwrites that revision without the 409 it should get.
 */
let t: TestApp;
let admin: { agent: Agent; userId: string };
let analyst: Agent;
let notebookId: string;

beforeAll(async () => {
  t = await createTestApp();
  admin = await signUp(t, 'admin@lab.test', 'Ada Admin');
  analyst = (await signUp(t, 'analyst@lab.test', 'Ana Lyst')).agent;
  const workspaceId = await personalWorkspaceOf(admin.agent);
  await admin.agent.post(`/api/workspaces/${workspaceId}/members`).send({ email: 'analyst@lab.test', role: 'analyst' }).expect(201);
  const created = await admin.agent.post('/api/notebooks').send({ workspaceId, document: notebookDoc({ title: 'Shared' }) }).expect(201);
  notebookId = notebookResponseSchema.parse(created.body).notebook.id;
}, 180_000);
afterAll(async () => t.close());

/** The database, with `between` run once right after the next write commits (a save is one statement, a restore too). */
function withSaveInBetween(db: Db, between: () => Promise<void>): Db {
  let pending: (() => Promise<void>) | undefined = between;
  return new Proxy(db, {
    get(target, key, receiver) {
      const value = Reflect.get(target, key, receiver) as unknown;
      if ((key !== 'transaction' && key !== 'execute') || typeof value !== 'function') return typeof value === 'function' ? value.bind(target) : value;
      return async (...args: unknown[]) => {
        const result = await (value as (...a: unknown[]) => Promise<unknown>).apply(target, args);
        const run = pending;
        pending = undefined;
        if (run) await run();
        return result;
      };
    },
  });
}

async function current(): Promise<number> {
  return notebookResponseSchema.parse((await admin.agent.get(`/api/notebooks/${notebookId}`).expect(200)).body).revision;
}

it('a save answers with the revision it wrote, not one a collaborator saved just after it', async () => {
  const base = await current();
  const mine = notebookDoc({ title: 'Mine' });
  const db = withSaveInBetween(t.database.db, async () => {
    await analyst.put(`/api/notebooks/${notebookId}`).send({ baseRevision: base + 1, document: notebookDoc({ title: 'Theirs' }) }).expect(200);
  });
  const answer = await saveNotebook(db, admin.userId, notebookId, { baseRevision: base, document: mine });
  expect(answer.revision).toBe(base + 1);
  expect(answer.notebook.revision).toBe(base + 1);
  expect(answer.document.title).toBe('Mine');

  // The next autosave builds on the acknowledged revision and is refused: the collaborator's save stays the head.
  const next = await admin.agent.put(`/api/notebooks/${notebookId}`).send({ baseRevision: answer.notebook.revision, document: notebookDoc({ title: 'Mine again' }) });
  expect(next.status).toBe(409);
  const head = notebookResponseSchema.parse((await admin.agent.get(`/api/notebooks/${notebookId}`).expect(200)).body);
  expect(head.revision).toBe(base + 2);
  expect(head.document.title).toBe('Theirs');
});

it('a restore answers with the revision it wrote as well', async () => {
  const base = await current();
  const db = withSaveInBetween(t.database.db, async () => {
    await analyst.put(`/api/notebooks/${notebookId}`).send({ baseRevision: base + 1, document: notebookDoc({ title: 'Theirs later' }) }).expect(200);
  });
  const answer = await restoreRevision(db, admin.userId, notebookId, 1);
  expect(answer.revision).toBe(base + 1);
  expect(answer.notebook.revision).toBe(base + 1);
  expect(answer.document.title).toBe('Shared');
});
