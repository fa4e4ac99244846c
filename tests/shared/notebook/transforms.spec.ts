import { describe, expect, it } from 'vitest';
import { createFormulaEngine } from '../../../shared/formula/index.js';
import { runNotebook, type CellOutput } from '../../../shared/notebook/index.js';
import { deviceView, synthesizeRide } from '../../../shared/synthetic/index.js';
import { formula, notebook, recording } from './notebook-builders.js';

const engine = createFormulaEngine();
const ride = synthesizeRide({ seed: 11 });
const reference = deviceView(ride, { label: 'Reference hub', serialNumber: 1 }).recording;
// The device under test reads 2% high on both legs and its clock runs 7 s ahead (known by construction).
const dut = deviceView(ride, { label: 'Test crank', serialNumber: 2, gains: { left: [1.02, 1.02], right: [1.02, 1.02] }, clockOffsetS: 7 }).recording;

const values = (o: CellOutput | undefined) => (o?.result?.type === 'values' ? o.result.values : undefined);

describe('transform cells on a synthetic ride', () => {
  const doc = notebook([
    { id: 'ref', kind: 'import', config: { slot: 'reference' } },
    { id: 'test', kind: 'import', config: { slot: 'dut' } },
    { id: 'aligned', kind: 'transform', config: { op: 'align', reference: 'ref', test: 'test' } },
    { id: 'blocks', kind: 'transform', config: { op: 'segment', source: 'aligned', method: 'steady', minDurationS: 120 } },
    formula('stats', 'total = pctdiff(aligned.test_power, aligned.ref_power)\nper_block = persegment(blocks.test_power, blocks.segment) ./ persegment(blocks.ref_power, blocks.segment) * 100 - 100'),
    { id: 'bars', kind: 'chart', config: { preset: 'bars-tolerance', bindings: { values: 'per_block', tolerance: 'tolerance' } } },
    { id: 'traces', kind: 'chart', config: { preset: 'traces', bindings: { x: 'aligned.time', y1: 'aligned.ref_power', y2: 'aligned.test_power' }, labels: ['Reference', 'Device under test'] } },
  ]);
  const run = runNotebook(doc, { reference, dut }, undefined, { engine });

  it('aligns the clocks and pairs the recordings', () => {
    const aligned = run.outputs['aligned']!;
    expect(aligned.state).toBe('fresh');
    expect(aligned.result?.type === 'table' && aligned.result.table.facts?.['offsetS']).toBe(7);
    expect(aligned.result?.type === 'table' && aligned.result.table.columns.map((c) => c.name)).toEqual(expect.arrayContaining(['ref_power', 'test_power']));
  });

  it('finds the steady blocks and the 2% the device was given', () => {
    const blocks = run.outputs['blocks']!;
    // The default protocol has 8 steady blocks (6 targets, the mis-reported chainring block, the cool-down).
    expect(blocks.result?.type === 'table' && blocks.result.table.segments!.length).toBeGreaterThanOrEqual(7);
    const v = values(run.outputs['stats'])!;
    expect(v['total'] as number).toBeCloseTo(2, 0);
    expect(Math.abs((v['total'] as number) - 2)).toBeLessThan(0.3);
  });

  it('builds the chart cells from bindings', () => {
    expect(run.outputs['bars']).toMatchObject({ state: 'fresh', result: { type: 'chart' } });
    const traces = run.outputs['traces']!;
    expect(traces.result?.type === 'chart' && JSON.stringify(traces.result.spec)).toContain('Device under test');
  });

  it('says which binding of a chart failed', () => {
    const bad = notebook([formula('a', 'x = [1, 2]'), { id: 'ch', kind: 'chart', config: { preset: 'scatter', bindings: { ref: 'x', test: 'x + [1, 2, 3]' } } }]);
    const out = runNotebook(bad, {}, undefined, { engine }).outputs['ch']!;
    expect(out).toMatchObject({ state: 'failed', error: { where: { cell: 'ch', field: 'test' } } });
    expect(out.error!.message).toContain('binding "test"');
  });
});

describe('table transforms', () => {
  const rec = recording([100, 110, 120, 130, 140, 150, 160, 170, 180, 190], { cadence: [80, 80, 80, 80, 80, 80, 80, 80, 80, 80] });

  it('trims to a time range', () => {
    const doc = notebook([
      { id: 'r', kind: 'import', config: { slot: 'reference' } },
      { id: 'part', kind: 'transform', config: { op: 'trim', source: 'r', startS: 2, endS: 5 } },
      formula('f', 'p = part.power'),
    ]);
    const out = runNotebook(doc, { reference: rec }, undefined, { engine });
    expect(values(out.outputs['f'])?.['p']).toEqual(Float64Array.of(120, 130, 140, 150));
  });

  it('smooths with a centred moving average', () => {
    const doc = notebook([
      { id: 'r', kind: 'import', config: { slot: 'reference' } },
      { id: 'sm', kind: 'transform', config: { op: 'smooth', source: 'r', windowS: 3, centred: true } },
      formula('f', 'p = sm.power'),
    ]);
    const p = values(runNotebook(doc, { reference: rec }, undefined, { engine }).outputs['f'])?.['p'] as Float64Array;
    // A centred 3-sample mean of a straight line is the line itself inside the edges.
    expect(Array.from(p.subarray(1, 9))).toEqual([110, 120, 130, 140, 150, 160, 170, 180]);
  });

  it('numbers hand-set sections in a segment column', () => {
    const doc = notebook([
      { id: 'r', kind: 'import', config: { slot: 'reference' } },
      { id: 'seg', kind: 'transform', config: { op: 'segment', source: 'r', method: 'manual', ranges: [{ startS: 0, endS: 3 }, { startS: 5, endS: 8 }] } },
      formula('f', 'm = persegment(seg.power, seg.segment)'),
    ]);
    expect(values(runNotebook(doc, { reference: rec }, undefined, { engine }).outputs['f'])?.['m']).toEqual(Float64Array.of(110, 160));
  });

  it('sets gears by hand over a time range', () => {
    const doc = notebook([
      { id: 'r', kind: 'import', config: { slot: 'reference' } },
      { id: 'g', kind: 'transform', config: { op: 'gears', source: 'r', method: 'override', overrides: [{ startS: 0, endS: 5, frontTeeth: 50 }, { startS: 5, endS: 10, frontTeeth: 34 }] } },
      formula('f', 'by = pergear(g.power, g.front_teeth)'),
    ]);
    const by = values(runNotebook(doc, { reference: rec }, undefined, { engine }).outputs['f'])?.['by'] as Record<string, Float64Array>;
    expect(Array.from(by['gear']!)).toEqual([34, 50]);
    expect(Array.from(by['mean']!)).toEqual([170, 120]);
  });

  it('explains that align needs imported recordings', () => {
    const doc = notebook([
      { id: 'r', kind: 'import', config: { slot: 'reference' } },
      { id: 'sm', kind: 'transform', config: { op: 'smooth', source: 'r' } },
      { id: 'al', kind: 'transform', config: { op: 'align', reference: 'sm', test: 'r' } },
    ]);
    const out = runNotebook(doc, { reference: rec }, undefined, { engine }).outputs['al']!;
    expect(out).toMatchObject({ state: 'failed', error: { code: 'transform_input', where: { cell: 'al' } } });
  });
});
