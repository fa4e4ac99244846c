import { deviceDisplayName, type RecordingDevice } from '../../shared/api/uploads.js';
import { importRecording } from '../../shared/recording/import-recording.js';
import type { Db } from '../db/client.js';
import { readUploadBytes } from '../db/repositories/uploads.js';

/** What lists show of a recording beyond its name: the device that made it and when it started. */
export interface RecordingFacts {
  device: RecordingDevice | null;
  startedAt: string | null;
}

// The bytes behind a sha256 never change, so what was read from them stays true; bounded, oldest out first.
const CACHE_LIMIT = 5000;
const cache = new Map<string, RecordingFacts>();

/**
 * Device and start time of a stored upload, read from its bytes with the shared importer
 * (the schema keeps neither). A file the importer cannot read (e.g. a CSV that needs a
 * column mapping) gives nulls rather than an error: a list must still show it.
 */
export async function recordingFactsOf(db: Db, upload: { id: string; sha256: string; fileName: string }): Promise<RecordingFacts> {
  const known = cache.get(upload.sha256);
  if (known) return known;
  const facts = await readFacts(db, upload);
  cache.set(upload.sha256, facts);
  if (cache.size > CACHE_LIMIT) cache.delete(cache.keys().next().value!);
  return facts;
}

async function readFacts(db: Db, upload: { id: string; fileName: string }): Promise<RecordingFacts> {
  const bytes = await readUploadBytes(db, upload.id).catch(() => undefined);
  if (!bytes) return { device: null, startedAt: null };
  const result = await importRecording(bytes, upload.fileName, { readDamaged: true }).catch(() => null);
  if (!result?.ok) return { device: null, startedAt: null };
  const d = result.recording.meta.device;
  const name = deviceDisplayName(d);
  const startMs = result.recording.meta.startMs;
  return {
    device: name ? { name, manufacturer: d.manufacturer ?? null, product: d.product ?? null, serialNumber: d.serialNumber ?? null } : null,
    startedAt: Number.isFinite(startMs) ? new Date(startMs).toISOString() : null,
  };
}
