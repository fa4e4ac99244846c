import { performance } from 'node:perf_hooks';
import { generateDemoFiles } from '../../shared/demo/demo-files.js';
import { buildDemoNotebook } from '../../shared/demo/demo-notebooks.js';
import { listDemoScenarios } from '../../shared/demo/scenarios.js';
import type { Db } from '../db/client.js';
import { createNotebook } from '../services/notebooks.js';
import type { DemoSeed, DemoServices } from '../services/seed.js';
import { storeUploads } from '../services/uploads.js';

/** What {@link seedDemoLab} stored, for logs and tests. */
export interface DemoLabResult {
  notebooks: { key: string; id: string; title: string }[];
  uploads: { fileName: string; id: string; size: number }[];
  timings: { generateMs: number; storeMs: number };
}

/**
 * Adds the demo rides and notebooks to the freshly seeded lab: each scenario's files are
 * generated (same bytes every time), stored as the analyst's uploads in the lab, and its
 * notebook saved as revision 1 with its slots bound to them. Goes through the same
 * services as a user's upload and save, so the files download like any other.
 */
export async function addDemoContent(db: Db, seed: DemoSeed): Promise<DemoLabResult> {
  const result: DemoLabResult = { notebooks: [], uploads: [], timings: { generateMs: 0, storeMs: 0 } };
  const analyst = seed.users.analyst;
  for (const scenario of listDemoScenarios()) {
    const t0 = performance.now();
    const files = generateDemoFiles(scenario);
    const t1 = performance.now();
    const stored = await storeUploads(db, analyst, seed.workspaceId, files.map((f) => ({ fileName: f.fileName, bytes: f.bytes })));
    const idOf = (slot: 'reference' | 'test'): string => stored.uploads[files.findIndex((f) => f.slot === slot)]!.id;
    const uploads = { reference: idOf('reference'), test: idOf('test') };
    const saved = await createNotebook(db, analyst, { workspaceId: seed.workspaceId, document: buildDemoNotebook(scenario.key, uploads) });
    result.timings.generateMs += t1 - t0;
    result.timings.storeMs += performance.now() - t1;
    result.notebooks.push({ key: scenario.key, id: saved.notebook.id, title: saved.notebook.title });
    for (const u of stored.uploads) result.uploads.push({ fileName: u.fileName, id: u.id, size: u.size });
  }
  return result;
}

/** The seed step that adds the demo content (see `demoSteps` in services/seed.ts). */
export async function seedDemoLab(services: DemoServices, seed: DemoSeed): Promise<void> {
  const r = await addDemoContent(services.db, seed);
  services.logger.info(
    { notebooks: r.notebooks.length, files: r.uploads.length, generateMs: Math.round(r.timings.generateMs), storeMs: Math.round(r.timings.storeMs) },
    'demo rides and notebooks added',
  );
}
