import type { TopLevelSpec } from 'vega-lite';

/** A complete vega-lite specification, as every chart builder returns it. */
export type { TopLevelSpec };

/** One row of a chart's inline data. */
export type ChartRow = Record<string, number | string | boolean | null>;
