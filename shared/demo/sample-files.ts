import type { NotebookDocument } from '../notebook/document.js';
import { DEMO_SCENARIOS, type DemoScenarioKey } from './scenarios.js';

/** A demo file offered to a new user to try the upload flow with. */
export interface DemoSampleFile {
  /** Demo notebook whose slot binds the file (its upload id is read from there). */
  scenario: DemoScenarioKey;
  notebookTitle: string;
  slot: 'reference' | 'test';
  fileName: string;
  format: 'fit' | 'csv';
  device: string;
  /** One line for the link's description. */
  description: string;
}

const chainring = DEMO_SCENARIOS['chainring-gain'];

/**
 * The two files of the chainring demo, stored as ordinary uploads of the lab at first
 * start. Their upload ids are the `uploadId`s of the demo notebook's slots (see
 * {@link sampleUploadIds}); download them from `GET /api/uploads/:id/content`.
 */
export const DEMO_SAMPLE_FILES: readonly DemoSampleFile[] = [chainring.reference, chainring.test].map((f) => ({
  scenario: chainring.key,
  notebookTitle: chainring.title,
  slot: f.slot,
  fileName: f.fileName,
  format: f.format,
  device: f.device.label,
  description: f.slot === 'reference' ? `Reference: ${f.device.label}, steady blocks on both chainrings (FIT)` : `Device under test: ${f.device.label}, same ride (FIT)`,
}));

/** The upload id bound to each slot of a demo notebook (null when the slot is empty or absent). */
export function sampleUploadIds(document: NotebookDocument): Record<'reference' | 'test', string | null> {
  const idOf = (name: string): string | null => document.slots.find((s) => s.name === name)?.uploadId ?? null;
  return { reference: idOf('reference'), test: idOf('test') };
}

/**
 * The demo notebook to publish for signed-out readers once publishing exists: the
 * chainring finding, the one a reader understands without running anything.
 */
export const DEMO_PUBLISHED_NOTEBOOK: { readonly key: DemoScenarioKey; readonly title: string } = {
  key: chainring.key,
  title: chainring.title,
};
