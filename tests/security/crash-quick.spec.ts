import { describe, expect, it } from 'vitest';
import { runSaveCrashLoop } from '../stress/support/save-crash-loop.js';
import { runUploadCrashLoop } from '../stress/support/upload-crash-loop.js';

const seed = Number(process.env.STRESS_SEED ?? Date.now() % 1_000_000);

/** A short version of tests/stress/crash-saves.spec.ts, so every `npm test` kills the server a few times. */
describe(`crashes while writing, quick (seed ${seed})`, () => {
  it('keeps every acknowledged save across 5 SIGKILLs, taking over the stale lock each time', { timeout: 600_000 }, async () => {
    const report = await runSaveCrashLoop({ kills: 5, budgetMs: 400_000, seed });
    console.info(`[crash-saves quick] kills ${report.kills}, acknowledged ${report.acknowledged}, intact ${report.foundIntact}, in flight committed ${report.inFlightCommitted} / lost ${report.inFlightLost}, ${report.durationMs} ms`);
    expect(report.problems).toEqual([]);
    expect(report.kills).toBe(5);
    expect(report.killsWithSaveInFlight).toBe(5);
    expect(report.staleLocksTakenOver).toBe(5);
    expect(report.foundIntact).toBe(report.acknowledged);
    expect(report.acknowledged).toBeGreaterThan(5);
    expect(report.indexesChecked).toBeGreaterThan(0);
  });

  it('keeps every acknowledged upload byte for byte across 3 SIGKILLs', { timeout: 600_000 }, async () => {
    const report = await runUploadCrashLoop({ kills: 3, budgetMs: 400_000, seed: seed + 1 });
    console.info(`[crash-uploads quick] kills ${report.kills}, acknowledged ${report.acknowledged}, intact ${report.foundIntact}, rows checked ${report.rowsChecked}, ${report.durationMs} ms`);
    expect(report.problems).toEqual([]);
    expect(report.kills).toBe(3);
    expect(report.killsWithUploadInFlight).toBe(3);
    expect(report.foundIntact).toBe(report.acknowledged);
    expect(report.rowsChecked).toBeGreaterThanOrEqual(report.acknowledged);
    expect(report.indexesChecked).toBeGreaterThan(0);
  });
});
