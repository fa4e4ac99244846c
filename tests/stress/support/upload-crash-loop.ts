import { createHash } from 'node:crypto';
import { PGlite } from '@electric-sql/pglite';
import { acquireDataDirLock } from '../../../server/db/data-lock.js';
import { pgliteDirOf } from '../../../server/db/client.js';
import { openCrashSite } from './crash-server.js';
import { clientFor, personalWorkspace, prng, signUpClient, type Client } from './http-client.js';

export interface UploadCrashOptions {
  kills: number;
  budgetMs: number;
  seed: number;
  /** Parallel uploaders. */
  uploaders?: number;
}

export interface UploadCrashReport {
  seed: number;
  kills: number;
  /** Uploads answered 201. */
  acknowledged: number;
  /** Acknowledged uploads read back after the last restart with the same sha256. */
  foundIntact: number;
  /** Cut-off uploads sent again after the restart: stored whole before the kill, or not stored. */
  inFlightStoredWhole: number;
  inFlightNotStored: number;
  /** Rows of the upload table checked in the database itself at the end (bytes hash to their sha256). */
  rowsChecked: number;
  restartMs: number[];
  problems: string[];
}

const sha256 = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');

/** A CSV ride of 100 kB to ~3 MB; the random tail makes every file's bytes unique. */
function csvFile(random: () => number): Uint8Array<ArrayBuffer> {
  const rows = 3000 + Math.floor(random() * 150_000);
  const lines = ['time,power,cadence'];
  const base = 150 + Math.floor(random() * 200);
  for (let i = 0; i < rows; i++) lines.push(`${i},${base + ((i * 7919) % 37)},${85 + (i % 11)}`);
  lines.push(`${rows},${base},${Math.floor(random() * 1e9) % 120}`);
  return new TextEncoder().encode(`${lines.join('\n')}\n`);
}

async function upload(client: Client, workspaceId: string, bytes: Uint8Array<ArrayBuffer>, name: string) {
  const form = new FormData();
  form.set('workspaceId', workspaceId);
  form.append('file', new Blob([bytes]), name);
  return client.json<{ uploads: { id: string; sha256: string; size: number; duplicate: boolean }[] }>('/api/uploads', { method: 'POST', body: form, timeoutMs: 60_000 });
}

async function contentSha(client: Client, id: string): Promise<string | number> {
  const res = await client.call(`/api/uploads/${id}/content`);
  if (res.status !== 200) return res.status;
  return sha256(new Uint8Array(await res.arrayBuffer()));
}

/**
 * Uploads CSV files in parallel, SIGKILLs the server mid-upload, restarts it on the same
 * folder and checks: every acknowledged upload reads back byte-identical; an upload cut
 * off by the kill is either absent or whole; at the end, every row of the upload table
 * (read from the database files directly) hashes to its own sha256 and is a file that
 * was actually sent.
 */
export async function runUploadCrashLoop(options: UploadCrashOptions): Promise<UploadCrashReport> {
  const random = prng(options.seed);
  const report: UploadCrashReport = {
    seed: options.seed,
    kills: 0,
    acknowledged: 0,
    foundIntact: 0,
    inFlightStoredWhole: 0,
    inFlightNotStored: 0,
    rowsChecked: 0,
    restartMs: [],
    problems: [],
  };
  const deadline = Date.now() + options.budgetMs;
  const site = await openCrashSite();
  const acked = new Map<string, string>(); // id -> sha256
  const sent = new Set<string>(); // sha256 of every file ever sent
  try {
    let client = await signUpClient(site.server.url, 'crash.uploads@lab.test');
    const cookie = client.cookie;
    const workspaceId = await personalWorkspace(client);
    let fileNo = 0;

    while (report.kills < options.kills && Date.now() < deadline) {
      let alive = true;
      let ackedThisCycle = 0;
      const pending: Uint8Array<ArrayBuffer>[] = [];
      const uploader = async () => {
        while (alive) {
          const bytes = csvFile(random);
          sent.add(sha256(bytes));
          pending.push(bytes);
          let res;
          try {
            res = await upload(client, workspaceId, bytes, `ride-${++fileNo}.csv`);
          } catch {
            return; // killed mid-upload: stays pending
          }
          pending.splice(pending.indexOf(bytes), 1);
          const meta = res.body.uploads?.[0];
          if (res.status !== 201 || !meta) {
            report.problems.push(`upload answered ${res.status} ${JSON.stringify(res.body)}`);
            return;
          }
          if (meta.sha256 !== sha256(bytes) || meta.size !== bytes.byteLength) report.problems.push(`upload ${meta.id}: answer names another sha256 or size`);
          acked.set(meta.id, meta.sha256);
          report.acknowledged++;
          ackedThisCycle++;
        }
      };
      const uploaders = Array.from({ length: options.uploaders ?? 3 }, uploader);
      const waitStart = Date.now();
      while (ackedThisCycle === 0 && Date.now() - waitStart < 30_000) await new Promise((r) => setTimeout(r, 2));
      await new Promise((r) => setTimeout(r, Math.floor(random() * 800)));
      await site.kill();
      alive = false;
      await Promise.all(uploaders);
      report.kills++;
      if (!site.staleLockLeft()) report.problems.push(`kill ${report.kills}: no stale lock file left behind`);
      try {
        report.restartMs.push(await site.restart());
      } catch (error) {
        report.problems.push(`kill ${report.kills}: restart failed: ${String(error)}`);
        break;
      }
      client = clientFor(site.server.url, cookie);
      // A cut-off upload sent again: either new, or already stored and then byte-identical.
      for (const bytes of pending) {
        const res = await upload(client, workspaceId, bytes, 'again.csv');
        const meta = res.body.uploads?.[0];
        if (res.status !== 201 || !meta) {
          report.problems.push(`re-upload after kill ${report.kills} answered ${res.status}`);
          continue;
        }
        if (meta.duplicate) {
          const got = await contentSha(client, meta.id);
          if (got === sha256(bytes)) report.inFlightStoredWhole++;
          else report.problems.push(`after kill ${report.kills}: a cut-off upload was stored as ${String(got)}, not its own bytes`);
        } else {
          report.inFlightNotStored++;
        }
        acked.set(meta.id, meta.sha256);
        report.acknowledged++;
      }
      if (report.problems.length > 0) break;
    }
    for (const [id, want] of acked) {
      const got = await contentSha(client, id);
      if (got === want) report.foundIntact++;
      else report.problems.push(`upload ${id}: read back ${String(got)}, acknowledged ${want}`);
    }
    await site.server.stop();
    report.rowsChecked = await checkUploadRows(site.dataDir, sent, report.problems);
  } finally {
    await site.close(report.problems.length > 0);
    if (report.problems.length > 0) report.problems.push(`data folder kept for inspection: ${site.dataDir}`);
  }
  return report;
}

/** Reads the upload table straight from the PGlite folder (server stopped, lock held). */
async function checkUploadRows(dataDir: string, sent: Set<string>, problems: string[]): Promise<number> {
  const lock = acquireDataDirLock(dataDir);
  const db = new PGlite(pgliteDirOf(dataDir));
  try {
    const { rows } = await db.query<{ id: string; sha256: string; size: number; bytes: Uint8Array }>('SELECT id, sha256, size, bytes FROM upload');
    for (const row of rows) {
      const actual = sha256(row.bytes);
      if (actual !== row.sha256 || row.size !== row.bytes.byteLength) problems.push(`upload row ${row.id}: bytes hash to ${actual}, size ${row.bytes.byteLength}; row says ${row.sha256}, ${row.size}`);
      if (!sent.has(row.sha256)) problems.push(`upload row ${row.id} holds bytes nobody sent`);
    }
    return rows.length;
  } finally {
    await db.close();
    lock.release();
  }
}
