import { useQueryClient } from '@tanstack/vue-query';
import { onScopeDispose, toRaw, watch } from 'vue';
import type { NotebookResponse } from '../../shared/api/notebooks.js';
import { notebookDocumentSchema } from '../../shared/notebook/document.js';
import { createNotebook, getNotebook, saveNotebook } from '@/api/notebooks';
import { ApiError } from '@/api/http';
import { notebookKeys } from '@/composables/useNotebooks';
import { useNotebookStore } from '@/stores/notebook';
import { errorMessage } from '@/utils/errorMessage';

/** Autosave waits this long after the last edit. */
export const AUTOSAVE_DELAY_MS = 1500;

/**
 * Saves the notebook as new revisions: 1.5 s after the last edit, or at once with
 * `saveNow` (Ctrl+S). A save on top of an outdated revision is refused by the server
 * (409); then nothing is overwritten and the user picks: take the server's copy, or
 * keep theirs as a new notebook.
 */
export function useNotebookSave() {
  const store = useNotebookStore();
  const queryClient = useQueryClient();
  let timer: ReturnType<typeof setTimeout> | undefined;
  let inFlight: Promise<void> | null = null;

  function accept(response: NotebookResponse): void {
    queryClient.setQueryData(notebookKeys.one(response.notebook.id), response);
    store.meta = response.notebook;
  }

  async function save(): Promise<void> {
    const meta = store.meta;
    const doc = store.document;
    if (!meta || !doc || store.readOnly || store.saveProblem?.kind === 'conflict') return;
    const version = store.version;
    if (version === store.savedVersion) return;
    const checked = notebookDocumentSchema.safeParse(toRaw(doc));
    if (!checked.success) {
      const issue = checked.error.issues[0];
      store.saveProblem = { kind: 'failed', message: `Not saved: ${issue?.message ?? 'the notebook is not valid'}${issue?.path.length ? ` (${issue.path.join('.')})` : ''}.` };
      return;
    }
    store.saving = true;
    try {
      const response = await saveNotebook(meta.id, { baseRevision: meta.revision, document: checked.data });
      accept(response);
      store.savedVersion = version;
      store.saveProblem = null;
    } catch (e) {
      if (e instanceof ApiError && e.code === 'stale_revision') {
        store.saveProblem = { kind: 'conflict', message: 'Someone saved this notebook after you opened it.' };
      } else {
        store.saveProblem = { kind: 'failed', message: errorMessage(e, 'Could not save the notebook.') };
      }
    } finally {
      store.saving = false;
    }
    // Edits made while saving go in the next save.
    if (store.version !== store.savedVersion && !store.saveProblem) schedule();
  }

  function saveNow(): Promise<void> {
    clearTimeout(timer);
    if (store.saveProblem?.kind === 'failed') store.saveProblem = null;
    inFlight ??= save().finally(() => (inFlight = null));
    return inFlight;
  }

  function schedule(): void {
    clearTimeout(timer);
    timer = setTimeout(() => void saveNow(), AUTOSAVE_DELAY_MS);
  }

  watch(() => store.version, (v) => {
    if (v !== store.savedVersion) schedule();
  });

  /** Conflict answer 1: drop my edits and load what the server has now. */
  async function takeServerCopy(): Promise<void> {
    const id = store.meta?.id;
    if (!id) return;
    const response = await getNotebook(id);
    accept(response);
    store.load(response);
  }

  /** Conflict answer 2: keep my edits as a new notebook in the same workspace; answers its id. */
  async function keepMineAsNew(): Promise<string | null> {
    const meta = store.meta;
    const doc = store.document;
    if (!meta || !doc) return null;
    const document = { ...toRaw(doc), title: `${doc.title} (my version)`.slice(0, 200) };
    const created = await createNotebook({ workspaceId: meta.workspace.id, document });
    queryClient.setQueryData(notebookKeys.one(created.notebook.id), created);
    void queryClient.invalidateQueries({ queryKey: notebookKeys.list() });
    return created.notebook.id;
  }

  onScopeDispose(() => clearTimeout(timer));

  return { saveNow, takeServerCopy, keepMineAsNew };
}
