import { createHash } from 'node:crypto';
import { brotliCompress, constants as zlibConstants, gzip } from 'node:zlib';
import type { PublishedFile } from '../../shared/api/publications.js';
import type { Snapshot } from '../../shared/api/snapshots.js';
import type { Database, Db } from '../db/client.js';
import * as repo from '../db/repositories/publications.js';
import { findUploadBySha } from '../db/repositories/uploads.js';
import { notFound } from '../errors.js';
import { withDrawings } from './published-drawings.js';
import { revisionDocument } from './snapshot.js';

/** Content codings a page is kept in besides plain JSON. */
export type PageEncoding = 'br' | 'gzip';

/** A published page ready to send: the JSON body, its entity tag and compressed copies. */
export interface PublishedPage {
  body: Buffer;
  /** Weak ETag (the same for every content coding of the same JSON). */
  etag: string;
  /** Compressed copies of `body`, each made once, in the background, after the first reader asked for it. */
  encoded: Partial<Record<PageEncoding, Buffer>>;
  compressing: Set<PageEncoding>;
}

/**
 * The part of a published page that one publication fixes: the snapshot (as JSON text),
 * the published revision's description and the files its inputs name. A publication is
 * identified by notebook, revision and publishing time: republishing sets a new time, so
 * any change of snapshot, revision or downloads gives a new key.
 */
interface Frozen {
  key: string;
  snapshotJson: string;
  description: string;
  /** Every input whose upload is stored; sent only while downloads are allowed. */
  files: PublishedFile[];
  /** Hash of the three above, part of every ETag built on them. */
  digest: string;
  /** Last page built on this entry, reused while the live fields (title, publisher's name) stay the same. */
  page?: { live: string; page: PublishedPage };
  /** The publication's row as last read, and when that read started (performance.now()). */
  checked: { row: repo.PublicationRecord; at: number };
}

export interface PublishedPageCacheOptions {
  /** Most publications kept (least recently read are dropped first). */
  maxEntries?: number;
  /** Most characters of snapshot JSON kept over all entries. */
  maxChars?: number;
  /**
   * How long a page checked against the database is sent without checking again, ms. 0 (the
   * default) checks on every read; only a database no other process writes may trust longer.
   */
  trustForMs?: number;
}

/**
 * Published pages of one server process, by slug. A read is checked against the
 * publication's small row in the database (no snapshot; readers arriving while that query
 * runs share it): an unpublished page is gone, and a page republished by another process
 * sharing the database is seen, on the next read. Only the snapshot, which that row's key
 * pins, is reused. The many readers of a popular page then cost a small query each at most,
 * instead of reading, parsing and re-serialising the whole snapshot each. On embedded PGlite
 * (see {@link publishedPagesOf}) even that query is saved for a moment, as it shares the
 * one thread with every save.
 */
export class PublishedPageCache {
  private readonly entries = new Map<string, Frozen>();
  private readonly loading = new Map<string, Promise<{ row: repo.PublicationRecord; frozen: Frozen }>>();
  private readonly checking = new Map<string, Promise<repo.PublicationRecord | undefined>>();
  /** Counts forget() per slug: a read that started before one must not keep or trust what it read. */
  private readonly generations = new Map<string, number>();
  private chars = 0;
  private readonly maxEntries: number;
  private readonly maxChars: number;
  private readonly trustForMs: number;
  /** Reads answered from a kept snapshot and snapshots read from the database, for tests and diagnostics. */
  readonly stats = { hits: 0, fills: 0, checks: 0 };

  constructor(options: PublishedPageCacheOptions = {}) {
    this.maxEntries = options.maxEntries ?? 100;
    this.maxChars = options.maxChars ?? 64 * 1024 * 1024;
    this.trustForMs = options.trustForMs ?? 0;
  }

  /**
   * The page at `slug`, built from the kept snapshot when the publication is still the
   * one it was taken from; else reads the snapshot (once for concurrent readers).
   *
   * @throws AppError 404 when nothing is published at `slug`.
   */
  async read(db: Db, slug: string): Promise<PublishedPage> {
    const kept = this.entries.get(slug);
    if (kept && performance.now() - kept.checked.at < this.trustForMs) {
      this.stats.hits++;
      return pageOf(kept, kept.checked.row);
    }
    if (kept) {
      const at = performance.now();
      const generation = this.generationOf(slug);
      const row = await this.check(db, slug);
      if (!row) {
        this.forget(slug);
        throw notFound('Publication');
      }
      // The entry may have been replaced or dropped while the query ran: look again.
      const now = this.entries.get(slug);
      if (now && now.key === keyOf(row)) {
        if (now.checked.at < at && generation === this.generationOf(slug)) now.checked = { row, at };
        this.stats.hits++;
        this.touch(slug, now);
        return pageOf(now, row);
      }
    }
    const { row, frozen } = await this.fill(db, slug);
    return pageOf(frozen, row);
  }

  /** Drops what is kept for `slug`, so the next read asks the database afresh (after publishing or unpublishing here). */
  forget(slug: string): void {
    this.generations.set(slug, this.generationOf(slug) + 1);
    this.checking.delete(slug);
    this.loading.delete(slug);
    this.drop(slug);
  }

  private generationOf(slug: string): number {
    return this.generations.get(slug) ?? 0;
  }

  private drop(slug: string): void {
    const kept = this.entries.get(slug);
    if (!kept) return;
    this.chars -= kept.snapshotJson.length;
    this.entries.delete(slug);
  }

  /**
   * The publication's row, one query for all readers who arrive while it runs: under load
   * a few queries a second instead of one per reader. A reader joining a running check gets
   * an answer at most that query's duration old; one arriving after it asks again.
   */
  private check(db: Db, slug: string): Promise<repo.PublicationRecord | undefined> {
    const running = this.checking.get(slug);
    if (running) return running;
    this.stats.checks++;
    const query = repo.findPublicationMetaBySlug(db, slug).finally(() => {
      if (this.checking.get(slug) === query) this.checking.delete(slug);
    });
    this.checking.set(slug, query);
    return query;
  }

  private fill(db: Db, slug: string): Promise<{ row: repo.PublicationRecord; frozen: Frozen }> {
    const running = this.loading.get(slug);
    if (running) return running;
    const generation = this.generationOf(slug);
    const load = (async () => {
      const at = performance.now();
      const found = await repo.findPublicationBySlug(db, slug);
      if (!found) {
        this.drop(slug);
        throw notFound('Publication');
      }
      // A publication from before charts were drawn on the server gets its drawings on this first read.
      const snapshot = await withDrawings(db, found);
      const document = await revisionDocument(db, found.notebookId, found.revision);
      const snapshotJson = JSON.stringify(snapshot);
      const files = await publishedFiles(db, snapshot);
      const frozen: Frozen = {
        key: keyOf(found),
        snapshotJson,
        description: document.description,
        files,
        digest: createHash('sha256').update(snapshotJson).update('\0').update(document.description).update('\0').update(JSON.stringify(files)).digest('base64url'),
        checked: { row: found, at },
      };
      this.stats.fills++;
      // Forgotten meanwhile (published or unpublished here): serve this read, keep nothing.
      if (generation === this.generationOf(slug)) this.keep(slug, frozen);
      return { row: found, frozen };
    })();
    const shared = load.finally(() => {
      if (this.loading.get(slug) === shared) this.loading.delete(slug);
    });
    this.loading.set(slug, shared);
    return shared;
  }

  private keep(slug: string, frozen: Frozen): void {
    this.drop(slug);
    if (frozen.snapshotJson.length > this.maxChars) return;
    this.entries.set(slug, frozen);
    this.chars += frozen.snapshotJson.length;
    for (const [oldest, entry] of this.entries) {
      if (this.entries.size <= this.maxEntries && this.chars <= this.maxChars) break;
      if (entry !== frozen) this.drop(oldest);
    }
  }

  /** Marks an entry as just read (a Map iterates in insertion order: oldest first). */
  private touch(slug: string, entry: Frozen): void {
    this.entries.delete(slug);
    this.entries.set(slug, entry);
  }
}

/** One cache per open database, shared by every app on it (tests run several apps on one). */
const cachesByDb = new WeakMap<Db, PublishedPageCache>();

/**
 * The published pages kept for `database`. On embedded PGlite this process is the only
 * writer (the data folder is locked), and publishing or unpublishing here forgets the page
 * at once ({@link forgetPublishedPage}), so a checked page is trusted for a second: only a
 * renamed notebook or publisher shows up to a second late. On PostgreSQL, where other
 * processes may republish or unpublish, every read checks.
 */
export function publishedPagesOf(database: Pick<Database, 'db' | 'kind'>): PublishedPageCache {
  let cache = cachesByDb.get(database.db);
  if (!cache) {
    cache = new PublishedPageCache({ trustForMs: database.kind === 'pglite' ? PGLITE_TRUST_MS : 0 });
    cachesByDb.set(database.db, cache);
  }
  return cache;
}

/** How long a checked page is trusted on embedded PGlite, ms. */
export const PGLITE_TRUST_MS = 1000;

/** Drops the kept page at `slug` of the database behind `db`, if any: after publishing or unpublishing it. */
export function forgetPublishedPage(db: Db, slug: string): void {
  cachesByDb.get(db)?.forget(slug);
}

/**
 * The snapshot names its inputs by content hash; the stored upload with those bytes is the file.
 * No route removes uploads, so the list holds for the life of a publication.
 */
export async function publishedFiles(db: Db, snapshot: Snapshot): Promise<PublishedFile[]> {
  const files: PublishedFile[] = [];
  for (const input of snapshot.inputs) {
    const upload = await findUploadBySha(db, input.sha256);
    if (upload) files.push({ uploadId: upload.id, slot: input.slot, fileName: input.fileName, format: input.format, size: input.size });
  }
  return files;
}

function keyOf(row: Pick<repo.PublicationRecord, 'notebookId' | 'revision' | 'publishedAt'>): string {
  return `${row.notebookId}:${row.revision}:${row.publishedAt.getTime()}`;
}

/**
 * The page as GET /api/published/:slug answers it (PublishedNotebookResponse), with the
 * snapshot's JSON text spliced in rather than serialised again. Title and publisher's
 * name are the live ones: renaming the notebook or the account shows without republishing.
 */
function pageOf(frozen: Frozen, row: repo.PublicationRecord): PublishedPage {
  const live = {
    slug: row.slug,
    title: row.title,
    description: frozen.description,
    publishedBy: row.publishedByName === null ? null : { name: row.publishedByName },
    publishedAt: row.publishedAt.toISOString(),
    revision: row.revision,
  };
  const tail = { allowDownloads: row.allowDownloads, files: row.allowDownloads ? frozen.files : null };
  const liveKey = JSON.stringify([live, tail]);
  if (frozen.page?.live === liveKey) return frozen.page.page;
  const head = JSON.stringify(live);
  const rest = JSON.stringify(tail);
  const body = Buffer.from(`${head.slice(0, -1)},"snapshot":${frozen.snapshotJson},${rest.slice(1)}`);
  const etag = `W/"${createHash('sha256').update(frozen.digest).update(liveKey).digest('base64url').slice(0, 27)}"`;
  const page: PublishedPage = { body, etag, encoded: {}, compressing: new Set() };
  frozen.page = { live: liveKey, page };
  return page;
}

/**
 * What to send for the content codings the client accepts (brotli preferred, as the
 * app's compression middleware does): the kept compressed copy when there is one. Otherwise the plain
 * body, which the app's compression middleware compresses on the way out as it does any
 * response, while a copy is made for the readers after this one: compressing a page of
 * charts takes milliseconds of CPU, once instead of for every reader.
 */
export function bodyFor(page: PublishedPage, accepts: (coding: PageEncoding) => boolean): { body: Buffer; encoding?: PageEncoding } {
  const accepted = accepts('br') ? 'br' : accepts('gzip') ? 'gzip' : null;
  if (accepted === null) return { body: page.body };
  const kept = page.encoded[accepted];
  if (kept) return { body: kept, encoding: accepted };
  if (!page.compressing.has(accepted)) {
    page.compressing.add(accepted);
    const done = (error: Error | null, out: Buffer) => {
      if (!error) page.encoded[accepted] = out;
      // A failed copy is tried again by a later reader; meanwhile the middleware compresses.
      else page.compressing.delete(accepted);
    };
    if (accepted === 'br') {
      brotliCompress(page.body, { params: { [zlibConstants.BROTLI_PARAM_QUALITY]: 6, [zlibConstants.BROTLI_PARAM_SIZE_HINT]: page.body.length } }, done);
    } else {
      gzip(page.body, { level: 9 }, done);
    }
  }
  return { body: page.body };
}
