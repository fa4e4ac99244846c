import { afterEach, describe, expect, it, vi } from 'vitest';
import type { Publication } from '../../../../shared/api/publications.js';
import CollabPublishDialog from '@/components/collab/CollabPublishDialog.vue';
import { buttonNamed, click, fakeServer, mountCollab, NOW } from './support';

// The server answers 200 with null for a notebook that is not published.
const NOT_PUBLISHED = { body: null };

function publication(overrides: Partial<Publication> = {}): Publication {
  return {
    slug: 'chainring-gain-3f9a',
    url: 'http://lab.test/published/chainring-gain-3f9a',
    notebookId: 'nb1',
    title: 'Chainring gain',
    revision: 3,
    publishedAt: NOW,
    publishedBy: { id: 'u1', name: 'Sam' },
    allowDownloads: false,
    ...overrides,
  };
}

afterEach(() => {
  vi.unstubAllGlobals();
  document.body.innerHTML = '';
});

describe('CollabPublishDialog', () => {
  it('publishes the current revision with downloads when the box is ticked, then shows the address', async () => {
    const seen = fakeServer({
      'GET /api/notebooks/nb1/publication': NOT_PUBLISHED,
      'POST /api/notebooks/nb1/publication': (body) => ({ body: publication({ allowDownloads: (body as { allowDownloads: boolean }).allowDownloads }) }),
    });
    await mountCollab(CollabPublishDialog, { props: { open: true, notebookId: 'nb1', revision: 3 } });
    expect(document.body.textContent).toContain('Anyone with the address can read the results of revision 3');

    await click(document.body.querySelector('input[type=checkbox]')!);
    await click(buttonNamed('Publish revision 3'));

    expect(seen.find((r) => r.method === 'POST')?.body).toEqual({ allowDownloads: true });
    expect(document.body.querySelector<HTMLInputElement>('input[aria-label="Page address"]')?.value).toBe('http://lab.test/published/chainring-gain-3f9a');
    expect(document.body.querySelector('[data-testid=publish-state]')?.textContent).toContain('Published from revision 3');
  });

  it('says when readers see an older revision than the notebook has now', async () => {
    fakeServer({ 'GET /api/notebooks/nb1/publication': { body: publication({ revision: 2, allowDownloads: true }) } });
    await mountCollab(CollabPublishDialog, { props: { open: true, notebookId: 'nb1', revision: 5 } });

    expect(document.body.textContent).toContain('Readers still see revision 2 until you publish again.');
    expect(buttonNamed('Publish revision 5 again')).toBeTruthy();
    // The stored choice is shown, not the default.
    expect(document.body.querySelector<HTMLInputElement>('input[type=checkbox]')?.checked).toBe(true);
  });

  it('takes the page down only after confirming', async () => {
    const seen = fakeServer({
      'GET /api/notebooks/nb1/publication': { body: publication() },
      'DELETE /api/notebooks/nb1/publication': { status: 204 },
    });
    await mountCollab(CollabPublishDialog, { props: { open: true, notebookId: 'nb1', revision: 3 } });

    await click(buttonNamed('Withdraw…'));
    expect(seen.some((r) => r.method === 'DELETE')).toBe(false);
    await click(buttonNamed('Take it down'));

    expect(seen.filter((r) => r.method === 'DELETE')).toHaveLength(1);
    expect(buttonNamed('Publish revision 3')).toBeTruthy();
    expect(document.body.querySelector('input[aria-label="Page address"]')).toBeNull();
  });
});
