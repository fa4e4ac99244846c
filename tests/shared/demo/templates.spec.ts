import { describe, expect, it } from 'vitest';
import { buildDemoNotebook } from '../../../shared/demo/demo-notebooks.js';
import { DEMO_SCENARIOS } from '../../../shared/demo/scenarios.js';
import { instantiateTemplate, listTemplates, type TemplateKey } from '../../../shared/demo/templates.js';
import { createFormulaEngine } from '../../../shared/formula/create-formula-engine.js';
import { notebookDocumentSchema } from '../../../shared/notebook/document.js';
import { runNotebook } from '../../../shared/notebook/run-notebook.js';
import { loadDemoInputs, notFresh } from './demo-inputs.js';

const engine = createFormulaEngine();

describe('listTemplates', () => {
  it('lists the three templates with valid documents, empty slots and the cautions first', () => {
    const templates = listTemplates();
    expect(templates.map((t) => t.key)).toEqual(['compare-two-files', 'per-leg-by-chainring', 'steady-blocks']);
    for (const t of templates) {
      expect(notebookDocumentSchema.safeParse(t.document).success).toBe(true);
      expect(t.document.slots.map((s) => [s.name, s.uploadId])).toEqual([['reference', null], ['test', null]]);
      const first = t.document.cells[0]!;
      expect(first.kind === 'note' && /qualified mechanic/.test(first.config.markdown) && /secure the bike/i.test(first.config.markdown)).toBe(true);
    }
  });

  it('shares the cell chain of the matching demo notebook', () => {
    const chain = (cells: { kind: string; name: string; config: unknown }[]) => cells.filter((c) => c.kind !== 'note').map((c) => [c.kind, c.name]);
    const byKey = Object.fromEntries(listTemplates().map((t) => [t.key, t.document]));
    const none = { reference: null, test: null };
    expect(chain(byKey['per-leg-by-chainring']!.cells)).toEqual(chain(buildDemoNotebook('chainring-gain', none).cells));
    expect(chain(byKey['steady-blocks']!.cells)).toEqual(chain(buildDemoNotebook('trainer-ladder', none).cells));
    expect(chain(byKey['compare-two-files']!.cells)).toEqual(chain(buildDemoNotebook('long-ride', none).cells));
  });
});

describe('instantiateTemplate', { timeout: 60_000 }, () => {
  it('gives fresh cell ids on every call and keeps everything else', () => {
    const template = listTemplates().find((t) => t.key === 'steady-blocks')!.document;
    const a = instantiateTemplate('steady-blocks');
    const b = instantiateTemplate('steady-blocks', { title: 'Ladder, new firmware' });
    const ids = (d: typeof a) => d.cells.map((c) => c.id);
    expect(new Set(ids(a)).size).toBe(a.cells.length);
    for (const id of ids(a)) expect(ids(template).includes(id) || ids(b).includes(id)).toBe(false);
    expect(b.title).toBe('Ladder, new firmware');
    expect(a.cells.map(({ id: _id, ...rest }) => rest)).toEqual(template.cells.map(({ id: _id, ...rest }) => rest));
  });

  it('takes ids from the caller and skips repeats', () => {
    const ids = ['x1', 'x1', 'x2', 'x3', 'x4', 'x5', 'x6', 'x7', 'x8', 'x9', 'x10', 'x11', 'x12'];
    let k = 0;
    const doc = instantiateTemplate('compare-two-files', { newId: () => ids[k++]! });
    expect(doc.cells.map((c) => c.id)).toEqual(ids.slice(1, doc.cells.length + 1));
  });

  it('refuses an unknown key, naming the known ones', () => {
    expect(() => instantiateTemplate('nope' as TemplateKey)).toThrow(/compare-two-files/);
  });

  it('blocks on the empty slots without failing any cell', () => {
    const result = runNotebook(instantiateTemplate('per-leg-by-chainring'), {}, undefined, { engine });
    const states = Object.values(result.outputs).map((o) => o.state);
    expect(states).not.toContain('failed');
    expect(Object.values(result.outputs).filter((o) => o.kind === 'import').map((o) => o.blockedBy?.reason)).toEqual(['empty_slot', 'empty_slot']);
  });

  it('runs every cell once files are dropped in', async () => {
    const demo = await loadDemoInputs(DEMO_SCENARIOS['chainring-gain']);
    for (const key of ['per-leg-by-chainring', 'steady-blocks', 'compare-two-files'] as const) {
      const result = runNotebook(instantiateTemplate(key), demo.inputs, undefined, { engine });
      expect(notFresh(result.outputs), key).toEqual([]);
    }
  }, 120_000);
});
