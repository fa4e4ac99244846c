import { cpus, release, totalmem, type as osType } from 'node:os';

/** The machine a benchmark ran on, written beside the rows. */
export interface Machine {
  cpus: number;
  model: string;
  /** Total memory, GB. */
  memory: number;
  node: string;
  os: string;
  /** ISO 8601 time the run started. */
  date: string;
}

/** Describes this machine now. */
export function describeMachine(): Machine {
  const list = cpus();
  return {
    cpus: list.length,
    model: list[0]?.model.trim() ?? 'unknown',
    memory: Math.round((totalmem() / 2 ** 30) * 10) / 10,
    node: process.version,
    os: `${osType()} ${release()}`,
    date: new Date().toISOString(),
  };
}
