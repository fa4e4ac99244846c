import { readFile } from 'node:fs/promises';
import { availableParallelism, loadavg } from 'node:os';
import { basename } from 'node:path';
import { isMainThread, parentPort, Worker, workerData } from 'node:worker_threads';
import type { ImportResult } from '../../shared/recording/import-result.js';
import type { Recording } from '../../shared/recording/recording.js';
import { COMPARE_USAGE, parseCompareArgs, UsageError } from './compare-args.js';

/**
 * The headless compare command: reads the reference and each device under test, runs
 * the comparison engine and prints a text report, or with --json one JSON document
 * validated by the report schema. Bad input (unknown flag, missing or unreadable file,
 * a file that is not a recording, recordings that do not overlap) prints one line and
 * exits with code 2.
 *
 * The parsers, the engine and the schema are loaded only once the command line is
 * known to be good, so --help and usage errors answer at once. Large files are read in
 * worker threads, one per file, while this thread loads the engine (see readRecordings).
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
  const reading = readRecordings(paths, files);
  // Loading the engine (and for --json the schema) overlaps the reading when workers read.
  const engine = settleLater(import('../../shared/engine/compare.js'));
  const schema = args.json ? settleLater(loadSchema()) : undefined;
  const [reference, ...tests] = (await reading) as [Recording, ...Recording[]];
  const { compareRecordings } = await engine;
  const { isEngineError } = await import('../../shared/errors.js');
  let report;
  try {
    report = compareRecordings(reference, tests, args.options);
  } catch (error) {
    if (isEngineError(error)) throw new UsageError(error.message);
    throw error;
  }
  if (schema) {
    const { compareReportSchema } = await schema;
    const checked = compareReportSchema.parse(report);
    process.stdout.write(`${JSON.stringify(checked, null, 2)}\n`);
  } else {
    const { formatCompareReport } = await import('./format-compare-report.js');
    process.stdout.write(`${formatCompareReport(report)}\n`);
  }
  return 0;
}

/**
 * Loads the report schema. One document is validated once: zod's compiled fast path costs
 * more to build (~20 ms) than it saves on a single parse, so this process runs it without.
 */
async function loadSchema(): Promise<typeof import('../../shared/engine/compare-report.js')> {
  const { z } = await import('zod');
  z.config({ jitless: true });
  return import('../../shared/engine/compare-report.js');
}

/** A promise awaited later: marked handled now, so a failure while another await runs is not reported twice. */
function settleLater<T>(promise: Promise<T>): Promise<T> {
  promise.catch(() => undefined);
  return promise;
}

/**
 * FIT files at least this large together are read in parallel worker threads. Below it a
 * worker's start (a new isolate loading the reader) costs more than the reading it takes over.
 */
const PARALLEL_FIT_BYTES = 128 * 1024;

/** What a worker thread is given, and what it answers. */
interface ReadJob {
  path: string;
  bytes: Uint8Array;
}
type ReadAnswer = { ok: true; recording: Recording } | { ok: false; message: string };

/**
 * Reads every file into a recording; the first file (in command-line order) that cannot be
 * read throws its UsageError. Large FIT files are read one per worker thread: side by side on
 * a multi-core machine while this thread goes on (loading the engine), and the decoder's
 * garbage (fit-file-parser builds objects for every message) stays out of the heap the
 * comparison then runs in. CSV is read here: its reader is quick, and a worker would load
 * it (and its schema library) once more. On a busy machine (see hasIdleCore), or run from the
 * TypeScript sources (tsx), whose worker could not load them, everything is read here.
 */
async function readRecordings(paths: string[], files: Uint8Array[]): Promise<Recording[]> {
  const fitBytes = files.reduce((sum, f) => sum + (looksLikeFit(f) ? f.length : 0), 0);
  const useWorkers = fitBytes >= PARALLEL_FIT_BYTES && import.meta.url.endsWith('.js') && hasIdleCore();
  const pending = paths.map((path, i) => {
    const job = { path, bytes: files[i]! };
    return useWorkers && looksLikeFit(job.bytes) ? settleLater(readInWorker(job)) : undefined;
  });
  const recordings: Recording[] = [];
  for (const [i, path] of paths.entries()) {
    const answer = await (pending[i] ?? readOne({ path, bytes: files[i]! }));
    if (!answer.ok) throw new UsageError(answer.message);
    recordings.push(answer.recording);
  }
  return recordings;
}

/**
 * Whether another thread would run beside this one: a worker pays only on a core that is free.
 * The load average includes this process (about 1 on an otherwise quiet machine); on a machine
 * already busy (within half a core of the core count) a worker would add an isolate's start-up
 * to the same share of CPU, so the files are read here.
 */
function hasIdleCore(): boolean {
  return loadavg()[0]! < availableParallelism() - 0.5;
}

/** The FIT signature ".FIT" at bytes 8-11 (the readers check everything else). */
function looksLikeFit(bytes: Uint8Array): boolean {
  return bytes.length >= 12 && bytes[8] === 0x2e && bytes[9] === 0x46 && bytes[10] === 0x49 && bytes[11] === 0x54;
}

function readInWorker(job: ReadJob): Promise<ReadAnswer> {
  return new Promise((resolve, reject) => {
    // This same module, which in a worker thread answers one job (see the end of the file).
    const worker = new Worker(new URL(import.meta.url), { workerData: job });
    let answered = false;
    worker.once('message', (answer: ReadAnswer) => {
      answered = true;
      // The answer is all this process needs: the worker's teardown must not delay the exit.
      worker.unref();
      resolve(answer);
    });
    worker.once('error', reject);
    worker.once('exit', (code) => {
      if (!answered) reject(new Error(`the reader of ${job.path} stopped (exit code ${code}) without an answer`));
    });
  });
}

async function readOne(job: ReadJob): Promise<ReadAnswer> {
  const { importRecording } = await import('../../shared/recording/import-recording.js');
  const name = basename(job.path);
  const result: ImportResult = await importRecording(job.bytes, name);
  if (result.ok) return { ok: true, recording: result.recording };
  const message = result.error.message.replace(/\s+/g, ' ').trim();
  return { ok: false, message: message.includes(name) ? message : `${job.path}: ${message}` };
}

/** Worker side: reads its job and hands the columns over without copying them. */
async function answerParent(job: ReadJob): Promise<void> {
  const answer = await readOne(job);
  const buffers = new Set<ArrayBuffer>();
  if (answer.ok) {
    const { time, columns } = answer.recording;
    for (const values of [time, ...Object.values(columns)]) if (values) buffers.add(values.buffer as ArrayBuffer);
  }
  try {
    parentPort!.postMessage(answer, [...buffers]);
  } catch {
    // A buffer that cannot be moved (shared with something else) is copied instead.
    parentPort!.postMessage(answer);
  }
}

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

if (!isMainThread) void answerParent(workerData as ReadJob);
else main(process.argv.slice(2)).then(
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
