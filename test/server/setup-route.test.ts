import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { api, CHARACTERISTICS, enrolDevice, signIn, startTestServer, type TestServer } from './fixtures';
import { describeBackends } from './backends';

describeBackends('set-up and PIN routes', (backend) => {
  let server: TestServer;
  let device: { deviceId: string; deviceToken: string };
  beforeEach(async () => {
    server = await startTestServer({ backend });
    device = await enrolDevice(server);
  });
  afterEach(async () => server.close());

  const renamedCharacteristic = { kind: 'characteristic', id: 'ch-len', body: { ...CHARACTERISTICS[0], name: 'Overall length' } };

  describe('POST /api/v1/setup (role checks)', () => {
    it('refuses an operator and a supervisor with 403: they cannot change set-up', async () => {
      for (const [login, pin] of [['odile', '1234'], ['sven', '2345']] as const) {
        const session = await signIn(server, device.deviceToken, login, pin);
        const res = await api(server, 'POST', '/api/v1/setup', { session, body: { entries: [renamedCharacteristic] } });
        expect(res.statusCode).toBe(403);
        expect(res.json().error).toBe('forbidden');
      }
      expect((await server.store.getSetup('characteristic', 'ch-len'))?.body.name).toBe('Length');
    });

    it('lets an admin change a characteristic: a new version with a new serverSeq', async () => {
      const session = await signIn(server, device.deviceToken, 'ada', '3456');
      const before = await server.store.getSetup('characteristic', 'ch-len');
      const res = await api(server, 'POST', '/api/v1/setup', { session, body: { entries: [renamedCharacteristic] } });
      expect(res.statusCode).toBe(200);
      const after = await server.store.getSetup('characteristic', 'ch-len');
      expect(after?.body.name).toBe('Overall length');
      expect(res.json().results[0].serverSeq).toBe(after?.serverSeq);
      expect(after?.serverSeq).toBeGreaterThan(before?.serverSeq ?? 0);
    });

    it('accepts a new station and its characteristic in one request, and refuses a dangling parent', async () => {
      const session = await signIn(server, device.deviceToken, 'ada', '3456');
      const station = { kind: 'station', id: 'st-2', body: { id: 'st-2', lineId: 'ln-1', name: 'Station 2' } };
      const ch = { kind: 'characteristic', id: 'ch-new', body: { ...CHARACTERISTICS[0], id: 'ch-new', stationId: 'st-2' } };
      expect((await api(server, 'POST', '/api/v1/setup', { session, body: { entries: [station, ch] } })).statusCode).toBe(200);
      const orphan = { kind: 'station', id: 'st-3', body: { id: 'st-3', lineId: 'ln-missing', name: 'Station 3' } };
      const res = await api(server, 'POST', '/api/v1/setup', { session, body: { entries: [orphan] } });
      expect(res.statusCode).toBe(400);
      expect(res.json().message).toContain('ln-missing');
      const foreign = { kind: 'line', id: 'ln-x', body: { id: 'ln-x', siteId: 'other-site', name: 'X' } };
      expect((await api(server, 'POST', '/api/v1/setup', { session, body: { entries: [foreign] } })).statusCode).toBe(400);
    });
  });

  describe('POST /api/v1/admin/pin', () => {
    it('lets an admin set a PIN that then signs in, and refuses an operator', async () => {
      const admin = await signIn(server, device.deviceToken, 'ada', '3456');
      const set = await api(server, 'POST', '/api/v1/admin/pin', { session: admin, body: { personId: 'p-op', pin: '8080' } });
      expect(set.statusCode).toBe(204);
      expect((await api(server, 'POST', '/api/v1/sign-in', { device: device.deviceToken, body: { login: 'odile', pin: '1234' } })).statusCode).toBe(401);
      const operator = await signIn(server, device.deviceToken, 'odile', '8080');
      const refused = await api(server, 'POST', '/api/v1/admin/pin', { session: operator, body: { personId: 'p-op', pin: '1111' } });
      expect(refused.statusCode).toBe(403);
    });
  });
});
