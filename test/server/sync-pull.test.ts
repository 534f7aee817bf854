import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { PullResponse, z, type PulledEntry } from '../../src/schema/index';
import { api, enrolDevice, makeSample, setupEntries, SITE, startTestServer, testUuid, type TestServer } from './fixtures';
import { describeBackends } from './backends';

describeBackends('pull', (backend) => {
  let server: TestServer;
  let device: { deviceId: string; deviceToken: string };
  beforeEach(async () => {
    server = await startTestServer({ backend });
    device = await enrolDevice(server);
  });
  afterEach(async () => server.close());

  async function pull(query: string): Promise<PullResponse> {
    const res = await api(server, 'GET', `/api/v1/sync/pull${query}`, { device: device.deviceToken });
    expect(res.statusCode).toBe(200);
    return z.parse(PullResponse, res.json());
  }

  async function pullAll(limit: number): Promise<{ entries: PulledEntry[]; pages: number }> {
    const entries: PulledEntry[] = [];
    let after = 0;
    let pages = 0;
    for (;;) {
      const page = await pull(`?after=${after}&limit=${limit}`);
      pages += 1;
      entries.push(...page.entries);
      after = page.next;
      if (!page.hasMore) return { entries, pages };
    }
  }

  describe('GET /api/v1/sync/pull', () => {
    it('returns set-up entries (people without secrets) from the start of the log', async () => {
      const page = await pull('');
      const kinds = page.entries.map((e) => e.entry.kind);
      expect(kinds).toEqual(setupEntries().map((e) => e.kind));
      const person = page.entries.find((e) => e.entry.kind === 'person');
      expect(Object.keys(person?.entry.body ?? {}).sort()).toEqual(['active', 'id', 'login', 'name', 'role']);
      expect(JSON.stringify(page.entries)).not.toMatch(/pin|verifier|hash/i);
    });

    it('pages through set-up and records in serverSeq order with no gap and no repeat', async () => {
      const records = Array.from({ length: 23 }, () => makeSample(device.deviceId));
      await api(server, 'POST', '/api/v1/sync/push', { device: device.deviceToken, body: { batchId: testUuid(), records } });
      const { entries, pages } = await pullAll(5);
      const total = setupEntries().length + records.length;
      expect(entries).toHaveLength(total);
      expect(pages).toBe(Math.ceil(total / 5));
      const seqs = entries.map((e) => e.serverSeq);
      expect(seqs).toEqual([...seqs].sort((a, b) => a - b));
      expect(new Set(seqs).size).toBe(seqs.length);
      expect(entries.filter((e) => e.entry.kind === 'record').map((e) => e.entry.id)).toEqual(records.map((r) => r.id));
    });

    it('gives next = after and hasMore = false when nothing is newer', async () => {
      const first = await pull('?limit=500');
      const again = await pull(`?after=${first.next}`);
      expect(again).toMatchObject({ entries: [], next: first.next, hasMore: false });
    });

    it('carries a set-up update as a new log row with the same entity id', async () => {
      const before = await pull('?limit=500');
      await server.store.appendSetup([{ siteId: SITE, record: { kind: 'line', id: 'ln-1', body: { id: 'ln-1', siteId: SITE, name: 'Line 1 (renamed)' } } }], server.now().toISOString());
      const after = await pull(`?after=${before.next}`);
      expect(after.entries).toHaveLength(1);
      expect(after.entries[0]?.entry).toEqual({ kind: 'line', id: 'ln-1', body: { id: 'ln-1', siteId: SITE, name: 'Line 1 (renamed)' } });
      expect(after.entries[0]?.serverSeq).toBeGreaterThan(before.next);
    });

    it('shows a device only its own site', async () => {
      await server.store.appendSetup([{ siteId: 'site-other', record: { kind: 'site', id: 'site-other', body: { id: 'site-other', name: 'Elsewhere' } } }], server.now().toISOString());
      const page = await pull('?limit=500');
      expect(page.entries.some((e) => e.entry.id === 'site-other')).toBe(false);
    });

    it.each(['?after=-1', '?after=abc', '?limit=0', '?limit=501', '?after=1.5'])('refuses %s with 400', async (q) => {
      const res = await api(server, 'GET', `/api/v1/sync/pull${q}`, { device: device.deviceToken });
      expect(res.statusCode).toBe(400);
      expect(res.json().error).toBe('bad-request');
    });
  });
});
