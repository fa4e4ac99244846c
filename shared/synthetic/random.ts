/** A seeded source of pseudo-random numbers; the same seed gives the same sequence everywhere. */
export interface Random {
  /** Uniform in [0, 1). */
  next(): number;
  /** Standard normal (mean 0, SD 1). */
  gaussian(): number;
  /** Uniform integer in [lo, hi]. */
  int(lo: number, hi: number): number;
}

/**
 * A small deterministic generator (mulberry32, 32-bit state) with a Box-Muller gaussian.
 * Good enough for invented test rides; not for cryptography.
 *
 * @example const rnd = createRandom(42); rnd.gaussian();
 */
export function createRandom(seed: number): Random {
  let state = seed >>> 0;
  let spare = NaN;
  const next = (): number => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const gaussian = (): number => {
    if (!Number.isNaN(spare)) {
      const value = spare;
      spare = NaN;
      return value;
    }
    // 1 - next() lies in (0, 1], so the log is finite.
    const r = Math.sqrt(-2 * Math.log(1 - next()));
    const a = 2 * Math.PI * next();
    spare = r * Math.sin(a);
    return r * Math.cos(a);
  };
  return { next, gaussian, int: (lo, hi) => lo + Math.floor(next() * (hi - lo + 1)) };
}
