import { PROTOCOL_CAUTIONS } from '../../../shared/demo/cautions.js';

/**
 * The protocol cautions as plain sentences, read from the same Markdown the notebooks
 * carry so the library and the notes never say different things.
 */
export function cautionItems(markdown: string = PROTOCOL_CAUTIONS): string[] {
  return markdown
    .split('\n')
    .filter((line) => line.startsWith('- '))
    .map((line) => line.slice(2).replace(/\*\*/g, '').trim());
}

/** A protocol note without its heading and without the cautions (shown once, beside the cards). */
export function protocolSteps(markdown: string): string {
  return markdown
    .replace(PROTOCOL_CAUTIONS, '')
    .replace(/^##[^\n]*\n/, '')
    .trim();
}
