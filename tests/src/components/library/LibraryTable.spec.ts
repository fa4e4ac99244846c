import { mount } from '@vue/test-utils';
import { describe, expect, it } from 'vitest';
import { createMemoryHistory, createRouter } from 'vue-router';
import type { NotebookMeta } from '../../../../shared/api/notebooks.js';
import LibraryTable from '@/components/library/LibraryTable.vue';

function notebook(overrides: Partial<NotebookMeta> = {}): NotebookMeta {
  return {
    id: 'nb1',
    title: 'Crank vs hub, steady blocks',
    workspace: { id: 'w1', name: 'Hill Lab' },
    owner: { id: 'u1', name: 'Ada Tester' },
    role: 'owner',
    permissions: { edit: true, manage: true },
    revision: 3,
    forkedFrom: null,
    createdAt: '2026-01-01T10:00:00Z',
    updatedAt: '2026-01-02T10:00:00Z',
    ...overrides,
  };
}

async function mountTable(props: { notebooks: NotebookMeta[]; canCreate: boolean; userId?: string }) {
  const stub = { template: '<div />' };
  const router = createRouter({
    history: createMemoryHistory(),
    routes: [
      { path: '/', component: stub },
      { path: '/notebooks/:id', name: 'notebook', component: stub },
    ],
  });
  await router.push('/');
  return mount(LibraryTable, {
    props: { userId: 'u1', loading: false, ...props },
    global: { plugins: [router] },
  });
}

describe('LibraryTable', () => {
  it('explains what a notebook is and offers to create one when the library is empty', async () => {
    const wrapper = await mountTable({ notebooks: [], canCreate: true });

    expect(wrapper.text()).toContain('No notebooks yet');
    expect(wrapper.text()).toContain('device under test');
    const create = wrapper.findAll('button').find((b) => b.text().includes('New notebook'));
    expect(create).toBeDefined();
    await create!.trigger('click');
    expect(wrapper.emitted('create')).toHaveLength(1);
  });

  it('tells a viewer with an empty library that notebooks will appear when shared', async () => {
    const wrapper = await mountTable({ notebooks: [], canCreate: false });

    expect(wrapper.text()).toContain('No notebooks yet');
    expect(wrapper.text()).toContain('shares one with you');
    expect(wrapper.findAll('button').some((b) => b.text().includes('New notebook'))).toBe(false);
  });

  it('lists notebooks with a link to each and shows "You" for the caller\'s own', async () => {
    const wrapper = await mountTable({
      notebooks: [notebook(), notebook({ id: 'nb2', title: 'Pedals L/R', owner: { id: 'u2', name: 'Bo Rider' }, role: 'viewer' })],
      canCreate: true,
    });

    const links = wrapper.findAll('a').map((a) => a.attributes('href'));
    expect(links).toContain('/notebooks/nb1');
    expect(links).toContain('/notebooks/nb2');
    expect(wrapper.text()).toContain('You');
    expect(wrapper.text()).toContain('Bo Rider');
    expect(wrapper.text()).toContain('Can read');
  });

  it('filters by title search and shows a clear-filters state when nothing matches', async () => {
    const wrapper = await mountTable({ notebooks: [notebook()], canCreate: true });

    await wrapper.get('input[aria-label="Search notebooks by title or owner"]').setValue('sprint');

    expect(wrapper.text()).toContain('No notebook matches these filters.');
    expect(wrapper.text()).toContain('0 of 1');
  });
});

describe('LibraryTable filters', () => {
  const two = [
    notebook(),
    notebook({ id: 'nb2', title: 'Pedals L/R', owner: { id: 'u2', name: 'Bo Rider' }, role: 'viewer', workspace: { id: 'w2', name: 'Shop' } }),
  ];

  it('finds a notebook by its owner\'s name as well as its title', async () => {
    const wrapper = await mountTable({ notebooks: two, canCreate: true });

    await wrapper.get('input[aria-label="Search notebooks by title or owner"]').setValue('bo rid');

    const links = wrapper.findAll('a').map((a) => a.attributes('href'));
    expect(links).toEqual(['/notebooks/nb2']);
    expect(wrapper.text()).toContain('1 of 2 notebooks');
  });

  it('offers owner and workspace filters as labelled selects, not only a column menu', async () => {
    const wrapper = await mountTable({ notebooks: two, canCreate: true });

    const labels = wrapper.findAll('label').map((l) => [l.text(), l.attributes('for')] as const);
    for (const [text, target] of labels) {
      expect(wrapper.find(`input#${target}`).exists(), text).toBe(true);
    }
    expect(labels.map(([text]) => text)).toEqual(['Show notebooks', 'Filter by workspace', 'Filter by owner']);
    expect(wrapper.find('.ant-table-filter-trigger').exists()).toBe(false);
  });
});
