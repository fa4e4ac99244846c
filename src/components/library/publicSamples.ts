import { sampleHref } from '../../../shared/api/samples.js';
import { DEMO_SAMPLE_FILES } from '../../../shared/demo/sample-files.js';
import type { SampleFileLink } from '@/composables/useDemoLab';

/**
 * The demo's sample recordings at their public addresses (GET /api/samples/:name): they
 * download for anyone, member of the demo lab or not, signed in or not.
 */
export function publicSampleLinks(): SampleFileLink[] {
  return DEMO_SAMPLE_FILES.map((f) => ({ ...f, href: sampleHref(f.fileName) }));
}
