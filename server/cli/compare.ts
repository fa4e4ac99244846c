import { readFile } from 'node:fs/promises';
import { basename } from 'node:path';
import { isEngineError } from '../../shared/errors.js';
import { compareRecordings } from '../../shared/engine/compare.js';
import { compareReportSchema } from '../../shared/engine/compare-report.js';
import { importRecording } from '../../shared/recording/import-recording.js';
import type { Recording } from '../../shared/recording/recording.js';
import { COMPARE_USAGE, parseCompareArgs, UsageError } from './compare-args.js';
import { formatCompareReport } from './format-compare-report.js';

/**
 * The headless compare command: reads the reference and each device under test, runs
 * the comparison engine and prints a text report, or with --json one JSON document
 * validated by the report schema. Bad input (unknown flag, missing or unreadable file,
 * a file that is not a recording, recordings that do not overlap) prints one line and
 * exits with code 2.
 */
async function main(argv: string[]): Promise<number> {
  const args = parseCompareArgs(argv);
  if (args.help) {
    process.stdout.write(`${COMPARE_USAGE}\n`);
    return 0;
  }
  const reference = await load(args.referencePath);
  const tests: Recording[] = [];
  for (const path of args.testPaths) tests.push(await load(path));
  let report;
  try {
    report = compareRecordings(reference, tests, args.options);
  } catch (error) {
    if (isEngineError(error)) throw new UsageError(error.message);
    throw error;
  }
  if (args.json) {
    const checked = compareReportSchema.parse(report);
    process.stdout.write(`${JSON.stringify(checked, null, 2)}\n`);
  } else {
    process.stdout.write(`${formatCompareReport(report)}\n`);
  }
  return 0;
}

async function load(path: string): Promise<Recording> {
  let bytes: Uint8Array;
  try {
    bytes = new Uint8Array(await readFile(path));
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    const why = code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'is a directory' : code === 'EACCES' ? 'permission denied' : 'cannot be read';
    throw new UsageError(`${path}: ${why}`);
  }
  const name = basename(path);
  const result = await importRecording(bytes, name);
  if (!result.ok) {
    const message = result.error.message.replace(/\s+/g, ' ').trim();
    throw new UsageError(message.includes(name) ? message : `${path}: ${message}`);
  }
  return result.recording;
}

main(process.argv.slice(2)).then(
  (code) => {
    process.exitCode = code;
  },
  (error: unknown) => {
    const usage = error instanceof UsageError;
    const message = error instanceof Error ? error.message : String(error);
    process.stderr.write(`compare: ${message.split('\n')[0]}\n`);
    process.exitCode = usage ? 2 : 1;
  },
);
