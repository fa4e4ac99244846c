import { z } from 'zod';

/** Current version of the notebook document format. Older documents are migrated on load. */
export const NOTEBOOK_SCHEMA_VERSION = 1;

/** A name cells can read: letters, digits and underscores, not starting with a digit. */
export const identifierSchema = z
  .string()
  .regex(/^[A-Za-z_][A-Za-z0-9_]*$/, 'use letters, digits and _ only, not starting with a digit')
  .max(64);

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
});

export const cellKindSchema = z.enum(['import', 'transform', 'formula', 'chart', 'note']);

/** One cell. `config` is kind-specific and validated by the notebook runner. */
export const cellSchema = z.object({
  id: z.string().min(1).max(64),
  kind: cellKindSchema,
  /** The name its output is known by to later cells. */
  name: identifierSchema,
  collapsed: z.boolean().optional(),
  config: z.record(z.string(), z.unknown()),
});

/** The whole notebook document as stored (jsonb) and exported. */
export const notebookDocumentSchema = z.object({
  schemaVersion: z.literal(NOTEBOOK_SCHEMA_VERSION),
  title: z.string().min(1).max(200),
  description: z.string().max(5000).default(''),
  parameters: z.array(parameterSchema).max(100),
  slots: z.array(slotSchema).max(20),
  cells: z.array(cellSchema).max(500),
});

export type NotebookParameter = z.infer<typeof parameterSchema>;
export type NotebookSlot = z.infer<typeof slotSchema>;
export type CellKind = z.infer<typeof cellKindSchema>;
export type NotebookCell = z.infer<typeof cellSchema>;
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
