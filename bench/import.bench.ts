import FitParser from 'fit-file-parser';
import Papa from 'papaparse';
import { parseCsv } from '../shared/recording/parse-csv.js';
import { parseFit, type FitDecoder } from '../shared/recording/parse-fit.js';
import { writeCsv } from '../shared/recording/write-csv.js';
import { writeFit } from '../shared/recording/write-fit.js';
import { deviceView } from '../shared/synthetic/device-view.js';
import { defaultProtocol } from '../shared/synthetic/protocol.js';
import { synthesizeRide } from '../shared/synthetic/synthesize-ride.js';
import type { BenchOptions, BenchRow } from './types.js';

/**
 * Import cost against the bare library parse of the same bytes, per format: value = Cogbook's
 * import (checks, parse, recording model), baseline = the library alone (fit-file-parser mode
 * 'list'; papaparse with the same options). Ratio 1.30 = 30 % model-building overhead (target: below).
 * FIT has two rows: Cogbook's own decoder (what every ordinary file takes: it reads the bytes into
 * the model without fit-file-parser, so its ratio says how it compares with the library's parse
 * alone), and the fit-file-parser path (what a file the own decoder declines takes: the library's
 * parse plus Cogbook's checks and model, the overhead the target is about).
 */
export async function benchImport(options: BenchOptions = { quick: false }): Promise<BenchRow[]> {
  const hours = options.quick ? 1 : 4;
  const reps = options.quick ? 3 : 9;
  const blocks = Array.from({ length: hours }, () => defaultProtocol()).flat();
  const device = { label: 'Bench crank', noiseSdW: 3, channels: { pedalMetrics: true }, dropouts: { perHour: 10, meanLengthS: 3 } };

  const fitRide = synthesizeRide({ seed: 1, blocks });
  const fit = writeFit(deviceView(fitRide, device).recording);
  const bareParse = async (): Promise<void> => {
    await new FitParser({ mode: 'list' }).parseAsync(fit as unknown as ArrayBuffer);
  };
  const importWith = (decoder: FitDecoder) => async (): Promise<void> => {
    const result = await parseFit(fit, 'bench.fit', {}, decoder);
    if (!result.ok) throw new Error(result.error.message);
  };
  // The fit-file-parser path first: it warms the library's code, so both rows meet a warm baseline.
  const fitLibraryRow = await compare(reps, importWith('library'), bareParse);
  const fitRow = await compare(reps, importWith('own'), bareParse);

  const csvRide = synthesizeRide({ seed: 2, blocks, rateHz: 10 });
  const csvView = deviceView(csvRide, { ...device, intervalS: 0.1 }).recording;
  // Every column the writer has (16), and a narrow logger export (time, power, balance, cadence, speed).
  const wide = writeCsv(csvView);
  const narrowColumns = { power: csvView.columns.power, balance: csvView.columns.balance, cadence: csvView.columns.cadence, speed: csvView.columns.speed };
  const narrow = writeCsv({ ...csvView, columns: narrowColumns });
  const csvCase = (csv: string) =>
    compare(
      reps,
      async () => {
        const result = parseCsv(csv, 'bench.csv');
        if (!result.ok) throw new Error(result.error.message);
      },
      async () => {
        Papa.parse<string[]>(csv, { delimiter: '', skipEmptyLines: false });
      },
    );
  const wideRow = await csvCase(wide);
  const narrowRow = await csvCase(narrow);
  const row = (name: string, r: { value: number; baseline: number }, baselineName: string): BenchRow => ({
    name,
    value: r.value,
    unit: 'ms',
    baseline: r.baseline,
    ratio: r.value / r.baseline,
    note: `baseline: ${baselineName} alone; overhead ${(100 * (r.value / r.baseline - 1)).toFixed(0)} % (target < 30 %); fastest of ${reps} interleaved runs`,
  });
  const fitSize = `${(fit.length / 1e6).toFixed(2)} MB`;
  return [
    {
      ...row(`import ${hours} h 1 Hz FIT (${fitSize}), own decoder`, fitRow, 'fit-file-parser'),
      note: `Cogbook's whole import (checks, CRC, own decoding, model) against fit-file-parser's parse alone of the same bytes, which it no longer runs: below 1 = cheaper than the bare library parse; fastest of ${reps} interleaved runs`,
    },
    row(`import ${hours} h 1 Hz FIT (${fitSize}), fit-file-parser path`, fitLibraryRow, 'fit-file-parser'),
    row(`import ${hours} h 10 Hz CSV, 16 columns (${(wide.length / 1e6).toFixed(1)} MB)`, wideRow, 'papaparse'),
    row(`import ${hours} h 10 Hz CSV, 5 columns (${(narrow.length / 1e6).toFixed(1)} MB)`, narrowRow, 'papaparse'),
  ];
}

/**
 * Interleaved runs after one warm-up of each; the fastest of each, in ms. The minimum is the
 * figure least disturbed by other work on a shared machine (both sides get the same chance).
 */
async function compare(reps: number, subject: () => Promise<void>, baseline: () => Promise<void>): Promise<{ value: number; baseline: number }> {
  await subject();
  await baseline();
  const a: number[] = [];
  const b: number[] = [];
  for (let i = 0; i < reps; i++) {
    let t = performance.now();
    await baseline();
    b.push(performance.now() - t);
    t = performance.now();
    await subject();
    a.push(performance.now() - t);
  }
  return { value: Math.min(...a), baseline: Math.min(...b) };
}
