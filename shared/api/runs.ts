import { z } from 'zod';
import { identifierSchema } from '../notebook/cell-config.js';
import { idSchema, isoDateSchema } from './common.js';
import { snapshotSchema } from './snapshots.js';

/** Slot name -> upload id. Slots not named keep the upload bound in the notebook. */
export const runBindingsSchema = z.record(identifierSchema, idSchema);
export type RunBindings = z.infer<typeof runBindingsSchema>;

/**
 * POST /api/notebooks/:id/runs (editors): computes the notebook at its current
 * revision on the given uploads, on the server, and stores the outcome. Answers 201
 * with a {@link RunResponse}. An unknown slot name or an unreadable upload -> 400 / 404;
 * a file that cannot be read as a recording -> 400 `input_unreadable` naming it.
 */
export const createRunBodySchema = z.object({
  bindings: runBindingsSchema.default({}),
  label: z.string().trim().max(120).optional(),
});
export type CreateRunBody = z.infer<typeof createRunBodySchema>;

/** One slot of a run and the upload it read. */
export const runBindingSchema = z.object({ slot: z.string(), uploadId: idSchema, fileName: z.string() });
export type RunBinding = z.infer<typeof runBindingSchema>;

/** A run in a list (no outputs). */
export const runSummarySchema = z.object({
  id: idSchema,
  notebookId: idSchema,
  revision: z.number().int().positive(),
  label: z.string().nullable(),
  bindings: z.array(runBindingSchema),
  createdBy: z.object({ id: idSchema, name: z.string() }).nullable(),
  createdAt: isoDateSchema,
  durationMs: z.number(),
  cellCount: z.number().int().nonnegative(),
  failedCells: z.number().int().nonnegative(),
});
export type RunSummary = z.infer<typeof runSummarySchema>;

/** GET /api/notebooks/:id/runs (readers): newest first. */
export const runListResponseSchema = z.object({ runs: z.array(runSummarySchema) });
export type RunListResponse = z.infer<typeof runListResponseSchema>;

/** GET /api/runs/:id (readers of its notebook), and the answer of POST .../runs. */
export const runResponseSchema = runSummarySchema.extend({ snapshot: snapshotSchema });
export type RunResponse = z.infer<typeof runResponseSchema>;

/**
 * GET /api/notebooks/:id/runs/compare?path=legs.left_gear_effect: one output across
 * every run of the notebook. `path` is a cell name followed by keys: for a formula cell
 * the assigned name (`legs.left_gear_effect`), for a table `facts.<name>` or
 * `<column>.mean|min|max|n|missing` or `rows`; a bare cell name takes a formula cell's
 * last value.
 */
export const runCompareQuerySchema = z.object({ path: z.string().trim().min(1).max(200) });
export type RunCompareQuery = z.infer<typeof runCompareQuerySchema>;

/** One run's value at the compared path (null when absent or not a single value; see `problem`). */
export const runCompareRowSchema = z.object({
  runId: idSchema,
  label: z.string().nullable(),
  createdAt: isoDateSchema,
  revision: z.number().int().positive(),
  value: z.union([z.number(), z.string(), z.boolean(), z.null()]),
  /** Unit of a quantity value (`W`, `%` ...). */
  unit: z.string().optional(),
  /** Why `value` is null: `missing`, `failed`, `not_a_value`. */
  problem: z.enum(['missing', 'failed', 'not_a_value']).optional(),
});
export type RunCompareRow = z.infer<typeof runCompareRowSchema>;

/** Answer of the compare route: oldest run first (ready for a chart over time). */
export const runCompareResponseSchema = z.object({ path: z.string(), rows: z.array(runCompareRowSchema) });
export type RunCompareResponse = z.infer<typeof runCompareResponseSchema>;

/** Route params of `/api/runs/:id/cells/:cellId.csv`. */
export const runCellParamsSchema = z.object({ id: idSchema, cellId: z.string().min(1).max(64) });
