import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { ApiError, api, clearCsrfToken, setCsrfToken, setUnauthorisedHandler } from './api-client';

type Call = { url: string; method: string; headers: Record<string, string>; body?: string };

function json(status: number, body: unknown): Response {
  return new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } });
}

let calls: Call[] = [];
function stubFetch(responder: (call: Call, index: number) => Response) {
  vi.stubGlobal('fetch', async (url: string, init: RequestInit) => {
    const call = { url, method: String(init.method), headers: (init.headers ?? {}) as Record<string, string>, body: init.body as string | undefined };
    calls.push(call);
    return responder(call, calls.length - 1);
  });
}

beforeEach(() => {
  calls = [];
  clearCsrfToken();
  setUnauthorisedHandler(null);
});
afterEach(() => vi.unstubAllGlobals());

describe('api client', () => {
  it('fetches the CSRF token once and sends it on every write', async () => {
    stubFetch((c) => (c.url === '/api/auth/csrf' ? json(200, { token: 't1' }) : json(200, { ok: true })));
    await api.post('/sites', { name: 'A' });
    await api.put('/sites/1', { name: 'B' });
    expect(calls.map((c) => `${c.method} ${c.url}`)).toEqual(['GET /api/auth/csrf', 'POST /api/sites', 'PUT /api/sites/1']);
    expect(calls[1].headers['x-csrf-token']).toBe('t1');
    expect(calls[2].headers['x-csrf-token']).toBe('t1');
    expect(calls[1].body).toBe('{"name":"A"}');
  });

  it('sends no token on reads and builds the query string without empty values', async () => {
    stubFetch(() => json(200, { items: [] }));
    await api.get('/users', { query: { page: 2, q: '', sort: undefined, dir: 'desc' } });
    expect(calls[0].url).toBe('/api/users?page=2&dir=desc');
    expect(calls[0].headers['x-csrf-token']).toBeUndefined();
  });

  it('refreshes a stale token once and retries after csrf_failed', async () => {
    setCsrfToken('old');
    stubFetch((c, i) => {
      if (c.url === '/api/auth/csrf') return json(200, { token: 'new' });
      return i === 0 ? json(403, { error: { code: 'csrf_failed', message: 'stale' } }) : json(200, { ok: true });
    });
    await expect(api.patch('/users/3', { name: 'X' })).resolves.toEqual({ ok: true });
    expect(calls.map((c) => c.headers['x-csrf-token'] ?? c.url)).toEqual(['old', '/api/auth/csrf', 'new']);
  });

  it('turns an error body into a typed ApiError with field details', async () => {
    setCsrfToken('t');
    stubFetch(() => json(400, { error: { code: 'invalid_input', message: 'Invalid site', details: [{ path: 'altitudeM', message: 'above 5,000 m?' }] } }));
    const error = await api.post('/sites', {}).catch((e) => e);
    expect(error).toBeInstanceOf(ApiError);
    expect(error).toMatchObject({ status: 400, code: 'invalid_input', message: 'Invalid site', details: [{ path: 'altitudeM', message: 'above 5,000 m?' }] });
  });

  it('gives a readable error for a gateway page that is not our JSON', async () => {
    stubFetch(() => new Response('<html>Bad gateway</html>', { status: 502 }));
    await expect(api.get('/overview')).rejects.toMatchObject({ status: 502, code: 'http_502' });
  });

  it('calls the sign-in handler on a 401, unless the caller expects the 401', async () => {
    const handler = vi.fn();
    setUnauthorisedHandler(handler);
    stubFetch(() => json(401, { error: { code: 'unauthorised', message: 'Sign in first' } }));
    await expect(api.get('/sites')).rejects.toMatchObject({ status: 401 });
    expect(handler).toHaveBeenCalledTimes(1);
    await expect(api.get('/auth/me', { on401: 'throw' })).rejects.toMatchObject({ status: 401 });
    expect(handler).toHaveBeenCalledTimes(1);
  });

  it('reports a network failure as status 0', async () => {
    vi.stubGlobal('fetch', async () => {
      throw new TypeError('Failed to fetch');
    });
    await expect(api.get('/sites')).rejects.toMatchObject({ status: 0, code: 'network_error' });
  });
});
