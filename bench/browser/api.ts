import type { APIRequestContext, APIResponse } from 'playwright-core';
import type { NotebookResponse } from '../../shared/api/notebooks.js';
import type { Publication } from '../../shared/api/publications.js';
import type { UploadResponse } from '../../shared/api/uploads.js';
import type { WorkspaceListResponse } from '../../shared/api/workspaces.js';
import type { NotebookDocument } from '../../shared/notebook/document.js';
import type { BenchFile } from './bench-notebook.js';

/**
 * The product's HTTP API through a browser context's request client, so the session cookie
 * it receives at sign-in is the one the context's pages use.
 */
export class BenchApi {
  constructor(
    private readonly request: APIRequestContext,
    private readonly baseUrl: string,
  ) {}

  private async json<T>(what: string, res: APIResponse): Promise<T> {
    if (!res.ok()) throw new Error(`${what}: HTTP ${res.status()} ${(await res.text()).slice(0, 300)}`);
    return (await res.json()) as T;
  }

  /** Same-origin writes: the server refuses a write whose Origin it does not trust. */
  private get headers(): Record<string, string> {
    return { origin: this.baseUrl };
  }

  async signIn(email: string, password: string): Promise<void> {
    const res = await this.request.post(`${this.baseUrl}/api/auth/sign-in/email`, { headers: this.headers, data: { email, password } });
    if (!res.ok()) throw new Error(`sign-in as ${email}: HTTP ${res.status()} ${(await res.text()).slice(0, 300)}`);
  }

  /** The first workspace where the caller may create notebooks. */
  async workspaceId(): Promise<string> {
    const { workspaces } = await this.json<WorkspaceListResponse>('workspaces', await this.request.get(`${this.baseUrl}/api/workspaces`));
    const w = workspaces.find((x) => x.role !== 'viewer') ?? workspaces[0];
    if (!w) throw new Error('the bench account has no workspace');
    return w.id;
  }

  /** Uploads the files one request each; answers upload ids by slot. */
  async upload(files: readonly BenchFile[]): Promise<Record<BenchFile['slot'], string>> {
    const ids: Partial<Record<BenchFile['slot'], string>> = {};
    for (const f of files) {
      const res = await this.request.post(`${this.baseUrl}/api/uploads`, {
        headers: this.headers,
        multipart: { file: { name: f.fileName, mimeType: 'application/octet-stream', buffer: Buffer.from(f.bytes.buffer, f.bytes.byteOffset, f.bytes.byteLength) } },
        timeout: 120_000,
      });
      const { uploads } = await this.json<UploadResponse>(`upload ${f.fileName}`, res);
      ids[f.slot] = uploads[0]!.id;
    }
    return ids as Record<BenchFile['slot'], string>;
  }

  async createNotebook(workspaceId: string, document: NotebookDocument): Promise<NotebookResponse> {
    return this.json('create notebook', await this.request.post(`${this.baseUrl}/api/notebooks`, { headers: this.headers, data: { workspaceId, document } }));
  }

  /** Publishes (the server computes the snapshot: minutes for long rides on a busy machine). */
  async publish(notebookId: string): Promise<Publication> {
    return this.json(
      'publish',
      await this.request.post(`${this.baseUrl}/api/notebooks/${notebookId}/publication`, { headers: this.headers, data: { allowDownloads: false }, timeout: 600_000 }),
    );
  }
}
