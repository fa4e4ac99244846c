import { createRouter, createWebHistory, type Router, type RouterHistory } from 'vue-router';
import { authGuard, type SessionView } from './guards';
import { routes } from './routes';

export { RouteName } from './names';

/** Builds the router; tests pass a memory history and a session of their own. */
export function createAppRouter(session: SessionView, history: RouterHistory = createWebHistory()): Router {
  const router = createRouter({
    history,
    routes,
    scrollBehavior: (_to, _from, saved) => saved ?? { top: 0 },
  });
  router.beforeEach((to) => authGuard(to, session));
  router.afterEach((to) => {
    if (typeof document !== 'undefined') {
      document.title = to.meta.title ? `${to.meta.title} · Cogbook` : 'Cogbook';
    }
  });
  return router;
}
