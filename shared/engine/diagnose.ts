import { detectSingleSided, type SingleSidedCheck } from './detect-single-sided.js';
import { fitLegGearGains, type GainCell } from './fit-leg-gear-gains.js';
import { fitLinearModel } from './fit-linear-model.js';
import { olsFit } from './stats/index.js';
import type { Table } from './table.js';

/** Options of {@link diagnose}. */
export interface DiagnoseOptions {
  /** Stated accuracy of the device, percent (default 2). */
  tolerancePct?: number;
  /** Smallest gain error worth naming, percent (default half the tolerance). */
  minEffectPct?: number;
  /** Seconds under this reference power are not pedalling, W (default 50). */
  minPowerW?: number;
  seed?: number;
  replicates?: number;
  blockLength?: number;
}

/** One part of the explanation: a leg (or the total) reading off on some gear states. */
export interface GainFinding {
  leg: 'total' | 'left' | 'right';
  /** Chainrings it applies to; null = all gear states. */
  frontTeeth: number[] | null;
  diffPct: number;
  lowPct: number;
  highPct: number;
}

/** What the diagnosis found, as data and in words. */
export interface Diagnosis {
  minEffectPct: number;
  /** Gain per leg per chainring (and over all), with 95% intervals. */
  gains: GainCell[];
  /** The leg/gear combinations that explain the difference; empty when none stands out. */
  explained: GainFinding[];
  /** Legs that do not deviate, with their largest |difference|, percent. */
  withinLegs: { leg: 'total' | 'left' | 'right'; maxAbsPct: number }[];
  /** Total difference after dividing the explained gains out, percent. */
  residualTotalPct: number;
  zeroOffset: { detected: boolean; interceptW: number; interceptSe: number; slope: number };
  drift: { detected: boolean; wPerHour: number; seWPerHour: number; overRideW: number };
  singleSided: SingleSidedCheck;
  findings: string[];
}

/**
 * Explains a difference between a device and the reference: fits the gain per leg per
 * front chainring (ratio of means, block-bootstrap 95% interval), names the leg/gear
 * combinations that deviate, and states the total once those gains are divided out;
 * also looks for a constant offset (missing zero offset: intercept clearly non-zero at
 * slope ~1), drift (W per hour, after the gains are removed) and single-sided doubling.
 *
 * @example
 * diagnose(paired).findings[0]
 * // "Left leg reads +7.9% (95% CI 7.4 to 8.4) on the 50T chainring only; right leg within 0.3%; with that gain removed the total agrees within 0.4%."
 */
export function diagnose(table: Table, options: DiagnoseOptions = {}): Diagnosis {
  const tolerancePct = options.tolerancePct ?? 2;
  const minEffectPct = options.minEffectPct ?? tolerancePct / 2;
  const minPowerW = options.minPowerW ?? 50;
  const c = table.columns;
  const ref = c.ref_power!;
  const n = ref.length;
  const pedalling = new Uint8Array(n);
  for (let i = 0; i < n; i++) pedalling[i] = ref[i]! >= minPowerW ? 1 : 0;
  const zeroOffset = detectZeroOffset(table, pedalling);
  const fit = fitDrift(table, pedalling);
  const hours = n > 1 ? (table.timeS[n - 1]! - table.timeS[0]!) / 3600 : 0;
  const meanRef = meanOf(ref, pedalling);
  const overRideW = fit.wPerHour * hours;
  const drift = {
    detected: Math.abs(fit.wPerHour) >= 4 * fit.seWPerHour && Math.abs(overRideW) >= Math.max(4, 0.015 * meanRef),
    wPerHour: fit.wPerHour,
    seWPerHour: fit.seWPerHour,
    overRideW,
  };
  // A drift read as a gain would be blamed on a leg or chainring: fit gains with it removed.
  const basis = drift.detected ? withoutDrift(table, fit.wPerHour, pedalling) : table;
  const gains = fitLegGearGains(basis, {
    seed: options.seed ?? 1,
    replicates: options.replicates ?? 1000,
    ...(options.blockLength !== undefined && { blockLength: options.blockLength }),
  });
  const findings: string[] = [];
  const hasLegs = gains.some((g) => g.leg === 'left');
  const legs = hasLegs ? (['left', 'right'] as const) : (['total'] as const);
  const off = (g: GainCell): boolean => Math.abs(g.diffPct) >= minEffectPct && (g.lowPct > 0 || g.highPct < 0);
  const explained: GainFinding[] = [];
  const withinLegs: Diagnosis['withinLegs'] = [];
  for (const leg of zeroOffset.detected ? [] : legs) {
    const all = gains.find((g) => g.leg === leg && g.frontTeeth === null);
    const perGear = gains.filter((g) => g.leg === leg && g.frontTeeth !== null);
    const offGears = perGear.filter(off);
    if (perGear.length >= 2 && offGears.length > 0 && offGears.length < perGear.length) {
      for (const g of offGears) explained.push({ leg, frontTeeth: [g.frontTeeth!], diffPct: g.diffPct, lowPct: g.lowPct, highPct: g.highPct });
    } else if (perGear.length >= 2 && offGears.length === perGear.length && spread(offGears) > minEffectPct) {
      for (const g of offGears) explained.push({ leg, frontTeeth: [g.frontTeeth!], diffPct: g.diffPct, lowPct: g.lowPct, highPct: g.highPct });
    } else if (all !== undefined && off(all)) {
      explained.push({ leg, frontTeeth: null, diffPct: all.diffPct, lowPct: all.lowPct, highPct: all.highPct });
    } else {
      const cells = gains.filter((g) => g.leg === leg);
      withinLegs.push({ leg, maxAbsPct: Math.max(0, ...cells.map((g) => Math.abs(g.diffPct)).filter(Number.isFinite)) });
    }
  }
  if (zeroOffset.detected) for (const leg of legs) {
    const cells = gains.filter((g) => g.leg === leg);
    withinLegs.push({ leg, maxAbsPct: Math.max(0, ...cells.map((g) => Math.abs(g.diffPct)).filter(Number.isFinite)) });
  }

  const corrected = removeGains(basis, explained, gains);
  const residualTotalPct = ratioPct(corrected, ref);
  const singleSided = detectSingleSided(table, minPowerW);

  if (explained.length > 0) findings.push(explainInWords(explained, withinLegs, residualTotalPct));
  if (zeroOffset.detected) {
    findings.push(
      `Constant offset: the device reads ${signed(zeroOffset.interceptW, 1)} W at every power (intercept, slope ${zeroOffset.slope.toFixed(3)}); its zero offset looks wrong: zero-offset it and ride again.`,
    );
  }
  if (drift.detected) {
    findings.push(
      `The difference drifts by ${signed(fit.wPerHour, 1)} W per hour (${signed(overRideW, 1)} W over the ride): a temperature drift or a zero offset that moves. Gains are stated with the drift removed.`,
    );
  }
  if (singleSided.detected) {
    const side = singleSided.side ? `the ${singleSided.side} leg` : 'one leg';
    findings.push(`The device looks single-sided: it appears to measure ${side} and double it, so its total follows the rider's balance.`);
  }
  if (findings.length === 0) {
    const worst = Math.max(0, ...withinLegs.map((w) => w.maxAbsPct));
    findings.push(`No leg, chainring, offset or drift effect stands out: every leg and chainring agrees within ${worst.toFixed(1)}%.`);
  }
  return { minEffectPct, gains, explained, withinLegs, residualTotalPct, zeroOffset, drift, singleSided, findings };
}

/**
 * Drift in W per hour from one model of the test total: a gain per reference leg per
 * chainring, a constant, and a term linear in time. Fitting them together keeps a
 * gear-dependent gain (chainrings used at different times of the ride) from passing for
 * drift, and drift from passing for a gain.
 */
function fitDrift(table: Table, pedalling: Uint8Array): { wPerHour: number; seWPerHour: number } {
  const c = table.columns;
  const n = table.timeS.length;
  const legs = c.ref_left !== undefined && c.ref_right !== undefined ? [c.ref_left, c.ref_right] : [c.ref_power!];
  const front = c.front_teeth;
  const states = new Set<number>();
  for (let i = 0; i < n; i++) if (pedalling[i]) states.add(front === undefined || !Number.isFinite(front[i]!) ? -1 : front[i]!);
  const regressors: Float64Array[] = [];
  for (const leg of legs) {
    for (const state of states) {
      regressors.push(Float64Array.from(leg, (v, i) => ((front === undefined || !Number.isFinite(front[i]!) ? -1 : front[i]!) === state ? v : 0)));
    }
  }
  const t0 = n > 0 ? table.timeS[0]! : 0;
  regressors.push(new Float64Array(n).fill(1), Float64Array.from(table.timeS, (t) => (t - t0) / 3600));
  const fit = fitLinearModel(regressors, c.test_power!, pedalling);
  const k = regressors.length - 1;
  return { wPerHour: fit.coefficients[k]!, seWPerHour: fit.standardErrors[k]! };
}

/** A copy of the table with a drift taken out of the test total and, half each, out of its legs, while pedalling. */
function withoutDrift(table: Table, wPerHour: number, pedalling: Uint8Array): Table {
  const c = table.columns;
  const t0 = table.timeS.length > 0 ? table.timeS[0]! : 0;
  const take = (column: Float64Array | undefined, share: number): Float64Array | undefined =>
    column?.map((v, i) => (pedalling[i] ? v - (share * wPerHour * (table.timeS[i]! - t0)) / 3600 : v));
  const columns: Record<string, Float64Array> = { ...c, test_power: take(c.test_power, 1)! };
  if (c.test_left !== undefined) columns.test_left = take(c.test_left, 0.5)!;
  if (c.test_right !== undefined) columns.test_right = take(c.test_right, 0.5)!;
  return { ...table, columns };
}

/**
 * A constant offset shows as an intercept clearly away from zero with a slope of about 1.
 * Fitted within each chainring: a gain that differs between chainrings, mixed with power
 * levels that differ between them, would otherwise fake an intercept.
 */
function detectZeroOffset(table: Table, pedalling: Uint8Array): Diagnosis['zeroOffset'] {
  const c = table.columns;
  const front = c.front_teeth;
  const dt = table.timeS.length > 1 ? table.timeS[1]! - table.timeS[0]! : 1;
  const gears = new Set<number>();
  if (front !== undefined) for (let i = 0; i < front.length; i++) if (pedalling[i] && Number.isFinite(front[i]!)) gears.add(front[i]!);
  const masks = [...gears].map((teeth) => pedalling.map((p, i) => (p && front![i] === teeth ? 1 : 0)));
  const fits = (masks.length > 0 ? masks : [pedalling]).map((m) => olsFit(c.ref_power!, c.test_power!, m)).filter((f) => f.n * dt >= 60);
  if (fits.length === 0) return { detected: false, interceptW: NaN, interceptSe: NaN, slope: NaN };
  const total = fits.reduce((s, f) => s + f.n, 0);
  const interceptW = fits.reduce((s, f) => s + f.intercept * f.n, 0) / total;
  const slope = fits.reduce((s, f) => s + f.slope * f.n, 0) / total;
  const interceptSe = Math.max(...fits.map((f) => f.interceptSe));
  const detected = fits.every(
    (f) => Math.abs(f.intercept) >= 3 && Math.abs(f.intercept) >= 4 * f.interceptSe && Math.abs(f.slope - 1) <= 0.015 && Math.sign(f.intercept) === Math.sign(interceptW),
  );
  return { detected, interceptW, interceptSe, slope };
}

/** The test total with the explained gains divided out of the legs (or the total) they apply to. */
function removeGains(table: Table, explained: readonly GainFinding[], gains: readonly GainCell[]): Float64Array {
  const c = table.columns;
  const out = c.test_power!.slice();
  const front = c.front_teeth;
  for (const part of explained) {
    const column = part.leg === 'total' ? c.test_power! : part.leg === 'left' ? c.test_left! : c.test_right!;
    const gains1 = part.frontTeeth === null ? [gains.find((g) => g.leg === part.leg && g.frontTeeth === null)!] : gains.filter((g) => g.leg === part.leg && part.frontTeeth!.includes(g.frontTeeth!));
    for (const g of gains1) {
      for (let i = 0; i < out.length; i++) {
        if (g.frontTeeth !== null && front![i] !== g.frontTeeth) continue;
        const v = column[i]!;
        if (Number.isFinite(v)) out[i] = out[i]! - v + v / g.gain;
      }
    }
  }
  return out;
}

function explainInWords(explained: readonly GainFinding[], within: Diagnosis['withinLegs'], residualPct: number): string {
  const parts = explained.map((e) => {
    const who = e.leg === 'total' ? 'Total' : `${e.leg === 'left' ? 'Left' : 'Right'} leg`;
    const where = e.frontTeeth === null ? 'on every chainring' : `on the ${e.frontTeeth.map((t) => `${t}T`).join(' and ')} chainring${e.frontTeeth.length > 1 ? 's' : ''}`;
    const only = e.frontTeeth !== null && explained.filter((x) => x.leg === e.leg).length === 1 ? ' only' : '';
    return `${who} reads ${signed(e.diffPct, 1)}% (95% CI ${e.lowPct.toFixed(1)} to ${e.highPct.toFixed(1)}) ${where}${only}`;
  });
  for (const w of within) if (w.leg !== 'total') parts.push(`${w.leg} leg within ${w.maxAbsPct.toFixed(1)}%`);
  const sentence = parts.map((p, i) => (i === 0 ? p : p.charAt(0).toLowerCase() + p.slice(1))).join('; ');
  const removed = explained.length > 1 ? 'those gains' : 'that gain';
  return `${sentence}; with ${removed} removed the total agrees within ${Math.abs(residualPct).toFixed(1)}%.`;
}

function spread(cells: readonly GainCell[]): number {
  const values = cells.map((g) => g.diffPct);
  return Math.max(...values) - Math.min(...values);
}

function ratioPct(test: Float64Array, ref: Float64Array): number {
  let st = 0;
  let sr = 0;
  for (let i = 0; i < ref.length; i++) {
    if (!Number.isFinite(test[i]!) || !Number.isFinite(ref[i]!)) continue;
    st += test[i]!;
    sr += ref[i]!;
  }
  return (st / sr - 1) * 100;
}

function meanOf(x: Float64Array, mask: Uint8Array): number {
  let s = 0;
  let m = 0;
  for (let i = 0; i < x.length; i++) if (mask[i] && Number.isFinite(x[i]!)) (s += x[i]!), m++;
  return m > 0 ? s / m : NaN;
}

function signed(x: number, digits: number): string {
  const text = x.toFixed(digits);
  return x >= 0 ? `+${text}` : text;
}
