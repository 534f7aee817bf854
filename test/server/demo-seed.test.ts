import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DeviceRecord, PullResponse, z } from '../../src/schema/index';
import { createServer } from '../../src/server/create-server';
import { buildDemoHistory } from '../../src/server/demo/demo-history';
import { DEMO_CHARACTERISTICS, DEMO_PEOPLE, DEMO_SITE_ID } from '../../src/server/demo/demo-site';
import { mulberry32, seededUuidV7 } from '../../src/server/demo/prng';
import { hasDemo, seedDemo } from '../../src/server/demo/seed-demo';
import { issueEnrolmentCode } from '../../src/server/routes/admin-enrolment-codes';
import type { ServerStore } from '../../src/server/store/server-store';
import { describeBackends, openTestStore } from './backends';
import { PROTOCOL } from './fixtures';

const NOW = new Date('2026-12-02T09:30:00.000Z');

describe('buildDemoHistory()', () => {
  const history = buildDemoHistory(NOW);

  it('is deterministic: the same now gives the same records', () => {
    expect(buildDemoHistory(NOW)).toEqual(history);
  });

  it('gives the same data shifted in time for another now', () => {
    const later = buildDemoHistory(new Date(NOW.getTime() + 7 * 86_400_000));
    expect(later.samples.map((s) => s.values ?? s.count)).toEqual(history.samples.map((s) => s.values ?? s.count));
    expect(later.signals.map((s) => [s.characteristicId, s.index, s.rules])).toEqual(history.signals.map((s) => [s.characteristicId, s.index, s.rules]));
  });

  it('covers about three weeks before now, every record valid and made before now', () => {
    expect(history.warnings).toEqual([]);
    expect(NOW.getTime() - history.historyStart.getTime()).toBe(21 * 86_400_000);
    for (const r of history.records) expect(z.safeParse(DeviceRecord, r).success).toBe(true);
    const times = history.samples.map((s) => Date.parse(s.takenAt));
    expect(Math.max(...times)).toBeLessThan(NOW.getTime());
    expect(Math.min(...times)).toBeGreaterThanOrEqual(history.historyStart.getTime());
    expect(new Set(history.records.map((r) => r.id)).size).toBe(history.records.length);
    for (const c of DEMO_CHARACTERISTICS) expect(history.samples.some((s) => s.characteristicId === c.id)).toBe(true);
  });

  it('contains the designed signals: a sustained shift, a slow trend and one outlier', () => {
    const at = (id: string) => history.signals.filter((s) => s.characteristicId === id);
    // Shift on the bore from subgroup 310: caught by a run rule some hours later, not at once.
    const shift = at('bore-dia').find((s) => s.index >= 310);
    expect(shift?.index).toBeGreaterThan(315);
    expect(shift?.rules.some((r) => r === 'we2' || r === 'we3' || r === 'we4')).toBe(true);
    // Trend on the fill weight from subgroup 150, caught later still.
    expect(at('fill-weight').find((s) => s.index >= 150)?.index).toBeGreaterThan(160);
    // The torque outlier at subgroup 200 fires rule 1 (beyond the limits).
    expect(at('bonnet-torque').find((s) => s.index === 200)?.rules).toContain('n1');
  });

  it('answers most signals, leaves one or two open, and has a few acknowledgements', () => {
    const open = history.signals.filter((s) => !s.answered);
    expect(open.length).toBeGreaterThanOrEqual(1);
    expect(open.length).toBeLessThanOrEqual(2);
    expect(history.responses.length).toBe(history.signals.length - open.length);
    expect(history.responses.length).toBeGreaterThan(10);
    expect(history.acks.length).toBeGreaterThan(2);
    expect(history.acks.length).toBeLessThan(history.responses.length);
    const responseIds = new Set(history.responses.map((r) => r.id));
    for (const a of history.acks) expect(responseIds.has(a.responseId)).toBe(true);
    const sampleIds = new Set(history.samples.map((s) => s.id));
    for (const r of history.responses) {
      expect(sampleIds.has(r.sampleId)).toBe(true);
      for (const s of r.signals) expect(s.sampleIds.every((id) => sampleIds.has(id))).toBe(true);
    }
  });
});

describe('seededUuidV7()', () => {
  it('puts the time in the first 48 bits and the version and variant where RFC 9562 says', () => {
    const id = seededUuidV7(mulberry32(1), Date.parse('2026-12-02T00:00:00.000Z'));
    expect(z.safeParse(z.uuid(), id).success).toBe(true);
    expect(parseInt(id.replace(/-/g, '').slice(0, 12), 16)).toBe(Date.parse('2026-12-02T00:00:00.000Z'));
    expect(id[14]).toBe('7');
    expect('89ab').toContain(id[19]);
  });
});

describeBackends('seedDemo()', (backend) => {
  let dir: string;
  let store: ServerStore;
  let dispose: () => Promise<void>;
  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'plumbline-demo-'));
    ({ store, dispose } = await openTestStore(backend));
    expect(await hasDemo(store)).toBe(false);
    await seedDemo(store, NOW);
  });
  afterAll(async () => {
    await dispose();
    rmSync(dir, { recursive: true, force: true });
  });

  it('fills the store: set-up first, then every record, served by pull to an enrolled tablet', async () => {
    expect(await hasDemo(store)).toBe(true);
    const history = buildDemoHistory(NOW);
    const app = createServer({ store, distDir: join(dir, 'dist'), now: () => NOW });
    const { code } = await issueEnrolmentCode(store, DEMO_SITE_ID, 'p-marguerite', NOW);
    const enrol = await app.inject({ method: 'POST', url: '/api/v1/enrol', headers: PROTOCOL, payload: { code, deviceName: 'Demo tablet' } });
    const token = (enrol.json() as { deviceToken: string }).deviceToken;
    const kinds: string[] = [];
    let after = 0;
    for (;;) {
      const res = await app.inject({ method: 'GET', url: `/api/v1/sync/pull?after=${after}&limit=500`, headers: { ...PROTOCOL, authorization: `Bearer ${token}` } });
      const page = z.parse(PullResponse, res.json());
      kinds.push(...page.entries.map((e) => e.entry.kind));
      after = page.next;
      if (!page.hasMore) break;
    }
    const firstRecord = kinds.indexOf('record');
    expect(kinds.slice(0, firstRecord)).toContain('characteristic');
    expect(kinds.slice(firstRecord).every((k) => k === 'record')).toBe(true);
    expect(kinds.length - firstRecord).toBe(history.records.length);
    await app.close();
  });

  it('lets each demo person sign in with the printed PIN', async () => {
    const app = createServer({ store, distDir: join(dir, 'dist'), now: () => NOW });
    const { code } = await issueEnrolmentCode(store, DEMO_SITE_ID, 'p-marguerite', NOW);
    const enrol = await app.inject({ method: 'POST', url: '/api/v1/enrol', headers: PROTOCOL, payload: { code, deviceName: 'Demo tablet 2' } });
    const token = (enrol.json() as { deviceToken: string }).deviceToken;
    for (const p of DEMO_PEOPLE) {
      const res = await app.inject({ method: 'POST', url: '/api/v1/sign-in', headers: { ...PROTOCOL, authorization: `Bearer ${token}` }, payload: { login: p.login, pin: p.pin } });
      expect(res.statusCode).toBe(200);
      expect(res.json().person.role).toBe(p.role);
    }
    await app.close();
  });
});
