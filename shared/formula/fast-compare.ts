import type { MathJsInstance } from 'mathjs';

type Fn = (...args: unknown[]) => unknown;
type TypedFn = Fn & { signatures: Record<string, Fn> };

/** The comparisons a formula writes as operators (`>`, `<=`, `==`, …) on whole columns. */
const COMPARISONS = ['larger', 'largerEq', 'smaller', 'smallerEq', 'equal', 'unequal'] as const;

function allNumbers(list: unknown[]): list is number[] {
  for (let i = 0; i < list.length; i++) if (typeof list[i] !== 'number') return false;
  return true;
}

/**
 * Versions of mathjs's comparisons that compare a flat list of numbers with a number (or
 * two such lists of one length) in one loop, with mathjs's own number-to-number rule (its
 * tolerance included). `aligned.cadence > 5` over a long ride otherwise builds and checks
 * a matrix and dispatches every element by type. Every other pairing (units, nested lists,
 * mixed types, unequal lengths) goes to mathjs's own implementation, unchanged.
 */
export function fastComparisons(math: MathJsInstance): Record<string, Fn> {
  const fns = math as unknown as Record<string, TypedFn>;
  const equalNumbers = fns['equal']!.signatures['number,number']!;
  const out: Record<string, Fn> = {};
  for (const name of COMPARISONS) {
    const generic = fns[name]!;
    const scalar = name === 'unequal' ? (x: unknown, y: unknown) => !equalNumbers(x, y) : generic.signatures['number,number'];
    if (scalar === undefined) continue;
    const pairs = generic.signatures['Array,Array']!;
    out[name] = (math.typed as unknown as (name: string, signatures: Record<string, Fn>) => Fn)(name, {
      ...generic.signatures,
      'Array, number': (a, b) => (allNumbers(a as unknown[]) ? (a as number[]).map((x) => scalar(x, b)) : generic(a, b)),
      'number, Array': (a, b) => (allNumbers(b as unknown[]) ? (b as number[]).map((y) => scalar(a, y)) : generic(a, b)),
      'Array,Array': (a, b) => {
        const x = a as unknown[];
        const y = b as unknown[];
        return x.length === y.length && allNumbers(x) && allNumbers(y) ? x.map((v, i) => scalar(v, y[i])) : pairs(a, b);
      },
    });
  }
  return out;
}
