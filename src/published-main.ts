import '@fontsource/ibm-plex-sans/400.css';
import '@fontsource/ibm-plex-sans/500.css';
import '@fontsource/ibm-plex-sans/600.css';
import '@fontsource/jetbrains-mono/400.css';
import '@fontsource/jetbrains-mono/500.css';
import 'ant-design-vue/dist/reset.css';
import './styles/base.css';
import { createApp } from 'vue';
import PublishedView from './views/PublishedView.vue';

/**
 * The published page's own entry (published.html, which the server answers /p/:slug and
 * /published/:slug with): the reader's view alone, without the router, stores, query cache,
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

createApp(PublishedView, { slug: slugOf(window.location.pathname) }).mount('#app');
