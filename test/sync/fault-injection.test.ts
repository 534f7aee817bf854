/**
 * Jepsen-style set test (sync.md §1 "Jepsen-style verification", §4): save records while faults are
 * injected, heal, run until the outbox is empty, then read the server once. Checks: lost = 0,
 * duplicated = 0, pending at the end = 0. A control run with server-side dedup switched off must see
 * duplicates, which shows the check can see them.
 */
import fc from 'fast-check';
import { afterEach, describe, expect, it } from 'vitest';
import { countOutbox, saveDeviceRecord, setDeviceIdentity } from '../../src/store';
import { createApiClient } from '../../src/sync/api-client';
import { createSyncEngine } from '../../src/sync/sync-engine';
import { closeAll, freshDb, makeSample } from '../store/helpers';
import { BASE_URL, FakeSyncServer } from './fake-server';

afterEach(closeAll);

type Step =
  | { op: 'save'; n: number }
  | { op: 'sync'; backup: boolean }
  | { op: 'offline' }
  | { op: 'online' }
  | { op: 'lose-answers'; n: number }
  | { op: 'fail503'; n: number }
  | { op: 'restore' }
  | { op: 'wait'; ms: number };

const step: fc.Arbitrary<Step> = fc.oneof(
  fc.record({ op: fc.constant('save' as const), n: fc.integer({ min: 1, max: 12 }) }),
  fc.record({ op: fc.constant('sync' as const), backup: fc.boolean() }),
  fc.constant({ op: 'offline' as const }),
  fc.constant({ op: 'online' as const }),
  fc.record({ op: fc.constant('lose-answers' as const), n: fc.integer({ min: 1, max: 2 }) }),
  fc.record({ op: fc.constant('fail503' as const), n: fc.integer({ min: 1, max: 2 }) }),
  fc.constant({ op: 'restore' as const }),
  fc.record({ op: fc.constant('wait' as const), ms: fc.integer({ min: 0, max: 400_000 }) }),
);

interface Outcome {
  saved: string[];
  distinctStored: number;
  storedCopies: number;
  lost: string[];
  pendingAtEnd: number;
}

async function runScenario(steps: readonly Step[], dedup = true): Promise<Outcome> {
  const db = await freshDb();
  await setDeviceIdentity(db, { deviceId: 'tab-1', deviceToken: 'device-token-1', siteId: 'plant-1', deviceName: 'T1' });
  const server = new FakeSyncServer();
  server.dedup = dedup;
  let clock = Date.UTC(2026, 11, 2, 8);
  let seed = 1;
  const engine = createSyncEngine({
    db,
    api: createApiClient({ baseUrl: BASE_URL, fetch: server.fetch }),
    now: () => clock,
    random: () => ((seed = (seed * 16807) % 2147483647) / 2147483647), // Park–Miller, deterministic
    batchSize: 7,
    pullLimit: 5,
    locks: null,
    windowTarget: null,
    documentTarget: null,
  });
  const saved: string[] = [];
  let backup = server.snapshot();
  for (const s of steps) {
    switch (s.op) {
      case 'save':
        for (let i = 0; i < s.n; i++) {
          const sample = makeSample();
          await saveDeviceRecord(db, sample, clock);
          saved.push(sample.id);
        }
        break;
      case 'sync':
        await engine.syncNow();
        if (s.backup) backup = server.snapshot(); // the server's backup schedule
        break;
      case 'offline':
        server.offline = true;
        break;
      case 'online':
        server.offline = false;
        break;
      case 'lose-answers':
        server.dropResponsesAfterCommit += s.n;
        break;
      case 'fail503':
        server.fail503 += s.n;
        break;
      case 'restore':
        server.restore(backup);
        break;
      case 'wait':
        clock += s.ms;
        break;
    }
  }
  // Heal, then let the tablet's timer run until the outbox is empty (bounded). At least one run: only
  // a contact with the server can reveal a restore that happened after the last sync.
  server.offline = false;
  server.dropResponsesAfterCommit = 0;
  server.fail503 = 0;
  let runs = 0;
  do {
    clock += 600_000;
    await engine.syncNow();
    runs += 1;
  } while (runs < 10 && (await countOutbox(db)).pending > 0);
  const stored = server.log.filter((e) => e.entry.kind === 'record').map((e) => e.entry.id);
  const storedSet = new Set(stored);
  return {
    saved,
    distinctStored: storedSet.size,
    storedCopies: stored.length,
    lost: saved.filter((id) => !storedSet.has(id)),
    pendingAtEnd: (await countOutbox(db)).pending,
  };
}

describe('fault injection (set test)', () => {
  it('loses nothing and duplicates nothing under random offline periods, lost answers, 503s and restores', async () => {
    await fc.assert(
      fc.asyncProperty(fc.array(step, { minLength: 1, maxLength: 25 }), async (steps) => {
        const o = await runScenario(steps);
        expect(o.lost).toEqual([]);
        expect(o.storedCopies).toBe(o.distinctStored);
        expect(o.distinctStored).toBe(o.saved.length);
        expect(o.pendingAtEnd).toBe(0);
        closeAll();
      }),
      { numRuns: 40 },
    );
  });

  it('control: with server dedup switched off, a lost answer shows up as a duplicate', async () => {
    const o = await runScenario([{ op: 'save', n: 5 }, { op: 'lose-answers', n: 1 }, { op: 'sync', backup: false }], false);
    expect(o.lost).toEqual([]);
    expect(o.storedCopies).toBeGreaterThan(o.distinctStored);
  });
});
