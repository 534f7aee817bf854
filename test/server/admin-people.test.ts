import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { api, enrolDevice, makeSample, signIn, startTestServer, testUuid, type TestServer } from './fixtures';
import { pinRefOf } from '../../src/schema/index';
import { describeBackends } from './backends';

describeBackends('admin people routes', (backend) => {
  let server: TestServer;
  let tablet: { deviceId: string; deviceToken: string };
  let admin: string;
  beforeEach(async () => {
    server = await startTestServer({ backend });
    tablet = await enrolDevice(server, 'Office tablet');
    admin = await signIn(server, tablet.deviceToken, 'ada', '3456');
  });
  afterEach(async () => server.close());

  const addPerson = (body: unknown, session = admin) => api(server, 'POST', '/api/v1/admin/people', { session, body });
  const change = (id: string, body: unknown, session = admin) => api(server, 'POST', `/api/v1/admin/people/${id}`, { session, body });
  const signInRes = (login: string, pin: string) => api(server, 'POST', '/api/v1/sign-in', { device: tablet.deviceToken, body: { login, pin } });

  describe('GET /api/v1/admin/people', () => {
    it('lists everyone at the site, inactive people too, with when their PIN was set and no secrets', async () => {
      const res = await api(server, 'GET', '/api/v1/admin/people', { session: admin });
      expect(res.statusCode).toBe(200);
      const people = res.json().people as { login: string; active: boolean; pinSetAt?: string }[];
      expect(people.map((p) => p.login)).toEqual(['ada', 'gone', 'odile', 'sven']); // by name: Ada, Gone, Odile, Sven
      expect(people.find((p) => p.login === 'gone')?.active).toBe(false);
      expect(people.every((p) => p.pinSetAt === server.now().toISOString())).toBe(true);
      expect(res.body).not.toMatch(/hash|salt|verifier/i);
    });

    it('refuses a supervisor (403) and a request without a session (401)', async () => {
      const sup = await signIn(server, tablet.deviceToken, 'sven', '2345');
      const res = await api(server, 'GET', '/api/v1/admin/people', { session: sup });
      expect(res.statusCode).toBe(403);
      expect(res.json().message).toMatch(/^Only an admin or above may list the people of the site/);
      expect((await api(server, 'GET', '/api/v1/admin/people')).statusCode).toBe(401);
    });
  });

  describe('POST /api/v1/admin/people', () => {
    it('adds a person who can sign in at once with the first PIN, and puts them in the set-up log for tablets', async () => {
      const res = await addPerson({ name: 'Nadia Test', login: 'nadia', role: 'operator', pin: '4826' });
      expect(res.statusCode).toBe(201);
      const secrets = await server.store.getPersonSecrets('p-nadia');
      expect(res.json().person).toEqual({ id: 'p-nadia', name: 'Nadia Test', login: 'nadia', role: 'operator', active: true, pinRef: await pinRefOf(secrets!.verifierSalt) });
      expect((await signInRes('NADIA', '4826')).statusCode).toBe(200);
      const pull = await api(server, 'GET', '/api/v1/sync/pull?after=0&limit=500', { device: tablet.deviceToken });
      const persons = (pull.json().entries as { entry: { kind: string; id: string } }[]).filter((e) => e.entry.kind === 'person').map((e) => e.entry.id);
      expect(persons).toContain('p-nadia');
    });

    it('refuses a login in use (any case, also by an inactive person) with 409 and names who has it', async () => {
      const res = await addPerson({ name: 'Other Gone', login: 'GONE', role: 'operator', pin: '4826' });
      expect(res.statusCode).toBe(409);
      expect(res.json()).toEqual({ error: 'login-taken', message: 'The login "GONE" is already used by Gone Test (access withdrawn); choose another.' });
    });

    it('gives a new id when p-<login> is taken', async () => {
      // An engineer-made record may use the id p-kim for someone with another login.
      const kim = { kind: 'person', id: 'p-kim', body: { id: 'p-kim', name: 'Kim Older', login: 'kim.older', role: 'operator', active: true } };
      expect((await api(server, 'POST', '/api/v1/setup', { session: admin, body: { entries: [kim] } })).statusCode).toBe(200);
      const res = await addPerson({ name: 'Kim Newer', login: 'kim', role: 'operator', pin: '4826' });
      expect(res.json().person.id).toBe('p-kim-2');
    });

    it('refuses bad input with 400 and one line per problem: PIN rule, login characters, unknown role', async () => {
      const res = await addPerson({ name: '', login: 'has space', role: 'boss', pin: '1234' });
      expect(res.statusCode).toBe(400);
      const message = res.json().message as string;
      expect(message).toContain('name');
      expect(message).toContain('A login uses only letters, digits, dot, dash and underscore (no spaces).');
      expect(message).toContain('role');
      expect(message).toContain('This PIN is too easy to guess');
      for (const pin of ['12', '0000', '9876', '12a4', '1234567890123']) {
        expect((await addPerson({ name: 'P', login: 'pp', role: 'operator', pin })).statusCode).toBe(400);
      }
    });

    it('refuses an engineer with 403', async () => {
      const eng = await signIn(server, tablet.deviceToken, 'sven', '2345');
      expect((await addPerson({ name: 'X', login: 'xx', role: 'operator', pin: '4826' }, eng)).statusCode).toBe(403);
    });
  });

  describe('POST /api/v1/admin/people/:id', () => {
    it('withdraws access: the next sign-in is refused with a clear reason, the open session stops working, and tablets are told', async () => {
      const operatorSession = await signIn(server, tablet.deviceToken, 'odile', '1234');
      const res = await change('p-op', { active: false });
      expect(res.statusCode).toBe(200);
      expect(res.json().person).toMatchObject({ id: 'p-op', active: false, role: 'operator' });
      const refused = await signInRes('odile', '1234');
      expect(refused.statusCode).toBe(401);
      expect(refused.json()).toEqual({ error: 'person-inactive', message: "Odile Test's access to this site has been withdrawn by an administrator; ask the site admin if this is a mistake." });
      // A wrong PIN still says only that login or PIN is wrong.
      expect((await signInRes('odile', '9999')).json().error).toBe('sign-in-failed');
      const push = await api(server, 'POST', '/api/v1/sync/push', { device: tablet.deviceToken, body: { batchId: testUuid(), records: [makeSample(tablet.deviceId)] } });
      expect(push.statusCode).toBe(200); // the tablet itself still syncs
      expect((await api(server, 'POST', '/api/v1/admin/enrolment-codes', { session: operatorSession, body: {} })).statusCode).toBe(401);
      const pull = await api(server, 'GET', '/api/v1/sync/pull?after=0&limit=500', { device: tablet.deviceToken });
      const versions = (pull.json().entries as { entry: { kind: string; id: string; body: { active?: boolean } } }[]).filter((e) => e.entry.id === 'p-op');
      expect(versions.at(-1)?.entry.body.active).toBe(false);
    });

    it('gives access back and changes a role', async () => {
      expect((await change('p-gone', { active: true, role: 'supervisor' })).json().person).toMatchObject({ active: true, role: 'supervisor' });
      expect((await signInRes('gone', '4567')).statusCode).toBe(200);
    });

    it('refuses to take away the last active admin, by demotion or by withdrawal, with 409 last-admin', async () => {
      for (const body of [{ role: 'engineer' }, { active: false }]) {
        const res = await change('p-adm', body);
        expect(res.statusCode).toBe(409);
        expect(res.json().error).toBe('last-admin');
        expect(res.json().message).toMatch(/^You cannot (change the role of|withdraw the access of) Ada Test: they are the site's only active admin/);
      }
      // With a second admin, the first may step down.
      expect((await change('p-sup', { role: 'admin' })).statusCode).toBe(200);
      expect((await change('p-adm', { role: 'engineer' })).statusCode).toBe(200);
    });

    it('guards the set-up route the same way', async () => {
      const demoted = { kind: 'person', id: 'p-adm', body: { id: 'p-adm', name: 'Ada Test', login: 'ada', role: 'operator', active: true } };
      const res = await api(server, 'POST', '/api/v1/setup', { session: admin, body: { entries: [demoted] } });
      expect(res.statusCode).toBe(409);
      expect(res.json().error).toBe('last-admin');
      expect((await server.store.getSetup('person', 'p-adm'))?.body.role).toBe('admin');
    });

    it('answers 404 for someone not at the site and 400 for an empty change', async () => {
      expect((await change('p-nobody', { active: false })).statusCode).toBe(404);
      expect((await change('p-op', {})).statusCode).toBe(400);
      expect((await change('p-op', { role: 'boss' })).statusCode).toBe(400);
    });
  });

  describe('POST /api/v1/admin/pin', () => {
    it('resets a PIN under the same rule as a first PIN', async () => {
      const weak = await api(server, 'POST', '/api/v1/admin/pin', { session: admin, body: { personId: 'p-op', pin: '1111' } });
      expect(weak.statusCode).toBe(400);
      expect(weak.json().message).toContain('too easy to guess');
      server.advance(60_000);
      expect((await api(server, 'POST', '/api/v1/admin/pin', { session: admin, body: { personId: 'p-op', pin: '5281' } })).statusCode).toBe(204);
      expect((await signInRes('odile', '5281')).statusCode).toBe(200);
      const listed = (await api(server, 'GET', '/api/v1/admin/people', { session: admin })).json().people as { id: string; pinSetAt: string; pinRef?: string }[];
      expect(listed.find((p) => p.id === 'p-op')?.pinSetAt).toBe(server.now().toISOString());
      // The person's new version names the new PIN (tablets compare it with their cached verifier).
      const secrets = await server.store.getPersonSecrets('p-op');
      expect(listed.find((p) => p.id === 'p-op')?.pinRef).toBe(await pinRefOf(secrets!.verifierSalt));
      expect((await server.store.getSetup('person', 'p-op'))?.body.pinRef).toBe(await pinRefOf(secrets!.verifierSalt));
      // A set-up change that does not mention the PIN keeps the reference.
      const renamed = { kind: 'person', id: 'p-op', body: { id: 'p-op', name: 'Odile Renamed', login: 'odile', role: 'operator', active: true } };
      expect((await api(server, 'POST', '/api/v1/setup', { session: admin, body: { entries: [renamed] } })).statusCode).toBe(200);
      expect((await server.store.getSetup('person', 'p-op'))?.body).toMatchObject({ name: 'Odile Renamed', pinRef: await pinRefOf(secrets!.verifierSalt) });
    });
  });
});
