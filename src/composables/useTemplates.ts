import { useMutation, useQueryClient } from '@tanstack/vue-query';
import type { NotebookResponse } from '../../shared/api/notebooks.js';
import { instantiateTemplate, listTemplates, type NotebookTemplate, type TemplateKey } from '../../shared/demo/templates.js';
import { createNotebook } from '@/api/notebooks';
import { notebookKeys } from '@/composables/useNotebooks';

/** What a template card shows: the template plus the files it asks for, in the slots' words. */
export interface TemplateCard {
  key: TemplateKey;
  title: string;
  summary: string;
  /** Slot labels, e.g. ["Reference", "Device under test"]. */
  files: string[];
  /** What those files must contain, in a sentence (the template's description). */
  needs: string;
  /** The template's protocol note (Markdown), cautions included. */
  protocol: string;
}

function protocolOf(t: NotebookTemplate): string {
  const note = t.document.cells.find((c) => c.kind === 'note' && c.name === 'protocol');
  return note?.kind === 'note' ? note.config.markdown : '';
}

// Templates are pure data that never change at run time, so they are built once per page.
let cards: TemplateCard[] | null = null;

/** The templates as the library shows them, in their listed order. */
export function useTemplateCards(): TemplateCard[] {
  cards ??= listTemplates().map((t: NotebookTemplate) => ({
    key: t.key,
    title: t.title,
    summary: t.summary,
    files: t.document.slots.map((s) => s.label),
    needs: t.document.description,
    protocol: protocolOf(t),
  }));
  return cards;
}

/** Creates a notebook from a template in a workspace and answers the stored notebook. */
export function useStartFromTemplate() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ workspaceId, key, title }: { workspaceId: string; key: TemplateKey; title?: string }) =>
      createNotebook({ workspaceId, document: instantiateTemplate(key, { title }) }),
    onSuccess: (created: NotebookResponse) => {
      queryClient.setQueryData(notebookKeys.one(created.notebook.id), created);
      void queryClient.invalidateQueries({ queryKey: notebookKeys.list() });
    },
  });
}
