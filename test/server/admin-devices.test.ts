import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { api, enrolDevice, makeSample, signIn, startTestServer, testUuid, type TestServer } from './fixtures';
import { describeBackends } from './backends';

describeBackends('admin device routes', (backend) => {
  let server: TestServer;
  let adminTablet: { deviceId: string; deviceToken: string };
  let lineTablet: { deviceId: string; deviceToken: string };
  let adminSession: string;
  beforeEach(async () => {
    server = await startTestServer({ backend });
    adminTablet = await enrolDevice(server, 'Office tablet');
    lineTablet = await enrolDevice(server, 'Line tablet');
    adminSession = await signIn(server, adminTablet.deviceToken, 'ada', '3456');
  });
  afterEach(async () => server.close());

  describe('admin device routes', () => {
    it('lists the site tablets without their tokens', async () => {
      const res = await api(server, 'GET', '/api/v1/admin/devices', { session: adminSession });
      expect(res.statusCode).toBe(200);
      expect(res.json().devices.map((d: { name: string }) => d.name).sort()).toEqual(['Line tablet', 'Office tablet']);
      expect(res.body).not.toContain(lineTablet.deviceToken);
      expect(res.body).not.toMatch(/token/i);
    });

    it('says when each tablet last sent records and last had someone sign in', async () => {
      const before = (await api(server, 'GET', '/api/v1/admin/devices', { session: adminSession })).json().devices as Record<string, unknown>[];
      expect(before.find((d) => d.id === lineTablet.deviceId)).toMatchObject({ name: 'Line tablet', lastUploadAt: null, lastSignInAt: null, revokedAt: null });
      server.advance(60_000);
      const signedInAt = server.now().toISOString();
      await signIn(server, lineTablet.deviceToken, 'odile', '1234');
      server.advance(60_000);
      const sentAt = server.now().toISOString();
      const push = await api(server, 'POST', '/api/v1/sync/push', { device: lineTablet.deviceToken, body: { batchId: testUuid(), records: [makeSample(lineTablet.deviceId)] } });
      expect(push.statusCode).toBe(200);
      const after = (await api(server, 'GET', '/api/v1/admin/devices', { session: adminSession })).json().devices as Record<string, unknown>[];
      expect(after.find((d) => d.id === lineTablet.deviceId)).toMatchObject({ lastUploadAt: sentAt, lastSignInAt: signedInAt });
      expect(after.find((d) => d.id === adminTablet.deviceId)).toMatchObject({ lastUploadAt: null, lastSignInAt: expect.any(String) });
    });

    it('withdraws a tablet: its pushes, pulls and sessions stop at once', async () => {
      const operatorSession = await signIn(server, lineTablet.deviceToken, 'odile', '1234');
      const res = await api(server, 'POST', `/api/v1/admin/devices/${lineTablet.deviceId}/revoke`, { session: adminSession });
      expect(res.statusCode).toBe(204);
      const push = await api(server, 'POST', '/api/v1/sync/push', { device: lineTablet.deviceToken, body: { batchId: testUuid(), records: [makeSample(lineTablet.deviceId)] } });
      expect(push.statusCode).toBe(401);
      expect(push.json().error).toBe('device-revoked');
      expect((await api(server, 'GET', '/api/v1/sync/pull', { device: lineTablet.deviceToken })).statusCode).toBe(401);
      const setup = await api(server, 'POST', '/api/v1/admin/enrolment-codes', { session: operatorSession, body: {} });
      expect(setup.json().error).toBe('device-revoked');
      // The other tablet carries on.
      expect((await api(server, 'GET', '/api/v1/sync/pull', { device: adminTablet.deviceToken })).statusCode).toBe(200);
    });

    it('refuses a supervisor, and answers 404 for a tablet that is not there', async () => {
      const sup = await signIn(server, adminTablet.deviceToken, 'sven', '2345');
      expect((await api(server, 'POST', `/api/v1/admin/devices/${lineTablet.deviceId}/revoke`, { session: sup })).statusCode).toBe(403);
      expect((await api(server, 'GET', '/api/v1/admin/devices', { session: sup })).statusCode).toBe(403);
      expect((await api(server, 'POST', '/api/v1/admin/devices/dev-nope/revoke', { session: adminSession })).statusCode).toBe(404);
    });
  });

  describe('reinstating a withdrawn tablet', () => {
    const revoke = (id: string) => api(server, 'POST', `/api/v1/admin/devices/${id}/revoke`, { session: adminSession });
    const reinstate = (id: string, session = adminSession) => api(server, 'POST', `/api/v1/admin/devices/${id}/reinstate`, { session });
    const listed = async (id: string) =>
      ((await api(server, 'GET', '/api/v1/admin/devices', { session: adminSession })).json().devices as Record<string, unknown>[]).find((d) => d.id === id);

    it('gives the tablet back: the same token pushes the records it kept, pulls, and the list shows it in use', async () => {
      const kept = makeSample(lineTablet.deviceId);
      expect((await revoke(lineTablet.deviceId)).statusCode).toBe(204);
      const refused = await api(server, 'POST', '/api/v1/sync/push', { device: lineTablet.deviceToken, body: { batchId: testUuid(), records: [kept] } });
      expect(refused.json().error).toBe('device-revoked');
      expect((await listed(lineTablet.deviceId))?.revokedAt).toEqual(expect.any(String));

      const res = await reinstate(lineTablet.deviceId);
      expect(res.statusCode).toBe(204);
      expect(await listed(lineTablet.deviceId)).toMatchObject({ revokedAt: null });
      const push = await api(server, 'POST', '/api/v1/sync/push', { device: lineTablet.deviceToken, body: { batchId: testUuid(), records: [kept] } });
      expect(push.statusCode).toBe(200);
      expect(push.json().results).toEqual([expect.objectContaining({ id: kept.id, status: 'stored' })]);
      expect((await api(server, 'GET', '/api/v1/sync/pull', { device: lineTablet.deviceToken })).statusCode).toBe(200);
      // People can sign in on it again.
      await signIn(server, lineTablet.deviceToken, 'odile', '1234');
      const rows = await server.sql(`SELECT entity_id FROM log WHERE entity_id = ?`, kept.id);
      expect(rows).toHaveLength(1);
    });

    it('is idempotent: reinstating twice, or a tablet in use, answers 204 and leaves it in use', async () => {
      await revoke(lineTablet.deviceId);
      expect((await reinstate(lineTablet.deviceId)).statusCode).toBe(204);
      expect((await reinstate(lineTablet.deviceId)).statusCode).toBe(204);
      expect((await reinstate(adminTablet.deviceId)).statusCode).toBe(204);
      expect(await listed(lineTablet.deviceId)).toMatchObject({ revokedAt: null });
      expect(await listed(adminTablet.deviceId)).toMatchObject({ revokedAt: null });
      expect((await api(server, 'GET', '/api/v1/sync/pull', { device: lineTablet.deviceToken })).statusCode).toBe(200);
    });

    it('refuses an operator and a supervisor, and leaves the tablet withdrawn', async () => {
      await revoke(lineTablet.deviceId);
      const op = await signIn(server, adminTablet.deviceToken, 'odile', '1234');
      const sup = await signIn(server, adminTablet.deviceToken, 'sven', '2345');
      expect((await reinstate(lineTablet.deviceId, op)).statusCode).toBe(403);
      expect((await reinstate(lineTablet.deviceId, sup)).statusCode).toBe(403);
      expect((await api(server, 'POST', `/api/v1/admin/devices/${lineTablet.deviceId}/reinstate`, {})).statusCode).toBe(401);
      expect((await api(server, 'GET', '/api/v1/sync/pull', { device: lineTablet.deviceToken })).json().error).toBe('device-revoked');
    });

    it('answers 404 for a tablet that is not there or belongs to another site, and leaves that one withdrawn', async () => {
      await server.store.createDevice({ id: 'dev-elsewhere', siteId: 'site-other', name: 'Other site tablet', tokenHash: 'hash-elsewhere', enrolledAt: server.now().toISOString() });
      await server.store.revokeDevice('dev-elsewhere', server.now().toISOString());
      const res = await reinstate('dev-elsewhere');
      expect(res.statusCode).toBe(404);
      expect(res.json().error).toBe('not-found');
      expect((await server.store.getDevice('dev-elsewhere'))?.revokedAt).toEqual(expect.any(String));
      expect((await reinstate('dev-nope')).statusCode).toBe(404);
    });
  });
});
