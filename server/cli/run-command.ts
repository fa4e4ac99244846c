import { UsageError } from './compare-args.js';

/**
 * Runs a command's main and sets the exit code: its own code, 2 for a usage error,
 * 1 for anything else, with the first line of the message on stderr after the command's name.
 */
export function runCommand(name: string, main: (argv: string[]) => Promise<number>): void {
  main(process.argv.slice(2)).then(
    (code) => {
      process.exitCode = code;
    },
    (error: unknown) => {
      const message = error instanceof Error ? error.message : String(error);
      process.stderr.write(`${name}: ${message.split('\n')[0]}\n`);
      process.exitCode = error instanceof UsageError ? 2 : 1;
    },
  );
}
