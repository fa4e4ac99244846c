import { isDeepStrictEqual } from 'node:util';
import { NOTEBOOK_SCHEMA_VERSION, type NotebookDocument } from '../../../shared/notebook/document.js';
import { openCrashSite } from './crash-server.js';
import { clientFor, createNotebook, personalWorkspace, prng, signUpClient, type Client } from './http-client.js';
import { checkDataFolder } from './verify-folder.js';

export interface SaveCrashOptions {
  /** SIGKILLs to deliver. */
  kills: number;
  /** Stop early (and report fewer kills) after this long. */
  budgetMs: number;
  seed: number;
  /** Notebooks saved to in parallel, one writer each. */
  notebooks?: number;
}

export interface SaveCrashReport {
  seed: number;
  kills: number;
  /** Kills that cut off at least one save still on its way (sent, no answer yet). */
  killsWithSaveInFlight: number;
  /** Saves answered 200 (each one checked after every restart that followed it). */
  acknowledged: number;
  /** Acknowledged revisions read back with the exact document after the last restart. */
  foundIntact: number;
  /** Saves cut off by a kill: committed anyway (found as the next revision) or not. */
  inFlightCommitted: number;
  inFlightLost: number;
  /** Restarts whose lock file was left by the killed process and taken over. */
  staleLocksTakenOver: number;
  /** Tables and b-tree indexes amcheck verified in the folder at the end. */
  tablesChecked: number;
  indexesChecked: number;
  restartMs: number[];
  durationMs: number;
  /** Everything that went wrong; empty when the data survived every crash. */
  problems: string[];
}

interface NotebookTrack {
  id: string;
  /** Revision the next save builds on. */
  current: number;
  acked: Map<number, NotebookDocument>;
  /** The save a kill cut off: no answer seen. */
  pending?: { base: number; document: NotebookDocument };
}

/** A document of ~20-60 kB whose every field survives the schema unchanged, so stored == sent. */
function documentFor(label: string, random: () => number): NotebookDocument {
  const cells = Array.from({ length: 4 + Math.floor(random() * 8) }, (_, i) => ({
    id: `c${i}`,
    name: `note_${i}`,
    kind: 'note' as const,
    config: { markdown: `## ${label} part ${i}\n\n${'power 250 W, cadence 90 rpm; '.repeat(40 + Math.floor(random() * 60))}${random()}` },
  }));
  return {
    schemaVersion: NOTEBOOK_SCHEMA_VERSION,
    title: `Crash save ${label}`,
    description: `saved as ${label} (${random()})`,
    parameters: [{ name: 'tolerance', value: Math.round(random() * 1000) / 100, unit: '%', label: 'Stated accuracy' }],
    slots: [],
    cells,
  };
}

/**
 * Saves to several notebooks as fast as the server answers, SIGKILLs the server at a
 * random moment while saves are in flight, restarts it on the same data folder and
 * checks that every acknowledged revision is there with its exact document, and that a
 * save cut off by the kill is either absent or stored whole as the next revision.
 */
export async function runSaveCrashLoop(options: SaveCrashOptions): Promise<SaveCrashReport> {
  const started = Date.now();
  const random = prng(options.seed);
  const report: SaveCrashReport = {
    seed: options.seed,
    kills: 0,
    killsWithSaveInFlight: 0,
    acknowledged: 0,
    foundIntact: 0,
    inFlightCommitted: 0,
    inFlightLost: 0,
    staleLocksTakenOver: 0,
    tablesChecked: 0,
    indexesChecked: 0,
    restartMs: [],
    durationMs: 0,
    problems: [],
  };
  const site = await openCrashSite();
  try {
    let client = await signUpClient(site.server.url, 'crash.saves@lab.test');
    const cookie = client.cookie;
    const workspaceId = await personalWorkspace(client);
    const tracks: NotebookTrack[] = [];
    for (let i = 0; i < (options.notebooks ?? 3); i++) {
      tracks.push({ id: await createNotebook(client, workspaceId), current: 1, acked: new Map() });
    }
    let saveNo = 0;
    // The budget bounds the kill cycles; creating a fresh folder can take long on a busy machine.
    const deadline = Date.now() + options.budgetMs;

    while (report.kills < options.kills && Date.now() < deadline) {
      let alive = true;
      let ackedThisCycle = 0;
      const writer = async (track: NotebookTrack) => {
        while (alive) {
          const document = documentFor(`${track.id.slice(0, 8)}-${++saveNo}`, random);
          track.pending = { base: track.current, document };
          let res: { status: number; body: { revision: number; document: NotebookDocument } };
          try {
            res = await client.json('/api/notebooks/' + track.id, {
              method: 'PUT',
              headers: { 'content-type': 'application/json' },
              body: JSON.stringify({ baseRevision: track.current, document, summary: `save ${saveNo}` }),
            });
          } catch {
            return; // the server died under this request: it stays pending
          }
          track.pending = undefined;
          if (res.status !== 200) {
            report.problems.push(`save on ${track.id} at base ${track.current} answered ${res.status} ${JSON.stringify(res.body)}`);
            return;
          }
          if (res.body.revision !== track.current + 1) report.problems.push(`save on base ${track.current} became revision ${res.body.revision}`);
          track.current = res.body.revision;
          track.acked.set(res.body.revision, document);
          report.acknowledged++;
          ackedThisCycle++;
        }
      };
      const writers = tracks.map(writer);
      // Kill at a random moment once saves flow: 0-600 ms after the first acknowledgement of this
      // cycle (a busy machine may need long for it; every kill follows one, so acknowledged > kills).
      const waitStart = Date.now();
      while (ackedThisCycle === 0 && Date.now() - waitStart < 120_000) await new Promise((r) => setTimeout(r, 2));
      await new Promise((r) => setTimeout(r, Math.floor(random() * 600)));
      const pidBefore = site.server.child.pid;
      await site.kill();
      alive = false;
      await Promise.all(writers);
      report.kills++;
      if (tracks.some((t) => t.pending)) report.killsWithSaveInFlight++;

      if (site.staleLockLeft() && site.lockPid() === pidBefore) report.staleLocksTakenOver++;
      else report.problems.push(`kill ${report.kills}: no lock file of pid ${pidBefore} was left behind`);
      try {
        report.restartMs.push(await site.restart());
      } catch (error) {
        report.problems.push(`kill ${report.kills}: restart failed: ${String(error)}`);
        break;
      }
      client = clientFor(site.server.url, cookie);
      await checkAfterRestart(client, tracks, report);
      if (report.problems.length > 0) break;
    }
    report.foundIntact = await checkEveryRevision(client, tracks, report);
    await site.server.stop();
    const folder = await checkDataFolder(site.dataDir, report.problems, async (db) => {
      // The stored history itself, not only what the API shows: one row per revision 1..current.
      for (const track of tracks) {
        const { rows } = await db.query<{ n: number; top: number }>('SELECT count(*)::int AS n, max(revision)::int AS top FROM notebook_revision WHERE notebook_id = $1', [track.id]);
        const got = rows[0];
        if (got?.n !== track.current || got.top !== track.current) report.problems.push(`${track.id}: the database holds ${got?.n} revisions up to ${got?.top}, expected 1..${track.current}`);
      }
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

/** After a restart: the head is the last acknowledged save or the cut-off one, stored whole. */
async function checkAfterRestart(client: Client, tracks: NotebookTrack[], report: SaveCrashReport): Promise<void> {
  for (const track of tracks) {
    const { status, body } = await client.json<{ revision: number; document: NotebookDocument }>(`/api/notebooks/${track.id}`);
    if (status !== 200) {
      report.problems.push(`after kill ${report.kills}: GET notebook ${track.id} answered ${status}`);
      continue;
    }
    const lastAcked = Math.max(1, ...track.acked.keys());
    const pending = track.pending;
    track.pending = undefined;
    if (body.revision === track.current) {
      if (pending) report.inFlightLost++;
      const want = track.acked.get(body.revision);
      if (want && !isDeepStrictEqual(body.document, want)) report.problems.push(`after kill ${report.kills}: head revision ${body.revision} of ${track.id} differs from what was acknowledged`);
    } else if (pending && body.revision === pending.base + 1 && pending.base === track.current) {
      // Committed but the answer never arrived: it must be the whole document that was sent.
      if (!isDeepStrictEqual(body.document, pending.document)) report.problems.push(`after kill ${report.kills}: unacknowledged revision ${body.revision} of ${track.id} holds a different document`);
      else report.inFlightCommitted++;
      track.current = body.revision;
    } else {
      report.problems.push(`after kill ${report.kills}: ${track.id} is at revision ${body.revision}, last acknowledged ${lastAcked}, expected ${track.current}${pending ? ` or ${pending.base + 1}` : ''}`);
    }
  }
}

/** Reads back every acknowledged revision; also checks the history has no gaps. Returns how many matched. */
async function checkEveryRevision(client: Client, tracks: NotebookTrack[], report: SaveCrashReport): Promise<number> {
  let intact = 0;
  for (const track of tracks) {
    const list = await client.json<{ revisions: { revision: number }[] }>(`/api/notebooks/${track.id}/revisions`);
    const numbers = list.body.revisions.map((r) => r.revision).sort((a, b) => a - b);
    if (!isDeepStrictEqual(numbers, Array.from({ length: track.current }, (_, i) => i + 1))) {
      report.problems.push(`${track.id}: history is [${numbers.join(',')}], expected 1..${track.current}`);
    }
    for (const [revision, document] of track.acked) {
      const { status, body } = await client.json<{ document: NotebookDocument }>(`/api/notebooks/${track.id}/revisions/${revision}`);
      if (status === 200 && isDeepStrictEqual(body.document, document)) intact++;
      else report.problems.push(`${track.id}: acknowledged revision ${revision} ${status === 200 ? 'holds another document' : `answered ${status}`}`);
    }
  }
  return intact;
}
