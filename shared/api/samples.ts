import { z } from 'zod';
import { recordingFormatSchema } from './uploads.js';

/** One downloadable sample recording of the demo lab. */
export const sampleFileSchema = z.object({
  /** File name, also the last part of its address. */
  name: z.string(),
  format: recordingFormatSchema,
  /** Which device recorded it (the demo's invented device). */
  device: z.string(),
  slot: z.enum(['reference', 'test']),
  description: z.string(),
  size: z.number().int().positive(),
  /** Download address: GET it for the file (public, no session needed). */
  href: z.string(),
});
export type SampleFile = z.infer<typeof sampleFileSchema>;

/** GET /api/samples: the demo's sample recordings, public to every visitor. */
export const sampleListResponseSchema = z.object({ samples: z.array(sampleFileSchema) });
export type SampleListResponse = z.infer<typeof sampleListResponseSchema>;

/** Route params of GET /api/samples/:name. */
export const sampleParamsSchema = z.object({ name: z.string().min(1).max(200) });

/** Address of a sample file by name. */
export function sampleHref(name: string): string {
  return `/api/samples/${encodeURIComponent(name)}`;
}
