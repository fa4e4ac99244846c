import { all, create, type MathJsInstance, type MathNode } from 'mathjs';
import { EngineError } from '../errors.js';
import { fastComparisons } from './fast-compare.js';
import { libraryFunctions } from './library-functions.js';

/** Most elements one formula value may hold (about 40 MB of numbers). */
export const MAX_ELEMENTS = 5_000_000;

/**
 * Functions replaced by a thrower inside the instance (mathjs's security guidance): they
 * change the instance or parse text into code.
 */
const DISABLED_FUNCTIONS = [
  'import', 'createUnit', 'evaluate', 'parse', 'compile', 'simplify', 'simplifyConstant', 'simplifyCore',
  'derivative', 'resolve', 'rationalize', 'symbolicEqual', 'leafCount', 'parser', 'Parser', 'chain',
  'reviver', 'replacer', 'help', 'print',
];

/**
 * Names a formula may not use at all: the disabled functions plus internals that other
 * mathjs functions still need (so they stay in the instance, unreachable by name).
 */
export const BLOCKED_FUNCTIONS: readonly string[] = [
  ...DISABLED_FUNCTIONS,
  'typed', 'config', 'Help', 'Node', 'SymbolNode', 'FunctionNode', 'AccessorNode', 'AssignmentNode',
  'FunctionAssignmentNode', 'ObjectNode', 'IndexNode', 'ConstantNode', 'OperatorNode', 'BlockNode',
  'ArrayNode', 'ConditionalNode', 'ParenthesisNode', 'RangeNode', 'RelationalNode',
];

/** A locked-down mathjs instance plus the parser that was captured before locking it. */
export interface FormulaEngine {
  math: MathJsInstance;
  /** Parses formula text; the instance's own `parse` is disabled for formulas. */
  parse: (source: string) => MathNode;
  /** Names the instance defines (functions, constants, units are separate). */
  isBuiltin: (name: string) => boolean;
  isUnit: (name: string) => boolean;
}

function countArgs(args: unknown[]): number {
  let n = 1;
  for (const a of args) {
    if (typeof a === 'number') n *= Math.max(0, a);
    else if (Array.isArray(a)) for (const d of a) if (typeof d === 'number') n *= Math.max(0, d);
  }
  return n;
}

function rangeCount(args: unknown[]): number {
  let [start, end, step] = args;
  if (typeof start === 'string') [start, end, step] = start.split(':').map(Number);
  if (typeof start !== 'number' || typeof end !== 'number') return 0;
  const s = typeof step === 'number' ? step : 1;
  return s === 0 ? Infinity : Math.abs((end - start) / s);
}

function capped(name: string, fn: (...a: unknown[]) => unknown, count: (args: unknown[]) => number) {
  return (...args: unknown[]) => {
    const n = count(args);
    if (!(n <= MAX_ELEMENTS)) {
      throw new EngineError('formula_too_large', `${name}(...) would make ${n} elements; the limit is ${MAX_ELEMENTS}`);
    }
    return fn(...args);
  };
}

/**
 * Builds the mathjs instance formulas run in. Following mathjs's security guidance,
 * everything that changes the instance or parses text into code is replaced by a
 * function that throws, after Cogbook's own units (rpm) and library functions are
 * added (`print` too: its templates walk object fields by name). Sizes of generated arrays are capped so a formula cannot exhaust memory.
 * Property access is checked again on the parsed tree (see check-formula.ts).
 *
 * Creating one costs tens of milliseconds: a host keeps one and passes it to the runner.
 */
export function createFormulaEngine(): FormulaEngine {
  const math = create(all, { matrix: 'Array', number: 'number' });
  math.createUnit('rpm', { definition: '1 / minute', aliases: ['RPM'] });
  const parse = math.parse.bind(math) as (source: string) => MathNode;
  const isUnit = (name: string): boolean => {
    try {
      return math.Unit.isValuelessUnit(name);
    } catch {
      return false;
    }
  };
  const original = math as unknown as Record<string, (...a: unknown[]) => unknown>;
  const limits = {
    range: capped('range', original['range']!, rangeCount),
    zeros: capped('zeros', original['zeros']!, countArgs),
    ones: capped('ones', original['ones']!, countArgs),
    identity: capped('identity', original['identity']!, (a) => countArgs(a) * countArgs(a.slice(0, 1))),
    random: capped('random', original['random']!, (a) => (Array.isArray(a[0]) ? countArgs(a.slice(0, 1)) : 1)),
    randomInt: capped('randomInt', original['randomInt']!, (a) => (Array.isArray(a[0]) ? countArgs(a.slice(0, 1)) : 1)),
    resize: capped('resize', original['resize']!, (a) => countArgs(a.slice(1, 2))),
  };
  const blocked: Record<string, () => never> = {};
  for (const name of DISABLED_FUNCTIONS) {
    blocked[name] = () => {
      throw new EngineError('formula_blocked', `${name} is not available in formulas`);
    };
  }
  // Order matters: `import` itself is among the blocked names, so it is replaced last.
  math.import({ ...fastComparisons(math), ...libraryFunctions(), ...limits }, { override: true });
  math.import(blocked, { override: true });
  const names = new Set(Object.keys(math));
  return { math, parse, isBuiltin: (name) => names.has(name), isUnit };
}
