import { runEditors, auditSaves, type Editor, type SaveAudit } from './editors.js';
import type { LoadFigures } from './figures.js';
import { runReaders } from './readers.js';

export interface MixedLoadOptions {
  url: string;
  /** Slug of the published notebook the readers load. */
  slug: string;
  readers: number;
  editors: Editor[];
  durationS: number;
  /** Autosave period of each editor, ms. */
  intervalMs: number;
}

export interface MixedLoad {
  reads: LoadFigures;
  saves: LoadFigures;
  audit: SaveAudit;
  /** Acknowledged saves numbered other than base + 1. */
  misnumbered: string[];
}

/**
 * Readers of a published page and editors autosaving their own notebooks at the same
 * time, then an audit of every editor's revision history against what was acknowledged.
 */
export async function runMixedLoad(options: MixedLoadOptions): Promise<MixedLoad> {
  const [reads, editing] = await Promise.all([
    runReaders({ url: options.url, path: `/api/published/${options.slug}`, connections: options.readers, durationS: options.durationS }),
    runEditors({ url: options.url, editors: options.editors, durationS: options.durationS, intervalMs: options.intervalMs }),
  ]);
  const audit = await auditSaves(options.url, options.editors);
  return { reads, saves: editing.saves, audit, misnumbered: editing.misnumbered };
}

/** Everything that breaks "zero errors, zero non-2xx, zero lost saves", empty when the run was clean. */
export function loadProblems(run: MixedLoad): string[] {
  const problems: string[] = [];
  for (const [what, f] of [
    ['reads', run.reads],
    ['saves', run.saves],
  ] as const) {
    if (f.errors > 0) problems.push(`${what}: ${f.errors} requests got no answer`);
    if (f.non2xx > 0) problems.push(`${what}: ${f.non2xx} non-2xx answers ${JSON.stringify(f.statuses)}`);
  }
  if (run.saves.requests === 0) problems.push('saves: none answered');
  if (run.audit.lost.length > 0) problems.push(`lost saves: ${run.audit.lost.slice(0, 10).join(', ')}`);
  problems.push(...run.audit.problems, ...run.misnumbered);
  return problems;
}
