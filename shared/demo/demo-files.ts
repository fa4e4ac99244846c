import type { Recording } from '../recording/recording.js';
import { writeCsv } from '../recording/write-csv.js';
import { writeFit } from '../recording/write-fit.js';
import { deviceView, type DeviceView } from '../synthetic/device-view.js';
import { synthesizeRide, type RideTruth } from '../synthetic/synthesize-ride.js';
import type { DemoScenario, DemoScenarioKey } from './scenarios.js';

/** A demo ride generated in memory: the truth and each device's view of it. */
export interface DemoRecordings {
  truth: RideTruth;
  reference: DeviceView;
  test: DeviceView;
}

/** One demo file as it is stored: name, format and the exact bytes. */
export interface DemoFile {
  scenario: DemoScenarioKey;
  slot: 'reference' | 'test';
  fileName: string;
  format: 'fit' | 'csv';
  bytes: Uint8Array;
}

type Utf8Encoder = { encode(text: string): Uint8Array };

/** Generates a scenario's ride and both device views (deterministic: same seed, same numbers). */
export function generateDemoRecordings(scenario: DemoScenario): DemoRecordings {
  const truth = synthesizeRide(scenario.ride);
  return { truth, reference: deviceView(truth, scenario.reference.model), test: deviceView(truth, scenario.test.model) };
}

/**
 * Encodes a recording the way the scenario stores it: FIT through the FIT SDK's encoder,
 * or CSV with ISO 8601 times (so the absolute start survives and alignment works).
 */
export function encodeDemoRecording(recording: Recording, format: 'fit' | 'csv'): Uint8Array {
  if (format === 'fit') return writeFit(recording);
  // shared/ compiles without DOM or Node types; every host has TextEncoder.
  const Encoder = (globalThis as unknown as { TextEncoder: new () => Utf8Encoder }).TextEncoder;
  return new Encoder().encode(writeCsv(recording, { time: 'iso', speedUnit: 'km/h' }));
}

/** The reference and test files of one scenario, byte for byte the same on every call. */
export function generateDemoFiles(scenario: DemoScenario): DemoFile[] {
  const rides = generateDemoRecordings(scenario);
  return [scenario.reference, scenario.test].map((f) => ({
    scenario: scenario.key,
    slot: f.slot,
    fileName: f.fileName,
    format: f.format,
    bytes: encodeDemoRecording(rides[f.slot].recording, f.format),
  }));
}
