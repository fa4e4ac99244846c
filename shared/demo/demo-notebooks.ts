import { NOTEBOOK_SCHEMA_VERSION, notebookDocumentSchema, type NotebookDocument } from '../notebook/document.js';
import { comparisonSlots, noteCell } from './cells.js';
import { protocolNote } from './cautions.js';
import { compareCells, compareParameters } from './chains/compare-two-files.js';
import { perLegByChainringCells, perLegParameters } from './chains/per-leg-by-chainring.js';
import { steadyBlockCells, steadyBlockParameters } from './chains/steady-blocks.js';
import { DEMO_SCENARIOS, type DemoScenario, type DemoScenarioKey } from './scenarios.js';

/** Upload ids of a scenario's two files, or null to leave a slot empty. */
export interface DemoUploads {
  reference: string | null;
  test: string | null;
}

function slotsOf(s: DemoScenario, uploads: DemoUploads) {
  return comparisonSlots({ reference: s.reference.device.label, test: s.test.device.label }, uploads);
}

function chainringNotebook(uploads: DemoUploads): NotebookDocument {
  const s = DEMO_SCENARIOS['chainring-gain'];
  const test = s.test.device.label;
  return {
    schemaVersion: NOTEBOOK_SCHEMA_VERSION,
    title: s.title,
    description: `${s.rider.name} rode steady blocks on each chainring with the ${test} (device under test) and the ${s.reference.device.label} (reference). Does one leg read differently on one chainring?`,
    parameters: perLegParameters(s.statedTolerancePct, { small: 34, big: 50 }),
    slots: slotsOf(s, uploads),
    cells: [
      noteCell('protocol', 'protocol', protocolNote('Protocol', [
        `Rider: ${s.rider.name}. ${s.setting}`,
        '',
        `- Reference: ${s.reference.device.label} (${s.reference.device.kind}).`,
        `- Device under test: ${test} (${s.test.device.kind}).`,
        '- Zero offset on both devices after a 10-minute warm-up, then 4-minute steady blocks at 150, 250 and 350 W on the 50T, the same on the 34T, and 200 W on each once more. One minute easy between blocks.',
        '- Each device records to its own head unit; the shifting system logs every chainring change as a gear event.',
        '- Compare left with left and right with right, per chainring, over the steady blocks only.',
      ])),
      ...perLegByChainringCells(test),
      noteCell('finding', 'finding', [
        '## Finding',
        '',
        `The **left leg** of the ${test} reads about **+8% on the 50T chainring only**. On the 34T it agrees with the reference within 0.5%, and the **right leg agrees within 0.5% on both chainrings**.`,
        '',
        'Because the left leg carries about half of the power, the total reads about +4% on the 50T: a total error of x% pinned on one leg is a 2x% error on that leg.',
        'The ratio of the two chainrings\' ratios for the left leg (cell "legs", `left_gear_effect`) isolates the gear effect from any constant offset; it is close to +8% as well.',
        '',
        'Next step: repeat one 50T block with a shift signal sent while the chain stays on the 34T. If the left leg then still reads right, the error follows the physical load path, not a firmware correction keyed to the reported gear.',
      ].join('\n')),
    ],
  };
}

function ladderNotebook(uploads: DemoUploads): NotebookDocument {
  const s = DEMO_SCENARIOS['trainer-ladder'];
  const test = s.test.device.label;
  return {
    schemaVersion: NOTEBOOK_SCHEMA_VERSION,
    title: s.title,
    description: `${s.rider.name} rode a power ladder on the trainer with the ${test} (device under test, exported as CSV) and the ${s.reference.device.label} (reference).`,
    parameters: steadyBlockParameters(s.statedTolerancePct, 1),
    slots: slotsOf(s, uploads),
    cells: [
      noteCell('protocol', 'protocol', protocolNote('Protocol', [
        `Rider: ${s.rider.name}. ${s.setting}`,
        '',
        `- Reference: ${s.reference.device.label} (${s.reference.device.kind}), stated +/-1%.`,
        `- Device under test: ${test} (${s.test.device.kind}); its head unit exported a CSV file.`,
        '- Zero offset on both devices after a 10-minute warm-up; one minute easy between blocks; cadence held near 90 rpm.',
        '- Compare block averages, not single seconds: the devices sample and smooth at slightly different moments.',
      ])),
      ...steadyBlockCells(test),
      noteCell('finding', 'finding', [
        '## Finding',
        '',
        `The ${test} reads about **+1.2%** above the reference over the steady blocks, with the same difference at every power and on both chainrings (a scale error, no offset: the line fit has a slope near 1.012 and an intercept near 0 W).`,
        '',
        `That is inside its stated +/-${s.statedTolerancePct}%, and well inside the combined tolerance of the two devices (cell "overall", \`combined_tolerance\`).`,
      ].join('\n')),
    ],
  };
}

function longRideNotebook(uploads: DemoUploads): NotebookDocument {
  const s = DEMO_SCENARIOS['long-ride'];
  const test = s.test.device.label;
  return {
    schemaVersion: NOTEBOOK_SCHEMA_VERSION,
    title: s.title,
    description: `${s.rider.name} rode a 3.5-hour outdoor loop with the ${test} (device under test) and the ${s.reference.device.label} (reference). The head units were started by hand, some seconds apart.`,
    parameters: compareParameters(s.statedTolerancePct),
    slots: slotsOf(s, uploads),
    cells: [
      noteCell('protocol', 'protocol', protocolNote('Protocol', [
        `Rider: ${s.rider.name}. ${s.setting}`,
        '',
        `- Reference: ${s.reference.device.label} (${s.reference.device.kind}).`,
        `- Device under test: ${test} (${s.test.device.kind}).`,
        '- Zero offset on both devices at the start only, so any drift over the ride stays visible.',
        '- The two clocks differ: the alignment finds the offset by cross-correlating the power traces. Link dropouts are missing seconds, never zero power.',
        '- Outdoor rides are ridden in traffic: the rider watches the road, not the numbers.',
      ])),
      ...compareCells(test, 300),
      noteCell('finding', 'finding', [
        '## Finding',
        '',
        `- **Clock offset:** the ${test} file is stamped **37 s** after the reference (cell "aligned", offset found automatically).`,
        `- **Drift:** the difference grows by about **+3 W per hour** while pedalling (cell "whole_ride", \`drift_w_per_h\`): about +1.5 W over the first hour and about +10 W by the end of the ride.`,
        '- **Dropouts:** a few short link losses leave missing seconds in the device file; they are skipped, not counted as zero.',
        '',
        `In the first hour the device reads about +0.6% high, inside its stated +/-${s.statedTolerancePct}%; in the last hour about +5%, outside it. The whole-ride average (about +2.4%) hides that: the error is drift, not scale. Re-zeroing during long rides, or a temperature-compensation check, is the next thing to test.`,
      ].join('\n')),
    ],
  };
}

const BUILDERS: Record<DemoScenarioKey, (uploads: DemoUploads) => NotebookDocument> = {
  'chainring-gain': chainringNotebook,
  'trainer-ladder': ladderNotebook,
  'long-ride': longRideNotebook,
};

/**
 * The demo notebook of a scenario with its slots bound to the given uploads, checked
 * against the notebook document schema.
 *
 * @example buildDemoNotebook('long-ride', { reference: refUpload.id, test: dutUpload.id })
 */
export function buildDemoNotebook(key: DemoScenarioKey, uploads: DemoUploads): NotebookDocument {
  return notebookDocumentSchema.parse(BUILDERS[key](uploads));
}
