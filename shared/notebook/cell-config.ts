import { z } from 'zod';

/** A name cells can read: letters, digits and underscores, not starting with a digit. */
export const identifierSchema = z
  .string()
  .regex(/^[A-Za-z_][A-Za-z0-9_]*$/, 'use letters, digits and _ only, not starting with a digit')
  .max(64);

/** Seconds from the start of the (aligned) ride; never negative. */
const secondsSchema = z.number().min(0);

/** A time range in seconds, `endS` after `startS`. */
export const timeRangeSchema = z
  .object({ startS: secondsSchema, endS: secondsSchema, label: z.string().max(60).optional() })
  .refine((r) => r.endS > r.startS, { message: 'endS must be after startS' });

/**
 * Import cell: turns the recording bound to a slot into a named recording.
 * `csvMapping` is the column mapping used for CSV files (same shape the importer takes).
 */
export const importConfigSchema = z.object({
  slot: identifierSchema,
  csvMapping: z.record(z.string(), z.unknown()).optional(),
});

/** Align two recordings (reference and device under test) and pair them on one time grid. */
export const alignTransformSchema = z.object({
  op: z.literal('align'),
  reference: identifierSchema,
  test: identifierSchema,
  /** `auto` finds the lag by cross-correlating power; `manual` uses `offsetS` as given. */
  mode: z.enum(['auto', 'manual']).default('auto'),
  /** Seconds added to the test device's clock (manual mode, or the starting guess). */
  offsetS: z.number().default(0),
  /** Largest lag searched in auto mode, seconds. */
  maxLagS: z.number().positive().max(3600).default(120),
  /** Spacing of the common grid, seconds. */
  intervalS: z.number().positive().max(60).default(1),
});

/** Put a recording or table on a regular grid; gaps longer than `maxGapS` stay missing. */
export const resampleTransformSchema = z.object({
  op: z.literal('resample'),
  source: identifierSchema,
  intervalS: z.number().positive().max(60).default(1),
  maxGapS: z.number().min(0).max(600).default(3),
});

/** Moving average over `windowS` seconds (centred, or trailing as a head unit shows it). */
export const smoothTransformSchema = z.object({
  op: z.literal('smooth'),
  source: identifierSchema,
  windowS: z.number().positive().max(3600).default(3),
  centred: z.boolean().default(true),
});

/** Keep the part between `startS` and `endS` (null = to the end). */
export const trimTransformSchema = z.object({
  op: z.literal('trim'),
  source: identifierSchema,
  startS: secondsSchema.default(0),
  endS: secondsSchema.nullable().default(null),
});

/** Split a table into blocks: by laps, by detected steady sections, or by hand-set ranges. */
export const segmentTransformSchema = z.object({
  op: z.literal('segment'),
  source: identifierSchema,
  method: z.enum(['laps', 'steady', 'manual']).default('steady'),
  /** Column the steady detection looks at. */
  column: z.string().max(64).default('power'),
  /** Largest spread around the block mean still counted as steady, percent. */
  tolerancePct: z.number().positive().max(100).default(5),
  minDurationS: z.number().positive().max(36000).default(60),
  ranges: z.array(timeRangeSchema).max(500).default([]),
});

/** A hand-set gear state over a time range: the chainring the chain was physically on. */
export const gearOverrideSchema = z.object({
  startS: secondsSchema,
  endS: secondsSchema,
  frontTeeth: z.number().int().positive().max(80).optional(),
  rearTeeth: z.number().int().positive().max(80).optional(),
});

/** Attach the gear state: from the file's shift events, inferred from speed and cadence, or set by hand. */
export const gearsTransformSchema = z.object({
  op: z.literal('gears'),
  source: identifierSchema,
  method: z.enum(['events', 'inferred', 'override']).default('events'),
  chainrings: z.array(z.number().int().positive().max(80)).max(4).default([]),
  cogs: z.array(z.number().int().positive().max(80)).max(16).default([]),
  /** ETRTO tyre size, e.g. "25-622". */
  wheel: z.string().regex(/^\d{2}-\d{3}$/, 'ETRTO size like 25-622').default('25-622'),
  overrides: z.array(gearOverrideSchema).max(500).default([]),
});

/** Pair several aligned recordings (the first is the reference) into one table. */
export const combineTransformSchema = z.object({
  op: z.literal('combine'),
  sources: z.array(identifierSchema).min(2).max(8),
  intervalS: z.number().positive().max(60).default(1),
});

/** Transform cell: one operation, chosen by `op`. */
export const transformConfigSchema = z.discriminatedUnion('op', [
  alignTransformSchema,
  resampleTransformSchema,
  smoothTransformSchema,
  trimTransformSchema,
  segmentTransformSchema,
  gearsTransformSchema,
  combineTransformSchema,
]);

/** Formula cell: mathjs-syntax source, one statement per line; assignments name results. */
export const formulaConfigSchema = z.object({
  source: z.string().max(20_000).default(''),
});

/** The chart presets: each has a builder in shared/charts. */
export const chartPresetSchema = z.enum(['traces', 'difference', 'scatter', 'bland-altman', 'bars-tolerance', 'left-right']);

/**
 * Chart cell. Each binding is a short formula (same syntax and names as formula cells),
 * e.g. `{ x: 'aligned.time', y: 'aligned.ref_power' }`. Which bindings a preset uses is
 * listed in CHART_BINDINGS. `spec` replaces the preset's spec in advanced mode; the
 * bound data is still supplied as the dataset named "cells".
 */
export const chartConfigSchema = z.object({
  preset: chartPresetSchema,
  title: z.string().max(200).optional(),
  bindings: z.record(z.string().max(32), z.string().max(2000)).default({}),
  /** Series labels, in binding order (e.g. device names). */
  labels: z.array(z.string().max(60)).max(8).optional(),
  spec: z.record(z.string(), z.unknown()).optional(),
});

/** Note cell: Markdown text. */
export const noteConfigSchema = z.object({ markdown: z.string().max(50_000).default('') });

/** Config of an import cell. */
export type ImportConfig = z.infer<typeof importConfigSchema>;
/** Config of a transform cell (one of the ops). */
export type TransformConfig = z.infer<typeof transformConfigSchema>;
/** Name of a transform op. */
export type TransformOp = TransformConfig['op'];
/** Config of a formula cell. */
export type FormulaConfig = z.infer<typeof formulaConfigSchema>;
/** Name of a chart preset. */
export type ChartPreset = z.infer<typeof chartPresetSchema>;
/** Config of a chart cell. */
export type ChartConfig = z.infer<typeof chartConfigSchema>;
/** Config of a note cell. */
export type NoteConfig = z.infer<typeof noteConfigSchema>;
/** A hand-set gear state over a time range. */
export type GearOverride = z.infer<typeof gearOverrideSchema>;
/** A time range in seconds with an optional label. */
export type TimeRange = z.infer<typeof timeRangeSchema>;

/**
 * The bindings each chart preset reads (required first, `?` = optional). The editor
 * shows one input per binding; the runner evaluates each as a formula.
 */
export const CHART_BINDINGS: Readonly<Record<ChartPreset, readonly string[]>> = {
  traces: ['x', 'y1', 'y2?', 'y3?', 'y4?'],
  difference: ['x', 'test', 'ref'],
  scatter: ['ref', 'test'],
  'bland-altman': ['ref', 'test'],
  'bars-tolerance': ['values', 'labels?', 'groups?', 'tolerance'],
  'left-right': ['labels', 'left', 'right', 'tolerance'],
};
