import { ref } from 'vue';
import type { UploadResponse } from '../../shared/api/uploads.js';
import { ApiError } from '@/api/http';
import { uploadRecordings, type UploadProgress } from '@/api/uploads';

/** Uploads recordings with a progress value the template can bind to (0..1 or null). */
export function useUploadRecordings() {
  const progress = ref<number | null>(null);
  const uploading = ref(false);
  let controller: AbortController | null = null;

  async function upload(files: readonly File[], workspaceId?: string, options: { readDamaged?: boolean } = {}): Promise<UploadResponse> {
    controller?.abort();
    controller = new AbortController();
    uploading.value = true;
    progress.value = 0;
    try {
      return await uploadRecordings(files, {
        workspaceId,
        ...(options.readDamaged ? { readDamaged: true } : {}),
        signal: controller.signal,
        onProgress: (p: UploadProgress) => {
          progress.value = p.fraction;
        },
      });
    } catch (e) {
      throw tooLargeNamed(e, files);
    } finally {
      uploading.value = false;
      controller = null;
    }
  }

  function cancel(): void {
    controller?.abort();
  }

  return { upload, cancel, progress, uploading };
}

/**
 * The server's 413 says only "a file" is over its limit: name the file(s) over it and their
 * size beside the limit, so the person knows which file and by how much.
 */
function tooLargeNamed(error: unknown, files: readonly File[]): unknown {
  if (!(error instanceof ApiError) || error.status !== 413) return error;
  const limitMb = (error.details as { limitMb?: unknown } | undefined)?.limitMb;
  if (typeof limitMb !== 'number') return error;
  const limitBytes = limitMb * 1024 * 1024;
  const over = files.filter((f) => f.size > limitBytes);
  const named = (over.length > 0 ? over : files).map((f) => `${f.name} (${formatSize(f.size)})`).join(', ');
  const message = `${named} ${over.length > 1 ? 'are' : 'is'} larger than the server's upload limit of ${formatSize(limitBytes)} per file; nothing was uploaded. Cut the file to the ride, or ask whoever runs this server to raise its upload limit.`;
  return new ApiError(error.code, message, error.status, error.details);
}

function formatSize(bytes: number): string {
  if (bytes >= 1024 * 1024) return `${(bytes / 1024 / 1024).toFixed(1).replace(/\.0$/, '')} MB`;
  if (bytes >= 1024) return `${(bytes / 1024).toFixed(1).replace(/\.0$/, '')} KB`;
  return `${bytes} bytes`;
}
