import { afterEach, describe, expect, it, vi } from 'vitest';
import type { NotebookResponse, RevisionSummary } from '../../../../shared/api/notebooks.js';
import { emptyNotebook } from '../../../../shared/notebook/document.js';
import CollabHistoryDrawer from '@/components/collab/CollabHistoryDrawer.vue';
import { buttonNamed, click, fakeServer, mountCollab } from './support';

const revisions: RevisionSummary[] = [
  { revision: 3, author: { id: 'u2', name: 'Lee' }, summary: 'Tolerance to 1.5%', createdAt: '2026-03-03T10:00:00Z' },
  { revision: 2, author: null, summary: '', createdAt: '2026-03-02T10:00:00Z' },
  { revision: 1, author: { id: 'u1', name: 'Sam' }, summary: '', createdAt: '2026-03-01T10:00:00Z' },
];

function restored(revision: number): NotebookResponse {
  return {
    notebook: {
      id: 'nb1',
      title: 'Ride',
      workspace: { id: 'w1', name: 'Lab' },
      owner: { id: 'u1', name: 'Sam' },
      role: 'owner',
      permissions: { edit: true, manage: true },
      revision,
      forkedFrom: null,
      createdAt: '2026-03-01T10:00:00Z',
      updatedAt: '2026-03-04T10:00:00Z',
    },
    revision,
    document: emptyNotebook('Ride'),
  };
}

afterEach(() => {
  vi.unstubAllGlobals();
  document.body.innerHTML = '';
});

describe('CollabHistoryDrawer', () => {
  it('lists every revision with its author, summary and the current one marked', async () => {
    fakeServer({ 'GET /api/notebooks/nb1/revisions': { body: { revisions } } });
    await mountCollab(CollabHistoryDrawer, { props: { open: true, notebookId: 'nb1', canRestore: true, currentRevision: 3 } });

    const items = [...document.body.querySelectorAll<HTMLElement>('[data-revision]')];
    expect(items.map((i) => i.dataset['revision'])).toEqual(['3', '2', '1']);
    expect(items[0]!.textContent).toContain('Tolerance to 1.5%');
    expect(items[0]!.textContent).toContain('Lee');
    expect(items[0]!.textContent).toContain('current');
    expect(items[1]!.textContent).toContain('a deleted account');
    expect(items[2]!.textContent).toContain('Created');
    // The current revision cannot be "brought back" onto itself.
    expect(items[0]!.textContent).not.toContain('Bring back');
    expect(items[1]!.textContent).toContain('Bring back');
  });

  it('reads an old revision without changing anything', async () => {
    const doc = { ...emptyNotebook('Ride as it was'), cells: [{ id: 'c1', name: 'bias', kind: 'formula' as const, config: { source: 'bias = 1.5' } }] };
    const seen = fakeServer({
      'GET /api/notebooks/nb1/revisions': { body: { revisions } },
      'GET /api/notebooks/nb1/revisions/1': { body: { ...revisions[2], document: doc } },
    });
    await mountCollab(CollabHistoryDrawer, { props: { open: true, notebookId: 'nb1', canRestore: true, currentRevision: 3 } });

    await click(document.body.querySelector('[data-revision="1"] button')!);

    expect(document.body.textContent).toContain('Reading revision 1');
    expect(document.body.textContent).toContain('Ride as it was');
    expect(document.body.querySelector('pre')?.textContent).toBe('bias = 1.5');
    expect(seen.every((r) => r.method === 'GET')).toBe(true);
  });

  it('brings a revision back as a new one after confirmation and hands the answer to the editor', async () => {
    const seen = fakeServer({
      'GET /api/notebooks/nb1/revisions': { body: { revisions } },
      'POST /api/notebooks/nb1/revisions/1/restore': { body: restored(4) },
    });
    const { wrapper } = await mountCollab(CollabHistoryDrawer, { props: { open: true, notebookId: 'nb1', canRestore: true, currentRevision: 3, unsaved: true } });

    await click(document.body.querySelector('[data-revision="1"] button:nth-of-type(2)')!);
    expect(document.body.textContent).toContain('Revision 1 is copied into a new revision 4');
    expect(document.body.textContent).toContain('Your unsaved changes in the editor are dropped.');
    expect(seen.some((r) => r.method === 'POST')).toBe(false);

    await click(buttonNamed('Bring it back'));

    expect(seen.filter((r) => r.method === 'POST').map((r) => r.body)).toEqual([{ summary: 'Restored revision 1' }]);
    expect(wrapper.emitted('restored')?.[0]?.[0]).toMatchObject({ revision: 4 });
  });

  it('offers no restore to readers', async () => {
    fakeServer({ 'GET /api/notebooks/nb1/revisions': { body: { revisions } } });
    await mountCollab(CollabHistoryDrawer, { props: { open: true, notebookId: 'nb1', canRestore: false, currentRevision: 3 } });

    expect(document.body.textContent).not.toContain('Bring back');
  });
});
