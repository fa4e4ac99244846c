import type { GainFinding } from './diagnose.js';
import type { GainCell } from './fit-leg-gear-gains.js';
import { buildSelection } from './build-selection.js';
import type { Segment } from './segment.js';
import { sideMeans } from './side-means.js';
import type { Table } from './table.js';

/** A section whose reported chainring does not match how the device reads there. */
export interface GearMismatch {
  startS: number;
  endS: number;
  leg: 'total' | 'left' | 'right';
  /** Chainring the file reports over the section. */
  reportedTeeth: number;
  /** Chainring whose gain the section's reading matches. */
  readsLikeTeeth: number;
  /** The section's difference, percent, and the gains of the two chainrings. */
  diffPct: number;
  reportedGainPct: number;
  readsLikeGainPct: number;
}

/**
 * Looks for sections that read like another chainring than the one reported. When a leg
 * is off on one chainring only, a section reported on that chainring whose difference is
 * nearer the other chainring's gain suggests the chain was not where the shifting system
 * said (a shift signal without a chain move), or a firmware correction that follows the
 * reported gear. O(n * sections).
 *
 * @param minEffectPct a section must sit at least this far from its reported chainring's gain, percent
 * @example
 * findGearMismatches(paired, blocks, diagnosis.explained, diagnosis.gains, 1)
 */
export function findGearMismatches(
  table: Table,
  segments: readonly Segment[],
  explained: readonly GainFinding[],
  gains: readonly GainCell[],
  minEffectPct: number,
): GearMismatch[] {
  const front = table.columns.front_teeth;
  if (front === undefined) return [];
  const out: GearMismatch[] = [];
  for (const segment of segments) {
    const teeth = dominantTeeth(table, front, segment);
    if (teeth === undefined) continue;
    for (const finding of explained) {
      if (finding.frontTeeth === null || !finding.frontTeeth.includes(teeth)) continue;
      const others = gains.filter((g) => g.leg === finding.leg && g.frontTeeth !== null && g.frontTeeth !== teeth && Number.isFinite(g.diffPct));
      if (others.length === 0) continue;
      const m = sideMeans(table, buildSelection(table, { ranges: [segment] }));
      const diffPct = (m.test[finding.leg] / m.reference[finding.leg] - 1) * 100;
      if (!Number.isFinite(diffPct)) continue;
      const nearest = others.reduce((a, b) => (Math.abs(b.diffPct - diffPct) < Math.abs(a.diffPct - diffPct) ? b : a));
      if (Math.abs(diffPct - finding.diffPct) >= minEffectPct && Math.abs(diffPct - nearest.diffPct) < Math.abs(diffPct - finding.diffPct)) {
        out.push({
          startS: segment.startS,
          endS: segment.endS,
          leg: finding.leg,
          reportedTeeth: teeth,
          readsLikeTeeth: nearest.frontTeeth!,
          diffPct,
          reportedGainPct: finding.diffPct,
          readsLikeGainPct: nearest.diffPct,
        });
      }
    }
  }
  return out;
}

/** The chainring reported over at least 90% of the section's rows, if any. */
function dominantTeeth(table: Table, front: Float64Array, segment: Segment): number | undefined {
  const counts = new Map<number, number>();
  let total = 0;
  for (let i = 0; i < front.length; i++) {
    const t = table.timeS[i]!;
    if (t < segment.startS || t >= segment.endS) continue;
    total++;
    const teeth = front[i]!;
    if (Number.isFinite(teeth)) counts.set(teeth, (counts.get(teeth) ?? 0) + 1);
  }
  for (const [teeth, count] of counts) if (count >= 0.9 * total) return teeth;
  return undefined;
}
