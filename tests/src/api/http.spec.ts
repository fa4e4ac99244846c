import { afterEach, describe, expect, it, vi } from 'vitest';
import { ApiError, request } from '@/api/http';

function answer(status: number, body: unknown, contentType = 'application/json'): Response {
  const text = typeof body === 'string' ? body : JSON.stringify(body);
  return new Response(text, { status, headers: { 'content-type': contentType } });
}

afterEach(() => {
  vi.unstubAllGlobals();
});

describe('request', () => {
  it('maps the server error body to an ApiError with code, message, status and details', async () => {
    const details = { currentRevision: 5, baseRevision: 4 };
    vi.stubGlobal(
      'fetch',
      vi.fn(async () =>
        answer(409, { error: { code: 'stale_revision', message: 'Someone saved first.', details } }),
      ),
    );

    const error = await request('/api/notebooks/n1', { method: 'PUT', body: {} }).catch((e: unknown) => e);

    expect(error).toBeInstanceOf(ApiError);
    expect(error).toMatchObject({ code: 'stale_revision', message: 'Someone saved first.', status: 409, details });
  });

  it('gives a readable ApiError when the failure body is not the agreed shape', async () => {
    vi.stubGlobal('fetch', vi.fn(async () => answer(502, '<html>Bad gateway</html>', 'text/html')));

    const error = await request('/api/me').catch((e: unknown) => e);

    expect(error).toBeInstanceOf(ApiError);
    expect(error).toMatchObject({ code: 'internal', status: 502 });
    expect((error as ApiError).message).toContain('502');
  });

  it('reports a lost connection as code network with status 0', async () => {
    vi.stubGlobal('fetch', vi.fn(async () => Promise.reject(new TypeError('Failed to fetch'))));

    await expect(request('/api/me')).rejects.toMatchObject({ code: 'network', status: 0 });
  });

  it('sends JSON with the same-origin cookie and returns the parsed answer', async () => {
    const fetchMock = vi.fn(async (_url: string, _init: RequestInit) => answer(201, { ok: 1 }));
    vi.stubGlobal('fetch', fetchMock);

    const result = await request<{ ok: number }>('/api/notebooks', {
      method: 'POST',
      body: { a: 1 },
      query: { workspaceId: 'w 1', skip: undefined },
    });

    expect(result).toEqual({ ok: 1 });
    const [url, init] = fetchMock.mock.calls[0]!;
    expect(url).toBe('/api/notebooks?workspaceId=w+1');
    expect(init.credentials).toBe('same-origin');
    expect(init.body).toBe('{"a":1}');
    expect((init.headers as Record<string, string>)['content-type']).toBe('application/json');
  });

  it('answers undefined for 204 No Content', async () => {
    vi.stubGlobal('fetch', vi.fn(async () => new Response(null, { status: 204 })));
    await expect(request('/api/notebooks/n1', { method: 'DELETE' })).resolves.toBeUndefined();
  });
});
