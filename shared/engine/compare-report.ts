import { z } from 'zod';

/** A number that is null where it cannot be known (a leg the device does not report, too few samples). */
const num = z.number().nullable();

/** Total, left and right; null where a side is unknown. */
export const sidesSchema = z.object({ total: num, left: num, right: num });

/** A block-bootstrap percentile interval. */
export const bootstrapCiSchema = z.object({
  estimate: num,
  low: num,
  high: num,
  level: z.number(),
  blockLength: z.number(),
  replicates: z.number(),
});

/** What the report says about one input file. */
export const fileInfoSchema = z.object({
  fileName: z.string(),
  format: z.enum(['fit', 'csv']),
  label: z.string().nullable(),
  manufacturer: z.string().nullable(),
  product: z.string().nullable(),
  serialNumber: z.number().nullable(),
  softwareVersion: z.string().nullable(),
  /** Absolute start (UTC), null when the file has none. */
  startIso: z.string().nullable(),
  durationS: z.number(),
  sampleIntervalS: z.number(),
  dropouts: z.number(),
  balanceSide: z.enum(['left', 'right', 'unknown', 'none']),
});

const segmentSchema = z.object({
  /** Seconds from the reference's first sample; the segment is [startS, endS). */
  startS: z.number(),
  endS: z.number(),
  kind: z.enum(['steady', 'lap', 'manual']),
  label: z.string().nullable(),
  /** Paired seconds inside the segment. */
  seconds: z.number(),
  reference: sidesSchema,
  test: sidesSchema,
  diffPct: sidesSchema,
});

const gainCellSchema = z.object({
  leg: z.enum(['total', 'left', 'right']),
  frontTeeth: z.number().nullable(),
  seconds: z.number(),
  share: z.number(),
  gain: num,
  low: num,
  high: num,
  diffPct: num,
  lowPct: num,
  highPct: num,
});

/** One device under test against the reference. */
export const comparisonSchema = z.object({
  test: fileInfoSchema,
  alignment: z.object({
    /** Test clock minus reference clock, seconds. */
    offsetSeconds: z.number(),
    correlation: num,
    confidence: num,
    method: z.enum(['auto', 'manual']),
  }),
  /** Seconds both recordings cover after alignment. */
  overlapSeconds: z.number(),
  /** Seconds where both report power. */
  pairedSeconds: z.number(),
  gearSource: z.enum(['reference', 'test', 'inferred', 'none']),
  overall: z.object({
    reference: sidesSchema,
    test: sidesSchema,
    diffW: sidesSchema,
    diffPct: sidesSchema,
    ratio: sidesSchema,
    ratioCi: z.object({ total: bootstrapCiSchema.nullable(), left: bootstrapCiSchema.nullable(), right: bootstrapCiSchema.nullable() }),
  }),
  byFrontGear: z.array(
    z.object({ teeth: z.number(), seconds: z.number(), share: z.number(), reference: sidesSchema, test: sidesSchema, diffPct: sidesSchema, ratio: num }),
  ),
  segmentation: z.object({
    source: z.enum(['steady', 'laps', 'manual']),
    params: z.record(z.string(), z.number()),
  }),
  segments: z.array(segmentSchema),
  /**
   * The sections pooled: means over all of them (the primary comparison: averages over
   * steady sections), and the mean of the per-section ratios as testers average them.
   */
  sectionsPooled: z.object({
    seconds: z.number(),
    reference: sidesSchema,
    test: sidesSchema,
    diffPct: sidesSchema,
    meanOfSectionRatiosPct: sidesSchema,
  }),
  agreement: z.object({
    n: z.number(),
    biasW: num,
    sdW: num,
    loaLowW: num,
    loaHighW: num,
    biasCi: z.tuple([num, num]),
    loaLowCi: z.tuple([num, num]),
    loaHighCi: z.tuple([num, num]),
  }),
  regression: z.object({
    slope: num,
    intercept: num,
    r: num,
    slopeSe: num,
    interceptSe: num,
    originSlope: num,
    demingSlope: num,
    demingIntercept: num,
    rmseW: num,
  }),
  drift: z.object({ wPerHour: num, seWPerHour: num }),
  diagnosis: z.object({
    findings: z.array(z.string()),
    minEffectPct: z.number(),
    gains: z.array(gainCellSchema),
    explained: z.array(
      z.object({ leg: z.enum(['total', 'left', 'right']), frontTeeth: z.array(z.number()).nullable(), diffPct: num, lowPct: num, highPct: num }),
    ),
    residualTotalPct: num,
    /** Sections that read like another chainring than the one reported. */
    gearMismatches: z.array(
      z.object({
        startS: z.number(),
        endS: z.number(),
        leg: z.enum(['total', 'left', 'right']),
        reportedTeeth: z.number(),
        readsLikeTeeth: z.number(),
        diffPct: z.number(),
        reportedGainPct: z.number(),
        readsLikeGainPct: z.number(),
      }),
    ),
    zeroOffset: z.object({ detected: z.boolean(), interceptW: num, interceptSe: num, slope: num }),
    drift: z.object({ detected: z.boolean(), wPerHour: num, seWPerHour: num, overRideW: num }),
    singleSided: z.object({
      detected: z.boolean(),
      side: z.enum(['left', 'right']).nullable(),
      evenShare: num,
      referenceShareSdPct: num,
      shareSlope: num,
    }),
  }),
  verdict: z.object({
    tolerancePct: z.number(),
    referenceTolerancePct: z.number(),
    combinedTolerancePct: z.number(),
    pass: z.boolean(),
    findings: z.array(z.string()),
    checks: z.array(z.object({ what: z.string(), seconds: z.number(), share: z.number(), diffPct: num, within: z.boolean(), decides: z.boolean() })),
  }),
  warnings: z.array(z.object({ code: z.string(), message: z.string() })),
});

/**
 * The comparison report: the reference file, the options used, and one comparison per
 * device under test. This is the JSON `compare --json` prints; times are seconds from
 * the reference's first sample, powers W, differences percent (test against reference).
 */
export const compareReportSchema = z.object({
  reference: fileInfoSchema,
  options: z.object({
    tolerancePct: z.number(),
    referenceTolerancePct: z.number(),
    intervalS: z.number(),
    maxGapS: z.number(),
    offset: z.union([z.literal('auto'), z.number()]),
    seed: z.number(),
    replicates: z.number(),
  }),
  comparisons: z.array(comparisonSchema),
});

/** The comparison report as data. */
export type CompareReport = z.infer<typeof compareReportSchema>;
/** One device's comparison inside a {@link CompareReport}. */
export type Comparison = z.infer<typeof comparisonSchema>;
/** A {@link fileInfoSchema} value. */
export type FileInfo = z.infer<typeof fileInfoSchema>;
