import { mkdirSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import supertest from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, signUp, type Agent, type TestApp } from './helpers/test-app.js';

let t: TestApp;
let agent: Agent;

beforeAll(async () => {
  t = await createTestApp();
  agent = (await signUp(t, 'shape@lab.test')).agent;
});
afterAll(async () => t.close());

describe('error shape and headers', () => {
  it('answers malformed JSON with 400 malformed_json', async () => {
    const res = await agent.post('/api/notebooks').set('Content-Type', 'application/json').send('{"workspaceId": ').expect(400);
    expect(res.body).toEqual({ error: { code: 'malformed_json', message: expect.any(String) } });
  });

  it('answers an oversize JSON body with 413', async () => {
    const huge = JSON.stringify({ workspaceId: 'x', document: { description: 'x'.repeat(6 * 1024 * 1024) } });
    const res = await agent.post('/api/notebooks').set('Content-Type', 'application/json').send(huge).expect(413);
    expect(res.body.error.code).toBe('payload_too_large');
    expect(res.body.error.details.limitMb).toBe(5);
  });

  it('answers a schema violation with 400 and field details', async () => {
    const res = await agent.post('/api/notebooks').send({ workspaceId: '' }).expect(400);
    expect(res.body.error.code).toBe('validation_failed');
    const paths = res.body.error.details.fields.map((f: { path: string }) => f.path);
    expect(paths).toEqual(expect.arrayContaining(['workspaceId', 'document']));
  });

  it('answers unknown /api and /assets paths with 404 in the error shape, not the page', async () => {
    for (const path of ['/api/nothing-here', '/api/notebooks/x/y/z', '/assets/missing-chunk.js']) {
      const res = await agent.get(path).expect(404);
      expect(res.headers['content-type']).toMatch(/json/);
      expect(res.body.error.code).toBe('not_found');
    }
  });

  it('refuses a state-changing call from another site', async () => {
    const res = await agent.post('/api/notebooks').set('Origin', 'http://evil.example').send({}).expect(403);
    expect(res.body.error.code).toBe('forbidden_origin');
    await agent.post('/api/notebooks').set('Origin', 'http://localhost:3000').send({}).expect(400);
  });

  it('tags every response with a request id', async () => {
    const res = await supertest(t.app).get('/api/health').expect(200);
    expect(res.headers['x-request-id']).toMatch(/^[\w-]{8,}$/);
    expect(res.body).toEqual({ status: 'ok', database: t.database.kind, version: 'test' });
  });

  it('serves the page with a strict CSP and the engine worker with its own', async () => {
    // A throwaway client build in a temporary root, so the test does not depend on `vite build`.
    const root = join(t.config.dataDir, 'root');
    mkdirSync(join(root, 'dist', 'client', 'assets'), { recursive: true });
    writeFileSync(join(root, 'dist', 'client', 'index.html'), '<!doctype html><title>Cogbook</title>');
    writeFileSync(join(root, 'dist', 'client', 'assets', 'engine.worker-abc123.js'), 'self.onmessage = () => {};');
    writeFileSync(join(root, 'dist', 'client', 'assets', 'index-abc123.js'), 'console.log(1);');
    try {
      const { app } = t.appWith({ rootDir: root });
      const page = await supertest(app).get('/notebooks/some-id').expect(200);
      expect(page.text).toContain('<title>Cogbook</title>');
      const csp = page.headers['content-security-policy']!;
      expect(csp).toContain("script-src 'self'");
      expect(csp).toContain("object-src 'none'");
      expect(csp).toContain("frame-ancestors 'none'");
      expect(csp).not.toContain('unsafe-eval');
      const asset = await supertest(app).get('/assets/index-abc123.js').expect(200);
      expect(asset.headers['content-security-policy']).not.toContain('unsafe-eval');
      const worker = await supertest(app).get('/assets/engine.worker-abc123.js').expect(200);
      expect(worker.headers['content-security-policy']).toContain("'unsafe-eval'");
    } finally {
      rmSync(root, { recursive: true, force: true });
    }
  });
});
