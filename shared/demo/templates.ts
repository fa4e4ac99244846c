import { NOTEBOOK_SCHEMA_VERSION, notebookDocumentSchema, type NotebookCell, type NotebookDocument, type NotebookParameter } from '../notebook/document.js';
import { comparisonSlots, noteCell } from './cells.js';
import { protocolNote } from './cautions.js';
import { compareCells, compareParameters } from './chains/compare-two-files.js';
import { perLegByChainringCells, perLegParameters } from './chains/per-leg-by-chainring.js';
import { steadyBlockCells, steadyBlockParameters } from './chains/steady-blocks.js';

/** Key of a notebook template. */
export type TemplateKey = 'compare-two-files' | 'per-leg-by-chainring' | 'steady-blocks';

/** A template as the library lists it. */
export interface NotebookTemplate {
  key: TemplateKey;
  title: string;
  /** One or two sentences: what it answers and what files it needs. */
  summary: string;
  /** The document with empty slots and fixed cell ids; use {@link instantiateTemplate} to start a notebook. */
  document: NotebookDocument;
}

const SLOT_LABELS = { reference: 'Reference', test: 'Device under test' };
const TEST_LABEL = SLOT_LABELS.test;

function templateDocument(title: string, description: string, parameters: NotebookParameter[], protocol: string, cells: NotebookCell[]): NotebookDocument {
  return notebookDocumentSchema.parse({
    schemaVersion: NOTEBOOK_SCHEMA_VERSION,
    title,
    description,
    parameters,
    slots: comparisonSlots(SLOT_LABELS),
    cells: [noteCell('protocol', 'protocol', protocol), ...cells],
  });
}

function buildTemplates(): NotebookTemplate[] {
  return [
    {
      key: 'compare-two-files',
      title: 'Compare two files',
      summary: 'One ride recorded by a reference and a device under test: clock offset found automatically, agreement, drift per hour, difference over time and a Bland-Altman plot.',
      document: templateDocument(
        'Compare two files',
        'Drop the reference recording and the device under test recording into their slots.',
        compareParameters(2),
        protocolNote('Protocol', [
          'Record the same ride with both devices, each to its own file (FIT or CSV).',
          '',
          '- Zero offset on both devices after a 10-20 minute warm-up.',
          '- Clocks may differ by seconds or minutes: the alignment finds the offset (raise `maxLagS` in the align cell for larger ones).',
          '- Set `tolerance` to the stated accuracy of the device under test.',
        ]),
        compareCells(TEST_LABEL, 300),
      ),
    },
    {
      key: 'per-leg-by-chainring',
      title: 'Per-leg by chainring',
      summary: 'Two dual-sided devices with shift events: left and right compared on each chainring over steady blocks, the gear effect isolated, bars against the tolerance.',
      document: templateDocument(
        'Per-leg by chainring',
        'Both files need left/right balance; one of them needs gear-change events from electronic shifting.',
        perLegParameters(2, { small: 34, big: 50 }),
        protocolNote('Protocol', [
          'Steady blocks of 3-5 minutes at several powers on the large chainring, the same targets on the small chainring, then one block on each again.',
          '',
          '- Both devices dual-sided (each leg measured); log which chainring the chain was physically on.',
          '- Set `big_ring` and `small_ring` to your chainrings\' teeth and `tolerance` to the stated accuracy.',
          '- To tell a firmware correction from a physical effect, add a block with a shift signal sent while the chain stays put.',
        ]),
        perLegByChainringCells(TEST_LABEL),
      ),
    },
    {
      key: 'steady-blocks',
      title: 'Steady blocks',
      summary: 'A power ladder on the trainer: one row per steady block, the overall difference, a line fit of test on reference, bars per block and a scatter with the identity line.',
      document: templateDocument(
        'Steady blocks',
        'Drop the reference and the device under test recordings of a trainer session with steady blocks.',
        steadyBlockParameters(2, 1),
        protocolNote('Protocol', [
          'Steady blocks of 3-5 minutes at several target powers (for example 150 to 350 W in 50 W steps), with a minute easy between blocks.',
          '',
          '- Hold cadence steady within a block; repeat the ladder on the other chainring if gear effects matter.',
          '- Set `tolerance` and `ref_tolerance` to the stated accuracies of the two devices.',
        ]),
        steadyBlockCells(TEST_LABEL),
      ),
    },
  ];
}

/**
 * The notebook templates a user can start from, in the order the library shows them.
 * Pure data: the client imports it directly.
 */
export function listTemplates(): NotebookTemplate[] {
  return buildTemplates();
}

/** Options of {@link instantiateTemplate}. */
export interface InstantiateOptions {
  /** Title of the new notebook (default: the template's). */
  title?: string;
  /** Makes a new cell id; default a random one. Called once per cell. */
  newId?: () => string;
}

function randomId(): string {
  return `cell-${Math.random().toString(36).slice(2, 10)}${Date.now().toString(36).slice(-4)}`;
}

/**
 * A new notebook document from a template: fresh cell ids, empty slots, the cautions note first.
 *
 * @throws Error when `key` names no template.
 * @example const doc = instantiateTemplate('steady-blocks', { title: 'Ladder, new firmware' });
 */
export function instantiateTemplate(key: TemplateKey, options: InstantiateOptions = {}): NotebookDocument {
  const template = buildTemplates().find((t) => t.key === key);
  if (!template) throw new Error(`no notebook template "${key}"; known: ${buildTemplates().map((t) => t.key).join(', ')}`);
  const newId = options.newId ?? randomId;
  const used = new Set<string>();
  const cells = template.document.cells.map((cell) => {
    let id = newId();
    while (used.has(id)) id = newId();
    used.add(id);
    return { ...cell, id };
  });
  return notebookDocumentSchema.parse({ ...template.document, title: options.title ?? template.document.title, cells });
}
