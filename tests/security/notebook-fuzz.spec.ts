import fc from 'fast-check';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { isEngineError } from '../../shared/errors.js';
import { emptyNotebook, NOTEBOOK_SCHEMA_VERSION, notebookDocumentSchema } from '../../shared/notebook/document.js';
import { migrateNotebookDocument } from '../../shared/notebook/migrate-document.js';
import { createTestApp, personalWorkspaceOf, signUp, type Agent, type TestApp } from '../server/helpers/test-app.js';

/**
 * Hostile notebook documents: random JSON, prototype-pollution keys, deep nesting and
 * huge strings, against the migration (the import path) and the notebook routes.
 * Everything must end as a valid document or a typed refusal; never a 500, never a
 * changed Object.prototype.
 */

const RUNS = Number(process.env.FUZZ_RUNS ?? 150);
const HOSTILE_KEYS = ['__proto__', 'constructor', 'prototype', 'toString', 'valueOf', 'hasOwnProperty', '__defineGetter__', 'isAdmin', 'polluted'];

/** A JSON tree kept as data, so `__proto__` becomes an own key only when JSON.parse reads the text (as express.json does). */
type Tree = { t: 'v'; v: null | boolean | number | string } | { t: 'a'; items: Tree[] } | { t: 'o'; entries: [string, Tree][] };

const scalar = fc.oneof(
  fc.constant(null),
  fc.boolean(),
  fc.double({ noNaN: true, noDefaultInfinity: true }),
  fc.integer(),
  fc.string({ maxLength: 20 }),
  fc.constantFrom('', 'note', 'formula', 'chart', 'import', 'transform', 'align', '<img src=x onerror=alert(1)>', 'javascript:alert(1)', '\u0000', '\ud800'),
);
const key = fc.oneof({ weight: 3, arbitrary: fc.constantFrom(...HOSTILE_KEYS) }, fc.constantFrom('schemaVersion', 'title', 'cells', 'config', 'kind', 'name', 'id', 'slots', 'spec', 'csvMapping', 'markdown', 'source'), fc.string({ maxLength: 8 }));
const { tree } = fc.letrec<{ tree: Tree }>((tie) => ({
  tree: fc.oneof(
    { depthSize: 'small', withCrossShrink: true },
    scalar.map((v): Tree => ({ t: 'v', v })),
    fc.array(tie('tree'), { maxLength: 4 }).map((items): Tree => ({ t: 'a', items })),
    fc.array(fc.tuple(key, tie('tree')), { maxLength: 5 }).map((entries): Tree => ({ t: 'o', entries })),
  ),
}));

function toJson(node: Tree): string {
  if (node.t === 'v') return JSON.stringify(node.v) ?? 'null';
  if (node.t === 'a') return `[${node.items.map(toJson).join(',')}]`;
  return `{${node.entries.map(([k, v]) => `${JSON.stringify(k)}:${toJson(v)}`).join(',')}}`;
}

/** A valid document with one field (anywhere in it) replaced by hostile JSON text. */
const validDocText = (title: string) => {
  const doc = emptyNotebook(title);
  return {
    ...doc,
    slots: [{ id: 's1', name: 'reference', label: 'Reference', uploadId: null, csvMapping: { time: 'time' } }],
    cells: [
      { id: 'c1', kind: 'import', name: 'ref', config: { slot: 'reference' } },
      { id: 'c2', kind: 'note', name: 'intro', config: { markdown: 'Hello' } },
      { id: 'c3', kind: 'chart', name: 'plot', config: { preset: 'traces', bindings: {}, spec: { mark: 'line' } } },
    ],
  };
};
const PLACEHOLDER = '"@@HOSTILE@@"';
const slotPaths = ['title', 'description', 'parameters', 'slots', 'cells', 'schemaVersion'];
const hostileDocText = fc.tuple(fc.constantFrom(...slotPaths, 'csvMapping', 'spec', 'config', 'cell'), tree).map(([where, t]) => {
  const doc = validDocText('Fuzzed') as Record<string, unknown>;
  const marker = '@@HOSTILE@@';
  if (where === 'csvMapping') (doc.slots as Record<string, unknown>[])[0]!.csvMapping = marker;
  else if (where === 'spec') ((doc.cells as { config: Record<string, unknown> }[])[2]!.config.spec = marker);
  else if (where === 'config') (doc.cells as Record<string, unknown>[])[1]!.config = marker;
  else if (where === 'cell') (doc.cells as unknown[])[0] = marker;
  else doc[where] = marker;
  return JSON.stringify(doc).replace(PLACEHOLDER, () => toJson(t));
});
const anyDocText = fc.oneof(tree.map(toJson), hostileDocText);

const prototypeKeys = () => Object.getOwnPropertyNames(Object.prototype).sort().join(',');
const PROTOTYPE_BEFORE = prototypeKeys();

function expectPrototypesIntact(): void {
  expect(prototypeKeys()).toBe(PROTOTYPE_BEFORE);
  const probe = {} as Record<string, unknown>;
  for (const k of ['polluted', 'isAdmin', 'title', 'cells', 'spec']) expect(probe[k], `Object.prototype.${k}`).toBeUndefined();
  expect(Object.getPrototypeOf(probe)).toBe(Object.prototype);
}

afterEach(expectPrototypesIntact);

describe('migrateNotebookDocument on hostile JSON', () => {
  it(`returns a valid document or throws a typed notebook error (${RUNS * 4} runs)`, () => {
    const codes = new Map<string, number>();
    fc.assert(
      fc.property(anyDocText, (text) => {
        const input: unknown = JSON.parse(text);
        try {
          const doc = migrateNotebookDocument(input);
          expect(notebookDocumentSchema.safeParse(doc).success).toBe(true);
          expect(doc.schemaVersion).toBe(NOTEBOOK_SCHEMA_VERSION);
          codes.set('ok', (codes.get('ok') ?? 0) + 1);
        } catch (error) {
          expect(isEngineError(error), String(error)).toBe(true);
          const code = (error as { code: string }).code;
          expect(['notebook_invalid', 'notebook_too_new']).toContain(code);
          codes.set(code, (codes.get(code) ?? 0) + 1);
        }
        expectPrototypesIntact();
      }),
      { numRuns: RUNS * 4 },
    );
    // Both outcomes were exercised, so the fuzzing reached past the first check.
    expect(codes.get('ok')).toBeGreaterThan(0);
    expect(codes.get('notebook_invalid')).toBeGreaterThan(0);
  });

  it('keeps __proto__ keys as plain data (no prototype change on the result)', () => {
    const input = JSON.parse(
      '{"title":"P","__proto__":{"polluted":1},"cells":[{"id":"c","kind":"note","name":"n","config":{"__proto__":{"isAdmin":true},"text":"x"}}],' +
        '"slots":[{"id":"s","name":"s","label":"","uploadId":null,"csvMapping":{"__proto__":{"polluted":2},"constructor":{"prototype":{"polluted":3}}}}]}',
    ) as unknown;
    const doc = migrateNotebookDocument(input);
    expect(Object.getPrototypeOf(doc)).toBe(Object.prototype);
    expect((doc as unknown as Record<string, unknown>).polluted).toBeUndefined();
    expect((doc.cells[0]!.config as Record<string, unknown>).isAdmin).toBeUndefined();
  });

  it('refuses deep nesting and huge strings quickly with a typed error', () => {
    const deep = `{"title":"D","cells":${'['.repeat(50_000)}${']'.repeat(50_000)}}`;
    const huge = JSON.stringify({ title: 'x'.repeat(3_000_000), cells: [] });
    for (const text of [deep, huge]) {
      const started = performance.now();
      expect(() => migrateNotebookDocument(JSON.parse(text))).toThrow(expect.objectContaining({ code: 'notebook_invalid' }));
      expect(performance.now() - started).toBeLessThan(5000);
    }
  });
});

describe('notebook routes on hostile bodies', () => {
  let t: TestApp;
  let agent: Agent;
  let workspaceId: string;
  let notebookId: string;

  beforeAll(async () => {
    t = await createTestApp();
    agent = (await signUp(t, 'fuzzer@lab.test')).agent;
    workspaceId = await personalWorkspaceOf(agent);
    notebookId = (await agent.post('/api/notebooks').send({ workspaceId, document: emptyNotebook('Target') }).expect(201)).body.notebook.id;
  });
  afterAll(async () => t?.close());

  /** The one refusal shape; a 2xx must carry a document that passes the schema. */
  function expectHandled(res: { status: number; body: { error?: { code: unknown; message: unknown }; document?: unknown } }, what: string): void {
    expect(res.status, `${what}: ${JSON.stringify(res.body).slice(0, 300)}`).toBeLessThan(500);
    if (res.status >= 400) {
      expect(res.body.error, what).toMatchObject({ code: expect.any(String), message: expect.any(String) });
    } else {
      expect(notebookDocumentSchema.safeParse(res.body.document).success, what).toBe(true);
    }
  }

  it(`POST /api/notebooks answers 201 or a typed 4xx for random documents (${RUNS} runs)`, async () => {
    const statuses = new Map<number, number>();
    await fc.assert(
      fc.asyncProperty(anyDocText, async (docText) => {
        const res = await agent.post('/api/notebooks').set('Content-Type', 'application/json').send(`{"workspaceId":${JSON.stringify(workspaceId)},"document":${docText}}`);
        statuses.set(res.status, (statuses.get(res.status) ?? 0) + 1);
        expectHandled(res, 'POST');
        expectPrototypesIntact();
      }),
      { numRuns: RUNS },
    );
    expect(statuses.get(400)).toBeGreaterThan(0);
  });

  it(`PUT /api/notebooks/:id answers 200/409 or a typed 4xx for random bodies (${RUNS} runs)`, async () => {
    await fc.assert(
      fc.asyncProperty(anyDocText, tree, fc.boolean(), async (docText, extra, wrapped) => {
        const current = (await agent.get(`/api/notebooks/${notebookId}`)).body.revision as number;
        const body = wrapped ? `{"baseRevision":${current},"document":${docText},"summary":"fuzz"}` : toJson(extra);
        const res = await agent.put(`/api/notebooks/${notebookId}`).set('Content-Type', 'application/json').send(body);
        expectHandled(res, 'PUT');
        expectPrototypesIntact();
      }),
      { numRuns: RUNS },
    );
    // The notebook is still readable and valid after the barrage.
    const after = await agent.get(`/api/notebooks/${notebookId}`).expect(200);
    expect(notebookDocumentSchema.safeParse(after.body.document).success).toBe(true);
  });

  it('answers deeply nested documents with a 4xx, not a 500 or a crash', async () => {
    for (const depth of [1_000, 10_000, 100_000, 1_000_000]) {
      const nested = `${'['.repeat(depth)}${']'.repeat(depth)}`;
      const doc = JSON.stringify(validDocText('Deep')).replace('{"time":"time"}', `{"deep":${nested}}`).replace('{"mark":"line"}', `{"deep":${nested}}`);
      const started = Date.now();
      const res = await agent.post('/api/notebooks').set('Content-Type', 'application/json').send(`{"workspaceId":${JSON.stringify(workspaceId)},"document":${doc}}`);
      expectHandled(res, `depth ${depth}`);
      if (depth >= 10_000) expect(res.status, `depth ${depth}`).toBeGreaterThanOrEqual(400);
      expect(Date.now() - started).toBeLessThan(30_000);
    }
    await agent.get('/api/health').expect(200);
  });

  it('refuses NUL characters, unpaired surrogates and deep nesting before they reach the database', async () => {
    const cases = [
      { ...emptyNotebook('nul \u0000 in the title') },
      { ...emptyNotebook('x'), cells: [{ id: 'c', kind: 'note', name: 'n', config: { markdown: 'half \ud800 a pair' } }] },
      { ...emptyNotebook('x'), slots: [{ id: 's', name: 's', label: '', uploadId: null, csvMapping: { 'key\u0000': 1 } }] },
      { ...emptyNotebook('x'), slots: [{ id: 's', name: 's', label: '', uploadId: null, csvMapping: { a: JSON.parse('['.repeat(70) + ']'.repeat(70)) as unknown } }] },
    ];
    for (const document of cases) {
      const created = await agent.post('/api/notebooks').send({ workspaceId, document });
      expect(created.status, JSON.stringify(created.body)).toBe(400);
      expect(created.body.error.code).toBe('validation_failed');
      expect(created.body.error.details.fields[0].path).toMatch(/^document\./);
      const current = (await agent.get(`/api/notebooks/${notebookId}`)).body.revision as number;
      const saved = await agent.put(`/api/notebooks/${notebookId}`).send({ baseRevision: current, document });
      expect(saved.status).toBe(400);
    }
    const current = (await agent.get(`/api/notebooks/${notebookId}`)).body.revision as number;
    const summary = await agent.put(`/api/notebooks/${notebookId}`).send({ baseRevision: current, document: emptyNotebook('ok'), summary: 'a\u0000b' });
    expect(summary.status).toBe(400);
    await agent.post(`/api/notebooks/${notebookId}/revisions/1/restore`).send({ summary: '\u0000' }).expect(400);
    // A vega-lite-like spec nested a dozen levels is fine.
    const spec = JSON.parse('{"a":'.repeat(12) + '1' + '}'.repeat(12)) as Record<string, unknown>;
    const chart = { ...emptyNotebook('Nested spec'), cells: [{ id: 'c', kind: 'chart', name: 'plot', config: { preset: 'traces', bindings: {}, spec } }] };
    await agent.post('/api/notebooks').send({ workspaceId, document: chart }).expect(201);
  });

  it('answers huge strings and too many cells with 400/413', async () => {
    const tooLong = { ...emptyNotebook('x'), title: 'y'.repeat(201) };
    const tooMany = { ...emptyNotebook('x'), cells: Array.from({ length: 501 }, (_, i) => ({ id: `c${i}`, kind: 'note', name: `n${i}`, config: { markdown: '' } })) };
    const bigNote = { ...emptyNotebook('x'), cells: [{ id: 'c', kind: 'note', name: 'n', config: { markdown: 'z'.repeat(4_000_000) } }] };
    for (const [doc, status] of [[tooLong, 400], [tooMany, 400], [bigNote, 400]] as const) {
      const res = await agent.post('/api/notebooks').send({ workspaceId, document: doc });
      expect(res.status).toBe(status);
      expect(res.body.error.code).toBe('validation_failed');
    }
    const res = await agent.post('/api/notebooks').set('Content-Type', 'application/json').send(`{"workspaceId":"${workspaceId}","document":{"title":"${'q'.repeat(6_000_000)}"}}`);
    expect(res.status).toBe(413);
  });
});
