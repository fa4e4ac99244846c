import { spawn } from 'node:child_process';

/** One timed run of a command. */
export interface ProcessRun {
  /** Wall time from spawn to exit, ms: start-up included. */
  ms: number;
  stdout: string;
}

/**
 * Runs a command to completion and times it end to end, as a user would wait for it.
 * Rejects with the command's stderr when it exits with a non-zero code.
 */
export function timeProcess(command: string, args: readonly string[], env: NodeJS.ProcessEnv = process.env): Promise<ProcessRun> {
  return new Promise((resolve, reject) => {
    const started = performance.now();
    const child = spawn(command, args, { env, stdio: ['ignore', 'pipe', 'pipe'] });
    const out: Buffer[] = [];
    const err: Buffer[] = [];
    child.stdout.on('data', (b: Buffer) => out.push(b));
    child.stderr.on('data', (b: Buffer) => err.push(b));
    child.on('error', reject);
    child.on('close', (code) => {
      const ms = performance.now() - started;
      if (code === 0) resolve({ ms, stdout: Buffer.concat(out).toString('utf8') });
      else reject(new Error(`${command} ${args.join(' ')} exited with ${code}: ${Buffer.concat(err).toString('utf8').trim().split('\n').slice(-3).join(' | ')}`));
    });
  });
}

/** Median of some numbers (mean of the middle two for an even count); NaN for none. */
export function median(values: readonly number[]): number {
  if (values.length === 0) return NaN;
  const s = [...values].sort((a, b) => a - b);
  const mid = s.length >> 1;
  return s.length % 2 === 1 ? s[mid]! : (s[mid - 1]! + s[mid]!) / 2;
}
