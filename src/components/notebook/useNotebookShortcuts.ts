import { onBeforeUnmount, onMounted } from 'vue';
import { useNotebookStore } from '@/stores/notebook';

/** Actions the page owns that shortcuts trigger. */
export interface ShortcutActions {
  save: () => void;
  help: () => void;
  runAndNext: () => void;
  jumpTo: (cellId: string) => void;
}

function typingIn(target: EventTarget | null): boolean {
  const el = target as HTMLElement | null;
  if (!el) return false;
  return el.isContentEditable || ['INPUT', 'TEXTAREA', 'SELECT'].includes(el.tagName) || el.closest('.monaco-editor') !== null;
}

/**
 * The notebook's keyboard shortcuts (listed in the help dialog). Inside text fields and
 * the formula editor, keys keep their editing meaning except save, run and undo.
 */
export function useNotebookShortcuts(actions: ShortcutActions): void {
  const store = useNotebookStore();

  function onKey(e: KeyboardEvent): void {
    const mod = e.ctrlKey || e.metaKey;
    const typing = typingIn(e.target);
    const inEditor = (e.target as HTMLElement | null)?.closest?.('.monaco-editor') != null;
    const focused = store.focusedCellId;
    const key = e.key.toLowerCase();
    if (mod && key === 's') {
      e.preventDefault();
      actions.save();
    } else if (mod && !typing && key === 'z') {
      e.preventDefault();
      if (e.shiftKey) store.redo();
      else store.undo();
    } else if (mod && !typing && key === 'y') {
      e.preventDefault();
      store.redo();
    } else if (e.shiftKey && e.key === 'Enter' && !inEditor) {
      e.preventDefault();
      actions.runAndNext();
    } else if (e.altKey && (e.key === 'ArrowUp' || e.key === 'ArrowDown') && focused && !inEditor) {
      e.preventDefault();
      store.moveCell(focused, e.key === 'ArrowUp' ? -1 : 1);
      requestAnimationFrame(() => actions.jumpTo(focused));
    } else if (mod && e.shiftKey && key === 'd' && focused) {
      e.preventDefault();
      store.duplicateCell(focused);
    } else if (mod && e.shiftKey && e.key === 'Backspace' && focused) {
      e.preventDefault();
      store.deleteCell(focused);
    } else if (mod && e.key === '.' && focused) {
      e.preventDefault();
      store.toggleCollapsed(focused);
    } else if (!typing && !mod && e.key === '?') {
      e.preventDefault();
      actions.help();
    } else if (!typing && !mod && !e.altKey && (key === 'j' || key === 'k')) {
      const i = store.cells.findIndex((c) => c.id === focused);
      const next = store.cells[key === 'j' ? i + 1 : Math.max(0, i - 1)];
      if (next) actions.jumpTo(next.id);
    }
  }

  onMounted(() => window.addEventListener('keydown', onKey));
  onBeforeUnmount(() => window.removeEventListener('keydown', onKey));
}
