import type { PublishBody, Publication, PublishedNotebookResponse } from '../../shared/api/publications.js';
import { request } from './http';

const publicationOf = (notebookId: string) => `/api/notebooks/${encodeURIComponent(notebookId)}/publication`;

/** The notebook's publication; ApiError `not_found` (404) while it is not published. */
export function getPublication(notebookId: string): Promise<Publication> {
  return request(publicationOf(notebookId));
}

/** Publishes the current revision, or replaces the published snapshot (the address stays). */
export function publish(notebookId: string, body: PublishBody): Promise<Publication> {
  return request(publicationOf(notebookId), { method: 'POST', body });
}

export function unpublish(notebookId: string): Promise<void> {
  return request(publicationOf(notebookId), { method: 'DELETE' });
}

/** The reader's page data; public, no sign-in. */
export function getPublished(slug: string, signal?: AbortSignal): Promise<PublishedNotebookResponse> {
  return request(`/api/published/${encodeURIComponent(slug)}`, { signal });
}

/** Address of a recording a publisher allowed readers to download. */
export function publishedFileHref(slug: string, uploadId: string): string {
  return `/api/published/${encodeURIComponent(slug)}/files/${encodeURIComponent(uploadId)}`;
}
