import type { z } from 'zod';
import { EngineError } from '../errors.js';
import { NOTEBOOK_SCHEMA_VERSION, notebookDocumentSchema, type NotebookDocument } from './document.js';

type Json = Record<string, unknown>;

const isObject = (v: unknown): v is Json => typeof v === 'object' && v !== null && !Array.isArray(v);

/** Documents saved before the format carried a version: same shape as 1, lists could be absent. */
function from0(doc: Json): Json {
  return {
    ...doc,
    schemaVersion: 1,
    description: doc['description'] ?? '',
    parameters: doc['parameters'] ?? [],
    slots: doc['slots'] ?? [],
    cells: doc['cells'] ?? [],
  };
}

/**
 * Version 1 kept configs as free-form records. Version 2 checks them per kind; the
 * renames below map the keys early editors wrote onto the current ones, and the
 * schemas fill in defaults for anything left out.
 */
function from1(doc: Json): Json {
  const cells = Array.isArray(doc['cells']) ? doc['cells'] : [];
  return {
    ...doc,
    schemaVersion: 2,
    cells: cells.map((cell: unknown) => {
      if (!isObject(cell)) return cell;
      const config: Json = isObject(cell['config']) ? { ...cell['config'] } : {};
      if (cell['kind'] === 'note' && config['markdown'] === undefined && typeof config['text'] === 'string') {
        config['markdown'] = config['text'];
        delete config['text'];
      }
      if (cell['kind'] === 'formula' && config['source'] === undefined && typeof config['expression'] === 'string') {
        config['source'] = config['expression'];
        delete config['expression'];
      }
      if (cell['kind'] === 'chart' && config['preset'] === undefined) config['preset'] = 'traces';
      return { ...cell, config };
    }),
  };
}

/** Step k turns a version-k document into a version-(k+1) one. */
const STEPS: ReadonlyArray<(doc: Json) => Json> = [from0, from1];

function describeIssues(error: z.ZodError): string {
  return error.issues
    .slice(0, 3)
    .map((i) => `${i.path.length > 0 ? i.path.join('.') : '(document)'}: ${i.message}`)
    .join('; ');
}

/**
 * Reads a stored or imported notebook document of any known format version and
 * returns it in the current format, checked against {@link notebookDocumentSchema}.
 * A document without `schemaVersion` is treated as the earliest format.
 *
 * @throws EngineError `notebook_too_new` when the document was written by a newer
 *   Cogbook (its version is above {@link NOTEBOOK_SCHEMA_VERSION});
 *   `notebook_invalid` when it is not a notebook or fails the schema (message names the field).
 * @example
 * migrateNotebookDocument({ schemaVersion: 1, title: 'Lab ride', parameters: [], slots: [], cells: [] }).schemaVersion // 2
 */
export function migrateNotebookDocument(input: unknown): NotebookDocument {
  if (!isObject(input)) throw new EngineError('notebook_invalid', 'a notebook document must be a JSON object');
  const raw = input['schemaVersion'];
  const version = raw === undefined ? 0 : raw;
  if (typeof version !== 'number' || !Number.isInteger(version) || version < 0) {
    throw new EngineError('notebook_invalid', `schemaVersion must be a whole number, got ${JSON.stringify(raw)}`);
  }
  if (version > NOTEBOOK_SCHEMA_VERSION) {
    throw new EngineError(
      'notebook_too_new',
      `this notebook uses format version ${version}, but this Cogbook reads up to version ${NOTEBOOK_SCHEMA_VERSION}; ` +
        'open it with a newer Cogbook (it was left unchanged)',
    );
  }
  let doc: Json = input;
  for (let v = version; v < NOTEBOOK_SCHEMA_VERSION; v++) doc = STEPS[v]!(doc);
  const parsed = notebookDocumentSchema.safeParse(doc);
  if (!parsed.success) {
    throw new EngineError('notebook_invalid', `notebook document (format ${version}) is not valid: ${describeIssues(parsed.error)}`);
  }
  return parsed.data;
}
