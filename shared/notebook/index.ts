export { buildGraph, dependentsOf, type GraphCell, type NotebookGraph } from './build-graph.js';
export * from './cell-config.js';
export {
  resultOf,
  showValue,
  summariseTable,
  type CellOutput,
  type CellResult,
  type CellState,
  type ColumnSummary,
  type ListSummary,
  type RecordingSummary,
  type ShownValue,
  type TableSummary,
} from './cell-output.js';
export { formulaView, recordingAsTable, snakeCase, type CellValue, type NotebookTable } from './cell-value.js';
export {
  NOTEBOOK_SCHEMA_VERSION,
  cellKindSchema,
  cellSchema,
  emptyNotebook,
  notebookDocumentSchema,
  parameterSchema,
  slotSchema,
  type CellKind,
  type CellOf,
  type NotebookCell,
  type NotebookDocument,
  type NotebookParameter,
  type NotebookSlot,
} from './document.js';
export { hashRecording, hashText } from './hash.js';
export { migrateNotebookDocument } from './migrate-document.js';
export { buildChart } from './run-chart.js';
export { cellKeys } from './cell-keys.js';
export { runNotebook, staleCells, type RunCache, type RunNotebookOptions, type RunNotebookResult } from './run-notebook.js';
