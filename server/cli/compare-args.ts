import { parseArgs } from 'node:util';
import type { CompareOptions } from '../../shared/engine/compare-options.js';

/** What the compare command was asked to do. */
export interface CompareArgs {
  referencePath: string;
  testPaths: string[];
  json: boolean;
  help: boolean;
  options: CompareOptions;
}

/** A problem with the command line or the input files: printed as one line, exit code 2. */
export class UsageError extends Error {
  override readonly name = 'UsageError';
}

/** The help text of the compare command. */
export const COMPARE_USAGE = `Usage: npm run compare -- --reference REF.fit --test DEVICE.fit [--test OTHER.csv] [options]

Compares each device under test with the reference and prints a report.

  --reference FILE        the trusted device's recording (FIT or CSV)
  --test FILE             a device under test (repeat for several)
  --tolerance PCT         stated accuracy of the devices under test (default 2)
  --reference-tolerance PCT  stated accuracy of the reference (default 1)
  --interval S            common grid in seconds (default 1)
  --offset auto|S         clock offset test minus reference in seconds, or auto (default)
  --max-lag S             largest offset searched by auto (default 600)
  --segments steady|laps  sections to compare (default steady)
  --chainrings 53,39      chainring teeth, to infer gears from speed and cadence
  --cogs 11,12,...,28     cog teeth (a range such as 11-30 means every tooth count in it)
  --wheel 25-622          ETRTO tyre size or circumference in mm
  --front-override S-E:T  the chain was on chainring T (teeth) from S to E seconds after
                          the reference's first sample, whatever the file reports (repeat)
  --seed N                seed of the bootstrap intervals (default 1)
  --json                  print the report as one JSON document
  --help                  this text`;

/**
 * Reads the compare command line. Unknown flags, missing values and malformed numbers
 * throw {@link UsageError} with a one-line message.
 *
 * @example parseCompareArgs(['--reference', 'a.fit', '--test', 'b.fit', '--json'])
 */
export function parseCompareArgs(argv: string[]): CompareArgs {
  let values;
  try {
    ({ values } = parseArgs({
      args: joinNegativeNumbers(argv),
      strict: true,
      allowPositionals: false,
      options: {
        reference: { type: 'string' },
        test: { type: 'string', multiple: true },
        tolerance: { type: 'string' },
        'reference-tolerance': { type: 'string' },
        interval: { type: 'string' },
        offset: { type: 'string' },
        'max-lag': { type: 'string' },
        segments: { type: 'string' },
        chainrings: { type: 'string' },
        cogs: { type: 'string' },
        wheel: { type: 'string' },
        'front-override': { type: 'string', multiple: true },
        seed: { type: 'string' },
        json: { type: 'boolean', default: false },
        help: { type: 'boolean', short: 'h', default: false },
      },
    }));
  } catch (error) {
    const reason = error instanceof Error ? error.message.split('\n')[0]! : String(error);
    throw new UsageError(`${reason} (see --help)`);
  }
  if (values.help) return { referencePath: '', testPaths: [], json: false, help: true, options: {} };
  if (values.reference === undefined) throw new UsageError('missing --reference FILE (the trusted device)');
  if (values.test === undefined || values.test.length === 0) throw new UsageError('missing --test FILE (a device under test)');
  const options: CompareOptions = {};
  if (values.tolerance !== undefined) options.tolerancePct = positive('--tolerance', values.tolerance);
  if (values['reference-tolerance'] !== undefined) options.referenceTolerancePct = nonNegative('--reference-tolerance', values['reference-tolerance']);
  if (values.interval !== undefined) options.intervalS = positive('--interval', values.interval);
  if (values['max-lag'] !== undefined) options.maxLagS = nonNegative('--max-lag', values['max-lag']);
  if (values.offset !== undefined && values.offset !== 'auto') options.offset = finite('--offset', values.offset);
  if (values.segments !== undefined) {
    if (values.segments !== 'steady' && values.segments !== 'laps') throw new UsageError(`--segments must be steady or laps, got "${values.segments}"`);
    options.segments = values.segments;
  }
  if (values.chainrings !== undefined) options.chainrings = teeth('--chainrings', values.chainrings);
  if (values.cogs !== undefined) options.cogs = teeth('--cogs', values.cogs);
  if (values.wheel !== undefined) options.wheel = /^\d+(\.\d+)?$/.test(values.wheel) ? Number(values.wheel) : values.wheel;
  if (values['front-override'] !== undefined) options.gearOverrides = values['front-override'].map(frontOverride);
  if (values.seed !== undefined) options.seed = Math.trunc(finite('--seed', values.seed));
  return { referencePath: values.reference, testPaths: values.test, json: values.json, help: false, options };
}

/** `--offset -12` would read -12 as a flag: pass such values as `--offset=-12`. */
function joinNegativeNumbers(argv: string[]): string[] {
  const out: string[] = [];
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i]!;
    const next = argv[i + 1];
    if (arg.startsWith('--') && !arg.includes('=') && next !== undefined && /^-\d/.test(next)) {
      out.push(`${arg}=${next}`);
      i++;
    } else {
      out.push(arg);
    }
  }
  return out;
}

/** "2700-2940:34" -> the chain on 34T from 2700 s to 2940 s. */
function frontOverride(text: string): { startS: number; endS: number; frontTeeth: number } {
  const match = /^\s*(\d+(?:\.\d+)?)\s*-\s*(\d+(?:\.\d+)?)\s*:\s*(\d+)\s*$/.exec(text);
  if (!match || !(Number(match[2]) > Number(match[1]))) {
    throw new UsageError(`--front-override needs START-END:TEETH in seconds, e.g. 2700-2940:34, got "${text}"`);
  }
  return { startS: Number(match[1]), endS: Number(match[2]), frontTeeth: Number(match[3]) };
}

function finite(flag: string, text: string): number {
  const value = Number(text);
  if (text.trim() === '' || !Number.isFinite(value)) throw new UsageError(`${flag} needs a number, got "${text}"`);
  return value;
}

function positive(flag: string, text: string): number {
  const value = finite(flag, text);
  if (!(value > 0)) throw new UsageError(`${flag} must be above 0, got ${text}`);
  return value;
}

function nonNegative(flag: string, text: string): number {
  const value = finite(flag, text);
  if (value < 0) throw new UsageError(`${flag} must not be negative, got ${text}`);
  return value;
}

/** "53,39" or "11-30" (every tooth count in the range) or a mix: "11-17,19,21". */
function teeth(flag: string, text: string): number[] {
  const out: number[] = [];
  for (const part of text.split(',')) {
    const range = /^\s*(\d+)\s*-\s*(\d+)\s*$/.exec(part);
    if (range) {
      const [lo, hi] = [Number(range[1]), Number(range[2])].sort((a, b) => a - b) as [number, number];
      for (let t = lo; t <= hi; t++) out.push(t);
    } else if (/^\s*\d+\s*$/.test(part) && Number(part) > 0) {
      out.push(Number(part));
    } else {
      throw new UsageError(`${flag} needs tooth counts such as 53,39 or 11-30, got "${text}"`);
    }
  }
  return out;
}
