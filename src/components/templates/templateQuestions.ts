import type { TemplateKey } from '../../../shared/demo/templates.js';

/**
 * The question each template answers, in a tester's words: the line a newcomer matches
 * against their own work before reading the details.
 */
export const templateQuestions: Record<TemplateKey, string> = {
  'compare-two-files': 'Does my device agree with the reference over a whole ride?',
  'per-leg-by-chainring': 'Does one leg read differently on one chainring?',
  'steady-blocks': 'How far off is my device at each power of a ladder?',
};
