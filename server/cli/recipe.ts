import { createHash } from 'node:crypto';
import { readFile, writeFile } from 'node:fs/promises';
import { basename } from 'node:path';
import type { Snapshot, SnapshotCell } from '../../shared/api/snapshots.js';
import { parseRecipeArgs, RECIPE_USAGE, UsageError, type RecipeArgs } from './recipe-args.js';
import { isExportPath, loadExportFile, loadFromDatabase, type RecipeFile, type RecipeSource } from './recipe-source.js';
import { runCommand } from './run-command.js';

/**
 * The headless recipe command: computes a notebook on given files with the shared
 * runner (in this process) and writes per cell its name, kind, state, values or table
 * summary, and error, as JSON. Bad input (arguments, a missing file, a file that is not
 * a recording, an unknown slot, a damaged export) prints one line and exits with 2.
 */
async function main(argv: string[]): Promise<number> {
  const args = parseRecipeArgs(argv);
  if (args.help) {
    process.stdout.write(`${RECIPE_USAGE}\n`);
    return 0;
  }
  const source = isExportPath(args.notebook) ? await loadExportFile(args.notebook) : await loadFromDatabase(args.notebook, process.env);
  const files = await inputFiles(args, source);
  const { computeNotebook } = await import('../engine/compute-notebook.js');
  const outcome = await computeNotebook({
    document: source.document,
    revision: source.revision,
    inputs: files.map((f) => ({
      slot: f.slot,
      label: source.document.slots.find((s) => s.name === f.slot)?.label ?? f.slot,
      fileName: f.fileName,
      format: isFit(f.bytes) ? 'fit' : 'csv',
      sha256: createHash('sha256').update(f.bytes).digest('hex'),
      size: f.bytes.byteLength,
      bytes: f.bytes,
    })),
  });
  if (!outcome.ok) throw new UsageError(outcome.error.message.replace(/\s+/g, ' ').trim());
  const text = `${JSON.stringify(report(source, outcome.snapshot), null, 2)}\n`;
  if (args.out) await writeFile(args.out, text);
  else process.stdout.write(text);
  return 0;
}

/** Files given with --input (by slot), then the recordings the notebook carries for the other slots. */
async function inputFiles(args: RecipeArgs, source: RecipeSource): Promise<RecipeFile[]> {
  const slots = source.document.slots.map((s) => s.name);
  for (const slot of Object.keys(args.inputs)) {
    if (!slots.includes(slot)) throw new UsageError(`--input ${slot}=${args.inputs[slot]}: the notebook has no slot "${slot}" (its slots: ${slots.join(', ') || 'none'})`);
  }
  const files: RecipeFile[] = [];
  for (const slot of slots) {
    const path = args.inputs[slot];
    if (path !== undefined) files.push({ slot, fileName: basename(path), bytes: await readBytes(path) });
    else {
      const bound = source.bound.find((b) => b.slot === slot);
      if (bound) files.push(bound);
    }
  }
  return files;
}

/** FIT files carry ".FIT" at bytes 8-11 of their header; anything else is read as CSV. */
function isFit(bytes: Uint8Array): boolean {
  return bytes.length >= 12 && String.fromCharCode(bytes[8]!, bytes[9]!, bytes[10]!, bytes[11]!) === '.FIT';
}

async function readBytes(path: string): Promise<Uint8Array> {
  try {
    return new Uint8Array(await readFile(path));
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    throw new UsageError(`${path}: ${code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'is a directory' : code === 'EACCES' ? 'permission denied' : 'cannot be read'}`);
  }
}

/** The command's JSON: what was computed from what, and each cell's outcome without chart data. */
function report(source: RecipeSource, snapshot: Snapshot) {
  return {
    notebook: { title: source.document.title, revision: snapshot.revision, from: source.origin },
    computedAt: snapshot.computedAt,
    durationMs: snapshot.durationMs,
    inputs: snapshot.inputs.map((i) => ({ slot: i.slot, fileName: i.fileName, sha256: i.sha256, size: i.size })),
    failedCells: snapshot.cells.filter((c) => c.state === 'failed').length,
    cells: snapshot.cells.map(cellReport),
  };
}

function cellReport(cell: SnapshotCell) {
  const out: Record<string, unknown> = { name: cell.name, kind: cell.kind, state: cell.state };
  const r = cell.result;
  if (r?.type === 'values') {
    out['values'] = r.values;
    if (r.last !== undefined) out['last'] = r.last;
  } else if (r?.type === 'table') out['table'] = { rows: r.table.rows, startS: r.table.startS, endS: r.table.endS, columns: r.table.columns, ...(r.table.facts ? { facts: r.table.facts } : {}) };
  else if (r?.type === 'recording') out['recording'] = { fileName: r.recording.meta['fileName'], rows: r.recording.rows, columns: r.recording.columns };
  else if (r?.type === 'chart') out['chart'] = { title: (r.spec as { title?: unknown }).title ?? null };
  if (cell.error) out['error'] = { code: cell.error.code, message: cell.error.message };
  if (cell.blockedBy) out['blockedBy'] = cell.blockedBy;
  if (cell.warnings.length > 0) out['warnings'] = cell.warnings.map((w) => w.message);
  return out;
}

runCommand('recipe', main);
