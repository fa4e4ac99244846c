/**
 * Colours for devices in charts: the eight-colour categorical palette of Okabe & Ito
 * ("Color Universal Design", 2008), which stays distinguishable for the common forms
 * of colour-vision deficiency. The order puts the strongest contrasts on white first,
 * so the usual two or three devices get clearly different hues; the pale yellow comes
 * last because it is hard to read as a thin line on a light background.
 */
export const DEVICE_PALETTE: readonly string[] = Object.freeze([
  '#0072B2', // blue
  '#D55E00', // vermillion
  '#009E73', // bluish green
  '#CC79A7', // reddish purple
  '#E69F00', // orange
  '#56B4E9', // sky blue
  '#000000', // black
  '#F0E442', // yellow
]);

/**
 * The colour of the device at `index` (0-based, in slot order). Past the end of the
 * palette the colours repeat; charts with more than eight devices should also vary
 * the line dash or mark shape.
 *
 * @example
 * deviceColour(0) // '#0072B2'
 * deviceColour(9) // '#D55E00'
 */
export function deviceColour(index: number): string {
  const n = DEVICE_PALETTE.length;
  const i = Number.isFinite(index) ? Math.trunc(index) : 0;
  return DEVICE_PALETTE[((i % n) + n) % n] as string;
}
