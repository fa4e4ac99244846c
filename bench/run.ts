import { writeFile } from 'node:fs/promises';
import { parseArgs } from 'node:util';
import { benchBrowser, benchPublished } from './browser.bench.js';
import { benchCompare } from './compare.bench.js';
import { formatTable } from './format-table.js';
import { benchImport } from './import.bench.js';
import { benchLoad } from './load.bench.js';
import { describeMachine } from './machine.js';
import { benchPeer } from './peer.bench.js';
import { repoPath } from './repo-path.js';
import type { Bench, BenchRow } from './types.js';

/**
 * Every benchmark module, in the order of the table. To add one, write
 * `bench/<name>.bench.ts` exporting a {@link Bench} and list it here.
 */
const BENCHES: Record<string, Bench> = {
  import: benchImport,
  compare: benchCompare,
  peer: benchPeer,
  load: benchLoad,
  browser: benchBrowser,
  // The browser module's published-page rows alone (they are also part of browser).
  published: benchPublished,
};

/** Modules whose rows another module already gives: run only when named with --only. */
const PART_OF_ANOTHER = new Set(['published']);

const USAGE = `Usage: npm run bench -- [--only NAME[,NAME]] [--quick]

Runs the benchmarks, prints one table and writes bench/results.json.
Every figure is a ratio to a baseline measured in the same run on this machine.

  --only NAME   run only these modules (repeat or comma-separate): ${Object.keys(BENCHES).join(', ')}
                (published: the browser module's published-page rows alone)
  --quick       smaller sizes and fewer repetitions (a smoke test, not figures to quote)`;

async function main(argv: string[]): Promise<number> {
  const { values } = parseArgs({
    args: argv,
    options: { only: { type: 'string', multiple: true }, quick: { type: 'boolean', default: false }, help: { type: 'boolean', short: 'h', default: false } },
  });
  if (values.help) {
    process.stdout.write(`${USAGE}\n`);
    return 0;
  }
  const wanted = (values.only ?? []).flatMap((s) => s.split(',')).map((s) => s.trim()).filter((s) => s !== '');
  const unknown = wanted.filter((name) => !(name in BENCHES));
  if (unknown.length > 0) {
    process.stderr.write(`bench: no module named ${unknown.join(', ')} (have ${Object.keys(BENCHES).join(', ')})\n`);
    return 2;
  }
  const names = wanted.length > 0 ? Object.keys(BENCHES).filter((n) => wanted.includes(n)) : Object.keys(BENCHES).filter((n) => !PART_OF_ANOTHER.has(n));
  const machine = describeMachine();
  const rows: BenchRow[] = [];
  let failed = 0;
  for (const name of names) {
    process.stderr.write(`bench ${name}${values.quick ? ' (quick)' : ''} ...\n`);
    const started = performance.now();
    try {
      rows.push(...(await BENCHES[name]!({ quick: values.quick })));
    } catch (error) {
      // One broken module must not hide the others' figures; it shows as a row and fails the run.
      failed++;
      const message = error instanceof Error ? error.message : String(error);
      rows.push({ name: `${name}: FAILED`, value: NaN, unit: '', baseline: NaN, ratio: NaN, note: message.split('\n')[0]! });
    }
    process.stderr.write(`bench ${name} done in ${((performance.now() - started) / 1000).toFixed(1)} s\n`);
  }
  process.stdout.write(`${formatTable(machine, rows)}\n`);
  const path = repoPath('bench/results.json');
  await writeFile(path, `${JSON.stringify({ machine, quick: values.quick, rows }, (_k, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? null : v), 2)}\n`);
  process.stderr.write(`wrote ${path}\n`);
  return failed > 0 ? 1 : 0;
}

main(process.argv.slice(2)).then(
  (code) => {
    process.exitCode = code;
  },
  (error: unknown) => {
    process.stderr.write(`bench: ${error instanceof Error ? error.message : String(error)}\n`);
    process.exitCode = 2;
  },
);
