import { ref } from 'vue';
import type { UploadResponse } from '../../shared/api/uploads.js';
import { uploadRecordings, type UploadProgress } from '@/api/uploads';

/** Uploads recordings with a progress value the template can bind to (0..1 or null). */
export function useUploadRecordings() {
  const progress = ref<number | null>(null);
  const uploading = ref(false);
  let controller: AbortController | null = null;

  async function upload(files: readonly File[], workspaceId?: string): Promise<UploadResponse> {
    controller?.abort();
    controller = new AbortController();
    uploading.value = true;
    progress.value = 0;
    try {
      return await uploadRecordings(files, {
        workspaceId,
        signal: controller.signal,
        onProgress: (p: UploadProgress) => {
          progress.value = p.fraction;
        },
      });
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
