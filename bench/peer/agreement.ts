/** The headline figures both sides print, read from either side's JSON. */
export interface Headline {
  offsetSeconds: number;
  pairedSeconds: number;
  biasW: number;
  sdW: number;
  slope: number;
  intercept: number;
  r: number;
  driftWPerHour: number;
  /** Test/reference ratio of means per front chainring, by teeth. */
  ratioByTeeth: Map<number, number>;
  steadyBlocks: number;
}

/** One figure that differs beyond its tolerance. */
export interface Mismatch {
  what: string;
  cogbook: number;
  peer: number;
}

interface CogbookComparison {
  alignment: { offsetSeconds: number };
  pairedSeconds: number;
  agreement: { biasW: number; sdW: number };
  regression: { slope: number; intercept: number; r: number };
  drift: { wPerHour: number };
  byFrontGear: { teeth: number; ratio: number }[];
  segments: unknown[];
}

interface PeerReport {
  offsetSeconds: number;
  pairedSeconds: number;
  biasW: number;
  sdW: number;
  slope: number;
  intercept: number;
  r: number;
  driftWPerHour: number;
  byFrontGear: { teeth: number; ratio: number }[];
  segments: unknown[];
}

/** Headline figures of the first comparison in the compare command's --json output. */
export function cogbookHeadline(json: string): Headline {
  const c = (JSON.parse(json) as { comparisons: CogbookComparison[] }).comparisons[0]!;
  return {
    offsetSeconds: c.alignment.offsetSeconds,
    pairedSeconds: c.pairedSeconds,
    biasW: c.agreement.biasW,
    sdW: c.agreement.sdW,
    slope: c.regression.slope,
    intercept: c.regression.intercept,
    r: c.regression.r,
    driftWPerHour: c.drift.wPerHour,
    ratioByTeeth: new Map(c.byFrontGear.map((g) => [g.teeth, g.ratio])),
    steadyBlocks: c.segments.length,
  };
}

/** Headline figures of compare_pandas.py's output. */
export function peerHeadline(json: string): Headline {
  const p = JSON.parse(json) as PeerReport;
  return {
    offsetSeconds: p.offsetSeconds,
    pairedSeconds: p.pairedSeconds,
    biasW: p.biasW,
    sdW: p.sdW,
    slope: p.slope,
    intercept: p.intercept,
    r: p.r,
    driftWPerHour: p.driftWPerHour,
    ratioByTeeth: new Map(p.byFrontGear.map((g) => [g.teeth, g.ratio])),
    steadyBlocks: p.segments.length,
  };
}

/**
 * Figures that differ beyond what floating-point order of operations explains: the
 * tolerances are far below anything a tester would read (0.01 W, 1e-5 in a ratio), so an
 * entry here means the two sides computed different things. `sameClock` false skips the
 * offset (a FIT file carries absolute time, a CSV of seconds does not).
 */
export function compareHeadlines(cogbook: Headline, peer: Headline, sameClock = true): Mismatch[] {
  const out: Mismatch[] = [];
  const check = (what: string, a: number, b: number, tol: number): void => {
    if (!(Math.abs(a - b) <= tol)) out.push({ what, cogbook: a, peer: b });
  };
  if (sameClock) check('offset s', cogbook.offsetSeconds, peer.offsetSeconds, 0);
  check('paired s', cogbook.pairedSeconds, peer.pairedSeconds, 0);
  check('bias W', cogbook.biasW, peer.biasW, 0.01);
  check('SD W', cogbook.sdW, peer.sdW, 0.01);
  check('slope', cogbook.slope, peer.slope, 1e-5);
  check('intercept W', cogbook.intercept, peer.intercept, 0.01);
  check('r', cogbook.r, peer.r, 1e-6);
  check('drift W/h', cogbook.driftWPerHour, peer.driftWPerHour, 0.01);
  check('steady blocks', cogbook.steadyBlocks, peer.steadyBlocks, 0);
  const teeth = new Set([...cogbook.ratioByTeeth.keys(), ...peer.ratioByTeeth.keys()]);
  for (const t of teeth) check(`ratio ${t}T`, cogbook.ratioByTeeth.get(t) ?? NaN, peer.ratioByTeeth.get(t) ?? NaN, 1e-5);
  return out;
}

/** A short note for the table: what agrees, or what does not. */
export function agreementNote(cogbook: Headline, mismatches: readonly Mismatch[], sameClock = true): string {
  if (mismatches.length > 0) {
    return `DISAGREE ${mismatches.map((m) => `${m.what} ${round(m.cogbook)} vs ${round(m.peer)}`).join(', ')}`;
  }
  const offset = sameClock ? `offset ${cogbook.offsetSeconds} s, ` : '';
  return `agree: ${offset}bias ${cogbook.biasW.toFixed(2)} W, slope ${cogbook.slope.toFixed(4)}, ${cogbook.steadyBlocks} blocks, ${cogbook.ratioByTeeth.size} chainring ratios`;
}

function round(x: number): string {
  return Number.isFinite(x) ? String(Number(x.toPrecision(6))) : String(x);
}
