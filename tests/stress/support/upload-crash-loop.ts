import { createHash } from 'node:crypto';
import type { PGlite } from '@electric-sql/pglite';
import { openCrashSite } from './crash-server.js';
import { clientFor, personalWorkspace, prng, signUpClient, type Client } from './http-client.js';
import { checkDataFolder } from './verify-folder.js';

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
  /** Kills that cut off at least one upload still being sent or stored. */
  killsWithUploadInFlight: number;
  /** Uploads answered 201 (cut-off ones sent again after a restart included). */
  acknowledged: number;
  /** Acknowledged uploads read back after the last restart with the same sha256. */
  foundIntact: number;
  /** Cut-off uploads sent again after the restart: stored whole before the kill, or not stored. */
  inFlightStoredWhole: number;
  inFlightNotStored: number;
  /** Bytes sent in acknowledged uploads. */
  bytesAcknowledged: number;
  /** Rows of the upload table checked in the database itself at the end (bytes hash to their sha256). */
  rowsChecked: number;
  /** Tables and b-tree indexes amcheck verified in the folder at the end. */
  tablesChecked: number;
  indexesChecked: number;
  restartMs: number[];
  durationMs: number;
  problems: string[];
}

const sha256 = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');

/**
 * A CSV ride of ~20 kB to ~2 MB (log-uniform, so most are small and quick while some take
 * long enough to be cut off mid-body); the random tail makes every file's bytes unique.
 */
function csvFile(random: () => number): Uint8Array<ArrayBuffer> {
  const rows = Math.floor(Math.exp(Math.log(1500) + random() * Math.log(100)));
  const lines = ['time,power,cadence'];
  const base = 150 + Math.floor(random() * 200);
  for (let i = 0; i < rows; i++) lines.push(`${i},${base + ((i * 7919) % 37)},${85 + (i % 11)}`);
  lines.push(`${rows},${base},${Math.floor(random() * 1e9) % 120}`);
  return new TextEncoder().encode(`${lines.join('\n')}\n`);
}

type UploadAnswer = { uploads?: { id: string; sha256: string; size: number; duplicate: boolean }[] };

async function upload(client: Client, workspaceId: string, bytes: Uint8Array<ArrayBuffer>, name: string) {
  const form = new FormData();
  form.set('workspaceId', workspaceId);
  form.append('file', new Blob([bytes]), name);
  return client.json<UploadAnswer>('/api/uploads', { method: 'POST', body: form, timeoutMs: 120_000 });
}

/** sha256 of the bytes the server hands back, or what went wrong instead. */
async function contentSha(client: Client, id: string): Promise<string> {
  try {
    const res = await client.call(`/api/uploads/${id}/content`, { timeoutMs: 120_000 });
    if (res.status !== 200) return `status ${res.status}`;
    return sha256(new Uint8Array(await res.arrayBuffer()));
  } catch (error) {
    return `no answer (${String(error)})`;
  }
}

/**
 * Uploads CSV files in parallel, SIGKILLs the server mid-upload, restarts it on the same
 * folder and checks: the uploads acknowledged before the kill read back byte-identical;
 * an upload cut off by the kill is either absent or whole; at the end, every acknowledged
 * upload reads back byte-identical, and in the database itself (server stopped) amcheck
 * finds no damage and every row of the upload table hashes to its own sha256 and is a
 * file that was actually sent.
 */
export async function runUploadCrashLoop(options: UploadCrashOptions): Promise<UploadCrashReport> {
  const started = Date.now();
  const random = prng(options.seed);
  const report: UploadCrashReport = {
    seed: options.seed,
    kills: 0,
    killsWithUploadInFlight: 0,
    acknowledged: 0,
    foundIntact: 0,
    inFlightStoredWhole: 0,
    inFlightNotStored: 0,
    bytesAcknowledged: 0,
    rowsChecked: 0,
    tablesChecked: 0,
    indexesChecked: 0,
    restartMs: [],
    durationMs: 0,
    problems: [],
  };
  const site = await openCrashSite();
  const acked = new Map<string, string>(); // id -> sha256
  const sent = new Set<string>(); // sha256 of every file ever sent
  try {
    let client = await signUpClient(site.server.url, 'crash.uploads@lab.test');
    const cookie = client.cookie;
    const workspaceId = await personalWorkspace(client);
    let fileNo = 0;
    // The budget bounds the kill cycles; creating a fresh folder can take long on a busy machine.
    const deadline = Date.now() + options.budgetMs;

    while (report.kills < options.kills && Date.now() < deadline) {
      let alive = true;
      let ackedThisCycle = 0;
      const ackedBeforeKill: [string, string][] = [];
      const pending: Uint8Array<ArrayBuffer>[] = [];
      const accept = (bytes: Uint8Array, res: { status: number; body: UploadAnswer }, what: string) => {
        const meta = res.body?.uploads?.[0];
        if (res.status !== 201 || !meta) {
          report.problems.push(`${what} answered ${res.status} ${JSON.stringify(res.body)}`);
          return undefined;
        }
        if (meta.sha256 !== sha256(bytes) || meta.size !== bytes.byteLength) report.problems.push(`${what} ${meta.id}: the answer names another sha256 or size`);
        acked.set(meta.id, meta.sha256);
        report.acknowledged++;
        report.bytesAcknowledged += bytes.byteLength;
        return meta;
      };
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
          const meta = accept(bytes, res, 'upload');
          if (!meta) return;
          ackedBeforeKill.push([meta.id, meta.sha256]);
          ackedThisCycle++;
        }
      };
      const uploaders = Array.from({ length: options.uploaders ?? 3 }, uploader);
      // Kill at a random moment once uploads flow: 0-800 ms after the first acknowledgement.
      const waitStart = Date.now();
      while (ackedThisCycle === 0 && Date.now() - waitStart < 120_000) await new Promise((r) => setTimeout(r, 2));
      await new Promise((r) => setTimeout(r, Math.floor(random() * 800)));
      const pidBefore = site.server.child.pid;
      await site.kill();
      alive = false;
      await Promise.all(uploaders);
      report.kills++;
      if (pending.length > 0) report.killsWithUploadInFlight++;
      if (!site.staleLockLeft() || site.lockPid() !== pidBefore) report.problems.push(`kill ${report.kills}: no lock file of pid ${pidBefore} was left behind`);
      try {
        report.restartMs.push(await site.restart());
      } catch (error) {
        report.problems.push(`kill ${report.kills}: restart failed: ${String(error)}`);
        break;
      }
      client = clientFor(site.server.url, cookie);
      // What was acknowledged just before this kill must have outlived it.
      for (const [id, want] of ackedBeforeKill) {
        const got = await contentSha(client, id);
        if (got !== want) report.problems.push(`after kill ${report.kills}: acknowledged upload ${id} reads back as ${got}, not ${want}`);
      }
      // A cut-off upload sent again: either new, or already stored and then byte-identical.
      for (const bytes of pending) {
        let res;
        try {
          res = await upload(client, workspaceId, bytes, 'again.csv');
        } catch (error) {
          report.problems.push(`re-upload after kill ${report.kills}: no answer (${String(error)})`);
          continue;
        }
        const meta = accept(bytes, res, `re-upload after kill ${report.kills}`);
        if (!meta) continue;
        if (meta.duplicate) {
          const got = await contentSha(client, meta.id);
          if (got === sha256(bytes)) report.inFlightStoredWhole++;
          else report.problems.push(`after kill ${report.kills}: a cut-off upload was stored as ${got}, not its own bytes`);
        } else {
          report.inFlightNotStored++;
        }
      }
      if (report.problems.length > 0) break;
    }
    for (const [id, want] of acked) {
      const got = await contentSha(client, id);
      if (got === want) report.foundIntact++;
      else report.problems.push(`upload ${id}: read back ${got}, acknowledged ${want}`);
    }
    await site.server.stop();
    const folder = await checkDataFolder(site.dataDir, report.problems, async (db) => {
      report.rowsChecked = await checkUploadRows(db, sent, acked, report.problems);
    });
    report.tablesChecked = folder.tablesChecked;
    report.indexesChecked = folder.indexesChecked;
  } finally {
    await site.close(report.problems.length > 0);
    if (report.problems.length > 0) report.problems.push(`data folder kept for inspection: ${site.dataDir}`);
    report.durationMs = Date.now() - started;
  }
  return report;
}

/**
 * Every row of the upload table, as PostgreSQL itself reads it: its bytes hash (PostgreSQL's
 * sha256, not Node's) to the row's sha256 and have its size, they are a file that was sent,
 * and every acknowledged id is a row. Hashing in the database keeps hundreds of MB of bytes
 * out of the test process.
 */
async function checkUploadRows(db: PGlite, sent: Set<string>, acked: Map<string, string>, problems: string[]): Promise<number> {
  const { rows } = await db.query<{ id: string; sha256: string; size: number; actual: string | null; length: number | null }>(
    `SELECT id, sha256, size, encode(sha256(bytes), 'hex') AS actual, octet_length(bytes) AS length FROM upload`,
  );
  const ids = new Set<string>();
  for (const row of rows) {
    ids.add(row.id);
    if (row.actual !== row.sha256 || row.length !== row.size) problems.push(`upload row ${row.id}: bytes hash to ${row.actual}, size ${row.length}; row says ${row.sha256}, ${row.size}`);
    if (!sent.has(row.sha256)) problems.push(`upload row ${row.id} holds bytes nobody sent`);
  }
  for (const id of acked.keys()) if (!ids.has(id)) problems.push(`acknowledged upload ${id} has no row in the database`);
  return rows.length;
}
