import fc from 'fast-check';
import { all, create } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { engine, run } from './formula-helpers.js';

// The engine compares whole columns in one loop; plain mathjs (same configuration, not
// changed) is the reference each result must equal, element for element.
const plain = create(all, { matrix: 'Array', number: 'number' });
const NAMES = ['larger', 'largerEq', 'smaller', 'smallerEq', 'equal', 'unequal'] as const;
type Compare = (a: unknown, b: unknown) => unknown;
const fastFn = (name: string) => (engine.math as unknown as Record<string, Compare>)[name]!;
const plainFn = (name: string) => (plain as unknown as Record<string, Compare>)[name]!;

// Numbers that hit the tolerance rule: exact ties, ties within mathjs's relative tolerance,
// NaN and infinities.
const edgy = fc.oneof(
  fc.double({ noNaN: false }),
  fc.constantFrom(0, -0, 5, 5 + 1e-12, 5 - 1e-12, 5.000001, NaN, Infinity, -Infinity, 1e-300),
  fc.integer({ min: -3, max: 8 }),
);

describe('comparisons over columns', () => {
  it('are the engine’s own for a list and a number (the loop under test is installed)', () => {
    for (const name of NAMES) {
      const signatures = Object.keys((fastFn(name) as unknown as { signatures: Record<string, unknown> }).signatures);
      expect(signatures).toContain('Array,number');
      expect(signatures).toContain('number,Array');
    }
  });

  it('equal plain mathjs for a list against a number, both ways round', () => {
    fc.assert(
      fc.property(fc.constantFrom(...NAMES), fc.array(edgy, { maxLength: 40 }), edgy, (name, list, n) => {
        expect(fastFn(name)(list, n)).toEqual(plainFn(name)(list, n));
        expect(fastFn(name)(n, list)).toEqual(plainFn(name)(n, list));
      }),
      { numRuns: 600 },
    );
  });

  it('equal plain mathjs for two lists of one length', () => {
    fc.assert(
      fc.property(fc.constantFrom(...NAMES), fc.array(fc.tuple(edgy, edgy), { maxLength: 40 }), (name, pairs) => {
        const a = pairs.map((p) => p[0]);
        const b = pairs.map((p) => p[1]);
        expect(fastFn(name)(a, b)).toEqual(plainFn(name)(a, b));
      }),
      { numRuns: 600 },
    );
  });

  it('leave nested lists, booleans, units and unequal lengths to mathjs', () => {
    for (const name of NAMES) {
      expect(fastFn(name)([[1, 6], [5, 2]], 5)).toEqual(plainFn(name)([[1, 6], [5, 2]], 5));
      expect(fastFn(name)([true, false], 0)).toEqual(plainFn(name)([true, false], 0));
      expect(fastFn(name)(5, [true, 7])).toEqual(plainFn(name)(5, [true, 7]));
      expect(() => fastFn(name)([1, 2, 3], [1, 2])).toThrow();
    }
    const units = run('a = [5 W, 200 W] > 100 W');
    expect(units.ok && units.values).toEqual({ a: [false, true] });
  });

  it('work as operators inside a formula on a column', () => {
    const cadence = Float64Array.from([0, 4.9, 5, 5 + 1e-12, 88, NaN]);
    const r = run('moving = t.cadence > 5\nstill = t.cadence <= 5', { t: { cadence } });
    expect(r.ok && r.values).toEqual({ moving: [false, false, false, false, true, false], still: [true, true, true, true, false, false] });
  });
});
