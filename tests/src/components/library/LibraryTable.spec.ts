import { mount, type VueWrapper } from '@vue/test-utils';
import { Select } from 'ant-design-vue';
import { describe, expect, it } from 'vitest';
import { createMemoryHistory, createRouter } from 'vue-router';
import type { NotebookListItem } from '../../../../shared/api/notebooks.js';
import LibraryTable from '@/components/library/LibraryTable.vue';

function notebook(overrides: Partial<NotebookListItem> = {}): NotebookListItem {
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
    inputs: [],
    lastRunAt: null,
    ...overrides,
  };
}

async function mountTable(props: { notebooks: NotebookListItem[]; canCreate: boolean; userId?: string }) {
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
    expect(labels.map(([text]) => text)).toEqual(['Show notebooks', 'Filter by workspace', 'Filter by owner', 'Filter by device', 'Filter by last run']);
    expect(wrapper.find('.ant-table-filter-trigger').exists()).toBe(false);
  });
});

/** Picks a value in one of the toolbar's selects, as choosing an option does. */
async function pick(wrapper: VueWrapper, id: string, value: string | undefined): Promise<void> {
  const select = wrapper.findAllComponents(Select).find((c) => c.attributes('id') === id || c.props('id') === id);
  expect(select, id).toBeDefined();
  select!.vm.$emit('update:value', value);
  await wrapper.vm.$nextTick();
}

const hrefs = (wrapper: VueWrapper) => wrapper.findAll('a').map((a) => a.attributes('href'));

describe('LibraryTable device and last-run filters', () => {
  const crank = { name: 'Thimble DX crank · serial 77', manufacturer: null, product: 'Thimble DX crank', serialNumber: 77 };
  const hub = { name: 'Mossgate R1 hub · serial 12', manufacturer: null, product: 'Mossgate R1 hub', serialNumber: 12 };
  const day = 24 * 60 * 60 * 1000;
  const lab = [
    notebook({
      id: 'nb1',
      inputs: [
        { slot: 'reference', label: 'Reference hub', fileName: 'hub.fit', device: hub },
        { slot: 'test', label: 'Crank under test', fileName: 'crank.fit', device: crank },
      ],
      lastRunAt: new Date(Date.now() - 2 * day).toISOString(),
    }),
    notebook({
      id: 'nb2',
      title: 'Hub alone',
      inputs: [
        { slot: 'reference', label: 'Reference', fileName: 'hub2.fit', device: hub },
        { slot: 'test', label: 'Pedal', fileName: null, device: null },
      ],
      lastRunAt: new Date(Date.now() - 90 * day).toISOString(),
    }),
    notebook({ id: 'nb3', title: 'No files yet', inputs: [{ slot: 'a', label: 'Left', fileName: 'left.csv', device: null }] }),
  ];

  it('shows each input with the device of its recording', async () => {
    const wrapper = await mountTable({ notebooks: lab, canCreate: true });
    const text = wrapper.text();
    expect(text).toContain('Reference hub');
    expect(text).toContain('Thimble DX crank · serial 77');
    expect(text).toContain('no file');
    expect(text).toContain('device not stated');
  });

  it('offers every device once and keeps the notebooks that read a recording of the chosen one', async () => {
    const wrapper = await mountTable({ notebooks: lab, canCreate: true });
    const select = wrapper.findAllComponents(Select).find((c) => c.props('id') === 'library-device');
    expect((select!.props('options') as { value: string }[]).map((o) => o.value)).toEqual([hub.name, crank.name]);

    await pick(wrapper, 'library-device', crank.name);
    expect(hrefs(wrapper)).toEqual(['/notebooks/nb1']);
    expect(wrapper.text()).toContain('1 of 3 notebooks');

    await pick(wrapper, 'library-device', hub.name);
    expect(hrefs(wrapper).sort()).toEqual(['/notebooks/nb1', '/notebooks/nb2']);

    await pick(wrapper, 'library-device', undefined);
    expect(hrefs(wrapper)).toHaveLength(3);
  });

  it('filters by when the notebook last ran, and combines with the device filter', async () => {
    const wrapper = await mountTable({ notebooks: lab, canCreate: true });
    await pick(wrapper, 'library-last-run', 'week');
    expect(hrefs(wrapper)).toEqual(['/notebooks/nb1']);
    await pick(wrapper, 'library-last-run', 'older');
    expect(hrefs(wrapper)).toEqual(['/notebooks/nb2']);
    await pick(wrapper, 'library-last-run', 'never');
    expect(hrefs(wrapper)).toEqual(['/notebooks/nb3']);

    await pick(wrapper, 'library-device', crank.name);
    expect(wrapper.text()).toContain('No notebook matches these filters.');
    await wrapper.findAll('button').find((b) => b.text().includes('Clear filters'))!.trigger('click');
    expect(hrefs(wrapper)).toHaveLength(3);
  });

  it('links the public sample recordings from the empty library', async () => {
    const wrapper = await mountTable({ notebooks: [], canCreate: true });
    const samples = hrefs(wrapper).filter((h) => h?.startsWith('/api/samples/'));
    expect(samples).toHaveLength(2);
    expect(wrapper.find('[data-testid="sample-files"] a[download]').exists()).toBe(true);
  });
});
