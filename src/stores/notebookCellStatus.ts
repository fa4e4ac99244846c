import type { CellOutput, CellState } from '../../shared/notebook/cell-output.js';
import type { NotebookCell } from '../../shared/notebook/document.js';

/** A cell's state in Cogbook's words, with what the page needs to show it. */
export interface CellStatus {
  state: CellState;
  /** Short label: "up to date", "needs rerun", "computing", "failed", "waiting on aligned". */
  label: string;
  /** One sentence more, for the tooltip and the outline. */
  detail: string;
  /** Compute time of the last run, ms (0 when reused). */
  durationMs: number;
  /** True when the last run reused the earlier result. */
  cached: boolean;
  /** Times computed in this session. */
  runs: number;
  /** The cell this one waits on, when blocked by a failed cell. */
  waitsOn?: string;
}

/** Labels for each state, one place so the outline, the cells and the status line agree. */
export const STATE_LABELS: Readonly<Record<CellState, string>> = {
  fresh: 'up to date',
  stale: 'needs rerun',
  running: 'computing',
  failed: 'failed',
  blocked: 'waiting',
};

/**
 * How one cell stands, from its last output and what happened since: edited after the
 * run (stale), being computed now, or as the run left it.
 */
export function cellStatus(
  cell: NotebookCell,
  output: CellOutput | undefined,
  now: { stale: boolean; computing: boolean; queued: boolean; runs: number },
): CellStatus {
  const base = { durationMs: output?.durationMs ?? 0, cached: output?.cached ?? false, runs: now.runs };
  if (now.computing) return { ...base, state: 'running', label: STATE_LABELS.running, detail: `Computing ${cell.name}…` };
  if (now.stale || output === undefined) {
    return {
      ...base,
      state: 'stale',
      label: STATE_LABELS.stale,
      detail: now.queued ? 'Changed since the last run; it is next in line.' : 'Changed since the last run; it recomputes in a moment.',
    };
  }
  switch (output.state) {
    case 'fresh':
      return { ...base, state: 'fresh', label: STATE_LABELS.fresh, detail: output.cached ? 'Up to date (reused from the last run).' : `Up to date, computed in ${formatDuration(output.durationMs)}.` };
    case 'failed':
      return { ...base, state: 'failed', label: STATE_LABELS.failed, detail: output.error?.message ?? 'The cell failed.' };
    case 'blocked': {
      const by = output.blockedBy;
      if (by?.reason === 'empty_slot') {
        return { ...base, state: 'blocked', label: `waiting for a file in ${by.name}`, detail: `Add a recording to the input “${by.name}” to compute this cell.`, waitsOn: by.name };
      }
      const name = by?.name ?? 'an earlier cell';
      return { ...base, state: 'blocked', label: `waiting on ${name}`, detail: `Waits until “${name}” is fixed.`, waitsOn: name };
    }
    default:
      return { ...base, state: output.state, label: STATE_LABELS[output.state], detail: '' };
  }
}

/** 840 ms, 2.4 s, 1 min 5 s. */
export function formatDuration(ms: number): string {
  if (!Number.isFinite(ms) || ms < 0) return '–';
  if (ms < 1000) return `${Math.max(0, Math.round(ms))} ms`;
  if (ms < 60_000) return `${(ms / 1000).toFixed(1)} s`;
  const s = Math.round(ms / 1000);
  return `${Math.floor(s / 60)} min ${s % 60} s`;
}
