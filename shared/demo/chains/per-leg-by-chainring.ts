import type { NotebookCell, NotebookParameter } from '../../notebook/document.js';
import { chartCell, formulaCell, importCell, transformCell } from '../cells.js';

/** Parameters the per-leg chain reads: stated tolerance and the two chainrings' teeth. */
export function perLegParameters(tolerancePct: number, rings: { small: number; big: number }): NotebookParameter[] {
  return [
    { name: 'tolerance', value: tolerancePct, unit: '%', label: 'Stated accuracy of the device under test' },
    { name: 'big_ring', value: rings.big, unit: 'T', label: 'Large chainring, teeth' },
    { name: 'small_ring', value: rings.small, unit: 'T', label: 'Small chainring, teeth' },
  ];
}

/**
 * Two dual-sided recordings compared leg by leg and chainring by chainring: import both,
 * align, find steady blocks, attach the gear from the shift events, then percent
 * differences per leg per chainring (over steady blocks only), the ratio of the two
 * chainrings' ratios (isolates a gear effect from a constant offset), one value per
 * block, a bar chart against the tolerance and a Bland-Altman plot.
 */
export function perLegByChainringCells(testLabel: string): NotebookCell[] {
  return [
    importCell('import-reference', 'ref', 'reference'),
    importCell('import-test', 'dut', 'test'),
    transformCell('align', 'aligned', { op: 'align', reference: 'ref', test: 'dut', mode: 'auto', maxLagS: 120 }),
    transformCell('steady-blocks', 'blocks', { op: 'segment', source: 'aligned', method: 'steady', tolerancePct: 5, minDurationS: 180 }),
    transformCell('gears', 'geared', { op: 'gears', source: 'blocks', method: 'events' }),
    formulaCell('per-leg', 'legs', [
      'steady = geared.segment > 0',
      'on_big = steady and geared.front_teeth == big_ring',
      'on_small = steady and geared.front_teeth == small_ring',
      'left_big = pctdiff(geared.test_left, geared.ref_left, on_big)',
      'left_small = pctdiff(geared.test_left, geared.ref_left, on_small)',
      'right_big = pctdiff(geared.test_right, geared.ref_right, on_big)',
      'right_small = pctdiff(geared.test_right, geared.ref_right, on_small)',
      'total_big = pctdiff(geared.test_power, geared.ref_power, on_big)',
      'total_small = pctdiff(geared.test_power, geared.ref_power, on_small)',
      'left_gear_effect = 100 * (ratio(geared.test_left, geared.ref_left, on_big) / ratio(geared.test_left, geared.ref_left, on_small) - 1)',
      'right_gear_effect = 100 * (ratio(geared.test_right, geared.ref_right, on_big) / ratio(geared.test_right, geared.ref_right, on_small) - 1)',
    ]),
    formulaCell('per-block', 'block_legs', [
      'block_ring = persegment(geared.front_teeth, geared.segment)',
      'block_ref_w = persegment(geared.ref_power, geared.segment)',
      'block_left_pct = 100 * (persegment(geared.test_left, geared.segment) ./ persegment(geared.ref_left, geared.segment) - 1)',
      'block_right_pct = 100 * (persegment(geared.test_right, geared.segment) ./ persegment(geared.ref_right, geared.segment) - 1)',
    ]),
    chartCell(
      'leg-bars',
      'leg_bars',
      'bars-tolerance',
      {
        values: '[legs.left_small, legs.left_big, legs.right_small, legs.right_big]',
        labels: '[concat(string(small_ring), "T"), concat(string(big_ring), "T"), concat(string(small_ring), "T"), concat(string(big_ring), "T")]',
        groups: '["Left leg", "Left leg", "Right leg", "Right leg"]',
        tolerance: 'tolerance',
      },
      { title: 'Difference from the reference by leg and chainring (steady blocks)' },
    ),
    chartCell(
      'agreement',
      'agreement_plot',
      'bland-altman',
      { ref: 'geared.ref_power', test: 'geared.test_power' },
      { title: 'Agreement over the whole ride (Bland-Altman)', labels: [testLabel] },
    ),
  ];
}
