import { reactive, watch } from 'vue';
import type { EngineWarning } from '../../shared/errors.js';
import type { NotebookSlot } from '../../shared/notebook/document.js';
import { csvMappingSchema, type CsvMapping } from '../../shared/recording/csv-mapping.js';
import type { CsvInspection } from '../../shared/recording/inspect-csv.js';
import type { RecordingMeta } from '../../shared/recording/recording.js';
import { fetchUploadContent, getUpload } from '@/api/uploads';
import type { EngineClient } from '@/composables/useEngine';
import { useUploadRecordings } from '@/composables/useUploadRecordings';
import { useNotebookStore } from '@/stores/notebook';
import { errorMessage } from '@/utils/errorMessage';

/** What the inputs panel knows about one slot's file. */
export interface SlotInput {
  state: 'empty' | 'uploading' | 'loading' | 'ready' | 'failed' | 'needs-mapping';
  uploadId: string | null;
  fileName?: string;
  format?: 'fit' | 'csv';
  /** Upload progress 0..1 (null while the browser does not know the total). */
  progress?: number | null;
  error?: string;
  warnings: EngineWarning[];
  recording?: RecordingMeta;
  /** For CSV files: columns and first rows, for the mapping form. */
  csv?: CsvInspection;
}

interface Bytes {
  bytes: Uint8Array;
  fileName: string;
}

const looksLikeCsv = (fileName: string, bytes: Uint8Array) => /\.(csv|txt|tsv)$/i.test(fileName) || (bytes.length > 12 && String.fromCharCode(...bytes.subarray(8, 12)) !== '.FIT');

/**
 * The recordings behind the notebook's input slots: fetches each bound upload, reads it
 * in the engine worker (asking for a CSV column mapping when it cannot be guessed), and
 * uploads new files with progress. It follows the document, so undoing "attach file"
 * re-binds the earlier file by itself.
 */
export function useNotebookInputs(engine: EngineClient, onBound: () => void) {
  const store = useNotebookStore();
  const slots = reactive<Record<string, SlotInput>>({});
  // Bytes by upload id: a file uploaded here, or fetched once, is not fetched again.
  const bytesByUpload = new Map<string, Bytes>();
  /** Files seen in this session, offered when choosing an existing upload for a slot. */
  const known = reactive<{ id: string; fileName: string }[]>([]);
  const loadedKey = new Map<string, string>();

  function remember(id: string, fileName: string): void {
    if (!known.some((k) => k.id === id)) known.push({ id, fileName });
  }

  async function bytesOf(uploadId: string): Promise<Bytes> {
    const hit = bytesByUpload.get(uploadId);
    if (hit) return hit;
    const [meta, bytes] = await Promise.all([getUpload(uploadId), fetchUploadContent(uploadId)]);
    const entry = { bytes, fileName: meta.fileName };
    bytesByUpload.set(uploadId, entry);
    remember(uploadId, meta.fileName);
    return entry;
  }

  async function bind(slot: NotebookSlot): Promise<void> {
    const key = JSON.stringify([slot.uploadId, slot.csvMapping ?? null]);
    if (loadedKey.get(slot.name) === key) return;
    loadedKey.set(slot.name, key);
    const stillCurrent = () => loadedKey.get(slot.name) === key;
    if (slot.uploadId === null) {
      slots[slot.name] = { state: 'empty', uploadId: null, warnings: [] };
      await engine.bindSlots({ [slot.name]: null });
      onBound();
      return;
    }
    const previous = slots[slot.name];
    // Whatever the worker held under this name (another notebook's file, the old file) must not be computed on.
    await engine.bindSlots({ [slot.name]: null });
    slots[slot.name] = { ...previous, state: previous?.state === 'uploading' ? 'uploading' : 'loading', uploadId: slot.uploadId, warnings: [] };
    try {
      const { bytes, fileName } = await bytesOf(slot.uploadId);
      if (!stillCurrent()) return;
      const csv = looksLikeCsv(fileName, bytes);
      let mapping: CsvMapping | undefined;
      let inspection: CsvInspection | undefined;
      if (csv) {
        inspection = await engine.inspectCsv(new TextDecoder().decode(bytes.subarray(0, 256 * 1024)), fileName);
        const stored = csvMappingSchema.safeParse(slot.csvMapping);
        mapping = stored.success ? stored.data : inspection.guessedMapping;
        if (!mapping) {
          slots[slot.name] = { state: 'needs-mapping', uploadId: slot.uploadId, fileName, format: 'csv', warnings: inspection.warnings, csv: inspection };
          return;
        }
      }
      // A copy: the worker may take ownership of what it is sent.
      const result = await engine.importRecording(bytes.slice(), fileName, { slot: slot.name, ...(mapping ? { csvMapping: mapping } : {}), label: slot.label });
      if (!stillCurrent()) return;
      const common = { uploadId: slot.uploadId, fileName, format: csv ? ('csv' as const) : ('fit' as const), ...(inspection ? { csv: inspection } : {}) };
      if (result.ok) slots[slot.name] = { ...common, state: 'ready', warnings: result.warnings, recording: result.recording.meta };
      else slots[slot.name] = { ...common, state: csv ? 'needs-mapping' : 'failed', error: result.error.message, warnings: [] };
      onBound();
    } catch (e) {
      if (!stillCurrent()) return;
      slots[slot.name] = { state: 'failed', uploadId: slot.uploadId, error: errorMessage(e, 'Could not read this file.'), warnings: [] };
    }
  }

  watch(
    () => store.document?.slots,
    (list) => {
      for (const slot of list ?? []) void bind(slot);
    },
    { immediate: true },
  );

  /** Uploads a file and binds it to the slot (one undoable step). */
  async function upload(slotName: string, file: File): Promise<void> {
    const before = slots[slotName];
    slots[slotName] = { state: 'uploading', uploadId: before?.uploadId ?? null, fileName: file.name, progress: 0, warnings: [] };
    // One uploader per file: a shared one would cancel the first upload when a second starts.
    const uploader = useUploadRecordings();
    const stop = watch(uploader.progress, (p) => {
      const s = slots[slotName];
      if (s?.state === 'uploading') s.progress = p;
    });
    try {
      const response = await uploader.upload([file], store.meta?.workspace.id);
      const stored = response.uploads[0]!;
      bytesByUpload.set(stored.id, { bytes: new Uint8Array(await file.arrayBuffer()), fileName: stored.fileName });
      remember(stored.id, stored.fileName);
      store.updateSlot(slotName, { uploadId: stored.id }, 'attach file');
      // The same bytes again: the id does not change, so read it again by hand.
      if (before?.uploadId === stored.id) {
        loadedKey.delete(slotName);
        const slot = store.document?.slots.find((s) => s.name === slotName);
        if (slot) await bind(slot);
      }
    } catch (e) {
      slots[slotName] = { state: 'failed', uploadId: before?.uploadId ?? null, fileName: file.name, error: errorMessage(e, 'The upload failed.'), warnings: [] };
    } finally {
      stop();
    }
  }

  function choose(slotName: string, uploadId: string): void {
    store.updateSlot(slotName, { uploadId }, 'attach file');
  }

  function setMapping(slotName: string, mapping: CsvMapping): void {
    store.updateSlot(slotName, { csvMapping: mapping as Record<string, unknown> }, 'map CSV columns');
  }

  return { slots, known, upload, choose, setMapping };
}
