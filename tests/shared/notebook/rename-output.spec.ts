import { describe, expect, it } from 'vitest';
import { createFormulaEngine } from '../../../shared/formula/index.js';
import { buildGraph } from '../../../shared/notebook/index.js';
import { renameInFormula, renameOutput } from '../../../shared/notebook/rename-output.js';
import { notebook } from './notebook-builders.js';

const engine = createFormulaEngine();

function chain() {
  return notebook([
    { id: 'ref', kind: 'import', config: { slot: 'reference' } },
    { id: 'dut', kind: 'import', config: { slot: 'dut' } },
    { id: 'aligned', kind: 'transform', config: { op: 'align', reference: 'ref', test: 'dut' } },
    { id: 'blocks', kind: 'transform', config: { op: 'segment', source: 'aligned' } },
    { id: 'stats', kind: 'formula', config: { source: 'p = pctdiff(aligned.test_power, aligned.ref_power)\nnote = "aligned"  # aligned stays in text' } },
    { id: 'plot', kind: 'chart', config: { preset: 'bland-altman', bindings: { ref: 'aligned.ref_power', test: 'aligned.test_power' } } },
  ]);
}

describe('renameInFormula', () => {
  it('renames whole-word uses only, not fields, strings, comments or longer names', () => {
    expect(renameInFormula('a = aligned.x + aligned_2 + y.aligned # aligned\nb = "aligned"', 'aligned', 'paired')).toBe(
      'a = paired.x + aligned_2 + y.aligned # aligned\nb = "aligned"',
    );
  });

  it('leaves a function call of the same name alone', () => {
    expect(renameInFormula('x = ratio(ratio.a, 1)', 'ratio', 'r2')).toBe('x = ratio(r2.a, 1)');
  });
});

describe('renameOutput', () => {
  it('renames the cell and every later reference, keeping the dependency graph the same', () => {
    const doc = chain();
    const before = buildGraph(doc, engine);
    const result = renameOutput(doc, 'aligned', 'paired');
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    const cells = Object.fromEntries(result.document.cells.map((c) => [c.id, c]));
    expect(cells['aligned']!.name).toBe('paired');
    expect(cells['blocks']!.config).toMatchObject({ source: 'paired' });
    expect((cells['stats']!.config as { source: string }).source).toBe(
      'p = pctdiff(paired.test_power, paired.ref_power)\nnote = "aligned"  # aligned stays in text',
    );
    expect((cells['plot']!.config as { bindings: Record<string, string> }).bindings).toEqual({ ref: 'paired.ref_power', test: 'paired.test_power' });
    expect(result.changedCells.sort()).toEqual(['blocks', 'plot', 'stats']);

    const after = buildGraph(result.document, engine);
    for (const id of Object.keys(before.cells)) expect(after.cells[id]!.dependsOn).toEqual(before.cells[id]!.dependsOn);
    expect(Object.values(after.cells).every((g) => g.error === undefined || g.cell.kind === 'import')).toBe(true);
    // The input document is untouched.
    expect(doc.cells[2]!.name).toBe('aligned');
  });

  it('renames both sides of an align transform', () => {
    const result = renameOutput(chain(), 'ref', 'reference_ride');
    expect(result.ok && result.document.cells[2]!.config).toMatchObject({ reference: 'reference_ride', test: 'dut' });
  });

  it('refuses a name a parameter or another cell already gives, and non-identifiers', () => {
    expect(renameOutput(chain(), 'aligned', 'tolerance')).toMatchObject({ ok: false, message: expect.stringContaining('parameter') });
    expect(renameOutput(chain(), 'aligned', 'blocks')).toMatchObject({ ok: false, message: expect.stringContaining('another cell') });
    expect(renameOutput(chain(), 'aligned', '2fast')).toMatchObject({ ok: false });
  });
});
