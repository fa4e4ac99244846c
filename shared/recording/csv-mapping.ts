import { z } from 'zod';

/** Units a CSV column may carry; each maps to one recording column's unit. */
export const CSV_UNITS = ['W', 'kW', 'rpm', 'm/s', 'km/h', 'mph', 'bpm', '% left', '% right', '% unknown side', '%', 'index', 'teeth'] as const;
/** A unit a CSV column may state. */
export type CsvUnit = (typeof CSV_UNITS)[number];

/** Recording columns a CSV column can feed. */
export const CSV_FIELDS = [
  'power', 'leftPower', 'rightPower', 'balance', 'cadence', 'speed', 'heartRate',
  'leftTorqueEffectiveness', 'rightTorqueEffectiveness', 'leftPedalSmoothness', 'rightPedalSmoothness',
  'frontGear', 'frontGearTeeth', 'rearGear', 'rearGearTeeth',
] as const;
/** A recording column a CSV column can feed. */
export type CsvField = (typeof CSV_FIELDS)[number];

/** How the time column is written: seconds from the start, a clock (h:mm:ss, mm:ss) or ISO 8601 date-time. */
export const CSV_TIME_FORMATS = ['seconds', 'clock', 'iso'] as const;

/**
 * Which CSV column holds what, in which unit. Columns are named by their header text (or
 * "Column 3" for a file without a header row). Stored per notebook slot so a re-upload of the same
 * export needs no second mapping.
 */
export const csvMappingSchema = z.object({
  /** Field delimiter; detected when absent. */
  delimiter: z.enum([',', ';', '\t', '|']).optional(),
  /** Whether row 1 is a header; detected when absent. */
  hasHeader: z.boolean().optional(),
  time: z.object({ column: z.string().min(1), format: z.enum(CSV_TIME_FORMATS) }),
  columns: z.array(z.object({ column: z.string().min(1), field: z.enum(CSV_FIELDS), unit: z.enum(CSV_UNITS) })).max(64),
  /** Absolute start, ms since the Unix epoch, for files whose time column is relative. */
  startMs: z.number().optional(),
});
/** A CSV column mapping, as validated by {@link csvMappingSchema}. */
export type CsvMapping = z.infer<typeof csvMappingSchema>;

/** The unit each field accepts, first = the recording's own unit. */
export const FIELD_UNITS: Readonly<Record<CsvField, readonly CsvUnit[]>> = {
  power: ['W', 'kW'],
  leftPower: ['W', 'kW'],
  rightPower: ['W', 'kW'],
  balance: ['% right', '% left', '% unknown side'],
  cadence: ['rpm'],
  speed: ['m/s', 'km/h', 'mph'],
  heartRate: ['bpm'],
  leftTorqueEffectiveness: ['%'],
  rightTorqueEffectiveness: ['%'],
  leftPedalSmoothness: ['%'],
  rightPedalSmoothness: ['%'],
  frontGear: ['index'],
  frontGearTeeth: ['teeth'],
  rearGear: ['index'],
  rearGearTeeth: ['teeth'],
};

/** Factor from `unit` to the recording's unit (W, m/s; 1 for the rest). 1 mph = 0.44704 m/s exactly (international mile). */
export function unitFactor(unit: CsvUnit): number {
  switch (unit) {
    case 'kW':
      return 1000;
    case 'km/h':
      return 1 / 3.6;
    case 'mph':
      return 0.44704;
    default:
      return 1;
  }
}
