import { compareRecordings } from '../shared/engine/compare.js';
import type { Recording } from '../shared/recording/recording.js';
import { deviceView } from '../shared/synthetic/device-view.js';
import { defaultProtocol } from '../shared/synthetic/protocol.js';
import { synthesizeRide } from '../shared/synthetic/synthesize-ride.js';
import type { BenchOptions, BenchRow } from './types.js';

/**
 * Cost of a full comparison (alignment, pairing, steady blocks, statistics with
 * block-bootstrap intervals, diagnosis, verdict) of a device against the reference over a
 * 4 h ride, against a floor measured in the same run: one pass reading every sample of
 * every column of both recordings once. Also the scaling from n to 10 n grid rows (4 h at
 * 1 Hz on a 1 s grid against 4 h at 10 Hz on a 0.1 s grid): an O(n log n) engine stays
 * at most 12x.
 */
export async function benchCompare(options: BenchOptions = { quick: false }): Promise<BenchRow[]> {
  const hours = options.quick ? 1 : 4;
  const reps = options.quick ? 1 : 5;
  const blocks = Array.from({ length: hours }, () => defaultProtocol()).flat();
  const pair = (rateHz: 1 | 10): [Recording, Recording] => {
    const ride = synthesizeRide({ seed: 7, blocks, rateHz });
    const intervalS = 1 / rateHz;
    const reference = deviceView(ride, { label: 'Bench reference', serialNumber: 1, noiseSdW: 3, intervalS }).recording;
    const test = deviceView(ride, {
      label: 'Bench crank', serialNumber: 2, noiseSdW: 5, intervalS, clockOffsetS: 13,
      gains: { left: [1, 1.05] }, dropouts: { perHour: 10, meanLengthS: 3 },
    }).recording;
    return [reference, test];
  };
  const slow = pair(1);
  const fast = pair(10);
  const run = (p: [Recording, Recording], intervalS: number) => () => compareRecordings(p[0], [p[1]], { intervalS });
  const floor = (p: [Recording, Recording]) => () => readEverySample(p);

  const at1 = await measure(reps, run(slow, 1), floor(slow));
  const at10 = await measure(Math.max(1, Math.ceil(reps / 2)), run(fast, 1), floor(fast));
  const at10fine = await measure(Math.max(1, Math.ceil(reps / 2)), run(fast, 0.1), floor(fast));
  const rows = (slow[0].time.length + slow[1].time.length).toLocaleString('en');
  const rows10 = (fast[0].time.length + fast[1].time.length).toLocaleString('en');
  const vsFloor = (name: string, r: Measured, samples: string): BenchRow => ({
    name,
    value: r.value,
    unit: 'ms',
    baseline: r.baseline,
    ratio: r.value / r.baseline,
    note: `baseline: one pass over every column of both files (${samples} samples); median of ${r.reps}; lower is better`,
  });
  const scaling = at10fine.value / at1.value;
  return [
    vsFloor(`compare ${hours} h 1 Hz, 1 s grid`, at1, rows),
    vsFloor(`compare ${hours} h 10 Hz, 1 s grid`, at10, rows10),
    vsFloor(`compare ${hours} h 10 Hz, 0.1 s grid`, at10fine, rows10),
    {
      name: `compare scaling, 10x grid rows (${hours} h 1 Hz -> 10 Hz)`,
      value: at10fine.value,
      unit: 'ms',
      baseline: at1.value,
      ratio: scaling,
      note: `10x the rows should cost at most 12x (O(n log n)); ${scaling <= 12 ? 'within' : 'OVER'} the limit`,
    },
  ];
}

interface Measured {
  value: number;
  baseline: number;
  reps: number;
}

/**
 * Interleaved runs after one warm-up of each; medians in ms. The floor takes well under
 * a millisecond at 1 Hz, so it runs several times per round and a pause of the machine
 * during one of them does not become the figure.
 */
async function measure(reps: number, subject: () => unknown, baseline: () => unknown): Promise<Measured> {
  subject();
  for (let k = 0; k < 5; k++) baseline();
  const a: number[] = [];
  const b: number[] = [];
  for (let i = 0; i < reps; i++) {
    let t = performance.now();
    for (let k = 0; k < 9; k++) {
      t = performance.now();
      baseline();
      b.push(performance.now() - t);
    }
    t = performance.now();
    subject();
    a.push(performance.now() - t);
    await Promise.resolve();
  }
  return { value: median(a), baseline: median(b), reps };
}

/** The floor: touch every sample of every column once (the sum keeps the loop from being dropped). */
function readEverySample(recordings: readonly Recording[]): number {
  let sum = 0;
  for (const r of recordings) {
    for (let i = 0; i < r.time.length; i++) sum += r.time[i]!;
    for (const column of Object.values(r.columns)) {
      if (column === undefined) continue;
      for (let i = 0; i < column.length; i++) {
        const v = column[i]!;
        if (v === v) sum += v;
      }
    }
  }
  if (sum === 0.5) throw new Error('unreachable sum');
  return sum;
}

function median(xs: number[]): number {
  const s = [...xs].sort((x, y) => x - y);
  const mid = s.length >> 1;
  return s.length % 2 ? s[mid]! : (s[mid - 1]! + s[mid]!) / 2;
}
