import { EngineError } from '../errors.js';

/** A tyre size read from its ETRTO / ISO 5775 designation. */
export interface TyreSize {
  /** Nominal tyre width, mm. */
  widthMm: number;
  /** Bead-seat diameter of the rim, mm. */
  bsdMm: number;
  /** Geometric rolling circumference pi * (BSD + 2 * width), mm; real tyres roll out a little less. */
  circumferenceMm: number;
}

/**
 * Reads an ETRTO tyre size "WW-DDD" (width - bead-seat diameter, mm).
 *
 * @throws EngineError `bad_etrto` when the text is not of that form.
 * @example
 * parseEtrto('25-622') // { widthMm: 25, bsdMm: 622, circumferenceMm: 2111.15... }
 */
export function parseEtrto(text: string): TyreSize {
  const match = /^\s*(\d{2,3}(?:\.\d+)?)\s*-\s*(\d{3})\s*$/.exec(text);
  if (!match) {
    throw new EngineError('bad_etrto', `wheel size "${text}" is not an ETRTO size such as 25-622 (tyre width - bead-seat diameter, mm)`);
  }
  const widthMm = Number(match[1]);
  const bsdMm = Number(match[2]);
  return { widthMm, bsdMm, circumferenceMm: Math.PI * (bsdMm + 2 * widthMm) };
}
