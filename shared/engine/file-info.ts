import type { Recording } from '../recording/recording.js';
import type { FileInfo } from './compare-report.js';

/**
 * What a report states about an input file: name, format, device, start, duration,
 * sampling and dropouts.
 *
 * @example fileInfo(recording).startIso // "2026-03-02T09:00:00.000Z"
 */
export function fileInfo(recording: Recording): FileInfo {
  const { meta } = recording;
  const d = meta.device;
  return {
    fileName: meta.fileName,
    format: meta.format,
    label: d.label ?? null,
    manufacturer: d.manufacturer ?? null,
    product: d.product ?? null,
    serialNumber: d.serialNumber ?? null,
    softwareVersion: d.softwareVersion ?? null,
    startIso: Number.isFinite(meta.startMs) ? new Date(meta.startMs).toISOString() : null,
    durationS: meta.totalS,
    sampleIntervalS: meta.sampleIntervalS,
    dropouts: meta.dropouts,
    balanceSide: meta.balanceSide,
  };
}
