import { chartConfigSchema, transformConfigSchema, type ChartPreset } from '../notebook/cell-config.js';
import type { CellOf, NotebookSlot } from '../notebook/document.js';

/** Builds demo and template cells with the real config schemas, so defaults are filled in and bad configs fail early. */

/** A Markdown note. */
export function noteCell(id: string, name: string, markdown: string): CellOf<'note'> {
  return { id, name, kind: 'note', config: { markdown } };
}

/** Imports the recording bound to a slot. */
export function importCell(id: string, name: string, slot: string): CellOf<'import'> {
  return { id, name, kind: 'import', config: { slot } };
}

/** A transform; `config` is parsed so unset options take their schema defaults. */
export function transformCell(id: string, name: string, config: Record<string, unknown> & { op: string }): CellOf<'transform'> {
  return { id, name, kind: 'transform', config: transformConfigSchema.parse(config) };
}

/** A formula: one statement per line. */
export function formulaCell(id: string, name: string, lines: readonly string[]): CellOf<'formula'> {
  return { id, name, kind: 'formula', config: { source: lines.join('\n') } };
}

/** A chart preset with its bindings (each a short formula). */
export function chartCell(
  id: string,
  name: string,
  preset: ChartPreset,
  bindings: Record<string, string>,
  extra: { title?: string; labels?: string[] } = {},
): CellOf<'chart'> {
  return { id, name, kind: 'chart', config: chartConfigSchema.parse({ preset, bindings, ...extra }) };
}

/** The reference and test slots, bound to uploads or empty (`null`). */
export function comparisonSlots(
  labels: { reference: string; test: string },
  uploads: { reference: string | null; test: string | null } = { reference: null, test: null },
): NotebookSlot[] {
  return [
    { id: 'reference', name: 'reference', label: labels.reference, uploadId: uploads.reference },
    { id: 'test', name: 'test', label: labels.test, uploadId: uploads.test },
  ];
}
