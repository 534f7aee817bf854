import type { FastifyInstance } from 'fastify';
import {
  lastAdminProblem,
  NewPersonRequest,
  PersonChangeRequest,
  pinRefOf,
  type AdminPerson,
  type PeopleListResponse,
  type Person,
  type PersonResponse,
} from '../../schema/index';
import { authenticateSession, requireRole } from '../auth';
import { HttpError } from '../http-error';
import { parseInput } from '../parse-input';
import type { ServerContext } from '../server-context';
import type { ServerStore } from '../store/server-store';
import { personSecrets } from './admin-pin';

/**
 * The site's people, for its admin:
 * GET  /api/v1/admin/people            → {people}: everyone at the site, with when their PIN was set.
 * POST /api/v1/admin/people            {name, login, role, pin} → 201 {person}: a new person who can sign in at once.
 * POST /api/v1/admin/people/:id        {role?, active?} → {person}: a new role, access withdrawn or given back.
 * Every change is a new version of the person in the set-up log, so tablets learn of it at their next sync.
 */
export function registerAdminPeopleRoutes(app: FastifyInstance, ctx: ServerContext): void {
  app.get('/api/v1/admin/people', async (request): Promise<PeopleListResponse> => {
    const { siteId } = await adminOf(ctx, request, 'list the people of the site');
    const people = await sitePeople(ctx.store, siteId);
    const listed: AdminPerson[] = [];
    for (const person of people) {
      const secrets = await ctx.store.getPersonSecrets(person.id);
      listed.push(secrets ? { ...person, pinSetAt: secrets.updatedAt } : person);
    }
    return { people: listed.sort((a, b) => a.name.localeCompare(b.name)) };
  });

  app.post('/api/v1/admin/people', async (request, reply): Promise<PersonResponse> => {
    const { person: admin, siteId } = await adminOf(ctx, request, 'add people');
    const body = parseInput(NewPersonRequest, request.body, 'new person');
    const people = await sitePeople(ctx.store, siteId);
    const taken = people.find((p) => p.login.toLowerCase() === body.login.toLowerCase());
    if (taken) throw new HttpError(409, 'login-taken', `The login "${body.login}" is already used by ${taken.name}${taken.active ? '' : ' (access withdrawn)'}; choose another.`);
    const id = await freePersonId(ctx.store, body.login);
    const now = ctx.now();
    const secrets = await personSecrets(id, body.pin, now);
    const person: Person = { id, name: body.name, login: body.login, role: body.role, active: true, pinRef: await pinRefOf(secrets.verifierSalt) };
    // The PIN first: a person who is in the log can then always sign in.
    await ctx.store.setPersonSecrets(secrets);
    await ctx.store.appendSetup([{ siteId, record: { kind: 'person', id: person.id, body: person } }], now.toISOString());
    request.log.info({ by: admin.id, personId: person.id, role: person.role }, 'person added');
    reply.code(201);
    return { person };
  });

  app.post<{ Params: { id: string } }>('/api/v1/admin/people/:id', async (request): Promise<PersonResponse> => {
    const { person: admin, siteId } = await adminOf(ctx, request, 'change people');
    const change = parseInput(PersonChangeRequest, request.body, 'change of a person');
    if (change.role === undefined && change.active === undefined) {
      throw new HttpError(400, 'bad-request', 'The change of a person needs a new role or a new active state.');
    }
    const people = await sitePeople(ctx.store, siteId);
    const current = people.find((p) => p.id === request.params.id);
    if (!current) throw new HttpError(404, 'not-found', `There is no person "${request.params.id}" at this site.`);
    const problem = lastAdminProblem(people, current.id, change);
    if (problem) throw new HttpError(409, 'last-admin', problem);
    const person: Person = { ...current, ...(change.role ? { role: change.role } : {}), ...(change.active !== undefined ? { active: change.active } : {}) };
    await ctx.store.appendSetup([{ siteId, record: { kind: 'person', id: person.id, body: person } }], ctx.now().toISOString());
    request.log.info({ by: admin.id, personId: person.id, role: person.role, active: person.active }, 'person changed');
    return { person };
  });
}

async function adminOf(ctx: ServerContext, request: Parameters<typeof authenticateSession>[1], action: string) {
  const signedIn = await authenticateSession(ctx, request);
  requireRole(signedIn.person, 'admin', action);
  return signedIn;
}

async function sitePeople(store: ServerStore, siteId: string): Promise<Person[]> {
  return (await store.listSetup(siteId, 'person')).map((p) => p.body);
}

/** p-<login>, or p-<login>-2, -3 … when an id is already taken (at any site: ids are global). */
async function freePersonId(store: ServerStore, login: string): Promise<string> {
  const base = `p-${login.toLowerCase()}`.slice(0, 60);
  for (let n = 1; n < 1000; n++) {
    const id = n === 1 ? base : `${base}-${n}`;
    if (!(await store.getSetup('person', id))) return id;
  }
  throw new HttpError(409, 'login-taken', `No free id is left for the login "${login}"; choose another login.`);
}
