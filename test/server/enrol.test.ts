import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { EnrolResponse, ErrorBody, z } from '../../src/schema/index';
import { issueEnrolmentCode } from '../../src/server/routes/admin-enrolment-codes';
import { hashSecret } from '../../src/server/tokens';
import { api, SITE, startTestServer, type TestServer } from './fixtures';
import { describeBackends } from './backends';

describeBackends('enrolment', (backend) => {
  let server: TestServer;
  beforeEach(async () => {
    server = await startTestServer({ backend, rateLimits: { enrolPerWindow: 5, windowMs: 60_000 } });
  });
  afterEach(async () => server.close());

  const enrol = (code: string, ip?: string) => api(server, 'POST', '/api/v1/enrol', { body: { code, deviceName: 'Cell 4 tablet' }, ip });

  describe('POST /api/v1/enrol', () => {
    it('exchanges a good code for a device token stored only as its sha256', async () => {
      const { code } = await issueEnrolmentCode(server.store, SITE, 'p-adm', server.now());
      const res = await enrol(code);
      expect(res.statusCode).toBe(200);
      const body = z.parse(EnrolResponse, res.json());
      expect(body.siteId).toBe(SITE);
      // 32 random bytes as base64url: 43 characters
      expect(body.deviceToken).toMatch(/^[A-Za-z0-9_-]{43}$/);
      const device = await server.store.findDeviceByTokenHash(hashSecret(body.deviceToken));
      expect(device).toMatchObject({ id: body.deviceId, siteId: SITE, name: 'Cell 4 tablet', revokedAt: null });
      const [raw] = await server.sql<{ token_hash: string }>('SELECT token_hash FROM devices WHERE id = ?', body.deviceId);
      expect(raw?.token_hash).toMatch(/^[0-9a-f]{64}$/);
      expect(raw?.token_hash).not.toContain(body.deviceToken);
    });

    it('accepts the code typed in lower case without the dash', async () => {
      const { code } = await issueEnrolmentCode(server.store, SITE, 'p-adm', server.now());
      const res = await enrol(code.toLowerCase().replace('-', ' '));
      expect(res.statusCode).toBe(200);
    });

    it('refuses a code used before (409) and creates no second device', async () => {
      const { code } = await issueEnrolmentCode(server.store, SITE, 'p-adm', server.now());
      expect((await enrol(code)).statusCode).toBe(200);
      const again = await enrol(code);
      expect(again.statusCode).toBe(409);
      expect(z.parse(ErrorBody, again.json()).error).toBe('enrolment-code-used');
      const [n] = await server.sql<{ n: number | string }>('SELECT COUNT(*) AS n FROM devices');
      expect(Number(n?.n)).toBe(1);
    });

    it('refuses an expired code (410)', async () => {
      const { code } = await issueEnrolmentCode(server.store, SITE, 'p-adm', server.now(), 15);
      server.advance(15 * 60_000);
      const res = await enrol(code);
      expect(res.statusCode).toBe(410);
      expect(res.json()).toMatchObject({ error: 'enrolment-code-expired' });
    });

    it('refuses an unknown code (400)', async () => {
      const res = await enrol('ABCDE-FGHJK');
      expect(res.statusCode).toBe(400);
      expect(res.json()).toMatchObject({ error: 'enrolment-code-invalid' });
    });

    it('refuses a body that fails the schema with the problem named', async () => {
      const res = await api(server, 'POST', '/api/v1/enrol', { body: { code: 'ABCDE' } });
      expect(res.statusCode).toBe(400);
      expect(res.json().message).toContain('deviceName');
    });

    it('does not count good codes against the limit: many tablets enrol from one address', async () => {
      for (let i = 0; i < 8; i++) {
        const { code } = await issueEnrolmentCode(server.store, SITE, 'p-adm', server.now());
        expect((await enrol(code, '10.7.7.7')).statusCode).toBe(200);
      }
    });

    it('rate-limits failed attempts per address, with Retry-After, until the window passes', async () => {
      for (let i = 0; i < 5; i++) expect((await enrol(`WRONG-${i}`, '10.9.9.9')).statusCode).toBe(400);
      const limited = await enrol('WRONG-X', '10.9.9.9');
      expect(limited.statusCode).toBe(429);
      expect(limited.json()).toMatchObject({ error: 'rate-limited' });
      expect(Number(limited.headers['retry-after'])).toBeGreaterThan(0);
      // Another address is not affected; a good code from the blocked address waits too.
      const { code } = await issueEnrolmentCode(server.store, SITE, 'p-adm', server.now());
      expect((await enrol(code, '10.9.9.9')).statusCode).toBe(429);
      expect((await enrol('WRONG-Y', '10.1.1.1')).statusCode).toBe(400);
      server.advance(60_000);
      expect((await enrol(code, '10.9.9.9')).statusCode).toBe(200);
    });
  });
});
