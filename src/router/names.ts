/** Every route's name, so links and guards cannot drift apart by a typo. */
export const RouteName = {
  signIn: 'sign-in',
  signUp: 'sign-up',
  forgotPassword: 'forgot-password',
  resetPassword: 'reset-password',
  library: 'library',
  notebook: 'notebook',
  shared: 'shared',
  published: 'published',
  team: 'team',
  outbox: 'outbox',
  invitation: 'invitation',
  notFound: 'not-found',
} as const;

export type RouteName = (typeof RouteName)[keyof typeof RouteName];

/** Who may open a route. `admin-current`: admin of the current workspace; `admin-any`: of any. */
export type RouteAccess = 'public' | 'guest' | 'member' | 'admin-current' | 'admin-any';

declare module 'vue-router' {
  interface RouteMeta {
    access: RouteAccess;
    /** Window title; the app appends " · Cogbook". */
    title?: string;
  }
}
