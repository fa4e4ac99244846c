import { deviceColour } from './palette.js';

/** The vega-lite schema every builder declares. */
export const VEGA_LITE_SCHEMA = 'https://vega.github.io/schema/vega-lite/v6.json';

/** Points a chart keeps per series by default: more than a wide screen has pixels. */
export const DEFAULT_MAX_POINTS = 2000;

/** A device in a chart: its label and its place in the notebook's slot order (fixes its colour). */
export interface ChartDevice {
  label: string;
  /** 0-based position of the device among the notebook's slots; the same device keeps its colour. */
  colourIndex: number;
}

/** NaN and infinities become null: JSON has no NaN, and vega-lite treats null as missing. */
export function finiteOrNull(v: number): number | null {
  return Number.isFinite(v) ? v : null;
}

/** A colour scale that pins each device label to its palette colour. */
export function deviceScale(devices: readonly ChartDevice[]): { domain: string[]; range: string[] } {
  return { domain: devices.map((d) => d.label), range: devices.map((d) => deviceColour(d.colourIndex)) };
}

/** Colours for the two legs, fixed across charts (palette entries not used for the first devices). */
export const LEG_COLOURS = { left: deviceColour(2), right: deviceColour(3) } as const;

/** Colour of the tolerance band: a light grey that reads on white and under bars. */
export const TOLERANCE_BAND_COLOUR = '#BBBBBB';

/**
 * Data of one empty row, for a layer drawn once whatever the chart's rows (a rule at zero, a
 * tolerance band): a layer without data of its own takes the chart's and draws one mark per row.
 * A new object each time: the chart library tags the rows it is given.
 */
export function drawnOnce(): { values: Record<string, never>[] } {
  return { values: [{}] };
}
