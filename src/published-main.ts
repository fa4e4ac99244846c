import '@fontsource/ibm-plex-sans/400.css';
import '@fontsource/ibm-plex-sans/500.css';
import '@fontsource/ibm-plex-sans/600.css';
import '@fontsource/jetbrains-mono/400.css';
import '@fontsource/jetbrains-mono/500.css';
import 'ant-design-vue/dist/reset.css';
import './styles/base.css';
import { createApp, createSSRApp } from 'vue';
import { getPublished } from './api/publications';
import PublishedView from './views/PublishedView.vue';

/**
 * The published page's own entry (published.html, which the server answers /p/:slug and
 * /published/:slug with, usually with the finding already rendered in it): the reader's view alone, without the router, stores, query cache,
 * UI kit, editor or engine of the app, so a signed-out reader's first chart comes quickly.
 * Inside the app the same view is a route of its own (src/router/routes.ts).
 */
function slugOf(path: string): string {
  const match = /^\/(?:p|published)\/([^/]+)\/?$/.exec(path);
  try {
    return match ? decodeURIComponent(match[1]!) : '';
  } catch {
    return match![1]!; // a malformed escape: the server answers that slug with "not published"
  }
}

const root = document.getElementById('app')!;
const slug = slugOf(window.location.pathname);
if (root.dataset['rendered'] === 'server') {
  // The server sent the finding already drawn (src/published-ssr.ts): take that markup over
  // once its content is here (the request the page's preload link started), so nothing is
  // drawn twice. Should that fail, the page draws itself from scratch.
  getPublished(slug).then(
    (page) => createSSRApp(PublishedView, { slug, initial: page }).mount(root),
    () => createApp(PublishedView, { slug }).mount(root),
  );
} else {
  createApp(PublishedView, { slug }).mount(root);
}
