/**
 * One line of the benchmark table: a measured value beside a baseline measured in the
 * same run on the same machine, so the ratio means something on any machine.
 */
export interface BenchRow {
  /** What was measured, e.g. "import 4 h 1 Hz FIT". */
  name: string;
  value: number;
  unit: string;
  /** The baseline's value in the same unit, measured in the same run. */
  baseline: number;
  /** value / baseline (what "better" means is stated in `note`). */
  ratio: number;
  note?: string;
}

/** What every benchmark module is given. */
export interface BenchOptions {
  /** Smaller sizes and fewer repetitions: a smoke test that the benchmark runs, not a figure to quote. */
  quick: boolean;
}

/** A benchmark module's entry point: measures and returns its rows. */
export type Bench = (options: BenchOptions) => Promise<BenchRow[]>;
