import { z } from 'zod';
import {
  chartConfigSchema,
  formulaConfigSchema,
  identifierSchema,
  importConfigSchema,
  noteConfigSchema,
  transformConfigSchema,
} from './cell-config.js';

export { identifierSchema } from './cell-config.js';

/**
 * Current version of the notebook document format. Older documents are brought up to
 * it by {@link migrateNotebookDocument} (see migrate-document.ts).
 *
 * History: 1 = cell configs as free-form records; 2 = kind-specific config schemas.
 */
export const NOTEBOOK_SCHEMA_VERSION = 2;

/** A notebook parameter: a number any cell can read by name (tolerance, interval, thresholds). */
export const parameterSchema = z.object({
  name: identifierSchema,
  value: z.number(),
  unit: z.string().max(16).optional(),
  label: z.string().max(120).optional(),
});

/** An input slot: a named place a recording is bound to ("reference", "test A"). */
export const slotSchema = z.object({
  id: z.string().min(1).max(64),
  name: identifierSchema,
  label: z.string().max(120),
  /** Upload bound to this slot, or null while empty. */
  uploadId: z.string().max(64).nullable(),
  /** Remembered CSV column mapping, so the next file of the same shape imports without questions. */
  csvMapping: z.record(z.string(), z.unknown()).optional(),
  /** Read the bound FIT file even though its checksum fails or it is cut short (keeps what is intact, with a warning). */
  readDamaged: z.boolean().optional(),
});

/** The kinds of cell. */
export const cellKindSchema = z.enum(['import', 'transform', 'formula', 'chart', 'note']);

const cellBase = {
  id: z.string().min(1).max(64),
  /** The name its output is known by to later cells. */
  name: identifierSchema,
  collapsed: z.boolean().optional(),
};

/** One cell; `config` is checked against the schema of its `kind`. */
export const cellSchema = z.discriminatedUnion('kind', [
  z.object({ ...cellBase, kind: z.literal('import'), config: importConfigSchema }),
  z.object({ ...cellBase, kind: z.literal('transform'), config: transformConfigSchema }),
  z.object({ ...cellBase, kind: z.literal('formula'), config: formulaConfigSchema }),
  z.object({ ...cellBase, kind: z.literal('chart'), config: chartConfigSchema }),
  z.object({ ...cellBase, kind: z.literal('note'), config: noteConfigSchema }),
]);

/** The whole notebook document as stored (jsonb) and exported. */
export const notebookDocumentSchema = z
  .object({
    schemaVersion: z.literal(NOTEBOOK_SCHEMA_VERSION),
    title: z.string().min(1).max(200),
    description: z.string().max(5000).default(''),
    parameters: z.array(parameterSchema).max(100),
    slots: z.array(slotSchema).max(20),
    cells: z.array(cellSchema).max(500),
  })
  .superRefine((doc, ctx) => {
    // Every name must mean one thing: two cells (or a cell and a parameter) sharing a
    // name would make "which one does this formula read?" ambiguous.
    const seen = new Map<string, string>();
    for (const p of doc.parameters) seen.set(p.name, `parameter ${p.name}`);
    doc.cells.forEach((cell, i) => {
      const other = seen.get(cell.name);
      if (other !== undefined) {
        ctx.addIssue({ code: 'custom', path: ['cells', i, 'name'], message: `name "${cell.name}" is already used by ${other}` });
      }
      seen.set(cell.name, `cell ${cell.id}`);
    });
    const ids = new Set<string>();
    doc.cells.forEach((cell, i) => {
      if (ids.has(cell.id)) ctx.addIssue({ code: 'custom', path: ['cells', i, 'id'], message: `cell id "${cell.id}" appears twice` });
      ids.add(cell.id);
    });
  });

/** A notebook parameter. */
export type NotebookParameter = z.infer<typeof parameterSchema>;
/** An input slot. */
export type NotebookSlot = z.infer<typeof slotSchema>;
/** A kind of cell. */
export type CellKind = z.infer<typeof cellKindSchema>;
/** One cell, typed by kind. */
export type NotebookCell = z.infer<typeof cellSchema>;
/** A cell of one kind, e.g. `CellOf<'formula'>`. */
export type CellOf<K extends CellKind> = Extract<NotebookCell, { kind: K }>;
/** A notebook document in the current format. */
export type NotebookDocument = z.infer<typeof notebookDocumentSchema>;

/** A new, empty notebook document. */
export function emptyNotebook(title: string): NotebookDocument {
  return {
    schemaVersion: NOTEBOOK_SCHEMA_VERSION,
    title,
    description: '',
    parameters: [{ name: 'tolerance', value: 2, unit: '%', label: 'Stated accuracy of the device under test' }],
    slots: [],
    cells: [],
  };
}
