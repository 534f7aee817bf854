import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { api, enrolDevice, signIn, startTestServer, type TestServer } from './fixtures';
import { describeBackends } from './backends';

describeBackends('admin enrolment codes', (backend) => {
  let server: TestServer;
  let device: { deviceId: string; deviceToken: string };
  beforeEach(async () => {
    server = await startTestServer({ backend });
    device = await enrolDevice(server);
  });
  afterEach(async () => server.close());

  const createCode = (session?: string, body: unknown = {}) => api(server, 'POST', '/api/v1/admin/enrolment-codes', { session, body });

  describe('POST /api/v1/admin/enrolment-codes', () => {
    it('gives an admin a code that expires in 15 minutes and enrols a second tablet once', async () => {
      const session = await signIn(server, device.deviceToken, 'ada', '3456');
      const res = await createCode(session);
      expect(res.statusCode).toBe(201);
      const { code, expiresAt } = res.json() as { code: string; expiresAt: string };
      expect(code).toMatch(/^[2-9A-HJ-NP-Z]{5}-[2-9A-HJ-NP-Z]{5}$/);
      expect(Date.parse(expiresAt) - server.now().getTime()).toBe(15 * 60_000);
      const enrol = await api(server, 'POST', '/api/v1/enrol', { body: { code, deviceName: 'Tablet 2' } });
      expect(enrol.statusCode).toBe(200);
    });

    it('takes a lifetime in minutes', async () => {
      const session = await signIn(server, device.deviceToken, 'ada', '3456');
      const res = await createCode(session, { ttlMinutes: 60 });
      expect(Date.parse(res.json().expiresAt) - server.now().getTime()).toBe(60 * 60_000);
    });

    it('refuses an operator and a supervisor with 403 forbidden', async () => {
      for (const [login, pin] of [['odile', '1234'], ['sven', '2345']] as const) {
        const session = await signIn(server, device.deviceToken, login, pin);
        const res = await createCode(session);
        expect(res.statusCode).toBe(403);
        expect(res.json()).toMatchObject({ error: 'forbidden', message: expect.stringMatching(/^Only an admin or above may create enrolment codes; .* is signed in as an? (operator|supervisor)\.$/) });
      }
    });

    it('refuses a request with no session, an unknown one or an expired one', async () => {
      expect((await createCode()).statusCode).toBe(401);
      expect((await createCode('made-up')).statusCode).toBe(401);
      const session = await signIn(server, device.deviceToken, 'ada', '3456');
      server.advance(12 * 3_600_000);
      const expired = await createCode(session);
      expect(expired.statusCode).toBe(401);
      expect(expired.json().error).toBe('session-expired');
    });
  });
});
