import { analyseFormula, createFormulaEngine, evaluateFormula, type FormulaValue } from '../../../shared/formula/index.js';
import { isEngineError, type EngineErrorData } from '../../../shared/errors.js';

/** One engine for a test file: creating it takes tens of ms. */
export const engine = createFormulaEngine();

/** Analyses and runs a formula in cell "c1"; returns its result or the error as data. */
export function run(source: string, inputs: Record<string, FormulaValue> = {}) {
  try {
    const analysis = analyseFormula(engine, source, 'c1');
    return { ok: true as const, analysis, ...evaluateFormula(engine, analysis, inputs, source, 'c1') };
  } catch (e) {
    if (!isEngineError(e)) throw e;
    return { ok: false as const, error: e.toData() as EngineErrorData };
  }
}

/** The error a formula raises; fails the test when it does not raise one. */
export function errorOf(source: string, inputs: Record<string, FormulaValue> = {}): EngineErrorData {
  const r = run(source, inputs);
  if (r.ok) throw new Error(`expected "${source}" to fail, it gave ${JSON.stringify(r.values)} / ${String(r.last)}`);
  return r.error;
}
