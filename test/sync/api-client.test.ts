import { describe, expect, it } from 'vitest';
import { PROTOCOL_HEADER } from '../../src/schema';
import { ApiError, createApiClient, pullEntries, pushRecords, type ApiErrorCode } from '../../src/sync/api-client';
import { makeSample } from '../store/helpers';
import { BASE_URL, FakeSyncServer } from './fake-server';

const TOKEN = 'device-token-1';

function answering(status: number, body: string, headers: Record<string, string> = {}) {
  const seen: { url: string; init: RequestInit | undefined }[] = [];
  const fetch = (async (url: string, init?: RequestInit) => {
    seen.push({ url, init });
    return new Response(body, { status, headers });
  }) as unknown as typeof globalThis.fetch;
  return { fetch, seen };
}

async function codeOf(p: Promise<unknown>): Promise<ApiErrorCode | 'resolved'> {
  try {
    await p;
    return 'resolved';
  } catch (e) {
    expect(e).toBeInstanceOf(ApiError);
    return (e as ApiError).code;
  }
}

describe('api client', () => {
  it('sends the protocol header and the bearer token, and validates the answer', async () => {
    const { fetch, seen } = answering(200, JSON.stringify({ serverEpoch: 'e', results: [] }), { 'content-type': 'application/json' });
    await pushRecords({ baseUrl: BASE_URL + '/', fetch }, TOKEN, { batchId: makeSample().id, records: [makeSample()] });
    expect(seen[0]?.url).toBe(`${BASE_URL}/sync/push`);
    const headers = seen[0]?.init?.headers as Record<string, string>;
    expect(headers[PROTOCOL_HEADER]).toBe('1');
    expect(headers.authorization).toBe(`Bearer ${TOKEN}`);
  });

  it('pushes to and pulls from the fake server', async () => {
    const server = new FakeSyncServer();
    const api = createApiClient({ baseUrl: BASE_URL, fetch: server.fetch });
    const s = makeSample();
    const res = await api.pushRecords(TOKEN, { batchId: makeSample().id, records: [s] });
    expect(res.results).toEqual([{ id: s.id, status: 'stored', serverSeq: 1 }]);
    const page = await api.pullEntries(TOKEN, 0, 10);
    expect(page).toMatchObject({ serverEpoch: 'epoch-1', next: 1, hasMore: false });
    expect(page.entries).toHaveLength(1);
  });

  it('maps failures to codes', async () => {
    const cfg = (status: number, body: string, headers: Record<string, string> = {}) => ({
      baseUrl: BASE_URL,
      fetch: answering(status, body, headers).fetch,
    });
    const err = JSON.stringify({ error: 'x', message: 'why' });
    expect(await codeOf(pullEntries(cfg(401, err), TOKEN, 0))).toBe('unauthorized');
    expect(await codeOf(pullEntries(cfg(403, err), TOKEN, 0))).toBe('unauthorized');
    expect(await codeOf(pullEntries(cfg(426, err), TOKEN, 0))).toBe('protocol-mismatch');
    expect(await codeOf(pullEntries(cfg(400, err), TOKEN, 0))).toBe('rejected');
    expect(await codeOf(pullEntries(cfg(413, 'too big'), TOKEN, 0))).toBe('rejected');
    expect(await codeOf(pullEntries(cfg(500, err), TOKEN, 0))).toBe('server');
    expect(await codeOf(pullEntries(cfg(429, err), TOKEN, 0))).toBe('server');
    // A captive portal's 200 HTML page is not an answer (sync.md §2.15).
    expect(await codeOf(pullEntries(cfg(200, '<html>Sign in to Wi-Fi</html>', { 'content-type': 'text/html' }), TOKEN, 0))).toBe('bad-response');
    expect(await codeOf(pullEntries(cfg(200, JSON.stringify({ results: 'nope' })), TOKEN, 0))).toBe('bad-response');
    const offline = { baseUrl: BASE_URL, fetch: (async () => { throw new TypeError('fetch failed'); }) as unknown as typeof fetch };
    expect(await codeOf(pullEntries(offline, TOKEN, 0))).toBe('offline');
  });

  it('keeps the server message and Retry-After', async () => {
    const { fetch } = answering(503, JSON.stringify({ error: 'maintenance', message: 'Back at 9' }), { 'retry-after': '7' });
    const error = (await pullEntries({ baseUrl: BASE_URL, fetch }, TOKEN, 0).catch((e: unknown) => e)) as ApiError;
    expect(error.code).toBe('server');
    expect(error.message).toMatch(/Back at 9/);
    expect(error.details).toEqual({ status: 503, serverCode: 'maintenance', retryAfterMs: 7_000 });
  });

  it('counts a call that never answers as offline (timeout)', async () => {
    const hanging = ((_url: string, init?: RequestInit) =>
      new Promise((_resolve, reject) => {
        init?.signal?.addEventListener('abort', () => reject(new DOMException('aborted', 'AbortError')));
      })) as unknown as typeof fetch;
    const error = (await pullEntries({ baseUrl: BASE_URL, fetch: hanging, timeoutMs: 10 }, TOKEN, 0).catch((e: unknown) => e)) as ApiError;
    expect(error.code).toBe('offline');
    expect(error.message).toMatch(/in time/);
  });

  it('refuses an invalid enrolment or sign-in before sending', async () => {
    const { fetch, seen } = answering(200, '{}');
    const api = createApiClient({ baseUrl: BASE_URL, fetch });
    expect(await codeOf(api.enrolDevice({ code: '', deviceName: 'Tab' }))).toBe('rejected');
    expect(await codeOf(api.signIn(TOKEN, { login: 'ann', pin: '12' }))).toBe('rejected');
    expect(seen).toHaveLength(0);
  });
});
