import { afterEach, describe, expect, it, vi } from 'vitest';
import type { ShareLink } from '../../../../shared/api/shares.js';
import CollabShareDialog from '@/components/collab/CollabShareDialog.vue';
import { buttonNamed, click, fakeServer, mountCollab, NOW } from './support';

function link(token: string, membersOnly = false): ShareLink {
  return { token, url: `http://lab.test/shared/${token}`, notebookId: 'nb1', membersOnly, createdBy: { id: 'u1', name: 'Sam' }, createdAt: NOW };
}

afterEach(() => {
  vi.unstubAllGlobals();
  document.body.innerHTML = '';
});

describe('CollabShareDialog', () => {
  it('lists the live links with their full address and who may open them', async () => {
    fakeServer({ 'GET /api/notebooks/nb1/shares': { body: { shares: [link('a'.repeat(32), true), link('b'.repeat(32))] } } });
    await mountCollab(CollabShareDialog, { props: { open: true, notebookId: 'nb1', workspaceName: 'Hill Lab' } });

    const inputs = [...document.body.querySelectorAll<HTMLInputElement>('input[aria-label="Link address"]')];
    expect(inputs.map((i) => i.value)).toEqual([`http://lab.test/shared/${'a'.repeat(32)}`, `http://lab.test/shared/${'b'.repeat(32)}`]);
    expect(document.body.textContent).toContain('members only');
    expect(document.body.textContent).toContain('anyone with the link');
  });

  it('makes a members-only link when the box is ticked, and shows it after the list reloads', async () => {
    let shares: ShareLink[] = [];
    const seen = fakeServer({
      'GET /api/notebooks/nb1/shares': () => ({ body: { shares } }),
      'POST /api/notebooks/nb1/shares': (body) => {
        shares = [link('c'.repeat(32), (body as { membersOnly: boolean }).membersOnly)];
        return { status: 201, body: shares[0] };
      },
    });
    await mountCollab(CollabShareDialog, { props: { open: true, notebookId: 'nb1', workspaceName: 'Hill Lab' } });
    expect(document.body.textContent).toContain('No links yet.');

    await click(document.body.querySelector('input[type=checkbox]')!);
    await click(buttonNamed('Make a link'));

    expect(seen.find((r) => r.method === 'POST')?.body).toEqual({ membersOnly: true });
    expect(document.body.querySelector<HTMLInputElement>('input[aria-label="Link address"]')?.value).toBe(`http://lab.test/shared/${'c'.repeat(32)}`);
  });

  it('withdraws a link only after a second, explicit click', async () => {
    const token = 'd'.repeat(32);
    let shares = [link(token)];
    const seen = fakeServer({
      'GET /api/notebooks/nb1/shares': () => ({ body: { shares } }),
      [`DELETE /api/shares/${token}`]: () => {
        shares = [];
        return { status: 204 };
      },
    });
    await mountCollab(CollabShareDialog, { props: { open: true, notebookId: 'nb1', workspaceName: 'Hill Lab' } });

    await click(buttonNamed('Withdraw…'));
    expect(seen.some((r) => r.method === 'DELETE')).toBe(false);
    expect(document.body.textContent).toContain('Stop this link working?');

    await click(buttonNamed('Withdraw'));
    expect(seen.filter((r) => r.method === 'DELETE').map((r) => r.path)).toEqual([`/api/shares/${token}`]);
    expect(document.body.textContent).toContain('No links yet.');
  });
});
