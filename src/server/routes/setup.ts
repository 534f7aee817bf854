import type { FastifyInstance } from 'fastify';
import { SetupRecord, z, type Person, type Role } from '../../schema/index';
import { authenticateSession, requireRole } from '../auth';
import { HttpError } from '../http-error';
import { parseInput } from '../parse-input';
import { phaseTrailProblem } from '../phase-trail';
import type { ServerContext } from '../server-context';
import type { ServerStore, SetupKind } from '../store/server-store';

/** Who may change each kind of set-up: people and the site itself are the admin's; the process is the engineer's. */
export const SETUP_ROLE: Readonly<Record<SetupKind, Role>> = {
  site: 'admin',
  person: 'admin',
  line: 'engineer',
  station: 'engineer',
  characteristic: 'engineer',
  phase: 'engineer',
  causes: 'engineer',
};

const SetupChangeRequest = z.object({ entries: z.array(SetupRecord).check(z.minLength(1), z.maxLength(100)) });

export interface SetupChangeResponse {
  readonly serverEpoch: string;
  readonly results: readonly { kind: SetupKind; id: string; serverSeq: number }[];
}

/**
 * POST /api/v1/setup (session): appends new versions of set-up entities of the signed-in
 * person's site. Each entry's parent (line → site, station → line, …) must be at the site or
 * earlier in the same request. Operators and supervisors cannot change set-up.
 */
export function registerSetupRoute(app: FastifyInstance, ctx: ServerContext): void {
  app.post('/api/v1/setup', async (request): Promise<SetupChangeResponse> => {
    const { person, siteId } = await authenticateSession(ctx, request);
    const entries = await keepPinRefs(ctx.store, parseInput(SetupChangeRequest, request.body, 'set-up change').entries);

    const inBatch = new Set<string>();
    for (const entry of entries) {
      requireRole(person, SETUP_ROLE[entry.kind], `change ${entry.kind} set-up`);
      if (entry.id !== entityIdOf(entry)) throw new HttpError(400, 'bad-request', `The ${entry.kind} entry "${entry.id}" must carry the same id in its body.`);
      await checkParent(ctx.store, siteId, entry, inBatch);
      if (entry.kind === 'phase') {
        const problem = phaseTrailProblem((await ctx.store.getSetup('phase', entry.id))?.body, entry.body);
        if (problem) throw new HttpError(409, 'phase-trail', problem);
      }
      inBatch.add(`${entry.kind}:${entry.id}`);
    }
    await checkAdminKept(ctx.store, siteId, entries);
    const seqs = await ctx.store.appendSetup(entries.map((record) => ({ siteId, record })), ctx.now().toISOString());
    request.log.info({ by: person.id, count: entries.length }, 'set-up changed');
    return {
      serverEpoch: await ctx.store.getServerEpoch(),
      results: entries.map((e, i) => ({ kind: e.kind, id: e.id, serverSeq: seqs[i] ?? 0 })),
    };
  });
}

/** A person entry sent without pinRef keeps the one in force (set-up screens do not handle PINs). */
async function keepPinRefs(store: ServerStore, entries: readonly SetupRecord[]): Promise<SetupRecord[]> {
  const out: SetupRecord[] = [];
  for (const e of entries) {
    const pinRef = e.kind === 'person' && e.body.pinRef === undefined ? (await store.getSetup('person', e.id))?.body.pinRef : undefined;
    out.push(e.kind === 'person' && pinRef ? { ...e, body: { ...e.body, pinRef } } : e);
  }
  return out;
}

/** Person entries may not leave a site that had an active admin without one (schema/admin.ts). */
async function checkAdminKept(store: ServerStore, siteId: string, entries: readonly SetupRecord[]): Promise<void> {
  const changed = entries.flatMap((e) => (e.kind === 'person' ? [e.body] : []));
  if (changed.length === 0) return;
  const before = (await store.listSetup(siteId, 'person')).map((p) => p.body);
  const after = new Map(before.map((p) => [p.id, p]));
  for (const p of changed) after.set(p.id, p);
  const isAdmin = (p: Person) => p.active && p.role === 'admin';
  if (before.some(isAdmin) && ![...after.values()].some(isAdmin)) {
    throw new HttpError(409, 'last-admin', 'This change would leave the site without an active admin, and the site must keep one. Make someone else an admin first.');
  }
}

function entityIdOf(entry: SetupRecord): string {
  return entry.kind === 'causes' ? entry.id : entry.body.id;
}

/** The parent an entry hangs from must belong to the same site. */
async function checkParent(store: ServerStore, siteId: string, entry: SetupRecord, inBatch: ReadonlySet<string>): Promise<void> {
  const existingAtSite = async (kind: SetupKind, id: string): Promise<boolean> =>
    inBatch.has(`${kind}:${id}`) || (await store.getSetup(kind, id))?.siteId === siteId;
  const refuse = (what: string): never => {
    throw new HttpError(400, 'bad-request', `The ${entry.kind} "${entry.id}" refers to ${what}, which is not part of this site.`);
  };
  // An entity that exists at another site may not be moved here.
  const current = await store.getSetup(entry.kind, entry.id);
  if (current && current.siteId !== siteId) refuse(`an id already used at another site`);
  switch (entry.kind) {
    case 'site':
      if (entry.id !== siteId) refuse(`site "${entry.id}"`);
      return;
    case 'line':
    case 'causes':
      if (entry.body.siteId !== siteId) refuse(`site "${entry.body.siteId}"`);
      return;
    case 'station':
      if (!(await existingAtSite('line', entry.body.lineId))) refuse(`line "${entry.body.lineId}"`);
      return;
    case 'characteristic':
      if (!(await existingAtSite('station', entry.body.stationId))) refuse(`station "${entry.body.stationId}"`);
      return;
    case 'phase':
      if (!(await existingAtSite('characteristic', entry.body.characteristicId))) refuse(`characteristic "${entry.body.characteristicId}"`);
      return;
    case 'person':
      return;
  }
}
