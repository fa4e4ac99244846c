import type {
  CreateNotebookBody,
  NotebookAccessResponse,
  NotebookListResponse,
  NotebookResponse,
  PutNotebookAccessBody,
  RevisionListResponse,
  RevisionResponse,
  SaveNotebookBody,
} from '../../shared/api/notebooks.js';
import { request } from './http';

const one = (id: string) => `/api/notebooks/${encodeURIComponent(id)}`;

export function listNotebooks(workspaceId?: string): Promise<NotebookListResponse> {
  return request('/api/notebooks', { query: { workspaceId } });
}

export function createNotebook(body: CreateNotebookBody): Promise<NotebookResponse> {
  return request('/api/notebooks', { method: 'POST', body });
}

export function getNotebook(id: string, signal?: AbortSignal): Promise<NotebookResponse> {
  return request(one(id), { signal });
}

/** Saves a new revision; a concurrent save answers ApiError `stale_revision` (409). */
export function saveNotebook(id: string, body: SaveNotebookBody): Promise<NotebookResponse> {
  return request(one(id), { method: 'PUT', body });
}

export function deleteNotebook(id: string): Promise<void> {
  return request(one(id), { method: 'DELETE' });
}

export function listRevisions(id: string): Promise<RevisionListResponse> {
  return request(`${one(id)}/revisions`);
}

export function getRevision(id: string, revision: number): Promise<RevisionResponse> {
  return request(`${one(id)}/revisions/${revision}`);
}

export function restoreRevision(id: string, revision: number, summary?: string): Promise<NotebookResponse> {
  return request(`${one(id)}/revisions/${revision}/restore`, { method: 'POST', body: summary ? { summary } : {} });
}

export function getNotebookAccess(id: string): Promise<NotebookAccessResponse> {
  return request(`${one(id)}/access`);
}

export function putNotebookAccess(id: string, body: PutNotebookAccessBody): Promise<NotebookAccessResponse> {
  return request(`${one(id)}/access`, { method: 'PUT', body });
}
