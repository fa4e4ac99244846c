import { fileURLToPath } from 'node:url';

/** The repository root: this file runs as dist/node/bench/repo-path.js. */
const ROOT = fileURLToPath(new URL('../../../', import.meta.url));

/** An absolute path from a path relative to the repository root. */
export function repoPath(relative: string): string {
  return `${ROOT}${relative}`;
}
