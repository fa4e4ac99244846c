import { createSSRApp } from 'vue';
import { renderToString } from 'vue/server-renderer';
import type { PublishedNotebookResponse } from '../shared/api/publications.js';
import PublishedView from './views/PublishedView.vue';

/**
 * The published page rendered on the server (built by vite.ssr.config.ts into dist/ssr and
 * loaded by server/routes/publications-page.ts): the reader's view with its content, charts
 * as the server drew them, as HTML, so a reader sees the finding before any script runs.
 * The page's script then takes the markup over (hydrates it) with the same content.
 */
export async function renderPublishedPage(slug: string, page: PublishedNotebookResponse): Promise<string> {
  return renderToString(createSSRApp(PublishedView, { slug, initial: page }));
}
