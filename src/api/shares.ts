import type { NotebookResponse } from '../../shared/api/notebooks.js';
import type { ForkBody } from '../../shared/api/forks.js';
import type { CreateShareBody, ShareLink, ShareListResponse, SharedNotebookResponse } from '../../shared/api/shares.js';
import { request } from './http';

const sharesOf = (notebookId: string) => `/api/notebooks/${encodeURIComponent(notebookId)}/shares`;

export function createShare(notebookId: string, body: CreateShareBody): Promise<ShareLink> {
  return request(sharesOf(notebookId), { method: 'POST', body });
}

export function listShares(notebookId: string): Promise<ShareListResponse> {
  return request(sharesOf(notebookId));
}

export function revokeShare(token: string): Promise<void> {
  return request(`/api/shares/${encodeURIComponent(token)}`, { method: 'DELETE' });
}

/** What a share link opens: the notebook read-only with its newest snapshot. */
export function getSharedNotebook(token: string, signal?: AbortSignal): Promise<SharedNotebookResponse> {
  return request(`/api/shared/${encodeURIComponent(token)}`, { signal });
}

/** Copies a notebook the caller can read into one of their workspaces. */
export function forkNotebook(notebookId: string, body: ForkBody): Promise<NotebookResponse> {
  return request(`/api/notebooks/${encodeURIComponent(notebookId)}/fork`, { method: 'POST', body });
}

/** Copies the notebook behind a share link (signed in) into one of the caller's workspaces. */
export function forkShared(token: string, body: ForkBody): Promise<NotebookResponse> {
  return request(`/api/shared/${encodeURIComponent(token)}/fork`, { method: 'POST', body });
}
