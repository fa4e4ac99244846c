import { z } from 'zod';
import { cellKindSchema } from '../notebook/document.js';
import { isoDateSchema } from './common.js';
import { recordingFormatSchema } from './uploads.js';

/** Any JSON value (numbers that were NaN or infinite are stored as null). */
export const jsonValueSchema = z.json();

/** Count, missing and range of one column; null where the column had no finite value. */
export const snapshotColumnSchema = z.object({
  name: z.string(),
  n: z.number(),
  missing: z.number(),
  mean: z.number().nullable(),
  min: z.number().nullable(),
  max: z.number().nullable(),
});
export type SnapshotColumn = z.infer<typeof snapshotColumnSchema>;

/** Largest number of rows kept in a table's `head`. */
export const SNAPSHOT_TABLE_HEAD_ROWS = 20;
/** Largest number of rows kept in any one dataset of a chart spec. */
export const SNAPSHOT_CHART_MAX_ROWS = 2000;

/** What a computed cell produced, reduced for readers (no raw recording samples). */
export const snapshotResultSchema = z.discriminatedUnion('type', [
  z.object({
    type: z.literal('recording'),
    recording: z.object({
      /** RecordingMeta: file name, format, device, start, interval, dropouts. */
      meta: z.record(z.string(), z.unknown()),
      rows: z.number(),
      columns: z.array(snapshotColumnSchema),
      laps: z.number(),
      gearChanges: z.number(),
    }),
  }),
  z.object({
    type: z.literal('table'),
    table: z.object({
      rows: z.number(),
      startS: z.number().nullable(),
      endS: z.number().nullable(),
      intervalS: z.number().optional(),
      columns: z.array(snapshotColumnSchema),
      segments: z.array(z.record(z.string(), z.unknown())).optional(),
      facts: z.record(z.string(), z.union([z.number(), z.string(), z.null()])).optional(),
    }),
    /** The first {@link SNAPSHOT_TABLE_HEAD_ROWS} rows: `time` then each column. */
    head: z.object({ columns: z.array(z.string()), rows: z.array(z.array(z.number().nullable())) }),
  }),
  z.object({
    type: z.literal('values'),
    /** Each name the formula assigned; long lists are summarised ({ list: true, length, n, mean, min, max, head }). */
    values: z.record(z.string(), jsonValueSchema),
    last: jsonValueSchema.optional(),
  }),
  z.object({
    type: z.literal('chart'),
    /** A vega-lite spec with inline data of at most {@link SNAPSHOT_CHART_MAX_ROWS} rows per dataset. */
    spec: z.record(z.string(), z.unknown()),
    /**
     * The chart already drawn on the server as an SVG document (published snapshots), so a
     * reader's page shows it without the chart library. Plain shapes and text only; absent
     * when the chart could not be drawn there.
     */
    svg: z.string().optional(),
  }),
  z.object({ type: z.literal('note'), markdown: z.string() }),
]);
export type SnapshotResult = z.infer<typeof snapshotResultSchema>;

/** A problem as the engine reports it: stable code, message, and where. */
export const snapshotProblemSchema = z.object({
  code: z.string(),
  message: z.string(),
  where: z.record(z.string(), z.unknown()).optional(),
});

/** One cell of a snapshot. */
export const snapshotCellSchema = z.object({
  cellId: z.string(),
  name: z.string(),
  kind: cellKindSchema,
  /** `fresh` computed; `failed` raised `error`; `blocked` waits on `blockedBy`. */
  state: z.enum(['fresh', 'failed', 'blocked']),
  durationMs: z.number(),
  result: snapshotResultSchema.optional(),
  error: snapshotProblemSchema.optional(),
  blockedBy: z
    .object({ cellId: z.string().optional(), name: z.string(), reason: z.enum(['failed', 'empty_slot']) })
    .optional(),
  warnings: z.array(snapshotProblemSchema),
});
export type SnapshotCell = z.infer<typeof snapshotCellSchema>;

/** A recording a snapshot was computed from: no upload id, only what a reader may know. */
export const snapshotInputSchema = z.object({
  slot: z.string(),
  label: z.string(),
  fileName: z.string(),
  format: recordingFormatSchema,
  sha256: z.string(),
  size: z.number().int().nonnegative(),
});
export type SnapshotInput = z.infer<typeof snapshotInputSchema>;

/**
 * The rendered outputs of one notebook revision on given recordings, computed on the
 * server by the same runner the browser uses. What runs store, share links show and
 * published pages serve. Cells are in document order.
 */
export const snapshotSchema = z.object({
  snapshotVersion: z.literal(1),
  revision: z.number().int().positive(),
  computedAt: isoDateSchema,
  /** Wall time of the whole computation, ms (reading the files included). */
  durationMs: z.number(),
  inputs: z.array(snapshotInputSchema),
  cells: z.array(snapshotCellSchema),
});
export type Snapshot = z.infer<typeof snapshotSchema>;
