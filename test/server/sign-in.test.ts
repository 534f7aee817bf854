import { webcrypto } from 'node:crypto';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { SignInResponse, z } from '../../src/schema/index';
import { deriveOfflineVerifier } from '../../src/server/pin-hash';
import { api, enrolDevice, startTestServer, type TestServer } from './fixtures';
import { describeBackends } from './backends';

describeBackends('sign-in', (backend) => {
  let server: TestServer;
  let device: { deviceId: string; deviceToken: string };
  beforeEach(async () => {
    server = await startTestServer({ backend, rateLimits: { signInFailuresPerWindow: 3, windowMs: 60_000 } });
    device = await enrolDevice(server);
  });
  afterEach(async () => server.close());

  const signIn = (login: string, pin: string, token = device.deviceToken) =>
    api(server, 'POST', '/api/v1/sign-in', { device: token, body: { login, pin } });

  /** The client's side of the offline check, with WebCrypto as the tablet will run it. */
  async function webCryptoVerifier(pin: string, saltHex: string, iterations: number): Promise<string> {
    const key = await webcrypto.subtle.importKey('raw', new TextEncoder().encode(pin), 'PBKDF2', false, ['deriveBits']);
    const bits = await webcrypto.subtle.deriveBits({ name: 'PBKDF2', hash: 'SHA-256', salt: Buffer.from(saltHex, 'hex'), iterations }, key, 256);
    return Buffer.from(bits).toString('hex');
  }

  describe('POST /api/v1/sign-in', () => {
    it('signs in with the right PIN: person without secrets, session token, offline verifier', async () => {
      const res = await signIn('odile', '1234');
      expect(res.statusCode).toBe(200);
      const body = z.parse(SignInResponse, res.json());
      expect(body.person).toEqual({ id: 'p-op', name: 'Odile Test', login: 'odile', role: 'operator', active: true });
      expect(body.sessionToken).toMatch(/^[A-Za-z0-9_-]{43}$/);
      expect(body.offlineVerifier.hash).toMatch(/^[0-9a-f]{64}$/);
      // The tablet can check the PIN offline with WebCrypto and get the same hash.
      const { salt, iterations, hash } = body.offlineVerifier;
      expect(await webCryptoVerifier('1234', salt, iterations)).toBe(hash);
      expect(await webCryptoVerifier('1235', salt, iterations)).not.toBe(hash);
    });

    it('matches the login without regard to case', async () => {
      expect((await signIn('ODILE', '1234')).statusCode).toBe(200);
    });

    it('refuses a wrong PIN with 401 sign-in-failed', async () => {
      const res = await signIn('odile', '9999');
      expect(res.statusCode).toBe(401);
      expect(res.json()).toEqual({ error: 'sign-in-failed', message: 'The login or PIN is not right.' });
    });

    it('gives the same answer for an unknown login as for a wrong PIN', async () => {
      const res = await signIn('nobody', '1234');
      expect(res.statusCode).toBe(401);
      expect(res.json().error).toBe('sign-in-failed');
    });

    it('refuses an inactive person', async () => {
      expect((await signIn('gone', '4567')).statusCode).toBe(401);
    });

    it('refuses an unknown device token with 401 unauthenticated', async () => {
      const res = await signIn('odile', '1234', 'not-a-real-token');
      expect(res.statusCode).toBe(401);
      expect(res.json().error).toBe('unauthenticated');
    });

    it('refuses a request without a device token', async () => {
      const res = await api(server, 'POST', '/api/v1/sign-in', { body: { login: 'odile', pin: '1234' } });
      expect(res.statusCode).toBe(401);
    });

    it('rate-limits failures, then lets the person in after the window', async () => {
      for (let i = 0; i < 3; i++) expect((await signIn('odile', '0000')).statusCode).toBe(401);
      const limited = await signIn('odile', '1234');
      expect(limited.statusCode).toBe(429);
      expect(limited.headers['retry-after']).toBeDefined();
      server.advance(60_000);
      expect((await signIn('odile', '1234')).statusCode).toBe(200);
    });
  });
});

describe('deriveOfflineVerifier()', () => {
  it('is PBKDF2-HMAC-SHA256 with a hex salt and 32-byte key', async () => {
    // source: RFC 7914 §11, PBKDF2-HMAC-SHA256 test vector P="passwd", S="salt", c=1 (first 32 of 64 bytes) — from memory
    const hash = await deriveOfflineVerifier('passwd', Buffer.from('salt').toString('hex'), 1);
    expect(hash).toBe('55ac046e56e3089fec1691c22544b605f94185216dde0465e68b9d57c20dacbc');
  });
});
