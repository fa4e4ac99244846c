import { describe, expect, it } from 'vitest';
import { importRecording } from '../../../shared/recording/import-recording.js';
import { summarizeRecording } from '../../../shared/recording/summarize-recording.js';
import { FIXTURE_DEVICES, fixtureRide, generateFixtures } from '../../fixtures/generate.js';

const fixtures = generateFixtures();

async function summary(name: string) {
  const result = await importRecording(fixtures.find((f) => f.name === name)!.bytes, name);
  if (!result.ok) throw new Error(result.error.message);
  return summarizeRecording(result.recording);
}

describe('summarizeRecording', () => {
  const ride = fixtureRide();
  const pause = ride.blocks.find((b) => b.kind === 'pause')!;

  it('states duration, pause, samples, dropouts, sides and device of the crank file', async () => {
    const s = await summary('crank.fit');
    const view = fixtures.find((f) => f.name === 'crank.fit')!.view;
    expect(s.durationS).toBe(ride.time.length - 1);
    expect(s.pausedS).toBe(pause.endS - pause.startS);
    expect(s.samples).toBe(view.recording.time.length);
    expect(s.dropouts).toBe(view.dropoutSamples);
    expect(s.gaps).toBe(0); // the pause is not a gap
    expect(s.balanceSide).toBe('right');
    expect(s.hasLegs).toBe(true);
    expect(s.device).toMatchObject({ serialNumber: FIXTURE_DEVICES.crank.serialNumber, softwareVersion: FIXTURE_DEVICES.crank.softwareVersion, manufacturerId: 255 });
    expect(s.startIso).toBe(new Date(ride.startMs + FIXTURE_DEVICES.crank.clockOffsetS * 1000).toISOString());
    expect(s.laps).toBe(ride.blocks.length - 1);
  });

  it('lists the reported gear states with the time spent in each', async () => {
    const s = await summary('crank.fit');
    const expected = new Map<string, number>();
    for (let i = 0; i < ride.time.length; i++) {
      if (!ride.recording[i]) continue;
      const key = `${ride.frontGearTeeth[i]}x${ride.rearGearTeeth[i]}`;
      expected.set(key, (expected.get(key) ?? 0) + 1);
    }
    const seen = new Map(s.gears.map((g) => [`${g.frontTeeth}x${g.rearTeeth}`, g.seconds]));
    expect([...seen.keys()].sort()).toEqual([...expected.keys()].sort());
    // Each 1 s sample counts 1 s, except the sample before the pause (capped at 1.5 intervals).
    const total = [...seen.values()].reduce((a, b) => a + b, 0);
    expect(total).toBe([...expected.values()].reduce((a, b) => a + b, 0) + 0.5);
  });

  it('counts gaps left by dropouts that removed records', async () => {
    const s = await summary('pedals.fit');
    const view = fixtures.find((f) => f.name === 'pedals.fit')!.view;
    expect(s.gaps).toBeGreaterThan(0);
    expect(s.gapS).toBe(view.dropoutSamples);
    expect(s.balanceSide).toBe('unknown');
    expect(s.hasLegs).toBe(false);
  });
});
