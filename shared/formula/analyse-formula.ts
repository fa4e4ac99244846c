import type { MathNode } from 'mathjs';
import { EngineError, type Where } from '../errors.js';
import { BLOCKED_FUNCTIONS, type FormulaEngine } from './create-formula-engine.js';
import { findName, positionAt } from './source-position.js';

/** One statement group of a formula, with the line it starts on (for runtime messages). */
export interface FormulaStatement {
  line: number;
  node: MathNode;
}

/** What a formula reads and writes, found from its parsed tree. */
export interface FormulaAnalysis {
  statements: FormulaStatement[];
  /** Names assigned at the top level (`bias = ...`): the cell's outputs, in order. */
  writes: string[];
  /** Names used but not defined inside the formula nor built in: earlier cells or parameters. */
  reads: string[];
  /** Free names that are units (W, rpm, km); a cell or parameter of the same name takes precedence. */
  unitNames: string[];
  /** Functions the formula defines (`f(x) = ...`); they stay inside the cell. */
  functions: string[];
}

/** Properties no formula may read: the ways into constructors and prototypes. */
const FORBIDDEN_PROPERTIES = new Set([
  'constructor', '__proto__', 'prototype', '__defineGetter__', '__defineSetter__', '__lookupGetter__',
  '__lookupSetter__', 'call', 'apply', 'bind', 'valueOf', 'toString', 'toLocaleString', 'hasOwnProperty',
  'isPrototypeOf', 'propertyIsEnumerable', 'caller', 'callee', 'arguments',
]);
const BLOCKED = new Set(BLOCKED_FUNCTIONS);
const PROPERTY = /^[A-Za-z_][A-Za-z0-9_]*$/;

// mathjs's node types do not expose the fields each node kind has; read them loosely.
type AnyNode = MathNode & Record<string, any>;

function fail(code: string, message: string, where: Where): never {
  throw new EngineError(code, message, where);
}

/** The string a property access names (`a.b`, `a["b"]`), or undefined for numeric indexing. */
function propertyName(node: AnyNode): string | undefined {
  const dims: AnyNode[] = node['index']?.dimensions ?? [];
  if (dims.length === 1 && dims[0]!.type === 'ConstantNode' && typeof dims[0]!['value'] === 'string') return dims[0]!['value'];
  return undefined;
}

function rootSymbol(node: AnyNode): AnyNode | undefined {
  let n: AnyNode = node;
  while (n.type === 'AccessorNode' || n.type === 'ParenthesisNode') n = n.type === 'AccessorNode' ? n['object'] : n['content'];
  return n.type === 'SymbolNode' ? n : undefined;
}

/** Splits the source into statement groups that parse on their own, keeping start lines. */
function splitStatements(engine: FormulaEngine, source: string): FormulaStatement[] {
  const lines = source.split('\n');
  const out: FormulaStatement[] = [];
  let start = 0;
  for (let i = 0; i < lines.length; i++) {
    const chunk = lines.slice(start, i + 1).join('\n');
    try {
      const node = engine.parse(chunk);
      if (chunk.trim() !== '' && !/^\s*(#.*)?$/.test(chunk)) out.push({ line: start + 1, node });
      start = i + 1;
    } catch {
      // An unfinished bracket: the statement continues on the next line.
    }
  }
  return out;
}

/**
 * Parses a formula, checks it against Cogbook's formula rules and lists its reads and
 * writes. Rules on top of the locked mathjs instance: no blocked function names; fields
 * only on named values (`aligned.ref_power`, `fit.slope`), never on functions nor named
 * constructor/prototype/...; only named functions can be called; only plain names can
 * be assigned, and not the names of built-ins.
 *
 * @throws EngineError `formula_syntax` (with line and column), `formula_forbidden`.
 * @example analyseFormula(engine, 'd = a.x - a.y\nbias = avg(d)', 'c1').writes // ['d', 'bias']
 */
export function analyseFormula(engine: FormulaEngine, source: string, cell: string): FormulaAnalysis {
  let memo = analyses.get(engine);
  if (!memo) analyses.set(engine, (memo = new Map()));
  const key = `${cell}\u0000${source}`;
  let known = memo.get(key);
  if (!known) {
    try {
      known = { analysis: analyse(engine, source, cell) };
    } catch (e) {
      known = { error: e };
    }
    if (memo.size >= MEMO_LIMIT) memo.delete(memo.keys().next().value!);
    memo.set(key, known);
  }
  if ('error' in known) throw known.error;
  return known.analysis;
}

/**
 * Analyses by engine and (cell, source): the graph is rebuilt on every run and most
 * formulas have not changed since the last one. Results are never changed by readers.
 */
const analyses = new WeakMap<FormulaEngine, Map<string, { analysis: FormulaAnalysis } | { error: unknown }>>();
const MEMO_LIMIT = 500;

function analyse(engine: FormulaEngine, source: string, cell: string): FormulaAnalysis {
  try {
    engine.parse(source);
  } catch (e) {
    const char = (e as { char?: number }).char;
    const pos = typeof char === 'number' ? positionAt(source, char) : undefined;
    const text = e instanceof Error ? e.message.replace(/\s*\(char \d+\)$/, '') : String(e);
    fail('formula_syntax', `${text}${pos ? ` at line ${pos.line}, column ${pos.column}` : ''}`, { cell, ...pos });
  }
  const statements = splitStatements(engine, source);
  const writes: string[] = [];
  const functions: string[] = [];
  const locals = new Set<string>();
  const used: string[] = [];
  const at = (name: string): Where => ({ cell, ...findName(source, name) });

  for (const { node } of statements) {
    const top = node.type === 'BlockNode' ? (node as AnyNode)['blocks'].map((b: AnyNode) => b['node']) : [node];
    for (const n of top as AnyNode[]) {
      if (n.type === 'AssignmentNode' && n['object'].type === 'SymbolNode' && !n['index']) {
        if (!writes.includes(n['name'])) writes.push(n['name']);
      }
    }
    node.traverse((raw) => {
      const n = raw as AnyNode;
      switch (n.type) {
        case 'SymbolNode':
          if (BLOCKED.has(n['name'])) fail('formula_forbidden', `${n['name']} is not available in formulas`, at(n['name']));
          used.push(n['name']);
          break;
        case 'AccessorNode': {
          const prop = propertyName(n);
          if (prop === undefined) break;
          const root = rootSymbol(n);
          if (!PROPERTY.test(prop) || FORBIDDEN_PROPERTIES.has(prop)) {
            fail('formula_forbidden', `the field "${prop}" cannot be read`, { cell, ...(findName(source, prop, { field: true }) ?? findName(source, prop)) });
          }
          if (root === undefined) fail('formula_forbidden', `fields can only be read from a named value, as in aligned.${prop}`, at(prop));
          if (functions.includes(root['name']) || (engine.isBuiltin(root['name']) && typeof (engine.math as unknown as Record<string, unknown>)[root['name']] === 'function')) {
            fail('formula_forbidden', `${root['name']} is a function: functions have no fields`, at(root['name']));
          }
          break;
        }
        case 'FunctionNode':
          if (n['fn'].type !== 'SymbolNode') fail('formula_forbidden', 'only named functions can be called (no methods)', { cell });
          break;
        case 'AssignmentNode': {
          const target = n['object'] as AnyNode;
          if (target.type !== 'SymbolNode' || n['index']) {
            fail('formula_forbidden', 'only plain names can be assigned (no fields or elements): copy into a new name instead', { cell });
          }
          if (engine.isBuiltin(target['name']) || BLOCKED.has(target['name'])) {
            fail('formula_forbidden', `${target['name']} is a built-in name and cannot be assigned`, at(target['name']));
          }
          locals.add(target['name']);
          break;
        }
        case 'FunctionAssignmentNode':
          if (engine.isBuiltin(n['name']) || BLOCKED.has(n['name'])) {
            fail('formula_forbidden', `${n['name']} is a built-in name and cannot be redefined`, at(n['name']));
          }
          functions.push(n['name']);
          locals.add(n['name']);
          for (const p of n['params'] as string[]) locals.add(p);
          break;
        case 'ObjectNode':
          for (const key of Object.keys(n['properties'])) {
            if (FORBIDDEN_PROPERTIES.has(key)) fail('formula_forbidden', `the field "${key}" cannot be set`, at(key));
          }
          break;
        default:
          break;
      }
    });
  }
  const free = [...new Set(used)].filter((name) => !locals.has(name) && !engine.isBuiltin(name));
  const unitNames = free.filter((name) => engine.isUnit(name));
  return { statements, writes, reads: free.filter((name) => !unitNames.includes(name)), unitNames, functions };
}
