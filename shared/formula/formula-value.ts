import type { MathJsInstance } from 'mathjs';

/** A number with a unit, as a formula produced it (`36 km/h to m/s`). */
export interface Quantity {
  quantity: true;
  value: number;
  unit: string;
}

/**
 * A value a formula cell produces and later cells read: plain data that crosses a
 * worker boundary and JSON. Lists of numbers are Float64Arrays (transferable).
 */
export type FormulaValue =
  | number
  | boolean
  | string
  | null
  | Float64Array
  | Quantity
  | FormulaValue[]
  | { [key: string]: FormulaValue };

/** True when `v` is a {@link Quantity}. */
export function isQuantity(v: unknown): v is Quantity {
  return typeof v === 'object' && v !== null && (v as Quantity).quantity === true && typeof (v as Quantity).unit === 'string';
}

// The typed array each converted list was made from. mathjs never changes a list in place
// (assigning into one copies it), so the trade's functions can read the original column
// instead of converting the list back.
const sources = new WeakMap<unknown[], Float64Array>();

// The list made from each column, reused by later runs while the column lives: an edit
// recomputes one formula over columns that have not changed. Formulas cannot assign into
// a list (analyseFormula refuses it) and the trade's functions only read, so a list is
// never changed once made.
const lists = new WeakMap<Float64Array, number[]>();

function listFrom(v: Float64Array): number[] {
  const known = lists.get(v);
  if (known !== undefined) return known;
  const out: number[] = [];
  for (let i = 0; i < v.length; i++) out.push(v[i]!);
  sources.set(out, v);
  lists.set(v, out);
  return out;
}

/**
 * The column a list given to a formula was made from, when it is that very list unchanged
 * (same length and ends, checked as a guard); undefined for any other list.
 */
export function columnSourceOf(list: unknown[]): Float64Array | undefined {
  const source = sources.get(list);
  if (source === undefined || source.length !== list.length) return undefined;
  const last = list.length - 1;
  const same = (i: number) => Object.is(list[i], source[i]);
  return list.length === 0 || (same(0) && same(last) && same(last >> 1)) ? source : undefined;
}

/**
 * Converts a value for use inside mathjs: typed arrays become plain arrays (mathjs
 * works on those), quantities become mathjs units, records are copied field by field.
 * A record's fields are converted when first read: a formula that reads two columns of a
 * wide table of a long ride pays for those two, not for every column.
 */
export function toMathValue(math: MathJsInstance, v: FormulaValue): unknown {
  if (v instanceof Float64Array) return listFrom(v);
  if (Array.isArray(v)) return v.map((x) => toMathValue(math, x));
  if (isQuantity(v)) return math.unit(v.value, v.unit);
  if (typeof v === 'object' && v !== null) {
    const out: Record<string, unknown> = {};
    for (const [k, x] of Object.entries(v)) {
      Object.defineProperty(out, k, {
        enumerable: true,
        configurable: true,
        get() {
          const converted = toMathValue(math, x);
          Object.defineProperty(out, k, { value: converted, enumerable: true, configurable: true, writable: true });
          return converted;
        },
        set(value: unknown) {
          Object.defineProperty(out, k, { value, enumerable: true, configurable: true, writable: true });
        },
      });
    }
    return out;
  }
  return v;
}

/**
 * Converts a mathjs result to a {@link FormulaValue}. Functions are dropped (undefined);
 * lists of numbers become Float64Arrays; other mathjs types (fractions, big numbers)
 * become numbers, complex numbers become text.
 */
export function fromMathValue(math: MathJsInstance, v: unknown): FormulaValue | undefined {
  if (v === undefined || typeof v === 'function') return undefined;
  if (v === null || typeof v === 'number' || typeof v === 'boolean' || typeof v === 'string') return v;
  if (math.isUnit(v)) {
    const unit = v.formatUnits();
    return { quantity: true, value: unit === '' ? v.toNumber() : v.toNumber(unit), unit };
  }
  if (math.isMatrix(v)) return fromMathValue(math, v.toArray());
  if (Array.isArray(v)) {
    if (v.every((x) => typeof x === 'number')) return Float64Array.from(v as number[]);
    return v.map((x) => fromMathValue(math, x) ?? null);
  }
  if (math.isFraction(v) || math.isBigNumber(v)) return math.number(v as never) as number;
  if (math.isComplex(v)) return String(v);
  if (v instanceof Float64Array) return v;
  if (typeof v === 'object') {
    const out: { [key: string]: FormulaValue } = {};
    for (const [k, x] of Object.entries(v as Record<string, unknown>)) {
      const c = fromMathValue(math, x);
      if (c !== undefined) out[k] = c;
    }
    return out;
  }
  return undefined;
}

/** Number of elements in a value (1 for a scalar), counted through nested lists and records. */
export function countElements(v: unknown): number {
  if (v instanceof Float64Array) return v.length;
  if (Array.isArray(v)) return v.reduce((n: number, x) => n + (Array.isArray(x) ? countElements(x) : 1), 0);
  if (typeof v === 'object' && v !== null && !('value' in v)) {
    let n = 0;
    for (const x of Object.values(v)) n += countElements(x);
    return n;
  }
  return 1;
}

/** Counts NaN and +/-Infinity entries in a value (numbers, lists, records). */
export function countNonFinite(v: FormulaValue): { nan: number; infinite: number } {
  const acc = { nan: 0, infinite: 0 };
  const visit = (x: FormulaValue): void => {
    if (typeof x === 'number') {
      if (Number.isNaN(x)) acc.nan++;
      else if (!Number.isFinite(x)) acc.infinite++;
    } else if (x instanceof Float64Array) {
      for (const y of x) if (Number.isNaN(y)) acc.nan++;
      else if (!Number.isFinite(y)) acc.infinite++;
    } else if (Array.isArray(x)) x.forEach(visit);
    else if (isQuantity(x)) visit(x.value);
    else if (typeof x === 'object' && x !== null) Object.values(x).forEach(visit);
  };
  visit(v);
  return acc;
}
