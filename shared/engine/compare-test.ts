import type { EngineWarning } from '../errors.js';
import type { Recording } from '../recording/recording.js';
import { applyGearOverrides } from './apply-gear-overrides.js';
import { buildSelection } from './build-selection.js';
import type { ResolvedCompareOptions } from './compare-options.js';
import { comparePair } from './compare-pair.js';
import type { Comparison } from './compare-report.js';
import { decideVerdict, type VerdictInput } from './decide-verdict.js';
import { STEADY_BLOCK_DEFAULTS, detectSteadyBlocks } from './detect-steady-blocks.js';
import { diagnose } from './diagnose.js';
import { estimateOffset } from './estimate-offset.js';
import { fileInfo } from './file-info.js';
import { findGearMismatches } from './find-gear-mismatches.js';
import { inferGears } from './infer-gears.js';
import { jsonNumber, jsonNumbers } from './json-number.js';
import { pairRecordings, type PairedTable } from './pair-recordings.js';
import type { Segment } from './segment.js';
import { segmentsFromLaps } from './segments-from-laps.js';
import { segmentsFromRanges } from './segments-from-ranges.js';
import { mapSides, sideMeans } from './side-means.js';
import { meanOfRatios, optimalBlockLength, percentDifference } from './stats/index.js';
import type { GainCell } from './fit-leg-gear-gains.js';

/**
 * One device under test against the reference: the body of one entry of
 * `CompareReport.comparisons` (see compareRecordings, which fills in the options).
 *
 * @example compareTest(reference, test, resolveCompareOptions({ seed: 3 })).verdict.pass
 */
export function compareTest(reference: Recording, test: Recording, o: ResolvedCompareOptions): Comparison {
  const warnings: EngineWarning[] = [];
  const alignment = estimateOffset(reference, test, {
    maxLagS: o.maxLagS,
    intervalS: o.intervalS,
    ...(o.offset !== 'auto' && { manualOffsetS: o.offset }),
  });
  if (alignment.method === 'auto' && (alignment.confidence < 0.2 || alignment.correlation < 0.7)) {
    warnings.push({
      code: 'weak_alignment',
      message: `${test.meta.fileName}: the clock offset ${alignment.offsetSeconds} s is uncertain (correlation ${alignment.correlation.toFixed(2)}, confidence ${alignment.confidence.toFixed(2)}); check it or pass it by hand`,
    });
  }
  const paired = pairRecordings(reference, test, { offsetSeconds: alignment.offsetSeconds, intervalS: o.intervalS, maxGapS: o.maxGapS });
  const gearSource = resolveGears(paired, o, warnings);
  const n = paired.timeS.length;
  const dt = o.intervalS;
  const diffs = new Float64Array(n);
  for (let i = 0; i < n; i++) diffs[i] = paired.columns.test_power[i]! - paired.columns.ref_power[i]!;
  // One block length for every interval: choosing it costs O(n^1.5), and the
  // dependence of 1-s differences is the same whichever part of the ride is resampled.
  const blockLength = optimalBlockLength(diffs);
  // The ratio intervals come from the diagnosis's all-gear cells (same seed and block
  // length), so the bootstrap over the whole ride runs once.
  const overall = comparePair(paired, { replicates: 0 });
  const pairedSeconds = overall.seconds;
  if (pairedSeconds === 0) warnings.push({ code: 'no_paired_power', message: `${test.meta.fileName}: no second has power from both devices` });

  const gears = distinctTeeth(paired.columns.front_teeth);
  const byFrontGear = gears.map((teeth) => {
    const m = sideMeans(paired, buildSelection(paired, { frontTeeth: teeth }));
    return {
      teeth,
      seconds: m.n.total * dt,
      share: pairedSeconds > 0 ? (m.n.total * dt) / pairedSeconds : 0,
      reference: jsonNumbers(m.reference),
      test: jsonNumbers(m.test),
      diffPct: jsonNumbers(mapSides(m.test, m.reference, percentDifference)),
      ratio: jsonNumber(m.test.total / m.reference.total),
      legs: m,
    };
  });

  const { source, params, segments } = chooseSegments(reference, paired, o, warnings);
  const segmentMeans = segments.map((s) => sideMeans(paired, buildSelection(paired, { ranges: [s] })));
  const segmentRows = segments.map((s, i) => {
    const m = segmentMeans[i]!;
    return {
      startS: s.startS,
      endS: s.endS,
      kind: s.kind,
      label: s.label ?? null,
      seconds: m.n.total * dt,
      reference: jsonNumbers(m.reference),
      test: jsonNumbers(m.test),
      diffPct: jsonNumbers(mapSides(m.test, m.reference, percentDifference)),
    };
  });

  const pooled = sideMeans(paired, buildSelection(paired, { ranges: segments }));
  const sectionRatioPct = (side: 'total' | 'left' | 'right'): number =>
    (meanOfRatios(segments.map((_, i) => segmentMeans[i]!.test[side] / segmentMeans[i]!.reference[side])) - 1) * 100;

  const diagnosis = diagnose(paired, { tolerancePct: o.tolerancePct, seed: o.seed, replicates: o.replicates, blockLength });
  const mismatches = findGearMismatches(paired, segments, diagnosis.explained, diagnosis.gains, diagnosis.minEffectPct);
  const mismatchFindings = mismatches.map(
    (m) =>
      `Section ${clock(m.startS)}-${clock(m.endS)} is reported on ${m.reportedTeeth}T, but the ${m.leg === 'total' ? 'total' : `${m.leg} leg`} reads ${signed(m.diffPct)}% there, ` +
      `like ${m.readsLikeTeeth}T (${signed(m.readsLikeGainPct)}%) rather than ${m.reportedTeeth}T (${signed(m.reportedGainPct)}%): check where the chain was; a gear override corrects it.`,
  );
  const parts: VerdictInput[] = [];
  for (const leg of ['left', 'right'] as const) {
    parts.push({ what: `${leg} leg`, seconds: overall.means.n[leg] * dt, diffPct: overall.diffPct[leg] });
  }
  for (const g of byFrontGear) {
    parts.push({ what: `total on ${g.teeth}T`, seconds: g.legs.n.total * dt, diffPct: percentDifference(g.legs.test.total, g.legs.reference.total) });
    for (const leg of ['left', 'right'] as const) {
      parts.push({ what: `${leg} leg on ${g.teeth}T`, seconds: g.legs.n[leg] * dt, diffPct: percentDifference(g.legs.test[leg], g.legs.reference[leg]) });
    }
  }
  const verdict = decideVerdict(
    pairedSeconds,
    { what: 'total', seconds: pairedSeconds, diffPct: overall.diffPct.total },
    parts,
    { tolerancePct: o.tolerancePct, referenceTolerancePct: o.referenceTolerancePct, minShare: o.minShare },
  );

  const a = overall.agreement;
  return {
    test: fileInfo(test),
    alignment: {
      offsetSeconds: alignment.offsetSeconds,
      correlation: jsonNumber(alignment.correlation),
      confidence: jsonNumber(alignment.confidence),
      method: alignment.method,
    },
    overlapSeconds: paired.overlapSeconds,
    pairedSeconds,
    gearSource,
    overall: {
      reference: jsonNumbers(overall.means.reference),
      test: jsonNumbers(overall.means.test),
      diffW: jsonNumbers(overall.diffW),
      diffPct: jsonNumbers(overall.diffPct),
      ratio: jsonNumbers(overall.ratio),
      ratioCi: { total: allGearCi(diagnosis.gains, 'total'), left: allGearCi(diagnosis.gains, 'left'), right: allGearCi(diagnosis.gains, 'right') },
    },
    byFrontGear: byFrontGear.map(({ legs: _legs, ...row }) => row),
    segmentation: { source, params },
    segments: segmentRows,
    sectionsPooled: {
      seconds: pooled.n.total * dt,
      reference: jsonNumbers(pooled.reference),
      test: jsonNumbers(pooled.test),
      diffPct: jsonNumbers(mapSides(pooled.test, pooled.reference, percentDifference)),
      meanOfSectionRatiosPct: jsonNumbers({ total: sectionRatioPct('total'), left: sectionRatioPct('left'), right: sectionRatioPct('right') }),
    },
    agreement: {
      n: a.n,
      biasW: jsonNumber(a.biasW),
      sdW: jsonNumber(a.sdW),
      loaLowW: jsonNumber(a.loaLowW),
      loaHighW: jsonNumber(a.loaHighW),
      biasCi: [jsonNumber(a.biasCi[0]), jsonNumber(a.biasCi[1])],
      loaLowCi: [jsonNumber(a.loaLowCi[0]), jsonNumber(a.loaLowCi[1])],
      loaHighCi: [jsonNumber(a.loaHighCi[0]), jsonNumber(a.loaHighCi[1])],
    },
    regression: jsonNumbers({
      slope: overall.ols.slope,
      intercept: overall.ols.intercept,
      r: overall.r,
      slopeSe: overall.ols.slopeSe,
      interceptSe: overall.ols.interceptSe,
      originSlope: overall.origin.slope,
      demingSlope: overall.deming.slope,
      demingIntercept: overall.deming.intercept,
      rmseW: overall.rmseW,
    }),
    drift: jsonNumbers({ wPerHour: overall.drift.wPerHour, seWPerHour: overall.drift.seWPerHour }),
    diagnosis: {
      findings: [...diagnosis.findings, ...mismatchFindings],
      minEffectPct: diagnosis.minEffectPct,
      gains: diagnosis.gains.map((g) => ({
        leg: g.leg,
        frontTeeth: g.frontTeeth,
        seconds: g.seconds,
        share: g.share,
        ...jsonNumbers({ gain: g.gain, low: g.low, high: g.high, diffPct: g.diffPct, lowPct: g.lowPct, highPct: g.highPct }),
      })),
      explained: diagnosis.explained.map((e) => ({ leg: e.leg, frontTeeth: e.frontTeeth, ...jsonNumbers({ diffPct: e.diffPct, lowPct: e.lowPct, highPct: e.highPct }) })),
      residualTotalPct: jsonNumber(diagnosis.residualTotalPct),
      gearMismatches: mismatches,
      zeroOffset: { detected: diagnosis.zeroOffset.detected, ...jsonNumbers({ interceptW: diagnosis.zeroOffset.interceptW, interceptSe: diagnosis.zeroOffset.interceptSe, slope: diagnosis.zeroOffset.slope }) },
      drift: { detected: diagnosis.drift.detected, ...jsonNumbers({ wPerHour: diagnosis.drift.wPerHour, seWPerHour: diagnosis.drift.seWPerHour, overRideW: diagnosis.drift.overRideW }) },
      singleSided: {
        detected: diagnosis.singleSided.detected,
        side: diagnosis.singleSided.side,
        ...jsonNumbers({ evenShare: diagnosis.singleSided.evenShare, referenceShareSdPct: diagnosis.singleSided.referenceShareSdPct, shareSlope: diagnosis.singleSided.shareSlope }),
      },
    },
    verdict: {
      tolerancePct: verdict.tolerancePct,
      referenceTolerancePct: verdict.referenceTolerancePct,
      combinedTolerancePct: verdict.combinedTolerancePct,
      pass: verdict.pass,
      findings: verdict.findings,
      checks: verdict.checks.map((c) => ({ ...c, diffPct: jsonNumber(c.diffPct) })),
    },
    warnings: [...test.warnings, ...warnings].map((w) => ({ code: w.code, message: w.message })),
  };
}

/** Fills gear columns by inference and applies overrides; returns where the gears came from. */
function resolveGears(paired: PairedTable, o: ResolvedCompareOptions, warnings: EngineWarning[]): Comparison['gearSource'] {
  let source: Comparison['gearSource'] = paired.meta?.gearSource ?? 'none';
  const canInfer = o.chainrings !== undefined && o.cogs !== undefined && o.wheel !== undefined;
  if ((source === 'none' || o.inferGears) && canInfer) {
    const { speed, cadence } = paired.columns;
    if (speed !== undefined && cadence !== undefined) {
      const inferred = inferGears(speed, cadence, { chainrings: o.chainrings!, cogs: o.cogs!, wheel: o.wheel! });
      paired.columns.front_teeth = inferred.frontTeeth;
      paired.columns.rear_teeth = inferred.rearTeeth;
      source = 'inferred';
    } else {
      warnings.push({ code: 'no_gear_inference', message: 'gears cannot be inferred: neither file has both speed and cadence' });
    }
  }
  if (o.gearOverrides !== undefined && o.gearOverrides.length > 0) {
    const { frontTeeth, rearTeeth } = applyGearOverrides(
      paired.timeS,
      { frontTeeth: paired.columns.front_teeth, rearTeeth: paired.columns.rear_teeth },
      o.gearOverrides,
    );
    paired.columns.front_teeth = frontTeeth;
    paired.columns.rear_teeth = rearTeeth;
  }
  return source;
}

function chooseSegments(
  reference: Recording,
  paired: PairedTable,
  o: ResolvedCompareOptions,
  warnings: EngineWarning[],
): { source: Comparison['segmentation']['source']; params: Record<string, number>; segments: Segment[] } {
  if (Array.isArray(o.segments)) return { source: 'manual', params: {}, segments: segmentsFromRanges(o.segments) };
  if (o.segments === 'laps') {
    const laps = segmentsFromLaps(reference);
    if (laps.length === 0) warnings.push({ code: 'no_laps', message: `${reference.meta.fileName} has no laps` });
    return { source: 'laps', params: {}, segments: laps };
  }
  const params = { ...STEADY_BLOCK_DEFAULTS, ...o.steady };
  const blocks = detectSteadyBlocks(paired.timeS, paired.columns.ref_power, params);
  if (blocks.length === 0) warnings.push({ code: 'no_steady_blocks', message: 'no steady block was found in the reference power' });
  return { source: 'steady', params, segments: blocks };
}

function clock(seconds: number): string {
  const s = Math.round(seconds);
  return `${Math.floor(s / 3600)}:${String(Math.floor((s % 3600) / 60)).padStart(2, '0')}:${String(s % 60).padStart(2, '0')}`;
}

function signed(x: number): string {
  const r = Math.round(x * 10) / 10 || 0; // no "-0.0"
  return `${r >= 0 ? '+' : ''}${r.toFixed(1)}`;
}

function distinctTeeth(column: Float64Array | undefined): number[] {
  const seen = new Set<number>();
  if (column !== undefined) for (let i = 0; i < column.length; i++) if (Number.isFinite(column[i]!)) seen.add(column[i]!);
  return [...seen].sort((a, b) => b - a);
}

function allGearCi(gains: readonly GainCell[], leg: GainCell['leg']): Comparison['overall']['ratioCi']['total'] {
  const cell = gains.find((g) => g.leg === leg && g.frontTeeth === null);
  if (cell === undefined) return null;
  return { estimate: jsonNumber(cell.gain), low: jsonNumber(cell.low), high: jsonNumber(cell.high), level: 0.95, blockLength: cell.blockLength, replicates: cell.replicates };
}
