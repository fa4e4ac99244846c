import type { EvalFunction, MathNode } from 'mathjs';
import { EngineError, isEngineError, type EngineWarning, type Where } from '../errors.js';
import type { FormulaAnalysis } from './analyse-formula.js';
import { MAX_ELEMENTS, type FormulaEngine } from './create-formula-engine.js';
import { countElements, countNonFinite, fromMathValue, toMathValue, type FormulaValue } from './formula-value.js';
import { findName } from './source-position.js';

/** Options of {@link evaluateFormula}. */
export interface EvaluateFormulaOptions {
  /** Time (ms, as `now()` counts) after which evaluation stops with `formula_timeout`. */
  deadlineMs?: number;
  /** Clock; default Date.now. */
  now?: () => number;
}

/** What a formula produced. */
export interface FormulaResult {
  /** Every top-level assignment, by name. */
  values: Record<string, FormulaValue>;
  /** Value of the last statement when it is not an assignment (what the cell shows). */
  last?: FormulaValue;
  warnings: EngineWarning[];
}

/** Checked between calls of the formula's own functions: a runaway recursion stops here. */
const TICK = '__cogbook_tick';
/** Calls between clock reads: reading the clock on every call would slow tight recursions. */
const TICK_EVERY = 1024;

function withTicks(engine: FormulaEngine, node: MathNode): MathNode {
  const { FunctionNode, SymbolNode, FunctionAssignmentNode } = engine.math;
  return node.transform((n) => {
    if (n.type !== 'FunctionAssignmentNode') return n;
    const f = n as unknown as { name: string; params: string[]; expr: MathNode };
    const body = withTicks(engine, f.expr);
    return new FunctionAssignmentNode(f.name, f.params, new FunctionNode(new SymbolNode(TICK), [body]));
  });
}

/** Compiled statements by parsed node: an unchanged formula is not compiled again on the next run. */
const compiledStatements = new WeakMap<MathNode, EvalFunction>();

function compiled(engine: FormulaEngine, node: MathNode): EvalFunction {
  let code = compiledStatements.get(node);
  if (!code) compiledStatements.set(node, (code = withTicks(engine, node).compile()));
  return code;
}

/** Rewrites mathjs's terse runtime messages into ones that say what to do. */
function explain(e: unknown, source: string, cell: string, line: number): EngineError {
  if (isEngineError(e)) return new EngineError(e.code, `${e.message} (line ${line})`, e.where ?? { cell, line });
  const text = e instanceof Error ? e.message : String(e);
  const where: Where = { cell, line };
  const undefinedSymbol = /^Undefined (?:symbol|function) (\w+)/.exec(text);
  if (undefinedSymbol) {
    const name = undefinedSymbol[1]!;
    const pos = findName(source, name);
    return new EngineError('formula_unknown_name', `unknown name "${name}"${pos ? ` at line ${pos.line}, column ${pos.column}` : ''}: not an earlier cell, parameter, function or unit`, { cell, ...(pos ?? { line }) });
  }
  if (/Units do not match/.test(text)) {
    return new EngineError('formula_units', `units do not match on line ${line}: quantities of different kinds (e.g. W and rpm) cannot be added, subtracted or compared; convert with "to" or drop units with number(x, "W")`, where);
  }
  if (/expected: Unit, actual: number|expected: number, actual: Unit/.test(text)) {
    return new EngineError('formula_units', `a number with a unit is combined with a plain number on line ${line}: give both a unit (5 W) or drop it with number(x, "W")`, where);
  }
  if (/Maximum call stack/.test(text)) {
    return new EngineError('formula_recursion', `a function calls itself too deeply on line ${line}`, where);
  }
  return new EngineError('formula_error', `${text} (line ${line})`, where, { cause: e });
}

function checkResult(name: string, value: FormulaValue, cell: string, line: number, warnings: EngineWarning[]): void {
  const { nan, infinite } = countNonFinite(value);
  const size = value instanceof Float64Array ? value.length : 0;
  if (infinite > 0) {
    warnings.push({ code: 'formula_infinite', message: `${name} has ${infinite} infinite value(s) (division by zero?)`, where: { cell, line } });
  }
  if (nan > 0 && (size === 0 || nan === size)) {
    warnings.push({ code: 'formula_nan', message: `${name} is not a number${size > 0 ? ' anywhere' : ''} (no valid samples, or 0/0)`, where: { cell, line } });
  }
}

/**
 * Runs an analysed formula with `inputs` (earlier outputs and parameters by name) in
 * scope. Statements run in order; after each one the clock and the size of what it made
 * are checked, and the formula's own functions check the clock while they run.
 * NaN or infinite results come back as warnings.
 *
 * @throws EngineError `formula_unknown_name` (line and column), `formula_units`,
 *   `formula_timeout`, `formula_too_large`, `formula_error`.
 */
export function evaluateFormula(
  engine: FormulaEngine,
  analysis: FormulaAnalysis,
  inputs: Record<string, FormulaValue>,
  source: string,
  cell: string,
  options: EvaluateFormulaOptions = {},
): FormulaResult {
  const now = options.now ?? Date.now;
  const deadline = options.deadlineMs ?? Infinity;
  const scope = new Map<string, unknown>();
  for (const [name, value] of Object.entries(inputs)) scope.set(name, toMathValue(engine.math, value));
  let calls = 0;
  let line = 1;
  const timeout = () => new EngineError('formula_timeout', `formula stopped after its time limit (line ${line})`, { cell, line });
  scope.set(TICK, (x: unknown) => {
    if (++calls % TICK_EVERY === 0 && now() > deadline) throw timeout();
    return x;
  });

  const values: Record<string, FormulaValue> = {};
  const warnings: EngineWarning[] = [];
  let last: FormulaValue | undefined;
  for (const statement of analysis.statements) {
    line = statement.line;
    let result: unknown;
    try {
      result = compiled(engine, statement.node).evaluate(scope);
    } catch (e) {
      throw explain(e, source, cell, line);
    }
    if (now() > deadline) throw timeout();
    const items = statement.node.type === 'BlockNode' ? ((result as { entries?: unknown[] })?.entries ?? []) : [result];
    last = undefined;
    for (const item of items) {
      if (countElements(item) > MAX_ELEMENTS) {
        throw new EngineError('formula_too_large', `line ${line} made more than ${MAX_ELEMENTS} elements`, { cell, line });
      }
    }
    const assigned = analysis.writes.filter((name) => topAssigns(statement.node).includes(name));
    for (const name of assigned) {
      const v = fromMathValue(engine.math, scope.get(name));
      if (v === undefined) continue;
      values[name] = v;
      checkResult(name, v, cell, line, warnings);
    }
    if (assigned.length === 0 && items.length > 0) {
      last = fromMathValue(engine.math, items[items.length - 1]);
      if (last !== undefined) checkResult('the result', last, cell, line, warnings);
    }
  }
  return last === undefined ? { values, warnings } : { values, last, warnings };
}

function topAssigns(node: MathNode): string[] {
  const n = node as unknown as { type: string; blocks?: { node: MathNode }[]; name?: string; object?: { type: string } };
  if (n.type === 'BlockNode') return (n.blocks ?? []).flatMap((b) => topAssigns(b.node));
  return n.type === 'AssignmentNode' && n.object?.type === 'SymbolNode' && n.name ? [n.name] : [];
}
