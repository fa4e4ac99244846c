import '@fontsource/ibm-plex-sans/400.css';
import '@fontsource/ibm-plex-sans/500.css';
import '@fontsource/ibm-plex-sans/600.css';
import '@fontsource/jetbrains-mono/400.css';
import '@fontsource/jetbrains-mono/500.css';
import 'ant-design-vue/dist/reset.css';
import './styles/base.css';

/**
 * The published page's own entry (published.html, which the server answers /p/:slug and
 * /published/:slug with, usually with the finding already rendered in it): the reader's view
 * alone, without the router, stores, query cache, UI kit, editor or engine of the app, so a
 * signed-out reader's first chart comes quickly. Inside the app the same view is a route of
 * its own (src/router/routes.ts).
 *
 * This module holds only the page's style sheets (the build writes them, and those of the
 * view it loads, into published.html). The view's code is loaded by a dynamic import: when
 * the server sent the finding already drawn, only after the browser has painted it once, so
 * fetching, compiling and running the scripts does not hold up the reader's first sight of
 * the page. Printing and downloads work from the moment the view has taken the page over.
 */
/** A performance mark set once the server's render has been painted and the view's scripts may load. */
const PAINTED_MARK = 'cogbook:reader-painted';

function afterFirstPaint(): Promise<void> {
  // A hidden tab paints nothing (and runs no animation frames): take the page over at once.
  if (document.visibilityState === 'hidden') return Promise.resolve();
  // The frame's callbacks run just before it is painted; the task after it, once it has been.
  return new Promise((resolve) =>
    requestAnimationFrame(() =>
      setTimeout(() => {
        performance.mark(PAINTED_MARK);
        resolve();
      }, 0),
    ),
  );
}

const root = document.getElementById('app')!;
const drawnByServer = root.dataset['rendered'] === 'server';
(drawnByServer ? afterFirstPaint() : Promise.resolve())
  .then(() => import('./published-app'))
  .then(({ startPublishedPage }) => startPublishedPage(root, window.location.pathname));
