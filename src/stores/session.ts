import { defineStore } from 'pinia';
import { computed, ref } from 'vue';
import type { MeResponse } from '../../shared/api/me.js';
import type { WorkspaceRole, WorkspaceSummary } from '../../shared/api/workspaces.js';
import { hasSession, signInWithEmail, signOutOfSession, signUpWithEmail } from '@/api/auth';
import { ApiError } from '@/api/http';
import { fetchMe } from '@/api/me';

export type SessionUser = MeResponse['user'];

/** Remembers the workspace the user last worked in, per browser. */
const CURRENT_WORKSPACE_KEY = 'cogbook.currentWorkspace';

function readStoredWorkspace(): string | null {
  try {
    return globalThis.localStorage?.getItem(CURRENT_WORKSPACE_KEY) ?? null;
  } catch {
    return null;
  }
}

function storeWorkspace(id: string | null): void {
  try {
    if (id) globalThis.localStorage?.setItem(CURRENT_WORKSPACE_KEY, id);
    else globalThis.localStorage?.removeItem(CURRENT_WORKSPACE_KEY);
  } catch {
    // Private mode or storage full: the choice simply is not remembered.
  }
}

/** Who is signed in, in which workspaces and with which role; signs in and out. */
export const useSessionStore = defineStore('session', () => {
  const user = ref<SessionUser | null>(null);
  const workspaces = ref<WorkspaceSummary[]>([]);
  const currentWorkspaceId = ref<string | null>(null);
  /** True once the server has been asked who we are (whatever the answer). */
  const loaded = ref(false);
  let pending: Promise<void> | null = null;

  const signedIn = computed(() => user.value !== null);
  const currentWorkspace = computed(
    () => workspaces.value.find((w) => w.id === currentWorkspaceId.value) ?? workspaces.value[0] ?? null,
  );
  const currentRole = computed<WorkspaceRole | null>(() => currentWorkspace.value?.role ?? null);
  const isAdminOfCurrent = computed(() => currentRole.value === 'admin');
  const isAdminAnywhere = computed(() => workspaces.value.some((w) => w.role === 'admin'));
  /** Admins and analysts create and edit notebooks; viewers only read. */
  const canCreateNotebooks = computed(() => currentRole.value === 'admin' || currentRole.value === 'analyst');

  function roleIn(workspaceId: string): WorkspaceRole | null {
    return workspaces.value.find((w) => w.id === workspaceId)?.role ?? null;
  }

  function apply(me: MeResponse | null): void {
    user.value = me?.user ?? null;
    workspaces.value = me?.workspaces ?? [];
    const remembered = currentWorkspaceId.value ?? readStoredWorkspace();
    const keep = workspaces.value.find((w) => w.id === remembered);
    // Without a remembered choice, start in a shared workspace: that is where the team's work is.
    const shared = workspaces.value.find((w) => !w.personal);
    currentWorkspaceId.value = keep?.id ?? shared?.id ?? workspaces.value[0]?.id ?? null;
    loaded.value = true;
  }

  /** Asks the server who is signed in. A 401 means signed out; other errors propagate. */
  async function refresh(): Promise<void> {
    try {
      // Ask the auth routes first: they answer 200 with no session for a signed-out
      // visitor, where /api/me would answer 401 and the browser would log it as an error.
      if (!(await hasSession())) {
        apply(null);
        return;
      }
      apply(await fetchMe());
    } catch (error) {
      if (error instanceof ApiError && error.isUnauthenticated) apply(null);
      else throw error;
    }
  }

  /** Loads the session once; concurrent callers share the same request. */
  function ensureLoaded(): Promise<void> {
    if (loaded.value) return Promise.resolve();
    pending ??= refresh().finally(() => {
      pending = null;
    });
    return pending;
  }

  function selectWorkspace(id: string): void {
    if (!workspaces.value.some((w) => w.id === id)) return;
    currentWorkspaceId.value = id;
    storeWorkspace(id);
  }

  async function signIn(email: string, password: string): Promise<void> {
    await signInWithEmail(email, password);
    await refresh();
  }

  async function signUp(name: string, email: string, password: string): Promise<void> {
    await signUpWithEmail(name, email, password);
    await refresh();
  }

  async function signOut(): Promise<void> {
    try {
      await signOutOfSession();
    } finally {
      apply(null);
    }
  }

  return {
    user,
    workspaces,
    currentWorkspaceId,
    loaded,
    signedIn,
    currentWorkspace,
    currentRole,
    isAdminOfCurrent,
    isAdminAnywhere,
    canCreateNotebooks,
    roleIn,
    refresh,
    ensureLoaded,
    selectWorkspace,
    signIn,
    signUp,
    signOut,
  };
});
