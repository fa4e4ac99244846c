import { describe, expect, it } from 'vitest';
import { runSaveCrashLoop } from './support/save-crash-loop.js';
import { runUploadCrashLoop } from './support/upload-crash-loop.js';

const KILLS = Number(process.env.STRESS_KILLS ?? 50);
const seed = Number(process.env.STRESS_SEED ?? Date.now() % 1_000_000);
// Per loop; a loop that runs out of time reports fewer kills and fails.
const BUDGET_MS = Number(process.env.STRESS_BUDGET_MS ?? 1_500_000);

/**
 * SIGKILL the built server again and again while it writes, on one PGlite folder.
 * Run with `npm run test:stress` (STRESS_KILLS and STRESS_SEED change the count and replay a run).
 */
describe(`crashes while writing (${KILLS} kills, seed ${seed})`, () => {
  it('keeps every acknowledged notebook save, exactly, across kills and restarts', { timeout: BUDGET_MS + 300_000 }, async () => {
    const report = await runSaveCrashLoop({ kills: KILLS, budgetMs: BUDGET_MS, seed });
    console.info(`[crash-saves] ${JSON.stringify({ ...report, restartMs: summary(report.restartMs) })}`);
    expect(report.problems).toEqual([]);
    expect(report.kills).toBe(KILLS);
    expect(report.killsWithSaveInFlight).toBe(KILLS);
    expect(report.staleLocksTakenOver).toBe(KILLS);
    expect(report.acknowledged).toBeGreaterThan(KILLS);
    expect(report.foundIntact).toBe(report.acknowledged);
    expect(report.tablesChecked).toBeGreaterThan(0);
    expect(report.indexesChecked).toBeGreaterThan(0);
  });

  it('keeps every acknowledged upload byte for byte and never shows a half-stored one', { timeout: BUDGET_MS + 300_000 }, async () => {
    const report = await runUploadCrashLoop({ kills: KILLS, budgetMs: BUDGET_MS, seed: seed + 1 });
    console.info(`[crash-uploads] ${JSON.stringify({ ...report, restartMs: summary(report.restartMs) })}`);
    expect(report.problems).toEqual([]);
    expect(report.kills).toBe(KILLS);
    expect(report.killsWithUploadInFlight).toBe(KILLS);
    expect(report.acknowledged).toBeGreaterThan(KILLS / 2);
    expect(report.foundIntact).toBe(report.acknowledged);
    expect(report.rowsChecked).toBeGreaterThanOrEqual(report.acknowledged);
    expect(report.tablesChecked).toBeGreaterThan(0);
    expect(report.indexesChecked).toBeGreaterThan(0);
  });
});

function summary(ms: number[]): { n: number; median: number; max: number } {
  const sorted = [...ms].sort((a, b) => a - b);
  return { n: ms.length, median: sorted[Math.floor(sorted.length / 2)] ?? 0, max: sorted.at(-1) ?? 0 };
}
