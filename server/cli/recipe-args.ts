import { UsageError } from './compare-args.js';

export { UsageError };

/** What the recipe command was asked to do. */
export interface RecipeArgs {
  help: boolean;
  /** An export file's path, or a notebook id in the database. */
  notebook: string;
  /** Slot name -> file path. */
  inputs: Record<string, string>;
  /** Where to write the JSON; stdout when absent. */
  out: string | undefined;
}

export const RECIPE_USAGE = `Usage: npm run recipe -- --notebook <export file or notebook id> [--input <slot>=<file> ...] [--out results.json]

Computes a notebook (a "recipe") on the given FIT or CSV files with the same engine as
the app, and writes every cell's outcome as JSON.

  --notebook  a Cogbook export file (.cogbook.json): needs no server or database; or a
              notebook id: read from the database (DATABASE_URL, else DATA_DIR, default ./data)
  --input     bind a file to an input slot, e.g. --input reference=ref.fit --input test=crank.fit;
              slots not given use the recordings embedded in the export (or bound in the database)
  --out       write the JSON to this file instead of standard output

Exit codes: 0 done (cells may still have failed: see "failedCells"), 2 bad input, 1 anything else.`;

/** Parses the command line. @throws UsageError naming the bad argument. */
export function parseRecipeArgs(argv: string[]): RecipeArgs {
  const args: RecipeArgs = { help: false, notebook: '', inputs: {}, out: undefined };
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i]!;
    const [flag, inline] = arg.startsWith('--') && arg.includes('=') ? [arg.slice(0, arg.indexOf('=')), arg.slice(arg.indexOf('=') + 1)] : [arg, undefined];
    const value = (): string => {
      const v = inline ?? argv[++i];
      if (v === undefined || v === '') throw new UsageError(`${flag} needs a value`);
      return v;
    };
    switch (flag) {
      case '--help':
      case '-h':
        args.help = true;
        break;
      case '--notebook':
        args.notebook = value();
        break;
      case '--out':
        args.out = value();
        break;
      case '--input': {
        const spec = value();
        const eq = spec.indexOf('=');
        if (eq <= 0 || eq === spec.length - 1) throw new UsageError(`--input ${spec}: write it as <slot>=<file>, e.g. reference=ride.fit`);
        const slot = spec.slice(0, eq);
        if (args.inputs[slot] !== undefined) throw new UsageError(`--input: slot "${slot}" is given twice`);
        args.inputs[slot] = spec.slice(eq + 1);
        break;
      }
      default:
        throw new UsageError(`unknown argument ${arg} (see --help)`);
    }
  }
  if (!args.help && !args.notebook) throw new UsageError('--notebook is required (an export file or a notebook id; see --help)');
  return args;
}
