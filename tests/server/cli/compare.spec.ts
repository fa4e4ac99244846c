import { execFile } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { compareReportSchema } from '../../../shared/engine/compare-report.js';
import { writeFit } from '../../../shared/recording/write-fit.js';
import { deviceView } from '../../../shared/synthetic/device-view.js';
import { twoRingRide } from '../../shared/engine/rides.js';

interface Run {
  code: number;
  stdout: string;
  stderr: string;
}

function runCompare(args: string[]): Promise<Run> {
  return new Promise((resolve) => {
    execFile(process.execPath, ['--import', 'tsx', 'server/cli/compare.ts', ...args], { cwd: process.cwd(), timeout: 60_000 }, (error, stdout, stderr) => {
      const code = error === null ? 0 : typeof error.code === 'number' ? error.code : -1;
      resolve({ code, stdout, stderr });
    });
  });
}

const oneLine = (text: string): string[] => text.split('\n').filter((line) => line.length > 0);

describe('compare command', () => {
  let dir = '';
  const file = (name: string): string => join(dir, name);

  beforeAll(() => {
    dir = mkdtempSync(join(tmpdir(), 'cogbook-compare-'));
    const ride = twoRingRide(51);
    writeFileSync(file('reference.fit'), writeFit(deviceView(ride, { label: 'reference', serialNumber: 1, noiseSdW: 3 }).recording));
    writeFileSync(file('crank.fit'), writeFit(deviceView(ride, { label: 'crank', serialNumber: 2, noiseSdW: 4, clockOffsetS: 6, gains: { left: [1, 1.08] } }).recording));
    writeFileSync(file('pedals.fit'), writeFit(deviceView(ride, { label: 'pedals', serialNumber: 3, noiseSdW: 4, clockOffsetS: -11, dropouts: { perHour: 20, meanLengthS: 4 } }).recording));
    writeFileSync(file('notes.txt'), 'this is not a recording\n');
  });

  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('prints one JSON document that the report schema accepts', async () => {
    const run = await runCompare(['--reference', file('reference.fit'), '--test', file('crank.fit'), '--test', file('pedals.fit'), '--json', '--seed', '4']);
    expect(run.stderr).toBe('');
    expect(run.code).toBe(0);
    const report = compareReportSchema.parse(JSON.parse(run.stdout));
    expect(report.comparisons.map((c) => c.alignment.offsetSeconds)).toEqual([6, -11]);
    expect(report.comparisons[0]!.verdict.pass).toBe(false);
    expect(report.comparisons[0]!.diagnosis.explained[0]).toMatchObject({ leg: 'left', frontTeeth: [50] });
    expect(report.comparisons[1]!.verdict.pass).toBe(true);
    expect(report.options.seed).toBe(4);
  });

  it('prints a readable report with tables per leg, chainring and block, and the verdict', async () => {
    const run = await runCompare(['--reference', file('reference.fit'), '--test', file('crank.fit'), '--tolerance', '1.5']);
    expect(run.code).toBe(0);
    expect(run.stdout).toMatch(/Alignment {2}offset \+6 s \(auto\)/);
    expect(run.stdout).toMatch(/Per chainring/);
    expect(run.stdout).toMatch(/ 50T /);
    expect(run.stdout).toMatch(/Sections \(steady blocks/);
    expect(run.stdout).toMatch(/Verdict {4}FAIL \(device ±1\.5%, reference ±1%/);
    expect(run.stdout).toMatch(/Left leg reads \+[78]\.\d% .* on the 50T chainring only/);
  });

  it.each([
    ['a missing file', () => ['--reference', file('missing.fit'), '--test', file('crank.fit')], /missing\.fit: no such file/],
    ['a file that is not a recording', () => ['--reference', file('reference.fit'), '--test', file('notes.txt')], /notes\.txt/],
    ['an unknown flag', () => ['--reference', file('reference.fit'), '--test', file('crank.fit'), '--colour'], /--colour/],
    ['a malformed number', () => ['--reference', file('reference.fit'), '--test', file('crank.fit'), '--tolerance', 'two'], /--tolerance needs a number/],
    ['no device under test', () => ['--reference', file('reference.fit')], /missing --test/],
  ])('exits with code 2 and one line for %s', async (_what, args, message) => {
    const run = await runCompare(args());
    expect(run.code).toBe(2);
    expect(run.stdout).toBe('');
    expect(oneLine(run.stderr)).toHaveLength(1);
    expect(run.stderr).toMatch(message);
    expect(run.stderr).not.toMatch(/\bat .*\(.*:\d+:\d+\)/); // no stack trace
  });
});
