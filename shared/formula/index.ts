export { analyseFormula, type FormulaAnalysis, type FormulaStatement } from './analyse-formula.js';
export { BLOCKED_FUNCTIONS, MAX_ELEMENTS, createFormulaEngine, type FormulaEngine } from './create-formula-engine.js';
export { evaluateFormula, type EvaluateFormulaOptions, type FormulaResult } from './evaluate-formula.js';
export { columnSourceOf, countNonFinite, fromMathValue, isQuantity, toMathValue, type FormulaValue, type Quantity } from './formula-value.js';
export { FORMULA_LIBRARY, FORMULA_UNITS, type FormulaFunctionDoc, type FormulaUnitDoc } from './library.js';
export { libraryFunctions } from './library-functions.js';
export { findName, positionAt, type SourcePosition } from './source-position.js';
