export { COLUMN_NAMES } from './recording.js';
export type {
  BalanceSide, ColumnName, DeviceIdentity, GearEvent, GearState, LapEvent, Recording, RecordingColumns, RecordingEvent, RecordingMeta, TimerEvent,
} from './recording.js';
export { importRecording } from './import-recording.js';
export { MIN_SAMPLES } from './import-result.js';
export type { ImportOptions, ImportResult } from './import-result.js';
export { parseFit } from './parse-fit.js';
export { parseCsv } from './parse-csv.js';
export { inspectCsv } from './inspect-csv.js';
export type { CsvColumnInfo, CsvInspection } from './inspect-csv.js';
export { CSV_FIELDS, CSV_TIME_FORMATS, CSV_UNITS, FIELD_UNITS, csvMappingSchema, unitFactor } from './csv-mapping.js';
export type { CsvField, CsvMapping, CsvUnit } from './csv-mapping.js';
export { sniffRecordingBytes } from './sniff.js';
export type { SniffOptions, SniffResult } from './sniff.js';
export { summarizeRecording } from './summarize-recording.js';
export type { RecordingSummary } from './summarize-recording.js';
export { writeFit } from './write-fit.js';
export { writeCsv } from './write-csv.js';
export type { WriteCsvOptions } from './write-csv.js';
export { splitPower } from './split-power.js';
export { fitCrc } from './fit-crc.js';
