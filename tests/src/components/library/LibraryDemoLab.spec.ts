import { mount } from '@vue/test-utils';
import { describe, expect, it } from 'vitest';
import { createMemoryHistory, createRouter } from 'vue-router';
import type { NotebookMeta } from '../../../../shared/api/notebooks.js';
import { buildDemoNotebook } from '../../../../shared/demo/demo-notebooks.js';
import { DEMO_SAMPLE_FILES, sampleUploadIds } from '../../../../shared/demo/sample-files.js';
import { DEMO_SCENARIOS } from '../../../../shared/demo/scenarios.js';
import LibraryDemoLab from '@/components/library/LibraryDemoLab.vue';
import { demoNotebookLinks, uploadContentHref, type SampleFileLink } from '@/composables/useDemoLab';

function meta(overrides: Partial<NotebookMeta>): NotebookMeta {
  return {
    id: 'nb',
    title: 'Untitled',
    workspace: { id: 'lab', name: 'Ridgeline Test Lab' },
    owner: { id: 'u1', name: 'Sam' },
    role: 'owner',
    permissions: { edit: true, manage: true },
    revision: 1,
    forkedFrom: null,
    createdAt: '2026-03-01T10:00:00Z',
    updatedAt: '2026-03-01T10:00:00Z',
    ...overrides,
  };
}

async function mountLab(props: InstanceType<typeof LibraryDemoLab>['$props']) {
  const stub = { template: '<div />' };
  const router = createRouter({
    history: createMemoryHistory(),
    routes: [
      { path: '/', component: stub },
      { path: '/notebooks/:id', name: 'notebook', component: stub },
    ],
  });
  await router.push('/');
  return mount(LibraryDemoLab, { props, global: { plugins: [router] } });
}

describe('demoNotebookLinks', () => {
  it('finds each demo notebook by its title and prefers the oldest of same-titled copies', () => {
    const chainring = DEMO_SCENARIOS['chainring-gain'].title;
    const links = demoNotebookLinks([
      meta({ id: 'copy', title: chainring, createdAt: '2026-03-05T10:00:00Z' }),
      meta({ id: 'seeded', title: chainring, createdAt: '2026-03-01T10:00:00Z' }),
      meta({ id: 'ladder', title: DEMO_SCENARIOS['trainer-ladder'].title }),
    ]);

    expect(links.map((l) => l.key)).toEqual(['chainring-gain', 'trainer-ladder', 'long-ride']);
    expect(links[0]!.notebook?.id).toBe('seeded');
    expect(links[1]!.notebook?.id).toBe('ladder');
    expect(links[2]!.notebook).toBeNull();
  });
});

describe('LibraryDemoLab', () => {
  const uploads = { reference: 'up-ref', test: 'up-dut' };
  const ids = sampleUploadIds(buildDemoNotebook('chainring-gain', uploads));
  const files: SampleFileLink[] = DEMO_SAMPLE_FILES.map((f) => ({ ...f, href: uploadContentHref(ids[f.slot]!) }));

  it('offers both sample files as downloads named after the files, with the one-sentence how-to', async () => {
    const demos = demoNotebookLinks([meta({ id: 'c1', title: DEMO_SCENARIOS['chainring-gain'].title })]);
    const wrapper = await mountLab({ demos, files, filesLoading: false, templateTitle: 'Per-leg by chainring' });

    const downloads = wrapper.findAll('a[download]');
    expect(downloads.map((a) => a.attributes('href'))).toEqual(['/api/uploads/up-ref/content', '/api/uploads/up-dut/content']);
    expect(downloads.map((a) => a.attributes('download'))).toEqual(DEMO_SAMPLE_FILES.map((f) => f.fileName));
    expect(wrapper.text()).toContain(
      'Download these two files, start from the template ‘Per-leg by chainring’, and drop them into its inputs.',
    );
  });

  it('links only the demo notebooks the user can see', async () => {
    const demos = demoNotebookLinks([meta({ id: 'c1', title: DEMO_SCENARIOS['long-ride'].title })]);
    const wrapper = await mountLab({ demos, files, filesLoading: false, templateTitle: 'Per-leg by chainring' });

    const links = wrapper.findAll('a:not([download])');
    expect(links).toHaveLength(1);
    expect(links[0]!.attributes('href')).toBe('/notebooks/c1');
    expect(links[0]!.text()).toBe(DEMO_SCENARIOS['long-ride'].title);
  });

  it('says a file is being looked up rather than showing a dead link', async () => {
    const waiting = DEMO_SAMPLE_FILES.map((f) => ({ ...f, href: null }));
    const demos = demoNotebookLinks([meta({ id: 'c1', title: DEMO_SCENARIOS['chainring-gain'].title })]);
    const wrapper = await mountLab({ demos, files: waiting, filesLoading: true, templateTitle: 'Per-leg by chainring' });

    expect(wrapper.findAll('a[download]')).toHaveLength(0);
    expect(wrapper.text()).toContain('finding the file');
  });
});
