import type { ImportResponse } from '../../shared/api/exports.js';
import { request } from './http';

/**
 * Address of a notebook's export file. A plain link download lets the browser stream
 * a file with embedded recordings to disk instead of holding it in the page.
 */
export function exportHref(notebookId: string, withRecordings: boolean): string {
  return `/api/notebooks/${encodeURIComponent(notebookId)}/export${withRecordings ? '?recordings=1' : ''}`;
}

/** Creates a new notebook in `workspaceId` from an export file (all or nothing). */
export function importNotebook(workspaceId: string, file: File): Promise<ImportResponse> {
  const form = new FormData();
  form.append('workspaceId', workspaceId);
  form.append('file', file, file.name);
  return request('/api/notebooks/import', { method: 'POST', body: form });
}
