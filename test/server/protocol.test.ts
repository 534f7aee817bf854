import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { ErrorBody, PROTOCOL_HEADER, z } from '../../src/schema/index';
import { api, startTestServer, type TestServer } from './fixtures';
import { describeBackends } from './backends';

describeBackends('protocol and errors', (backend) => {
  let server: TestServer;
  beforeEach(async () => {
    server = await startTestServer({ backend });
  });
  afterEach(async () => server.close());

  describe('protocol header', () => {
    it('answers 426 with an ErrorBody when the header is missing', async () => {
      const res = await server.app.inject({ method: 'GET', url: '/api/v1/health' });
      expect(res.statusCode).toBe(426);
      const body = z.parse(ErrorBody, res.json());
      expect(body.error).toBe('protocol-mismatch');
      expect(body.message).toContain(PROTOCOL_HEADER);
    });

    it('answers 426 when the version differs, naming both versions', async () => {
      const res = await server.app.inject({ method: 'POST', url: '/api/v1/sync/push', headers: { [PROTOCOL_HEADER]: '2' }, payload: {} });
      expect(res.statusCode).toBe(426);
      expect(res.json()).toMatchObject({ error: 'protocol-mismatch' });
      expect(res.json().message).toMatch(/protocol 1 .* sent 2/);
    });

    it('lets a request with the right header through: health gives the epoch', async () => {
      const res = await api(server, 'GET', '/api/v1/health');
      expect(res.statusCode).toBe(200);
      expect(res.json()).toEqual({ ok: true, serverEpoch: await server.store.getServerEpoch() });
      expect(res.headers['cache-control']).toBe('no-store');
    });
  });

  describe('errors', () => {
    it('answers an unknown API route with 404 not-found as ErrorBody', async () => {
      const res = await api(server, 'GET', '/api/v1/nothing-here');
      expect(res.statusCode).toBe(404);
      expect(z.parse(ErrorBody, res.json()).error).toBe('not-found');
    });

    it('answers malformed JSON with 400 bad-json, not 500', async () => {
      const res = await api(server, 'POST', '/api/v1/enrol', { body: '{"code": ', headers: { 'content-type': 'application/json' } });
      expect(res.statusCode).toBe(400);
      expect(res.json()).toMatchObject({ error: 'bad-json' });
    });

    it('refuses a __proto__ key in the body with 400', async () => {
      const res = await api(server, 'POST', '/api/v1/enrol', {
        body: '{"code":"X","deviceName":"T","__proto__":{"admin":true}}',
        headers: { 'content-type': 'application/json' },
      });
      expect(res.statusCode).toBe(400);
    });

    it('answers a body over the limit with 413 payload-too-large', async () => {
      const res = await api(server, 'POST', '/api/v1/enrol', { body: { code: 'x'.repeat(1_100_000), deviceName: 'T' } });
      expect(res.statusCode).toBe(413);
      expect(res.json()).toMatchObject({ error: 'payload-too-large' });
    });

    it('sets the security headers on API errors too', async () => {
      const res = await server.app.inject({ method: 'GET', url: '/api/v1/health' });
      expect(res.headers['content-security-policy']).toContain("default-src 'self'");
      expect(res.headers['x-content-type-options']).toBe('nosniff');
      expect(res.headers['referrer-policy']).toBe('no-referrer');
    });
  });
});
