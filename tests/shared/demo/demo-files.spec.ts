import { createHash } from 'node:crypto';
import { Decoder, Stream } from '@garmin/fitsdk';
import { describe, expect, it } from 'vitest';
import { generateDemoFiles, generateDemoRecordings } from '../../../shared/demo/demo-files.js';
import { DEMO_DEVICES, DEMO_RIDERS, type DemoDevice } from '../../../shared/demo/lab.js';
import { DEMO_PUBLISHED_NOTEBOOK, DEMO_SAMPLE_FILES } from '../../../shared/demo/sample-files.js';
import { DEMO_SCENARIOS, listDemoScenarios } from '../../../shared/demo/scenarios.js';
import { importRecording } from '../../../shared/recording/import-recording.js';

const sha = (bytes: Uint8Array): string => createHash('sha256').update(bytes).digest('hex');

describe('demo files', { timeout: 60_000 }, () => {
  it('are byte for byte the same on every generation', () => {
    const scenario = DEMO_SCENARIOS['chainring-gain'];
    expect(generateDemoFiles(scenario).map((f) => sha(f.bytes))).toEqual(generateDemoFiles(scenario).map((f) => sha(f.bytes)));
  });

  it('are FIT files the FIT SDK decoder reads without errors, with the gear events and clock of the ride', () => {
    const scenario = DEMO_SCENARIOS['chainring-gain'];
    const rides = generateDemoRecordings(scenario);
    const [ref, test] = generateDemoFiles(scenario);
    const sdkRef = new Decoder(Stream.fromByteArray(ref!.bytes)).read();
    const sdkTest = new Decoder(Stream.fromByteArray(test!.bytes)).read();
    expect(sdkRef.errors).toEqual([]);
    expect(sdkTest.errors).toEqual([]);
    expect(sdkRef.messages.recordMesgs).toHaveLength(rides.truth.time.length);
    const gearEvents = (sdkRef.messages.eventMesgs ?? []).filter((e) => e.event === 'frontGearChange' || e.event === 'rearGearChange');
    expect(gearEvents).toHaveLength(rides.truth.gearEvents.length);
    // FIT timestamps of the two files differ by the test device's clock offset.
    const t0 = (m: typeof sdkRef): number => (m.messages.recordMesgs![0]!.timestamp as Date).getTime();
    expect((t0(sdkTest) - t0(sdkRef)) / 1000).toBe(scenario.truth.clockOffsetS);
    // Bit 0x80 of left_right_balance marks the right leg's share (FIT profile).
    const balance = sdkRef.messages.recordMesgs!.find((r) => typeof r.leftRightBalance === 'number')?.leftRightBalance as number;
    expect(balance & 0x80).toBe(0x80);
  });

  it('include one CSV that imports with its absolute start time', async () => {
    const scenario = DEMO_SCENARIOS['trainer-ladder'];
    const csv = generateDemoFiles(scenario).find((f) => f.format === 'csv')!;
    expect(csv.fileName.endsWith('.csv')).toBe(true);
    const r = await importRecording(csv.bytes, csv.fileName);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.recording.meta.format).toBe('csv');
    expect(r.recording.meta.startMs).toBe(scenario.ride.startMs! + scenario.truth.clockOffsetS * 1000);
    expect(r.recording.columns.leftPower).toBeDefined();
  });

  it('use invented people and devices, and exactly one CSV among six files', () => {
    const names = listDemoScenarios().flatMap((s) => [s.reference.fileName, s.test.fileName]);
    expect(new Set(names).size).toBe(6);
    expect(names.filter((n) => n.endsWith('.csv'))).toHaveLength(1);
    expect(Object.values(DEMO_RIDERS).map((r) => r.name)).toEqual(['Mara Venn', 'Tobin Ashgrove', 'Ilse Corrow']);
    // FIT manufacturer 255 is "development": no real maker's id.
    for (const d of Object.values(DEMO_DEVICES) as DemoDevice[]) expect(d.model.manufacturerId ?? 255).toBe(255);
  });

  it('offer the chainring demo files as samples and name the notebook to publish', () => {
    const chainring = DEMO_SCENARIOS['chainring-gain'];
    expect(DEMO_SAMPLE_FILES.map((f) => [f.slot, f.fileName])).toEqual([
      ['reference', chainring.reference.fileName],
      ['test', chainring.test.fileName],
    ]);
    expect(DEMO_PUBLISHED_NOTEBOOK).toEqual({ key: 'chainring-gain', title: chainring.title });
  });
});
