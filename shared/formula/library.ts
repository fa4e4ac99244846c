/**
 * Cogbook's own formula functions: the trade's statistics, callable from formula cells.
 * The catalogue (FORMULA_LIBRARY) drives completion and hover in the editor; the
 * implementations (in library-functions.ts) call the engine's statistics.
 */

/** One library function as the editor shows it. */
export interface FormulaFunctionDoc {
  name: string;
  /** Call shape with argument names; `?` marks optional arguments. */
  signature: string;
  /** One line: what it returns. */
  doc: string;
  example: string;
}

/** Every Cogbook formula function, alphabetical. */
export const FORMULA_LIBRARY: readonly FormulaFunctionDoc[] = [
  {
    name: 'agreement',
    signature: 'agreement(test, ref, mask?)',
    doc: 'Bland-Altman agreement: {n, bias, sd, lower, upper} of test - ref (95% limits = bias +/- 1.96 sd).',
    example: 'ba = agreement(aligned.test_power, aligned.ref_power)',
  },
  {
    name: 'avg',
    signature: 'avg(values, mask?)',
    doc: 'Mean of the finite values (where mask is true); missing samples are skipped.',
    example: 'avg(aligned.ref_power, aligned.ref_power > 150)',
  },
  {
    name: 'drift',
    signature: 'drift(time, diff, mask?)',
    doc: 'Linear drift of a difference over time: {perHour, intercept, n} (slope in units per hour).',
    example: 'drift(aligned.time, aligned.test_power - aligned.ref_power).perHour',
  },
  {
    name: 'gainfit',
    signature: 'gainfit(test, ref, mask?)',
    doc: 'Least-squares line test = intercept + slope * ref: {n, slope, intercept, r2}.',
    example: 'gainfit(aligned.test_power, aligned.ref_power).slope',
  },
  {
    name: 'med',
    signature: 'med(values, mask?)',
    doc: 'Median of the finite values (where mask is true).',
    example: 'med(aligned.test_cadence)',
  },
  {
    name: 'pctdiff',
    signature: 'pctdiff(test, ref, mask?)',
    doc: 'Percent difference of the test mean against the reference mean over paired samples: 100 * (test - ref) / ref.',
    example: 'pctdiff(aligned.test_power, aligned.ref_power)',
  },
  {
    name: 'pergear',
    signature: 'pergear(values, gears)',
    doc: 'Mean of values for each gear state (e.g. chainring teeth): {gear: [...], mean: [...], n: [...]}.',
    example: 'pergear(aligned.test_power ./ aligned.ref_power, aligned.ref_front_gear_teeth)',
  },
  {
    name: 'persegment',
    signature: 'persegment(values, segments, stat?)',
    doc: 'One value per segment number (1, 2, ...): stat is "mean" (default), "median", "sd", "min", "max" or "n".',
    example: 'persegment(aligned.ref_power, blocks.segment)',
  },
  {
    name: 'ratio',
    signature: 'ratio(test, ref, mask?)',
    doc: 'Ratio of the test mean to the reference mean over paired samples (1.01 = reads 1% high).',
    example: 'ratio(aligned.test_power, aligned.ref_power)',
  },
  {
    name: 'rollavg',
    signature: 'rollavg(values, n)',
    doc: 'Trailing moving average over n samples (n seconds on a 1 s grid); missing samples are skipped.',
    example: 'rollavg(aligned.ref_power, 30)',
  },
  {
    name: 'sdev',
    signature: 'sdev(values, mask?)',
    doc: 'Sample standard deviation (n - 1) of the finite values (where mask is true).',
    example: 'sdev(aligned.test_power - aligned.ref_power)',
  },
  {
    name: 'withintol',
    signature: 'withintol(pct, tol)',
    doc: 'Share of finite percent differences with |pct| <= tol, in percent (0-100).',
    example: 'withintol(persegment_pct, tolerance)',
  },
];

/** A unit the formula editor offers, with what it means. */
export interface FormulaUnitDoc {
  unit: string;
  doc: string;
}

/** Units for completion; any mathjs unit also works (`36 km/h to m/s`). */
export const FORMULA_UNITS: readonly FormulaUnitDoc[] = [
  { unit: 'W', doc: 'watt (power)' },
  { unit: 'kW', doc: 'kilowatt' },
  { unit: 'rpm', doc: 'revolutions per minute (cadence)' },
  { unit: 'N m', doc: 'newton metre (torque)' },
  { unit: 'km/h', doc: 'kilometres per hour' },
  { unit: 'm/s', doc: 'metres per second' },
  { unit: 'Hz', doc: 'per second' },
  { unit: 's', doc: 'second' },
  { unit: 'min', doc: 'minute' },
  { unit: 'h', doc: 'hour' },
  { unit: 'kJ', doc: 'kilojoule (work)' },
  { unit: '%', doc: 'percent: 2% is 0.02' },
];
