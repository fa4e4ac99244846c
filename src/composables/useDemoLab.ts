import { useQuery } from '@tanstack/vue-query';
import { computed, type Ref } from 'vue';
import type { NotebookMeta } from '../../shared/api/notebooks.js';
import { DEMO_SAMPLE_FILES, sampleUploadIds, type DemoSampleFile } from '../../shared/demo/sample-files.js';
import { listDemoScenarios, type DemoScenarioKey } from '../../shared/demo/scenarios.js';
import { getNotebook } from '@/api/notebooks';
import { notebookKeys } from '@/composables/useNotebooks';

/** A demo notebook of the lab as the library points to it. */
export interface DemoNotebookLink {
  key: DemoScenarioKey;
  title: string;
  rider: string;
  setting: string;
  /** Null when the caller cannot see it (not a member of the demo lab, or it was deleted). */
  notebook: NotebookMeta | null;
}

/** A sample file with the address it downloads from (null until the demo notebook is read). */
export interface SampleFileLink extends DemoSampleFile {
  href: string | null;
}

/**
 * The demo lab's notebooks found in the caller's list. They are recognised by title; when
 * several notebooks share a demo title (a copy kept its name), the oldest is the seeded one.
 */
export function demoNotebookLinks(notebooks: readonly NotebookMeta[]): DemoNotebookLink[] {
  return listDemoScenarios().map((s) => {
    const matches = notebooks.filter((n) => n.title === s.title).sort((a, b) => Date.parse(a.createdAt) - Date.parse(b.createdAt));
    return { key: s.key, title: s.title, rider: s.rider.name, setting: s.setting, notebook: matches[0] ?? null };
  });
}

/** The download address of a stored upload. */
export function uploadContentHref(uploadId: string): string {
  return `/api/uploads/${encodeURIComponent(uploadId)}/content`;
}

/**
 * The two sample files of the chainring demo with their download addresses. Their upload
 * ids are the slots of the chainring demo notebook, so that notebook is read once.
 */
export function useSampleFiles(chainringNotebookId: Ref<string | null>) {
  const query = useQuery({
    queryKey: computed(() => notebookKeys.one(chainringNotebookId.value ?? '')),
    queryFn: () => getNotebook(chainringNotebookId.value!),
    enabled: computed(() => chainringNotebookId.value !== null),
  });
  const files = computed<SampleFileLink[]>(() => {
    const ids = query.data.value ? sampleUploadIds(query.data.value.document) : { reference: null, test: null };
    return DEMO_SAMPLE_FILES.map((f) => {
      const id = ids[f.slot];
      return { ...f, href: id ? uploadContentHref(id) : null };
    });
  });
  return { files, isPending: computed(() => chainringNotebookId.value !== null && query.isPending.value), error: query.error };
}
