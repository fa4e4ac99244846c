import { Decoder, Stream } from '@garmin/fitsdk';
import supertest from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sampleListResponseSchema } from '../../shared/api/samples.js';
import { DEMO_SAMPLE_FILES } from '../../shared/demo/sample-files.js';
import { createTestApp, signUp, type TestApp } from './helpers/test-app.js';

let t: TestApp;

beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => t.close());

const binary = (res: supertest.Response, cb: (err: Error | null, body: Buffer) => void) => {
  const chunks: Buffer[] = [];
  res.on('data', (c: Buffer) => chunks.push(c));
  res.on('end', () => cb(null, Buffer.concat(chunks)));
};

describe('public sample files', () => {
  it('lists the demo sample recordings to a signed-out visitor', async () => {
    const res = await supertest(t.app).get('/api/samples').expect(200);
    const { samples } = sampleListResponseSchema.parse(res.body);
    expect(samples.map((s) => s.name)).toEqual(DEMO_SAMPLE_FILES.map((f) => f.fileName));
    expect(samples.every((s) => s.href === `/api/samples/${encodeURIComponent(s.name)}`)).toBe(true);
  });

  it('serves every sample as a download a FIT decoder accepts, to signed-out visitors and to users outside the demo lab', async () => {
    const { samples } = sampleListResponseSchema.parse((await supertest(t.app).get('/api/samples')).body);
    const newcomer = await signUp(t, 'newcomer@elsewhere.test');
    for (const sample of samples) {
      for (const agent of [supertest(t.app), newcomer.agent]) {
        const res = await agent.get(sample.href).buffer(true).parse(binary).expect(200);
        const body = res.body as Buffer;
        expect(res.headers['content-type']).toBe(sample.format === 'fit' ? 'application/vnd.ant.fit' : 'text/csv; charset=utf-8');
        expect(res.headers['content-disposition']).toContain(`filename*=UTF-8''${encodeURIComponent(sample.name)}`);
        expect(res.headers['content-disposition']).toMatch(/^attachment;/);
        expect(body.byteLength).toBe(sample.size);
        if (sample.format === 'fit') {
          // Checked with the FIT SDK's own decoder, not Cogbook's reader.
          const decoder = new Decoder(Stream.fromByteArray([...body]));
          expect(decoder.isFIT()).toBe(true);
          expect(decoder.checkIntegrity()).toBe(true);
          const { messages, errors } = decoder.read();
          expect(errors).toEqual([]);
          expect((messages.recordMesgs ?? []).length).toBeGreaterThan(60);
        }
      }
    }
  });

  it('answers 404 for a name that is not a sample', async () => {
    await supertest(t.app).get('/api/samples/not-a-sample.fit').expect(404);
    await supertest(t.app).get('/api/samples/..%2Fsecret').expect(404);
  });
});
