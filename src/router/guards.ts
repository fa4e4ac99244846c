import type { RouteLocationNormalized, RouteLocationRaw } from 'vue-router';
import { RouteName, type RouteAccess } from './names';

/** What the guard needs to know about the session (the session store fits). */
export interface SessionView {
  signedIn: boolean;
  isAdminOfCurrent: boolean;
  isAdminAnywhere: boolean;
  ensureLoaded(): Promise<void>;
}

/** Only in-app paths are followed after sign-in, never another origin. */
export function safeRedirect(value: unknown): string | null {
  if (typeof value !== 'string') return null;
  if (!value.startsWith('/') || value.startsWith('//') || value.startsWith('/\\')) return null;
  return value;
}

/**
 * Sends signed-out visitors to sign-in (remembering where they were going) and
 * signed-in users away from the sign-in pages. Role checks do not redirect: the
 * layout shows a "not allowed" panel in place, so the address stays meaningful
 * and the panel goes away if the user switches to a workspace they administer.
 */
export async function authGuard(
  to: RouteLocationNormalized,
  session: SessionView,
): Promise<true | RouteLocationRaw> {
  const access: RouteAccess = to.meta.access ?? 'member';
  if (access === 'public') return true;
  try {
    await session.ensureLoaded();
  } catch {
    // The server did not answer: let member pages show their own error state.
    return true;
  }
  if (access === 'guest') {
    if (!session.signedIn) return true;
    return safeRedirect(to.query.redirect) ?? { name: RouteName.library };
  }
  if (!session.signedIn) {
    return { name: RouteName.signIn, query: { redirect: to.fullPath } };
  }
  return true;
}

/** Whether a signed-in user's role lets them see the route's content. */
export function roleAllows(access: RouteAccess, session: Pick<SessionView, 'isAdminOfCurrent' | 'isAdminAnywhere'>): boolean {
  if (access === 'admin-current') return session.isAdminOfCurrent;
  if (access === 'admin-any') return session.isAdminAnywhere;
  return true;
}
