import '@/utils/zodWithoutEval';
import { defineStore } from 'pinia';
import { computed, ref, shallowRef, toRaw } from 'vue';
import type { NotebookMeta, NotebookResponse } from '../../shared/api/notebooks.js';
import type { ChartPreset, TransformOp } from '../../shared/notebook/cell-config.js';
import type { CellOutput } from '../../shared/notebook/cell-output.js';
import type { CellKind, NotebookCell, NotebookDocument, NotebookSlot } from '../../shared/notebook/document.js';
import { copyCell, freeSlot, newCell } from '../../shared/notebook/new-cell.js';
import { renameOutput } from '../../shared/notebook/rename-output.js';
import { staleCells } from '../../shared/notebook/stale-cells.js';
import { cellStatus, type CellStatus } from './notebookCellStatus';

export type { CellStatus } from './notebookCellStatus';

/** A cell as other cells' forms list it. */
export interface CellName {
  id: string;
  kind: CellKind;
  name: string;
}

function sameStatus(a: CellStatus, b: CellStatus): boolean {
  return a.state === b.state && a.label === b.label && a.detail === b.detail && a.durationMs === b.durationMs && a.cached === b.cached && a.runs === b.runs && a.waitsOn === b.waitsOn;
}

/** Where the notebook stands against the server copy. */
export type SaveState = 'saved' | 'unsaved' | 'saving' | 'conflict' | 'failed';

interface HistoryEntry {
  document: NotebookDocument;
  label: string;
}

/** Edits with the same key this close together become one undo step (typing, dragging a number). */
const COALESCE_MS = 1200;
const HISTORY_LIMIT = 200;

/**
 * The notebook being edited: its document with undo/redo, what the server last stored,
 * and each cell's state from the engine worker. Every change goes through `edit`, which
 * replaces the document (never mutates it), so undo is keeping the old one.
 */
export const useNotebookStore = defineStore('notebook', () => {
  const meta = ref<NotebookMeta | null>(null);
  const document = shallowRef<NotebookDocument | null>(null);
  const undoStack = shallowRef<HistoryEntry[]>([]);
  const redoStack = shallowRef<HistoryEntry[]>([]);
  let lastEdit: { key: string; at: number } | null = null;

  /** Bumped by every edit; the save loop compares it with what was stored. */
  const version = ref(0);
  const savedVersion = ref(0);
  const saving = ref(false);
  const saveProblem = ref<{ kind: 'conflict' | 'failed'; message: string } | null>(null);

  const outputs = shallowRef<Record<string, CellOutput>>({});
  const stale = shallowRef<ReadonlySet<string>>(new Set());
  const runningCellId = ref<string | null>(null);
  const running = ref(false);
  /** How many times each cell was computed in this session (shown as a data attribute). */
  const runCounts = shallowRef<Record<string, number>>({});
  /** Why the last run stopped early (a runaway cell), shown above the cells. */
  const runProblem = ref<string | null>(null);
  // Cells edited while a run is under way: that run used their old config, so they stay stale after it.
  let staleDuringRun = new Set<string>();
  const focusedCellId = ref<string | null>(null);

  const readOnly = computed(() => meta.value !== null && !meta.value.permissions.edit);
  const cells = computed<NotebookCell[]>(() => document.value?.cells ?? []);
  /** Each cell's id, kind and name, in order: the same array until one of those changes (typing in a cell does not). */
  let shownNames: CellName[] = [];
  const cellNames = computed<CellName[]>(() => {
    const next = cells.value.map((c) => ({ id: c.id, kind: c.kind, name: c.name }));
    const same = next.length === shownNames.length && next.every((c, i) => c.id === shownNames[i]!.id && c.kind === shownNames[i]!.kind && c.name === shownNames[i]!.name);
    if (!same) shownNames = next;
    return shownNames;
  });
  /** The notebook's inputs: the same array until they change. */
  const slots = computed<NotebookSlot[]>(() => document.value?.slots ?? []);
  /** The notebook's parameters and title, each the same value until it changes (panels read these, not the document). */
  const parameters = computed(() => document.value?.parameters ?? []);
  const title = computed(() => document.value?.title ?? '');
  const canUndo = computed(() => undoStack.value.length > 0 && !readOnly.value);
  const canRedo = computed(() => redoStack.value.length > 0 && !readOnly.value);
  const saveState = computed<SaveState>(() => {
    if (saveProblem.value) return saveProblem.value.kind;
    if (saving.value) return 'saving';
    return version.value === savedVersion.value ? 'saved' : 'unsaved';
  });

  /** Starts editing a notebook as the server sent it; history and run state start over. */
  function load(response: NotebookResponse): void {
    meta.value = response.notebook;
    // A plain copy: the query layer hands out reactive objects, which cannot cross to the worker.
    document.value = JSON.parse(JSON.stringify(toRaw(response.document))) as NotebookDocument;
    undoStack.value = [];
    redoStack.value = [];
    lastEdit = null;
    version.value = 0;
    savedVersion.value = 0;
    saveProblem.value = null;
    outputs.value = {};
    stale.value = new Set(response.document.cells.map((c) => c.id));
    runCounts.value = {};
  }

  function markStale(before: NotebookDocument, after: NotebookDocument): void {
    const ids = staleCells(before, after);
    if (ids.length === 0) return;
    stale.value = new Set([...stale.value, ...ids]);
    if (running.value) for (const id of ids) staleDuringRun.add(id);
  }

  function replace(next: NotebookDocument): void {
    const before = document.value!;
    document.value = next;
    version.value++;
    markStale(before, next);
  }

  /**
   * Applies `change` to the document as one undoable step called `label`. Successive
   * edits with the same `key` within a moment merge into one step. Ignored when read-only.
   */
  function edit(label: string, change: (doc: NotebookDocument) => NotebookDocument, key?: string): void {
    if (readOnly.value || document.value === null) return;
    const before = document.value;
    const next = change(before);
    if (next === before) return;
    const now = Date.now();
    const merge = key !== undefined && lastEdit?.key === key && now - lastEdit.at < COALESCE_MS && undoStack.value.length > 0;
    if (!merge) undoStack.value = [...undoStack.value, { document: before, label }].slice(-HISTORY_LIMIT);
    redoStack.value = [];
    lastEdit = key === undefined ? null : { key, at: now };
    replace(next);
  }

  function undo(): void {
    const entry = undoStack.value.at(-1);
    if (!entry || readOnly.value) return;
    undoStack.value = undoStack.value.slice(0, -1);
    redoStack.value = [...redoStack.value, { document: document.value!, label: entry.label }];
    lastEdit = null;
    replace(entry.document);
  }

  function redo(): void {
    const entry = redoStack.value.at(-1);
    if (!entry || readOnly.value) return;
    redoStack.value = redoStack.value.slice(0, -1);
    undoStack.value = [...undoStack.value, { document: document.value!, label: entry.label }];
    lastEdit = null;
    replace(entry.document);
  }

  const withCells = (doc: NotebookDocument, list: NotebookCell[]): NotebookDocument => ({ ...doc, cells: list });
  const indexOf = (id: string) => cells.value.findIndex((c) => c.id === id);

  /** Adds a cell of `kind` at `index` (default: after the focused cell, else at the end); answers its id. */
  function addCell(kind: CellKind, options: { index?: number; op?: TransformOp; preset?: ChartPreset } = {}): string | null {
    if (readOnly.value || document.value === null) return null;
    const focused = focusedCellId.value ? indexOf(focusedCellId.value) : -1;
    const index = options.index ?? (focused >= 0 ? focused + 1 : cells.value.length);
    let id: string | null = null;
    edit(`add ${kind} cell`, (doc) => {
      let base = doc;
      // An import needs a slot of its own: make one when every slot is already read.
      const readSlots = new Set(doc.cells.flatMap((c) => (c.kind === 'import' ? [c.config.slot] : [])));
      if (kind === 'import' && doc.slots.every((s) => readSlots.has(s.name))) base = { ...doc, slots: [...doc.slots, freeSlot(doc)] };
      const cell = newCell(base, kind, { index, ...(options.op ? { op: options.op } : {}), ...(options.preset ? { preset: options.preset } : {}) });
      id = cell.id;
      const list = [...base.cells];
      list.splice(index, 0, cell);
      return withCells(base, list);
    });
    if (id) focusedCellId.value = id;
    return id;
  }

  function duplicateCell(id: string): string | null {
    const i = indexOf(id);
    if (i < 0) return null;
    let copyId: string | null = null;
    edit('duplicate cell', (doc) => {
      const copy = copyCell(doc, doc.cells[i]!);
      copyId = copy.id;
      const list = [...doc.cells];
      list.splice(i + 1, 0, copy);
      return withCells(doc, list);
    });
    if (copyId) focusedCellId.value = copyId;
    return copyId;
  }

  /** Moves a cell up (-1) or down (+1); nothing at the ends. */
  function moveCell(id: string, delta: -1 | 1): void {
    const i = indexOf(id);
    const j = i + delta;
    if (i < 0 || j < 0 || j >= cells.value.length) return;
    edit(delta < 0 ? 'move cell up' : 'move cell down', (doc) => {
      const list = [...doc.cells];
      [list[i], list[j]] = [list[j]!, list[i]!];
      return withCells(doc, list);
    });
  }

  function deleteCell(id: string): void {
    const i = indexOf(id);
    if (i < 0) return;
    edit('delete cell', (doc) => withCells(doc, doc.cells.filter((c) => c.id !== id)));
    if (focusedCellId.value === id) focusedCellId.value = cells.value[Math.min(i, cells.value.length - 1)]?.id ?? null;
  }

  /** Renames a cell's output; later cells that read it follow. Answers a message when refused. */
  function renameCell(id: string, name: string): string | null {
    if (document.value === null) return 'nothing is open';
    const result = renameOutput(document.value, id, name.trim());
    if (!result.ok) return result.message;
    edit('rename cell', () => result.document);
    return null;
  }

  /** Replaces a cell's config (forms call this on every change; typing merges into one undo step). */
  function updateCell(id: string, change: Partial<Pick<NotebookCell, 'config' | 'collapsed'>>, label = 'edit cell'): void {
    edit(label, (doc) => withCells(doc, doc.cells.map((c) => (c.id === id ? ({ ...c, ...change } as NotebookCell) : c))), `cell:${id}:${label}`);
  }

  function toggleCollapsed(id: string): void {
    const cell = cells.value.find((c) => c.id === id);
    if (cell) updateCell(id, { collapsed: !cell.collapsed }, cell.collapsed ? 'expand cell' : 'collapse cell');
  }

  function setParameter(name: string, value: number): void {
    if (!Number.isFinite(value)) return;
    edit('change parameter', (doc) => ({ ...doc, parameters: doc.parameters.map((p) => (p.name === name ? { ...p, value } : p)) }), `param:${name}`);
  }

  function updateSlot(name: string, change: Partial<Omit<NotebookSlot, 'id' | 'name'>>, label = 'change input'): void {
    edit(label, (doc) => ({ ...doc, slots: doc.slots.map((s) => (s.name === name ? { ...s, ...change } : s)) }), `slot:${name}:${label}`);
  }

  function setTitle(title: string): void {
    const t = title.trim();
    if (t) edit('rename notebook', (doc) => ({ ...doc, title: t }), 'title');
  }

  /** The run started; cells it recomputes show as computing in turn. */
  function runStarted(): void {
    running.value = true;
    runProblem.value = null;
    staleDuringRun = new Set();
  }

  /** Takes a finished run's outputs; the cells it covered are no longer stale (unless edited since). */
  function runFinished(result: { outputs: Record<string, CellOutput>; computed: string[] }): void {
    outputs.value = result.outputs;
    const counts = { ...runCounts.value };
    for (const id of result.computed) counts[id] = (counts[id] ?? 0) + 1;
    runCounts.value = counts;
    stale.value = new Set(staleDuringRun);
    running.value = false;
    runningCellId.value = null;
  }

  /** The run was stopped (the worker was restarted); `cellOutputs` already says which cell. */
  function runStopped(message: string, cellOutputs: Record<string, CellOutput>): void {
    outputs.value = { ...outputs.value, ...cellOutputs };
    runProblem.value = message;
    stale.value = new Set(staleDuringRun);
    running.value = false;
    runningCellId.value = null;
  }

  /**
   * Each cell's state as the page shows it. A cell whose state reads the same as before keeps
   * its object, so a keystroke in one cell does not draw every other cell again.
   */
  let shownStatuses: Record<string, CellStatus> = {};
  const statuses = computed<Record<string, CellStatus>>(() => {
    const out: Record<string, CellStatus> = {};
    for (const cell of cells.value) {
      const next = cellStatus(cell, outputs.value[cell.id], {
        stale: stale.value.has(cell.id),
        computing: runningCellId.value === cell.id,
        queued: running.value,
        runs: runCounts.value[cell.id] ?? 0,
      });
      const shown = shownStatuses[cell.id];
      out[cell.id] = shown !== undefined && sameStatus(shown, next) ? shown : next;
    }
    shownStatuses = out;
    return out;
  });

  const tally = computed(() => {
    const t = { fresh: 0, stale: 0, running: 0, failed: 0, blocked: 0 };
    for (const s of Object.values(statuses.value)) t[s.state]++;
    return t;
  });

  return {
    meta,
    document,
    cells,
    cellNames,
    slots,
    parameters,
    title,
    readOnly,
    version,
    savedVersion,
    saving,
    saveProblem,
    saveState,
    outputs,
    stale,
    running,
    runningCellId,
    runCounts,
    runProblem,
    focusedCellId,
    statuses,
    tally,
    canUndo,
    canRedo,
    undoStack,
    redoStack,
    load,
    edit,
    undo,
    redo,
    addCell,
    duplicateCell,
    moveCell,
    deleteCell,
    renameCell,
    updateCell,
    toggleCollapsed,
    setParameter,
    updateSlot,
    setTitle,
    runStarted,
    runFinished,
    runStopped,
  };
});
