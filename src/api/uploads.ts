import type { UploadListResponse, UploadMeta, UploadResponse } from '../../shared/api/uploads.js';
import { ApiError, request, toApiError } from './http';

export interface UploadProgress {
  loaded: number;
  total: number;
  /** 0..1, or null while the browser does not know the total yet. */
  fraction: number | null;
}

export interface UploadOptions {
  workspaceId?: string;
  /** Keep a FIT file whose checksum fails or that is cut short (the person chose to). */
  readDamaged?: boolean;
  onProgress?: (progress: UploadProgress) => void;
  signal?: AbortSignal;
}

function parseJson(text: string): unknown {
  try {
    return JSON.parse(text) as unknown;
  } catch {
    return undefined;
  }
}

/**
 * Uploads recording files (FIT or CSV) as one multipart request. Uses XMLHttpRequest
 * rather than fetch because only XHR reports upload progress for big FIT files.
 */
export function uploadRecordings(files: readonly File[], options: UploadOptions = {}): Promise<UploadResponse> {
  const form = new FormData();
  if (options.workspaceId) form.append('workspaceId', options.workspaceId);
  if (options.readDamaged) form.append('readDamaged', 'true');
  for (const file of files) form.append('file', file, file.name);

  return new Promise<UploadResponse>((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', '/api/uploads');
    xhr.setRequestHeader('accept', 'application/json');
    xhr.upload.onprogress = (event) => {
      options.onProgress?.({
        loaded: event.loaded,
        total: event.total,
        fraction: event.lengthComputable && event.total > 0 ? event.loaded / event.total : null,
      });
    };
    xhr.onload = () => {
      const body = parseJson(xhr.responseText);
      if (xhr.status >= 200 && xhr.status < 300 && body !== undefined) resolve(body as UploadResponse);
      else reject(toApiError(xhr.status, xhr.statusText, body));
    };
    xhr.onerror = () => reject(new ApiError('network', 'The upload was interrupted. Check your connection and try again.', 0));
    xhr.onabort = () => reject(new DOMException('Upload cancelled', 'AbortError'));
    if (options.signal) {
      if (options.signal.aborted) {
        reject(new DOMException('Upload cancelled', 'AbortError'));
        return;
      }
      options.signal.addEventListener('abort', () => xhr.abort(), { once: true });
    }
    xhr.send(form);
  });
}

/** A page of a workspace's earlier uploads, newest first. */
export function listUploads(workspaceId: string, page: { limit: number; offset: number }, signal?: AbortSignal): Promise<UploadListResponse> {
  return request('/api/uploads', { query: { workspace: workspaceId, limit: page.limit, offset: page.offset }, signal });
}

export function getUpload(id: string): Promise<UploadMeta> {
  return request(`/api/uploads/${encodeURIComponent(id)}`);
}

/** The stored bytes of an upload, for the engine worker to read. */
export async function fetchUploadContent(id: string, signal?: AbortSignal): Promise<Uint8Array> {
  let response: Response;
  try {
    response = await fetch(`/api/uploads/${encodeURIComponent(id)}/content`, { credentials: 'same-origin', signal });
  } catch (cause) {
    if (cause instanceof DOMException && cause.name === 'AbortError') throw cause;
    throw new ApiError('network', 'Cogbook could not reach its server to read a recording.', 0);
  }
  if (!response.ok) {
    const text = await response.text();
    let body: unknown = text;
    try {
      body = JSON.parse(text) as unknown;
    } catch {
      // not JSON: toApiError falls back to the status
    }
    throw toApiError(response.status, response.statusText, body);
  }
  return new Uint8Array(await response.arrayBuffer());
}
