import { EngineError } from '../errors.js';
import { parseEtrto } from './parse-etrto.js';

/** Options of {@link inferGears}. */
export interface InferGearsOptions {
  /** Chainring teeth, e.g. [50, 34]. */
  chainrings: readonly number[];
  /** Cog teeth, e.g. [11, 12, ..., 30]. */
  cogs: readonly number[];
  /** Wheel as an ETRTO size ("25-622") or a rolling circumference in mm. */
  wheel: string | number;
  /** Below this cadence the rider is taken to coast and the gear is unknown, rpm (default 20). */
  minCadenceRpm?: number;
  /** Largest relative mismatch between measured and nearest ratio still accepted (default 0.06). */
  maxMismatch?: number;
}

/** Gear state inferred per sample. */
export interface InferredGears {
  frontTeeth: Float64Array;
  rearTeeth: Float64Array;
  /** Measured development ratio speed / (cadence * circumference), NaN when coasting. */
  ratio: Float64Array;
}

/**
 * Infers the gear from speed and cadence: the chain turns the wheel at
 * `speed = cadence / 60 * (ring / cog) * circumference`, so the measured ratio
 * `speed * 60 / (cadence * circumference)` is matched to the nearest ring/cog ratio
 * (nearest on a log scale, since gear steps are proportional). NaN when coasting
 * (cadence below minCadenceRpm, no speed) or when no ratio is close enough. O(n * gears).
 *
 * @throws EngineError `bad_gears` when chainrings or cogs are empty or not positive.
 * @example
 * inferGears(speed, cadence, { chainrings: [53, 39], cogs: [11, 12, 13, 14, 15, 17, 19, 21, 23, 25, 28], wheel: '25-622' })
 */
export function inferGears(speed: Float64Array, cadence: Float64Array, options: InferGearsOptions): InferredGears {
  const circumferenceM = (typeof options.wheel === 'number' ? options.wheel : parseEtrto(options.wheel).circumferenceMm) / 1000;
  const minCadence = options.minCadenceRpm ?? 20;
  const maxMismatch = options.maxMismatch ?? 0.06;
  const { chainrings, cogs } = options;
  if (chainrings.length === 0 || cogs.length === 0 || [...chainrings, ...cogs].some((t) => !(t > 0))) {
    throw new EngineError('bad_gears', 'chainrings and cogs must be non-empty lists of positive tooth counts');
  }
  const combos: { ring: number; cog: number; logRatio: number }[] = [];
  for (const ring of chainrings) for (const cog of cogs) combos.push({ ring, cog, logRatio: Math.log(ring / cog) });
  const n = Math.min(speed.length, cadence.length);
  const frontTeeth = new Float64Array(n).fill(NaN);
  const rearTeeth = new Float64Array(n).fill(NaN);
  const ratio = new Float64Array(n).fill(NaN);
  const limit = Math.log(1 + maxMismatch);
  for (let i = 0; i < n; i++) {
    const rpm = cadence[i]!;
    const v = speed[i]!;
    if (!(rpm >= minCadence) || !(v > 0)) continue;
    const measured = (v * 60) / (rpm * circumferenceM);
    ratio[i] = measured;
    const logMeasured = Math.log(measured);
    let best = -1;
    let bestDistance = Infinity;
    for (let c = 0; c < combos.length; c++) {
      const distance = Math.abs(combos[c]!.logRatio - logMeasured);
      if (distance < bestDistance) {
        bestDistance = distance;
        best = c;
      }
    }
    if (best >= 0 && bestDistance <= limit) {
      frontTeeth[i] = combos[best]!.ring;
      rearTeeth[i] = combos[best]!.cog;
    }
  }
  return { frontTeeth, rearTeeth, ratio };
}
