import { combinedTolerance } from './stats/index.js';

/** One figure the verdict looks at: a percent difference over part of the paired time. */
export interface VerdictCheck {
  /** What was compared, e.g. "total", "left leg", "left leg on 50T". */
  what: string;
  seconds: number;
  /** Share of the paired time, 0..1. */
  share: number;
  diffPct: number;
  within: boolean;
  /** True when this check can fail the verdict (the whole ride, or at least minShare of it). */
  decides: boolean;
}

/** Options of {@link decideVerdict}. */
export interface VerdictOptions {
  /** Stated accuracy of the device under test, percent (default 2). */
  tolerancePct?: number;
  /** Stated accuracy of the reference, percent (default 1). */
  referenceTolerancePct?: number;
  /** A leg or gear state holding at least this share of the paired time decides the verdict (default 0.1). */
  minShare?: number;
}

/** Pass or fail, the band it was judged against, and why. */
export interface Verdict {
  tolerancePct: number;
  referenceTolerancePct: number;
  /** sqrt(device^2 + reference^2): a difference inside it cannot be pinned on the device. */
  combinedTolerancePct: number;
  pass: boolean;
  findings: string[];
  checks: VerdictCheck[];
}

/** A figure offered to the verdict, before judging. */
export interface VerdictInput {
  what: string;
  seconds: number;
  diffPct: number;
}

/**
 * Judges a device against the combined tolerance band of device and reference. The
 * verdict fails when the total is outside the band, and also when any leg or gear state
 * (or leg on a gear state) that holds at least `minShare` of the paired time is outside,
 * even if the total is inside: an error on one leg or chainring is a real fault that the
 * total can hide. Smaller parts are reported but do not decide.
 *
 * @param pairedSeconds the time both devices have a total for
 * @param total the overall total comparison; it always decides
 * @param parts legs, gear states and leg-on-gear cells
 * @example
 * decideVerdict(3400, { what: 'total', seconds: 3400, diffPct: 1.1 }, [{ what: 'left leg on 50T', seconds: 1700, diffPct: 4.2 }])
 * // { pass: false, ... }
 */
export function decideVerdict(
  pairedSeconds: number,
  total: VerdictInput,
  parts: readonly VerdictInput[],
  options: VerdictOptions = {},
): Verdict {
  const tolerancePct = options.tolerancePct ?? 2;
  const referenceTolerancePct = options.referenceTolerancePct ?? 1;
  const minShare = options.minShare ?? 0.1;
  const band = combinedTolerance(tolerancePct, referenceTolerancePct);
  const judge = (input: VerdictInput, decides: boolean): VerdictCheck => ({
    ...input,
    share: pairedSeconds > 0 ? input.seconds / pairedSeconds : 0,
    within: Number.isFinite(input.diffPct) && Math.abs(input.diffPct) <= band,
    decides,
  });
  const checks = [judge(total, true)];
  for (const part of parts) {
    if (!Number.isFinite(part.diffPct)) continue;
    const share = pairedSeconds > 0 ? part.seconds / pairedSeconds : 0;
    checks.push(judge(part, share >= minShare));
  }
  const failing = checks.filter((c) => c.decides && !c.within);
  const pass = failing.length === 0;
  const bandText = `±${fmt(band)}% (device ±${fmt(tolerancePct)}%, reference ±${fmt(referenceTolerancePct)}%)`;
  const findings: string[] = [];
  const totalCheck = checks[0]!;
  findings.push(
    Number.isFinite(totalCheck.diffPct)
      ? `Total reads ${signed(totalCheck.diffPct)}% against the reference: ${totalCheck.within ? 'inside' : 'outside'} the combined band ${bandText}.`
      : 'No paired power: the total cannot be compared.',
  );
  for (const c of failing) {
    if (c === totalCheck) continue;
    findings.push(`${capitalise(c.what)} reads ${signed(c.diffPct)}% over ${pct(c.share)} of the paired time: outside ±${fmt(band)}%.`);
  }
  for (const c of checks) {
    if (!c.decides && !c.within) {
      findings.push(`${capitalise(c.what)} reads ${signed(c.diffPct)}% but holds only ${pct(c.share)} of the paired time (under ${pct(minShare)}), so it does not decide.`);
    }
  }
  if (pass) findings.push('Verdict: PASS.');
  else if (totalCheck.within) findings.push('Verdict: FAIL: the total is inside the band, but a leg or gear state holding a large share of the ride is not.');
  else findings.push('Verdict: FAIL.');
  return { tolerancePct, referenceTolerancePct, combinedTolerancePct: band, pass, findings, checks };
}

function fmt(x: number): string {
  return (Math.round(x * 100) / 100).toString();
}

function signed(x: number): string {
  const text = x.toFixed(1);
  return x >= 0 ? `+${text}` : text;
}

function pct(share: number): string {
  return `${Math.round(share * 100)}%`;
}

function capitalise(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}
