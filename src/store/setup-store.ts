import {
  PulledEntry,
  describeIssues,
  type Acknowledgement,
  type CauseList,
  type Characteristic,
  type Line,
  type Person,
  type Phase,
  type Response,
  type Sample,
  type Site,
  type Station,
} from '../schema';
import { RECORD_STORE, type AppDb, type PullState, type SetupRow } from './app-db';
import { toWriteError } from './store-error';

/** The set-up as this tablet knows it: the latest pulled version of each entity. */
export interface SetupSnapshot {
  sites: Site[];
  lines: Line[];
  stations: Station[];
  characteristics: Characteristic[];
  phases: Phase[];
  people: Person[];
  causeLists: CauseList[];
}

export async function getSetup(db: AppDb): Promise<SetupSnapshot> {
  const rows = await db.getAll('setup');
  const snapshot: SetupSnapshot = { sites: [], lines: [], stations: [], characteristics: [], phases: [], people: [], causeLists: [] };
  for (const row of rows) {
    switch (row.kind) {
      case 'site': snapshot.sites.push(row.body); break;
      case 'line': snapshot.lines.push(row.body); break;
      case 'station': snapshot.stations.push(row.body); break;
      case 'characteristic': snapshot.characteristics.push(row.body); break;
      case 'phase': snapshot.phases.push(row.body); break;
      case 'person': snapshot.people.push(row.body); break;
      case 'causes': snapshot.causeLists.push(row.body); break;
    }
  }
  return snapshot;
}

/** A pulled entry that failed validation: skipped (never stored) and reported. */
export interface SkippedEntry {
  index: number;
  serverSeq?: number;
  reason: string;
}

export interface ApplyPullResult {
  setupWritten: number;
  recordsWritten: number;
  /** Own records that came back from the server and are now acked. */
  ownAcked: number;
  skipped: SkippedEntry[];
  cursor: number;
}

/**
 * Writes one pulled page AND the new cursor in ONE transaction (sync.md §2.17), so the cursor can never
 * run ahead of the data. Each entry is validated with zod first; a bad entry is skipped and reported.
 * Set-up entities keep the version with the highest serverSeq. Device records from other tablets are
 * added; a record this tablet already holds is not overwritten, and if it is one of ours still waiting
 * in the outbox, the row becomes acked (the server evidently holds it).
 */
export async function applyPulledEntries(
  db: AppDb,
  entries: readonly unknown[],
  next: number,
  serverEpoch: string,
  now: number = Date.now(),
): Promise<ApplyPullResult> {
  const result: ApplyPullResult = { setupWritten: 0, recordsWritten: 0, ownAcked: 0, skipped: [], cursor: next };
  const valid: PulledEntry[] = [];
  entries.forEach((raw, index) => {
    const parsed = PulledEntry.safeParse(raw);
    if (parsed.success) {
      valid.push(parsed.data);
    } else {
      const seq = (raw as { serverSeq?: unknown } | null)?.serverSeq;
      result.skipped.push({
        index,
        ...(typeof seq === 'number' ? { serverSeq: seq } : {}),
        reason: describeIssues(parsed.error),
      });
    }
  });

  const tx = db.transaction(['setup', 'samples', 'responses', 'acks', 'outbox', 'meta'], 'readwrite', {
    durability: 'strict',
  });
  try {
    for (const { serverSeq, serverTime, entry } of valid) {
      if (entry.kind === 'record') {
        const body = entry.body;
        const store = tx.objectStore(RECORD_STORE[body.kind]);
        if ((await store.get(body.id)) === undefined) {
          await store.add(body as Sample & Response & Acknowledgement);
          result.recordsWritten += 1;
        }
        const outbox = tx.objectStore('outbox');
        const row = await outbox.get(body.id);
        if (row && (row.state === 'pending' || row.state === 'sending')) {
          await outbox.put({ ...row, state: 'acked', serverSeq, ackedAt: now, ackedEpoch: serverEpoch, lastError: undefined });
          result.ownAcked += 1;
        }
      } else {
        const setup = tx.objectStore('setup');
        const existing = await setup.get([entry.kind, entry.id]);
        if (existing === undefined || existing.serverSeq <= serverSeq) {
          await setup.put({ ...entry, serverSeq, serverTime } as SetupRow);
          result.setupWritten += 1;
        }
      }
    }
    const pull: PullState = { cursor: next, serverEpoch };
    await tx.objectStore('meta').put({ key: 'pull', value: pull });
    await tx.done;
  } catch (e) {
    try {
      tx.abort();
    } catch {
      // already finished or aborted
    }
    await tx.done.catch(() => {}); // side promise: the error is thrown below
    throw toWriteError(tx.error ?? e, 'The pulled data');
  }
  return result;
}
