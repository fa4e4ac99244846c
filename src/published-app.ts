import { createApp, createSSRApp } from 'vue';
import { getPublished } from './api/publications';
import PublishedView from './views/PublishedView.vue';

/** The slug in /p/:slug or /published/:slug ('' for anything else: the server answers that with "not published"). */
export function publishedSlugOf(path: string): string {
  const match = /^\/(?:p|published)\/([^/]+)\/?$/.exec(path);
  try {
    return match ? decodeURIComponent(match[1]!) : '';
  } catch {
    return match![1]!; // a malformed escape: the server answers that slug with "not published"
  }
}

/**
 * Mounts the reader's view on `root` (see src/published-main.ts). When the server sent the
 * finding already drawn (src/published-ssr.ts), the view takes that markup over once its
 * content is here (the request the page's preload link started), so nothing is drawn twice;
 * should that fail, the page draws itself from scratch.
 */
export function startPublishedPage(root: HTMLElement, path: string): void {
  const slug = publishedSlugOf(path);
  if (root.dataset['rendered'] !== 'server') {
    createApp(PublishedView, { slug }).mount(root);
    return;
  }
  getPublished(slug).then(
    (page) => createSSRApp(PublishedView, { slug, initial: page }).mount(root),
    () => createApp(PublishedView, { slug }).mount(root),
  );
}
