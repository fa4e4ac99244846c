import { onBeforeUnmount, shallowRef, watch, type ShallowRef } from 'vue';
import type { PublishedNotebookResponse } from '../../../shared/api/publications.js';
import { getPublished } from '@/api/publications';

/** The published page's content and where its loading stands. */
export interface PublishedPageState {
  data: ShallowRef<PublishedNotebookResponse | undefined>;
  error: ShallowRef<unknown>;
  isPending: ShallowRef<boolean>;
  refetch: () => Promise<void>;
}

/**
 * Loads a published page's content for reading (unless given it), again whenever the slug changes. A plain
 * request (no query cache): the reader's page loads nothing it does not show. The server's
 * page names this request in a preload link, so the browser has usually started it before
 * this code runs, and the answer is taken from there.
 */
export function usePublishedPage(slug: () => string, initial?: PublishedNotebookResponse): PublishedPageState {
  const data = shallowRef<PublishedNotebookResponse | undefined>(initial);
  const error = shallowRef<unknown>(null);
  const isPending = shallowRef(initial === undefined);
  let controller: AbortController | undefined;

  async function load(): Promise<void> {
    controller?.abort();
    const mine = (controller = new AbortController());
    error.value = null;
    if (!data.value) isPending.value = true;
    try {
      const page = await getPublished(slug(), mine.signal);
      if (mine !== controller) return;
      data.value = page;
    } catch (e) {
      if (mine !== controller || (e instanceof DOMException && e.name === 'AbortError')) return;
      error.value = e;
    } finally {
      if (mine === controller) isPending.value = false;
    }
  }

  // Content given (the server's render, or the page taking that render over) is not asked for again.
  watch(slug, () => {
    data.value = undefined;
    void load();
  }, { immediate: initial === undefined });
  onBeforeUnmount(() => controller?.abort());
  return { data, error, isPending, refetch: load };
}
