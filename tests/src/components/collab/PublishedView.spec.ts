import { afterEach, describe, expect, it, vi } from 'vitest';
import type { PublishedNotebookResponse } from '../../../../shared/api/publications.js';
import PublishedView from '@/views/PublishedView.vue';
import { fakeServer, mountCollab } from './support';

const page: PublishedNotebookResponse = {
  slug: 'chainring-gain-3f9a',
  title: 'Chainring gain on one leg',
  description: 'Does one leg read differently on one chainring?',
  publishedBy: { name: 'Sam' },
  publishedAt: '2026-03-01T10:00:00Z',
  revision: 3,
  snapshot: {
    snapshotVersion: 1,
    revision: 3,
    computedAt: '2026-03-01T10:00:00Z',
    durationMs: 900,
    inputs: [],
    cells: [{ cellId: 'f1', name: 'legs', kind: 'formula', state: 'fresh', durationMs: 3, result: { type: 'values', values: { left_big: 8.06 } }, warnings: [] }],
  },
  allowDownloads: false,
  files: null,
};

afterEach(() => {
  vi.unstubAllGlobals();
  document.body.innerHTML = '';
});

describe('PublishedView', () => {
  it('shows the title, who published it, when and from which revision, with no edit controls', async () => {
    fakeServer({ 'GET /api/published/chainring-gain-3f9a': { body: page } });
    const { wrapper } = await mountCollab(PublishedView, { props: { slug: 'chainring-gain-3f9a' } });

    expect(wrapper.get('h1').text()).toBe('Chainring gain on one leg');
    expect(wrapper.get('.published__byline').text()).toMatch(/^Published by Sam on .+ · from revision 3$/);
    expect(wrapper.get('[data-value-name=left_big]').text()).toBe('8.06');
    expect(wrapper.findAll('button').map((b) => b.text())).toEqual(['Print']);
    // Downloads were not allowed: no recording links.
    expect(wrapper.findAll('a[download]')).toHaveLength(0);
  });

  it('lists the recordings only when the publisher allowed downloads', async () => {
    fakeServer({
      'GET /api/published/chainring-gain-3f9a': {
        body: { ...page, allowDownloads: true, files: [{ uploadId: 'u1', slot: 'reference', fileName: 'ref.fit', format: 'fit', size: 40_000 }] },
      },
    });
    const { wrapper } = await mountCollab(PublishedView, { props: { slug: 'chainring-gain-3f9a' } });

    const link = wrapper.get('a[download]');
    expect(link.attributes('href')).toBe('/api/published/chainring-gain-3f9a/files/u1');
    expect(link.attributes('download')).toBe('ref.fit');
  });

  it('says plainly when nothing is published at the address', async () => {
    fakeServer({ 'GET /api/published/gone': { status: 404, body: { error: { code: 'not_found', message: 'Publication not found.' } } } });
    const { wrapper } = await mountCollab(PublishedView, { props: { slug: 'gone' } });

    expect(wrapper.get('[data-testid=published-missing] h1').text()).toBe('This finding is not published');
    expect(wrapper.find('[data-testid=published-article]').exists()).toBe(false);
  });
});
