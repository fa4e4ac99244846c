import type { NotebookCell, NotebookParameter } from '../../notebook/document.js';
import { chartCell, formulaCell, importCell, transformCell } from '../cells.js';

/** Parameters the steady-block chain reads: stated tolerance of the device and of the reference. */
export function steadyBlockParameters(tolerancePct: number, referenceTolerancePct: number): NotebookParameter[] {
  return [
    { name: 'tolerance', value: tolerancePct, unit: '%', label: 'Stated accuracy of the device under test' },
    { name: 'ref_tolerance', value: referenceTolerancePct, unit: '%', label: 'Stated accuracy of the reference' },
  ];
}

/**
 * Steady blocks compared one by one: import both, align, find steady blocks, then one row
 * per block (reference mean, device mean, percent difference, chainring), the overall
 * difference over steady blocks, a line fit of test on reference, bars per block against
 * the tolerance and a scatter with the identity line.
 */
export function steadyBlockCells(testLabel: string): NotebookCell[] {
  return [
    importCell('import-reference', 'ref', 'reference'),
    importCell('import-test', 'dut', 'test'),
    transformCell('align', 'aligned', { op: 'align', reference: 'ref', test: 'dut', mode: 'auto', maxLagS: 120 }),
    transformCell('steady-blocks', 'blocks', { op: 'segment', source: 'aligned', method: 'steady', tolerancePct: 5, minDurationS: 180 }),
    formulaCell('per-block', 'per_block', [
      'block_ref_w = persegment(blocks.ref_power, blocks.segment)',
      'block_test_w = persegment(blocks.test_power, blocks.segment)',
      'block_pct = 100 * (block_test_w ./ block_ref_w - 1)',
      'block_ring = persegment(blocks.front_teeth, blocks.segment)',
      'block_seconds = persegment(blocks.ref_power, blocks.segment, "n")',
      'ring_name(t) = concat(string(t), "T")',
      'block_ring_name = map(block_ring, ring_name)',
    ]),
    formulaCell('overall', 'overall', [
      'in_blocks = blocks.segment > 0',
      'steady_pct = pctdiff(blocks.test_power, blocks.ref_power, in_blocks)',
      'fit = gainfit(blocks.test_power, blocks.ref_power, in_blocks)',
      'combined_tolerance = sqrt(tolerance^2 + ref_tolerance^2)',
      'blocks_within = withintol(per_block.block_pct, tolerance)',
    ]),
    chartCell(
      'block-bars',
      'block_bars',
      'bars-tolerance',
      { values: 'per_block.block_pct', labels: 'round(per_block.block_ref_w)', groups: 'per_block.block_ring_name', tolerance: 'tolerance' },
      { title: 'Difference per steady block (reference W, by chainring)' },
    ),
    chartCell(
      'scatter',
      'scatter_plot',
      'scatter',
      { ref: 'aligned.ref_power', test: 'aligned.test_power' },
      { title: 'Device under test against the reference, with the identity line', labels: [testLabel] },
    ),
  ];
}
