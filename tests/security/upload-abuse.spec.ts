import { createHash } from 'node:crypto';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { fitCrc } from '../../shared/recording/fit-crc.js';
import { importRecording } from '../../shared/recording/import-recording.js';
import { fitBytes } from '../server/helpers/fixtures.js';
import { createTestApp, personalWorkspaceOf, signUp, type Agent, type TestApp } from '../server/helpers/test-app.js';

/**
 * The upload route against random bytes, hostile file names, oversize bodies and
 * files that claim to be far larger than they are. Parser-level fuzzing of FIT and CSV
 * (byte flips, cuts, insertions) lives in tests/shared/recording/fuzz.spec.ts.
 */
const RUNS = Number(process.env.FUZZ_RUNS ?? 150);
const LIMIT_MB = 3;

let t: TestApp;
let agent: Agent;
let workspaceId: string;

beforeAll(async () => {
  t = await createTestApp({ UPLOAD_LIMIT_MB: String(LIMIT_MB) });
  agent = (await signUp(t, 'uploader@lab.test')).agent;
  workspaceId = await personalWorkspaceOf(agent);
});
afterAll(async () => t?.close());

const sha256 = (b: Uint8Array) => createHash('sha256').update(b).digest('hex');

function expectTypedAnswer(res: { status: number; body: { error?: unknown; uploads?: unknown } }, what: string): void {
  expect([201, 400, 413, 415], `${what}: ${res.status} ${JSON.stringify(res.body).slice(0, 300)}`).toContain(res.status);
  if (res.status === 201) expect(Array.isArray(res.body.uploads)).toBe(true);
  else expect(res.body.error, what).toMatchObject({ code: expect.any(String), message: expect.any(String) });
}

/** A FIT header (14 bytes, valid header CRC) that claims `dataSize` bytes of records. */
function fitHeaderClaiming(dataSize: number, bodyBytes: number): Uint8Array {
  const out = new Uint8Array(14 + bodyBytes + 2);
  out[0] = 14;
  out[1] = 0x20;
  out.set([dataSize & 255, (dataSize >>> 8) & 255, (dataSize >>> 16) & 255, dataSize >>> 24], 4);
  out.set([0x2e, 0x46, 0x49, 0x54], 8);
  const crc = fitCrc(out, 0, 12);
  out[12] = crc & 255;
  out[13] = crc >>> 8;
  return out;
}

describe('POST /api/uploads under hostile input', () => {
  it(`answers random bytes and names with 201 or a typed 4xx, never a 500 (${RUNS} runs)`, async () => {
    const statuses = new Map<number, number>();
    const name = fc.oneof(
      fc.string({ minLength: 1, maxLength: 40 }),
      fc.constantFrom('ride.fit', 'ride.csv', '../../etc/passwd', '..\\..\\boot.ini', '<img src=x onerror=alert(1)>.csv', 'a\u0000b.csv', '\ud800.fit', 'x'.repeat(300) + '.csv', 'ride.fit\r\nX-Injected: 1'),
    );
    const bytes = fc.oneof(
      fc.uint8Array({ minLength: 0, maxLength: 4096 }),
      fc.string({ maxLength: 2000 }).map((s) => new TextEncoder().encode(s)),
      fc.uint8Array({ minLength: 0, maxLength: 64 }).map((tail) => Uint8Array.from([...fitBytes(3), ...tail])),
    );
    await fc.assert(
      fc.asyncProperty(bytes, name, async (b, n) => {
        const res = await agent.post('/api/uploads').field('workspaceId', workspaceId).attach('file', Buffer.from(b), n);
        statuses.set(res.status, (statuses.get(res.status) ?? 0) + 1);
        expectTypedAnswer(res, `${b.length} bytes named ${JSON.stringify(n)}`);
        if (res.status === 201) {
          const meta = (res.body as { uploads: { id: string; sha256: string; fileName: string }[] }).uploads[0]!;
          expect(meta.sha256).toBe(sha256(b));
          // The stored name comes back as data: the download header is encoded, never raw.
          const content = await agent.get(`/api/uploads/${meta.id}/content`).buffer(true).parse((r, cb) => {
            const chunks: Buffer[] = [];
            r.on('data', (c: Buffer) => chunks.push(c));
            r.on('end', () => cb(null, Buffer.concat(chunks)));
          });
          expect(content.status).toBe(200);
          expect(content.headers['content-disposition']).toMatch(/^attachment; filename\*=UTF-8''[\w%.!~*'()-]*$/);
          expect(content.headers['x-injected']).toBeUndefined();
        }
      }),
      { numRuns: RUNS },
    );
    expect(statuses.get(201)).toBeGreaterThan(0);
    expect(statuses.get(415)).toBeGreaterThan(0);
  });

  it('answers a malformed multipart body with a typed 400', async () => {
    const bodies = [
      '--x\r\nContent-Disposition: form-data; name="file"; filename="a.csv"\r\n\r\nno end boundary',
      'not multipart at all',
      '--x--',
    ];
    for (const body of bodies) {
      const res = await agent.post('/api/uploads').set('Content-Type', 'multipart/form-data; boundary=x').send(body);
      expectTypedAnswer(res, JSON.stringify(body));
      expect(res.status).toBe(400);
    }
  });

  it(`refuses a file over the limit with 413 naming ${LIMIT_MB} MB, and too many files with 400`, async () => {
    const big = Buffer.alloc(LIMIT_MB * 1024 * 1024 + 1, 0x30);
    const res = await agent.post('/api/uploads').attach('file', big, 'huge.csv').expect(413);
    expect(res.body.error.code).toBe('payload_too_large');
    expect(res.body.error.message).toContain(`${LIMIT_MB} MB`);
    expect(res.body.error.details.limitMb).toBe(LIMIT_MB);
    let many = agent.post('/api/uploads');
    for (let i = 0; i < 21; i++) many = many.attach('file', Buffer.from(`time,power\n0,${i}\n`), `f${i}.csv`);
    const tooMany = await many;
    expect(tooMany.status).toBe(400);
    expect(tooMany.body.error.code).toBe('bad_upload');
  });

  it('refuses a FIT file whose header claims gigabytes of records, fast and without allocating them', async () => {
    for (const claimed of [0xfffffff0, 2 ** 31, 50 * 1024 * 1024]) {
      const file = fitHeaderClaiming(claimed, 64);
      const heapBefore = process.memoryUsage().heapUsed;
      const started = performance.now();
      const res = await agent.post('/api/uploads').attach('file', Buffer.from(file), 'bomb.fit');
      expect(performance.now() - started).toBeLessThan(5000);
      expect(res.status).toBe(415);
      expect(res.body.error.details.reason).toBe('fit_truncated');
      expect(res.body.error.message).toContain('bomb.fit');
      expect(process.memoryUsage().heapUsed - heapBefore).toBeLessThan(64 * 1024 * 1024);
      // The engine the browser runs says the same, just as fast.
      const result = await importRecording(file, 'bomb.fit', { readDamaged: true });
      expect(result.ok).toBe(false);
      expect(performance.now() - started).toBeLessThan(10_000);
    }
  });

  it('reads a CSV with a million empty columns or one giant line to a clear error in bounded time and memory', async () => {
    const wideHeader = new TextEncoder().encode(`time,power${','.repeat(1_000_000)}\n0,250${','.repeat(1_000_000)}\n`);
    const oneLine = new TextEncoder().encode('9'.repeat(2_500_000));
    for (const [file, name] of [[wideHeader, 'wide.csv'], [oneLine, 'line.csv']] as const) {
      const started = performance.now();
      const res = await agent.post('/api/uploads').attach('file', Buffer.from(file), name);
      // Stored as text (it is UTF-8); the parser, which runs on the reader's side, is what must cope.
      expectTypedAnswer(res, name);
      const heapBefore = process.memoryUsage().heapUsed;
      const result = await importRecording(file, name);
      const seconds = (performance.now() - started) / 1000;
      expect(seconds, name).toBeLessThan(20);
      expect(result.ok, name).toBe(false);
      if (!result.ok) {
        expect(result.error.message).toContain(name);
        expect(result.error.code).not.toBe('unreadable');
      }
      expect(process.memoryUsage().heapUsed - heapBefore, name).toBeLessThan(512 * 1024 * 1024);
    }
  });
});
