import type { NotebookCell, NotebookParameter } from '../../notebook/document.js';
import { chartCell, formulaCell, importCell, transformCell } from '../cells.js';

/** Parameters the comparison chain reads. */
export function compareParameters(tolerancePct: number): NotebookParameter[] {
  return [
    { name: 'tolerance', value: tolerancePct, unit: '%', label: 'Stated accuracy of the device under test' },
    { name: 'window_s', value: 300, unit: 's', label: 'Averaging window of the difference chart' },
  ];
}

/**
 * A whole ride compared second by second: import both, align automatically (the clock
 * offset is found by cross-correlating power), then agreement while pedalling, drift of
 * the difference in W per hour, missing seconds, the difference over time (averaged over
 * `window_s`) and a Bland-Altman plot.
 */
export function compareCells(testLabel: string, maxLagS = 300): NotebookCell[] {
  return [
    importCell('import-reference', 'ref', 'reference'),
    importCell('import-test', 'dut', 'test'),
    transformCell('align', 'aligned', { op: 'align', reference: 'ref', test: 'dut', mode: 'auto', maxLagS }),
    formulaCell('agreement-figures', 'whole_ride', [
      'pedalling = aligned.cadence > 0',
      'delta = aligned.test_power - aligned.ref_power',
      'ride_pct = pctdiff(aligned.test_power, aligned.ref_power, pedalling)',
      'ba = agreement(aligned.test_power, aligned.ref_power, pedalling)',
      'trend = drift(aligned.time, delta, pedalling)',
      'drift_w_per_h = trend.perHour',
      'missing_s = sum(isNaN(aligned.test_power))',
      'first_hour_pct = pctdiff(aligned.test_power, aligned.ref_power, pedalling and aligned.time < 3600)',
      'last_hour_pct = pctdiff(aligned.test_power, aligned.ref_power, pedalling and aligned.time > max(aligned.time) - 3600)',
    ]),
    chartCell(
      'difference',
      'difference_plot',
      'difference',
      { x: 'aligned.time', test: 'rollavg(aligned.test_power, window_s)', ref: 'rollavg(aligned.ref_power, window_s)' },
      { title: 'Difference from the reference over time (moving average)', labels: [testLabel] },
    ),
    chartCell(
      'agreement',
      'agreement_plot',
      'bland-altman',
      { ref: 'aligned.ref_power', test: 'aligned.test_power' },
      { title: 'Agreement over the whole ride (Bland-Altman)', labels: [testLabel] },
    ),
  ];
}
