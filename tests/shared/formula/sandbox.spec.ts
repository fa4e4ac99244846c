import { describe, expect, it } from 'vitest';
import { analyseFormula, evaluateFormula } from '../../../shared/formula/index.js';
import { engine, errorOf, run } from './formula-helpers.js';

// Escape attempts from mathjs's security guidance (mathjs.org/docs/expressions/security.html)
// and from published mathjs sandbox escapes: each must be refused, none may reach JavaScript.
const ATTEMPTS = [
  'import({}, {})',
  'import({cos: 1}, {override: true})',
  'createUnit("x")',
  'createUnit("foo", "1 m")',
  'evaluate("1")',
  'parse("1")',
  'simplify("x")',
  'derivative("x^2", "x")',
  'resolve(parse("x"), {})',
  'compile("1")',
  'f = cos.constructor',
  'cos.constructor("return this")()',
  '[].map.constructor("return this")',
  '"".constructor',
  '"abc".constructor.prototype',
  'f(x) = x; f.constructor',
  'f(x) = x; g = f.constructor; g("return this")()',
  'a = {}; a.__proto__',
  'a = {}; a["__proto__"]',
  'a = {}; a["constructor"]',
  'x = {constructor: 1}',
  'a = {b: 1}; a.b = 2',
  'a = [1,2]; a[1] = 5',
  'cos.prototype',
  'cos.call',
  'cos.bind',
  'sin.apply',
  'a = {}; a.toString()',
  'a = {}; a.valueOf',
  'typed("f", {})',
  'config({number: "BigNumber"})',
  'chain(3)',
  'parser()',
  'help(cos)',
  'reviver',
  'x = SymbolNode',
  'print("$constructor", {})',
  'Unit.BASE_UNITS',
  'Unit.isValuelessUnit("W")',
  'x = Unit.prototype',
  'a = {b: cos}; a.b.constructor',
  'f(x) = x; g = f; g.call',
  '(cos)(1)(2)',
];

describe('formula sandbox', () => {
  it.each(ATTEMPTS)('refuses %s', (source) => {
    const error = errorOf(source);
    expect(error.code).toMatch(/^formula_/);
    expect(error.where?.cell).toBe('c1');
  });

  it('has the disabled functions replaced inside the instance, not only refused by the checker', () => {
    for (const name of ['import', 'createUnit', 'evaluate', 'parse', 'simplify', 'derivative', 'compile', 'resolve']) {
      const fn = (engine.math as unknown as Record<string, () => unknown>)[name]!;
      expect(() => fn(), name).toThrow(/not available/);
    }
  });

  it('cannot reach the globals of its host', () => {
    for (const name of ['globalThis', 'self', 'window', 'process', 'Function', 'eval', 'postMessage']) {
      expect(errorOf(`x = ${name}`).code, name).toBe('formula_unknown_name');
    }
  });

  it('cannot assign over built-in functions or constants', () => {
    expect(errorOf('mean = 1').code).toBe('formula_forbidden');
    expect(errorOf('pi = 3').code).toBe('formula_forbidden');
    expect(errorOf('avg(x) = 0').code).toBe('formula_forbidden');
  });

  it('still reads fields of named values', () => {
    const r = run('d = t.a - t.b', { t: { a: Float64Array.of(3, 4), b: Float64Array.of(1, 1) } });
    expect(r.ok && Array.from(r.values['d'] as Float64Array)).toEqual([2, 3]);
  });

  it('caps the size of generated lists', () => {
    expect(errorOf('x = range(0, 1e9)').code).toBe('formula_too_large');
    expect(errorOf('x = zeros(100000, 100000)').code).toBe('formula_too_large');
    expect(errorOf('x = 1:1e10').code).toBe('formula_too_large');
  });

  it('stops a runaway recursion at its time limit', () => {
    // f(40) would make 2^40 calls; the fake clock advances 1 ms per reading.
    const source = 'f(n) = n < 1 ? 0 : f(n - 1) + f(n - 1)\ny = f(40)';
    const analysis = analyseFormula(engine, source, 'c1');
    let clock = 0;
    const now = () => (clock += 1);
    expect(() => evaluateFormula(engine, analysis, {}, source, 'c1', { now, deadlineMs: 50 })).toThrow(
      expect.objectContaining({ code: 'formula_timeout', where: { cell: 'c1', line: 2 } }),
    );
  });
});
