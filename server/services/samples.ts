import { sampleHref, type SampleFile, type SampleListResponse } from '../../shared/api/samples.js';
import { generateDemoFiles } from '../../shared/demo/demo-files.js';
import { DEMO_SAMPLE_FILES } from '../../shared/demo/sample-files.js';
import { DEMO_SCENARIOS } from '../../shared/demo/scenarios.js';
import { notFound } from '../errors.js';

/** A sample's bytes with what a download needs. */
export interface SampleContent {
  sample: SampleFile;
  bytes: Uint8Array;
  contentType: string;
}

const CONTENT_TYPES = { fit: 'application/vnd.ant.fit', csv: 'text/csv; charset=utf-8' } as const;

/**
 * The demo's sample recordings, generated from the same seeds as the lab's own files
 * (byte for byte what the demo notebook reads), so they need neither the database nor a
 * membership: anyone may download them. Generated once per process on first use.
 */
export function sampleFiles(): () => Promise<SampleContent[]> {
  let made: Promise<SampleContent[]> | undefined;
  return () =>
    (made ??= Promise.resolve().then(() => {
      const files = new Map<string, Uint8Array>();
      for (const key of new Set(DEMO_SAMPLE_FILES.map((s) => s.scenario))) {
        for (const f of generateDemoFiles(DEMO_SCENARIOS[key])) files.set(`${key}/${f.slot}`, f.bytes);
      }
      return DEMO_SAMPLE_FILES.map((s) => {
        const bytes = files.get(`${s.scenario}/${s.slot}`)!;
        return {
          sample: { name: s.fileName, format: s.format, device: s.device, slot: s.slot, description: s.description, size: bytes.byteLength, href: sampleHref(s.fileName) },
          bytes,
          contentType: CONTENT_TYPES[s.format],
        };
      });
    }));
}

export async function listSamples(all: () => Promise<SampleContent[]>): Promise<SampleListResponse> {
  return { samples: (await all()).map((c) => c.sample) };
}

export async function getSample(all: () => Promise<SampleContent[]>, name: string): Promise<SampleContent> {
  const found = (await all()).find((c) => c.sample.name === name);
  if (!found) throw notFound('Sample file');
  return found;
}
