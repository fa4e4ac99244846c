import { EngineError } from '../errors.js';
import { columnSourceOf } from './formula-value.js';
import { rollingMean } from '../engine/rolling-mean.js';
import { blandAltman } from '../engine/stats/bland-altman.js';
import { driftFit } from '../engine/stats/drift-fit.js';
import { olsFit } from '../engine/stats/ols-fit.js';
import { pairedIndices } from '../engine/stats/paired.js';
import { percentDifference, withinTolerance } from '../engine/stats/percent-difference.js';
import { summary } from '../engine/stats/summary.js';

type Fn = (...args: unknown[]) => unknown;

/** A formula argument as a column of numbers (booleans become 1/0). */
function column(value: unknown, fn: string, arg: string): Float64Array {
  if (value instanceof Float64Array) return value;
  if (typeof value === 'number') return Float64Array.of(value);
  if (Array.isArray(value)) {
    const source = columnSourceOf(value);
    if (source !== undefined) return source;
    const out = new Float64Array(value.length);
    for (let i = 0; i < value.length; i++) {
      const v = value[i];
      if (typeof v === 'number') out[i] = v;
      else if (typeof v === 'boolean') out[i] = v ? 1 : 0;
      else if (v === null || v === undefined) out[i] = NaN;
      else throw new EngineError('formula_argument', `${fn}: ${arg} must be a list of plain numbers (strip units with number(x, "W"))`);
    }
    return out;
  }
  throw new EngineError('formula_argument', `${fn}: ${arg} must be a number or a list of numbers`);
}

function mask(value: unknown, length: number, fn: string): Uint8Array | undefined {
  if (value === undefined) return undefined;
  const m = column(value, fn, 'mask');
  if (m.length !== length) throw new EngineError('length_mismatch', `${fn}: mask has ${m.length} entries for ${length} values`);
  const out = new Uint8Array(m.length);
  for (let i = 0; i < m.length; i++) out[i] = m[i]! !== 0 && !Number.isNaN(m[i]!) ? 1 : 0;
  return out;
}

/** The finite values of x where the mask is set, sorted ascending. */
function selected(x: Float64Array, m?: Uint8Array): Float64Array {
  const out: number[] = [];
  for (let i = 0; i < x.length; i++) if ((m === undefined || m[i] === 1) && Number.isFinite(x[i]!)) out.push(x[i]!);
  return Float64Array.from(out).sort();
}

function median(sorted: Float64Array): number {
  const n = sorted.length;
  if (n === 0) return NaN;
  return n % 2 === 1 ? sorted[(n - 1) / 2]! : (sorted[n / 2 - 1]! + sorted[n / 2]!) / 2;
}

/** Means of test and reference over the samples where both are finite. */
function pairedMeans(test: Float64Array, ref: Float64Array, m?: Uint8Array): { t: number; r: number } {
  const idx = pairedIndices(test, ref, m);
  let st = 0;
  let sr = 0;
  for (const i of idx) {
    st += test[i]!;
    sr += ref[i]!;
  }
  return idx.length === 0 ? { t: NaN, r: NaN } : { t: st / idx.length, r: sr / idx.length };
}

function segmentStat(values: Float64Array, stat: string): number {
  if (stat === 'median') return median(Float64Array.from(values).sort());
  const s = summary(values);
  if (stat === 'mean') return s.mean;
  if (stat === 'sd') return s.sd;
  if (stat === 'min') return s.min;
  if (stat === 'max') return s.max;
  if (stat === 'n') return s.n;
  throw new EngineError('formula_argument', `persegment: stat must be "mean", "median", "sd", "min", "max" or "n", got "${stat}"`);
}

/** Groups values by a key column (NaN keys skipped), keys ascending. */
function groupBy(values: Float64Array, keys: Float64Array, fn: string): Map<number, number[]> {
  if (values.length !== keys.length) {
    throw new EngineError('length_mismatch', `${fn}: ${values.length} values but ${keys.length} group labels`);
  }
  const groups = new Map<number, number[]>();
  for (let i = 0; i < values.length; i++) {
    const k = keys[i]!;
    if (!Number.isFinite(k) || !Number.isFinite(values[i]!)) continue;
    let g = groups.get(k);
    if (g === undefined) groups.set(k, (g = []));
    g.push(values[i]!);
  }
  return new Map([...groups.entries()].sort((a, b) => a[0] - b[0]));
}

/**
 * The implementations behind FORMULA_LIBRARY, keyed by name, ready to import into a
 * mathjs instance. Arguments arrive as mathjs values (arrays of numbers or booleans);
 * results are numbers, arrays or plain records (readable as `result.field`).
 */
export function libraryFunctions(): Record<string, Fn> {
  return {
    avg: (x, m) => {
      const v = column(x, 'avg', 'values');
      return summary(selected(v, mask(m, v.length, 'avg'))).mean;
    },
    med: (x, m) => {
      const v = column(x, 'med', 'values');
      return median(selected(v, mask(m, v.length, 'med')));
    },
    sdev: (x, m) => {
      const v = column(x, 'sdev', 'values');
      return summary(selected(v, mask(m, v.length, 'sdev'))).sd;
    },
    pctdiff: (t, r, m) => {
      const test = column(t, 'pctdiff', 'test');
      const { t: mt, r: mr } = pairedMeans(test, column(r, 'pctdiff', 'ref'), mask(m, test.length, 'pctdiff'));
      return percentDifference(mt, mr);
    },
    ratio: (t, r, m) => {
      const test = column(t, 'ratio', 'test');
      const { t: mt, r: mr } = pairedMeans(test, column(r, 'ratio', 'ref'), mask(m, test.length, 'ratio'));
      return mt / mr;
    },
    agreement: (t, r, m) => {
      const test = column(t, 'agreement', 'test');
      const ba = blandAltman(test, column(r, 'agreement', 'ref'), { mask: mask(m, test.length, 'agreement') });
      return { n: ba.n, bias: ba.biasW, sd: ba.sdW, lower: ba.loaLowW, upper: ba.loaHighW };
    },
    gainfit: (t, r, m) => {
      const test = column(t, 'gainfit', 'test');
      const fit = olsFit(column(r, 'gainfit', 'ref'), test, mask(m, test.length, 'gainfit'));
      return { n: fit.n, slope: fit.slope, intercept: fit.intercept, r2: fit.r2 };
    },
    drift: (time, diff, m) => {
      const t = column(time, 'drift', 'time');
      const fit = driftFit(t, column(diff, 'drift', 'diff'), mask(m, t.length, 'drift'));
      return { perHour: fit.wPerHour, intercept: fit.interceptW, n: fit.n };
    },
    withintol: (pct, tol) => {
      const v = selected(column(pct, 'withintol', 'pct'));
      if (typeof tol !== 'number') throw new EngineError('formula_argument', 'withintol: tol must be a number (percent)');
      let k = 0;
      for (const x of v) if (withinTolerance(x, tol)) k++;
      return v.length === 0 ? NaN : (100 * k) / v.length;
    },
    persegment: (x, seg, stat) => {
      const name = stat === undefined ? 'mean' : String(stat);
      const groups = groupBy(column(x, 'persegment', 'values'), column(seg, 'persegment', 'segments'), 'persegment');
      return [...groups.values()].map((g) => segmentStat(Float64Array.from(g), name));
    },
    pergear: (x, gears) => {
      const groups = groupBy(column(x, 'pergear', 'values'), column(gears, 'pergear', 'gears'), 'pergear');
      return {
        gear: [...groups.keys()],
        mean: [...groups.values()].map((g) => summary(g).mean),
        n: [...groups.values()].map((g) => g.length),
      };
    },
    rollavg: (x, n) => {
      if (typeof n !== 'number' || !(n >= 1)) throw new EngineError('formula_argument', 'rollavg: n must be a number of samples >= 1');
      return Array.from(rollingMean(column(x, 'rollavg', 'values'), n));
    },
  };
}
