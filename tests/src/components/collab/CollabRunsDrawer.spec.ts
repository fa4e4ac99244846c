import { afterEach, describe, expect, it, vi } from 'vitest';
import type { RunResponse, RunSummary } from '../../../../shared/api/runs.js';
import type { NotebookSlot } from '../../../../shared/notebook/document.js';
import CollabRunsDrawer from '@/components/collab/CollabRunsDrawer.vue';
import { buttonNamed, click, fakeServer, mountCollab } from './support';

const slots: NotebookSlot[] = [
  { id: 'reference', name: 'reference', label: 'Reference pedals', uploadId: 'up-ref' },
  { id: 'test', name: 'test', label: 'Crank', uploadId: 'up-dut' },
];

function run(id: string, label: string | null, createdAt: string): RunSummary {
  return {
    id,
    notebookId: 'nb1',
    revision: 2,
    label,
    bindings: [
      { slot: 'reference', uploadId: 'up-ref', fileName: 'ref.fit' },
      { slot: 'test', uploadId: `up-${id}`, fileName: `${id}.fit` },
    ],
    createdBy: { id: 'u1', name: 'Sam' },
    createdAt,
    durationMs: 800,
    cellCount: 8,
    failedCells: 0,
  };
}

function withSnapshot(summary: RunSummary, leftBig: number): RunResponse {
  return {
    ...summary,
    snapshot: {
      snapshotVersion: 1,
      revision: 2,
      computedAt: summary.createdAt,
      durationMs: 800,
      inputs: [],
      cells: [{ cellId: 'f1', name: 'legs', kind: 'formula', state: 'fresh', durationMs: 1, result: { type: 'values', values: { left_big: leftBig } }, warnings: [] }],
    },
  };
}

afterEach(() => {
  vi.unstubAllGlobals();
  document.body.innerHTML = '';
});

const props = { open: true, notebookId: 'nb1', workspaceId: 'w1', slots, revision: 3, canRun: true };

describe('CollabRunsDrawer', () => {
  it('starts a run on the notebook’s own files with a label, and lists it beside the earlier ones', async () => {
    let runs = [run('r1', 'First ride', '2026-03-01T10:00:00Z')];
    const seen = fakeServer({
      'GET /api/notebooks/nb1/runs': () => ({ body: { runs } }),
      'GET /api/runs/r1': { body: withSnapshot(runs[0]!, 8.1) },
      'GET /api/runs/r2': () => ({ body: withSnapshot(runs[0]!, 3.0) }),
      'POST /api/notebooks/nb1/runs': () => {
        runs = [run('r2', 'Firmware 2', '2026-03-02T10:00:00Z'), ...runs];
        return { status: 201, body: withSnapshot(runs[0]!, 3.0) };
      },
    });
    await mountCollab(CollabRunsDrawer, { props });
    expect(document.body.querySelectorAll('tr[data-run-id]')).toHaveLength(1);

    const label = document.body.querySelector<HTMLInputElement>('input[aria-label="Run label"]')!;
    label.value = ' Firmware 2 ';
    label.dispatchEvent(new Event('input'));
    await click(buttonNamed('Start the run'));

    expect(seen.filter((r) => r.method === 'POST').map((r) => r.body)).toEqual([{ bindings: {}, label: 'Firmware 2' }]);
    const rows = [...document.body.querySelectorAll<HTMLElement>('tr[data-run-id]')];
    expect(rows.map((r) => r.dataset['runId'])).toEqual(['r2', 'r1']);
    expect(rows[0]!.classList.contains('is-new')).toBe(true);
    expect(rows[0]!.textContent).toContain('r2.fit');
    // The notebook is at revision 3 now; both runs used revision 2.
    expect(rows[1]!.textContent).toContain('(older)');
  });

  it('starts every input on the notebook’s own file', async () => {
    fakeServer({
      'GET /api/notebooks/nb1/runs': { body: { runs: [run('r1', null, '2026-03-01T10:00:00Z')] } },
      'GET /api/runs/r1': { body: withSnapshot(run('r1', null, '2026-03-01T10:00:00Z'), 8.1) },
    });
    await mountCollab(CollabRunsDrawer, { props });

    const pickers = [...document.body.querySelectorAll<HTMLElement>('[data-run-slot]')];
    expect(pickers.map((p) => p.dataset['runSlot'])).toEqual(['reference', 'test']);
    expect(pickers.map((p) => p.querySelector('.ant-select-selection-item')?.textContent)).toEqual(['The notebook’s own file', 'The notebook’s own file']);
  });

  it('lets readers see the runs but not start one', async () => {
    fakeServer({
      'GET /api/notebooks/nb1/runs': { body: { runs: [run('r1', 'First ride', '2026-03-01T10:00:00Z')] } },
      'GET /api/runs/r1': { body: withSnapshot(run('r1', 'First ride', '2026-03-01T10:00:00Z'), 8.1) },
    });
    await mountCollab(CollabRunsDrawer, { props: { ...props, canRun: false } });

    expect(document.body.querySelectorAll('tr[data-run-id]')).toHaveLength(1);
    expect([...document.body.querySelectorAll('button')].some((b) => b.textContent?.includes('Start the run'))).toBe(false);
  });
});
