import { reactive, watch } from 'vue';
import type { EngineWarning } from '../../shared/errors.js';
import type { NotebookSlot } from '../../shared/notebook/document.js';
import { csvMappingSchema, type CsvMapping } from '../../shared/recording/csv-mapping.js';
import type { CsvInspection } from '../../shared/recording/inspect-csv.js';
import type { RecordingMeta } from '../../shared/recording/recording.js';
import { ApiError } from '@/api/http';
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
  /** The error is damage to a FIT file (bad checksum, cut short) that "read damaged file" can get past. */
  damaged?: boolean;
  warnings: EngineWarning[];
  recording?: RecordingMeta;
  /** For CSV files: columns and first rows, for the mapping form. */
  csv?: CsvInspection;
}

interface Bytes {
  bytes: Uint8Array;
  fileName: string;
}

/** Error codes of a damaged FIT file that reading with `readDamaged` gets past. */
const DAMAGE_CODES = new Set(['fit_crc', 'fit_truncated', 'fit_malformed']);

/** Error codes of a CSV file that mapping its columns by hand can fix (the others are the file's own fault). */
const MAPPING_CODES = new Set(['csv_needs_mapping', 'csv_mapping_column', 'csv_mapping_invalid', 'no_time_column', 'mixed_units', 'no_power']);

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
    const key = JSON.stringify([slot.uploadId, slot.csvMapping ?? null, slot.readDamaged ?? false]);
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
          // The importer says why no mapping could be guessed (no time column, no numbers, ...).
          const attempt = await engine.importRecording(bytes.slice(), fileName, {});
          if (!stillCurrent()) return;
          const error = attempt.ok ? undefined : attempt.error.message;
          const state = attempt.ok || MAPPING_CODES.has(attempt.error.code) ? ('needs-mapping' as const) : ('failed' as const);
          slots[slot.name] = { state, uploadId: slot.uploadId, fileName, format: 'csv', ...(error ? { error } : {}), warnings: inspection.warnings, csv: inspection };
          // The worker no longer holds a recording for this slot: let the cells say so.
          onBound();
          return;
        }
      }
      // A copy: the worker may take ownership of what it is sent.
      const result = await engine.importRecording(bytes.slice(), fileName, { slot: slot.name, ...(mapping ? { csvMapping: mapping } : {}), ...(slot.readDamaged ? { readDamaged: true } : {}), label: slot.label });
      if (!stillCurrent()) return;
      const common = { uploadId: slot.uploadId, fileName, format: csv ? ('csv' as const) : ('fit' as const), ...(inspection ? { csv: inspection } : {}) };
      if (result.ok) slots[slot.name] = { ...common, state: 'ready', warnings: result.warnings, recording: result.recording.meta };
      else slots[slot.name] = { ...common, state: csv && MAPPING_CODES.has(result.error.code) ? 'needs-mapping' : 'failed', error: result.error.message, damaged: DAMAGE_CODES.has(result.error.code), warnings: [] };
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

  // A damaged FIT file the server refused, by slot: "read damaged file" sends it again with consent.
  const refusedDamaged = new Map<string, File>();

  /** Uploads a file and binds it to the slot (one undoable step); `readDamaged` keeps a damaged FIT file. */
  async function upload(slotName: string, file: File, options: { readDamaged?: boolean } = {}): Promise<void> {
    refusedDamaged.delete(slotName);
    const before = slots[slotName];
    slots[slotName] = { state: 'uploading', uploadId: before?.uploadId ?? null, fileName: file.name, progress: 0, warnings: [] };
    // One uploader per file: a shared one would cancel the first upload when a second starts.
    const uploader = useUploadRecordings();
    const stop = watch(uploader.progress, (p) => {
      const s = slots[slotName];
      if (s?.state === 'uploading') s.progress = p;
    });
    try {
      const response = await uploader.upload([file], store.meta?.workspace.id, options);
      const stored = response.uploads[0]!;
      bytesByUpload.set(stored.id, { bytes: new Uint8Array(await file.arrayBuffer()), fileName: stored.fileName });
      remember(stored.id, stored.fileName);
      // A new file starts without the damaged-file permission the old one may have had.
      store.updateSlot(slotName, { uploadId: stored.id, readDamaged: options.readDamaged ? true : undefined }, options.readDamaged ? 'read damaged file' : 'attach file');
      // The same bytes again: the id does not change, so read it again by hand.
      if (before?.uploadId === stored.id) {
        loadedKey.delete(slotName);
        const slot = store.document?.slots.find((s) => s.name === slotName);
        if (slot) await bind(slot);
      }
    } catch (e) {
      const reason = e instanceof ApiError && e.status === 415 ? (e.details as { reason?: unknown } | undefined)?.reason : undefined;
      const damaged = typeof reason === 'string' && DAMAGE_CODES.has(reason);
      if (damaged) refusedDamaged.set(slotName, file);
      slots[slotName] = { state: 'failed', uploadId: before?.uploadId ?? null, fileName: file.name, error: errorMessage(e, 'The upload failed.'), damaged, warnings: [] };
    } finally {
      stop();
    }
  }

  function choose(slotName: string, uploadId: string): void {
    store.updateSlot(slotName, { uploadId, readDamaged: undefined }, 'attach file');
  }

  /**
   * Reads the slot's damaged FIT file after all, keeping what is intact past a bad checksum or a
   * cut: uploads it again with consent when the server refused it, else reads the stored file again.
   */
  async function readDamaged(slotName: string): Promise<void> {
    const refused = refusedDamaged.get(slotName);
    if (refused) return upload(slotName, refused, { readDamaged: true });
    store.updateSlot(slotName, { readDamaged: true }, 'read damaged file');
  }

  function setMapping(slotName: string, mapping: CsvMapping): void {
    store.updateSlot(slotName, { csvMapping: mapping as Record<string, unknown> }, 'map CSV columns');
  }

  return { slots, known, upload, choose, setMapping, readDamaged };
}
