import type { PublishBody, Publication, PublicationResponse, PublishedNotebookResponse } from '../../shared/api/publications.js';
import { request } from './http';

const publicationOf = (notebookId: string) => `/api/notebooks/${encodeURIComponent(notebookId)}/publication`;

/** The notebook's publication, or null while it is not published (404 only for a notebook the user cannot read). */
export async function getPublication(notebookId: string): Promise<PublicationResponse> {
  // An empty body would read as undefined: null is the agreed "not published".
  return (await request<PublicationResponse | undefined>(publicationOf(notebookId))) ?? null;
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
