import type { RouteRecordRaw } from 'vue-router';
import { RouteName } from './names';

/** Route targets load lazily so the editor and chart stack stay out of the entry chunk. */
export const routes: RouteRecordRaw[] = [
  { path: '/', redirect: { name: RouteName.library } },
  {
    path: '/sign-in',
    name: RouteName.signIn,
    component: () => import('@/views/SignInView.vue'),
    meta: { access: 'guest', title: 'Sign in' },
  },
  {
    path: '/sign-up',
    name: RouteName.signUp,
    component: () => import('@/views/SignUpView.vue'),
    meta: { access: 'guest', title: 'Create an account' },
  },
  {
    path: '/forgot-password',
    name: RouteName.forgotPassword,
    component: () => import('@/views/ForgotPasswordView.vue'),
    meta: { access: 'guest', title: 'Forgot password' },
  },
  {
    path: '/reset-password',
    name: RouteName.resetPassword,
    component: () => import('@/views/ResetPasswordView.vue'),
    meta: { access: 'public', title: 'Choose a new password' },
  },
  {
    path: '/library',
    name: RouteName.library,
    component: () => import('@/views/LibraryView.vue'),
    meta: { access: 'member', title: 'Library' },
  },
  {
    path: '/notebooks/:id',
    name: RouteName.notebook,
    component: () => import('@/views/NotebookView.vue'),
    props: true,
    meta: { access: 'member', title: 'Notebook' },
  },
  {
    path: '/s/:token',
    // The server's share links use the long form.
    alias: '/shared/:token',
    name: RouteName.shared,
    component: () => import('@/views/SharedNotebookView.vue'),
    props: true,
    meta: { access: 'public', title: 'Shared notebook' },
  },
  {
    path: '/p/:slug',
    alias: '/published/:slug',
    name: RouteName.published,
    component: () => import('@/views/PublishedView.vue'),
    props: true,
    meta: { access: 'public', title: 'Published finding' },
  },
  {
    path: '/team',
    name: RouteName.team,
    component: () => import('@/views/TeamView.vue'),
    meta: { access: 'admin-current', title: 'Team' },
  },
  {
    path: '/outbox',
    name: RouteName.outbox,
    component: () => import('@/views/OutboxView.vue'),
    meta: { access: 'admin-any', title: 'Outbox' },
  },
  {
    // The link in an invitation mail; signed-out visitors see it too and go to sign in or up from here.
    path: '/invitations/:token',
    name: RouteName.invitation,
    component: () => import('@/views/InvitationView.vue'),
    props: true,
    meta: { access: 'public', title: 'Invitation' },
  },
  {
    path: '/:pathMatch(.*)*',
    name: RouteName.notFound,
    component: () => import('@/views/NotFoundView.vue'),
    meta: { access: 'public', title: 'Not found' },
  },
];
