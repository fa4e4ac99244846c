import { afterEach, describe, expect, it, vi } from 'vitest';
import type { NotebookResponse } from '../../../../shared/api/notebooks.js';
import type { WorkspaceSummary } from '../../../../shared/api/workspaces.js';
import { emptyNotebook } from '../../../../shared/notebook/document.js';
import CollabForkDialog from '@/components/collab/CollabForkDialog.vue';
import { useSessionStore } from '@/stores/session';
import { buttonNamed, click, fakeServer, mountCollab, NOW } from './support';

const workspaces: WorkspaceSummary[] = [
  { id: 'lab', name: 'Hill Lab', role: 'viewer', personal: false, createdAt: NOW },
  { id: 'mine', name: 'Kim', role: 'admin', personal: true, createdAt: NOW },
  { id: 'team', name: 'Crank Team', role: 'analyst', personal: false, createdAt: NOW },
];

function created(id: string, workspaceId: string): NotebookResponse {
  return {
    notebook: {
      id,
      title: 'Chainring gain (copy)',
      workspace: { id: workspaceId, name: 'Kim' },
      owner: { id: 'u9', name: 'Kim' },
      role: 'owner',
      permissions: { edit: true, manage: true },
      revision: 1,
      forkedFrom: { notebookId: 'nb1', id: 'nb1', title: 'Chainring gain', revision: 4 },
      createdAt: NOW,
      updatedAt: NOW,
    },
    revision: 1,
    document: emptyNotebook('Chainring gain (copy)'),
  };
}

afterEach(() => {
  vi.unstubAllGlobals();
  document.body.innerHTML = '';
});

async function mountFork(props: { token?: string; notebookId?: string }) {
  const mounted = await mountCollab(CollabForkDialog, { props: { open: false, title: 'Chainring gain', revision: 4, ...props } });
  const session = useSessionStore();
  session.workspaces = workspaces;
  session.currentWorkspaceId = 'lab';
  await mounted.wrapper.setProps({ open: true });
  return mounted;
}

describe('CollabForkDialog', () => {
  it('offers only workspaces where the user may create notebooks, and names the copy after the original', async () => {
    fakeServer({});
    await mountFork({ notebookId: 'nb1' });

    // The current workspace is read-only for this user, so the first one they can write to is chosen.
    expect(document.body.querySelector('.ant-select-selection-item')?.textContent).toBe('Kim (personal)');
    expect(document.body.querySelector<HTMLInputElement>('input[aria-label="Title of the copy"]')?.value).toBe('Chainring gain (copy)');
    expect(document.body.textContent).toContain('Copies revision 4 of “Chainring gain”');
  });

  it('copies through the share link when opened from one, then opens the copy', async () => {
    const seen = fakeServer({ 'POST /api/shared/tok_abcdefghijklmnop/fork': { status: 201, body: created('nb2', 'mine') } });
    const { router } = await mountFork({ token: 'tok_abcdefghijklmnop' });

    await click(buttonNamed('Make the copy'));

    expect(seen.filter((r) => r.method === 'POST').map((r) => [r.path, r.body])).toEqual([
      ['/api/shared/tok_abcdefghijklmnop/fork', { workspaceId: 'mine', title: 'Chainring gain (copy)' }],
    ]);
    expect(router.currentRoute.value.fullPath).toBe('/notebooks/nb2');
  });

  it('says so when the user cannot create notebooks anywhere', async () => {
    fakeServer({});
    const mounted = await mountCollab(CollabForkDialog, { props: { open: false, title: 'T', revision: 1, notebookId: 'nb1' } });
    useSessionStore().workspaces = [workspaces[0]!];
    await mounted.wrapper.setProps({ open: true });

    expect(document.body.textContent).toContain('there is nowhere to put a copy');
  });
});
