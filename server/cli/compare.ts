import { readFile } from 'node:fs/promises';
import { basename } from 'node:path';
import type { Recording } from '../../shared/recording/recording.js';
import type { JsonSchema } from './check-json.js';
import { COMPARE_USAGE, parseCompareArgs, UsageError } from './compare-args.js';
import { runCommand } from './run-command.js';

/**
 * The headless compare command: reads the reference and each device under test, runs
 * the comparison engine and prints a text report, or with --json one JSON document
 * checked against the report schema. Bad input (unknown flag, missing or unreadable file,
 * a file that is not a recording, recordings that do not overlap) prints one line and
 * exits with code 2.
 *
 * The parsers, the engine and the schema are loaded only once the command line is
 * known to be good, so --help and usage errors answer at once.
 */
async function main(argv: string[]): Promise<number> {
  const args = parseCompareArgs(argv);
  if (args.help) {
    process.stdout.write(`${COMPARE_USAGE}\n`);
    return 0;
  }
  const paths = [args.referencePath, ...args.testPaths];
  const files: Uint8Array[] = [];
  for (const path of paths) files.push(await readBytes(path));
  const { importRecording } = await import('../../shared/recording/import-recording.js');
  const recordings: Recording[] = [];
  for (const [i, path] of paths.entries()) recordings.push(await parseRecording(path, files[i]!, importRecording));
  const [reference, ...tests] = recordings as [Recording, ...Recording[]];
  const { compareRecordings } = await import('../../shared/engine/compare.js');
  const { isEngineError } = await import('../../shared/errors.js');
  let report;
  try {
    report = compareRecordings(reference, tests, args.options);
  } catch (error) {
    if (isEngineError(error)) throw new UsageError(error.message);
    throw error;
  }
  if (args.json) {
    const { checkJson } = await import('./check-json.js');
    const checked = checkJson(await reportJsonSchema(), report);
    process.stdout.write(`${JSON.stringify(checked, null, 2)}\n`);
  } else {
    const { formatCompareReport } = await import('./format-compare-report.js');
    process.stdout.write(`${formatCompareReport(report)}\n`);
  }
  return 0;
}

/**
 * The report schema as JSON Schema: bundle.mjs makes it from the zod schema when building and
 * writes its text into the bundle, so the bundle checks its one document without loading zod (about
 * 20 ms of a FIT pair's start-up). Run from the sources, it is made here.
 */
declare const COMPARE_REPORT_JSON_SCHEMA: string | undefined;

async function reportJsonSchema(): Promise<JsonSchema> {
  if (typeof COMPARE_REPORT_JSON_SCHEMA === 'string') return JSON.parse(COMPARE_REPORT_JSON_SCHEMA) as JsonSchema;
  const { z } = await import('zod');
  const { compareReportSchema } = await import('../../shared/engine/compare-report.js');
  return z.toJSONSchema(compareReportSchema) as JsonSchema;
}

type ImportRecording = typeof import('../../shared/recording/import-recording.js').importRecording;

async function readBytes(path: string): Promise<Uint8Array> {
  try {
    // A view of the Buffer, not `new Uint8Array(buffer)`, which copies: 10 MB for a pair of 10 Hz rides.
    const buffer = await readFile(path);
    return new Uint8Array(buffer.buffer, buffer.byteOffset, buffer.byteLength);
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    const why = code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'is a directory' : code === 'EACCES' ? 'permission denied' : 'cannot be read';
    throw new UsageError(`${path}: ${why}`);
  }
}

async function parseRecording(path: string, bytes: Uint8Array, importRecording: ImportRecording): Promise<Recording> {
  const name = basename(path);
  const result = await importRecording(bytes, name);
  if (!result.ok) {
    const message = result.error.message.replace(/\s+/g, ' ').trim();
    throw new UsageError(message.includes(name) ? message : `${path}: ${message}`);
  }
  return result.recording;
}

runCommand('compare', main);
