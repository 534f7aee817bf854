import { pbkdf2Sync } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { constantTimeEqual, deriveOfflineVerifier, verifyOffline } from '../../src/sync/offline-verifier';

describe('deriveOfflineVerifier()', () => {
  it('matches the published PBKDF2-HMAC-SHA256 test vector', async () => {
    // source: RFC 7914 §11, PBKDF2-HMAC-SHA256 (P="passwd", S="salt", c=1, dkLen=64) (from memory);
    // cross-checked below against node:crypto.
    const expected =
      '55ac046e56e3089fec1691c22544b605f94185216dde0465e68b9d57c20dacbc49ca9cccf179b645991664b39d77ef317c71b845b1e30bd509112041d3a19783';
    const v = await deriveOfflineVerifier('passwd', '73616c74', 1, { saltEncoding: 'hex', lengthBytes: 64 });
    expect(v.hash).toBe(expected);
    expect(pbkdf2Sync('passwd', 'salt', 1, 64, 'sha256').toString('hex')).toBe(expected);
  });

  it('matches the server derivation: hex salt, UTF-8 PIN, 32 bytes, lower-case hex', async () => {
    const salt = '00112233445566778899aabbccddeeff';
    const server = pbkdf2Sync(Buffer.from('2468', 'utf8'), Buffer.from(salt, 'hex'), 1000, 32, 'sha256').toString('hex');
    const v = await deriveOfflineVerifier('2468', salt, 1000);
    expect(v).toEqual({ salt, hash: server, iterations: 1000 });
  });
});

describe('verifyOffline()', () => {
  const salt = 'a1b2c3d4e5f60718293a4b5c6d7e8f90';
  it('accepts the right PIN and refuses a wrong one', async () => {
    const verifier = await deriveOfflineVerifier('4711', salt, 2000);
    expect(await verifyOffline('4711', verifier)).toBe(true);
    expect(await verifyOffline('4712', verifier)).toBe(false);
    expect(await verifyOffline('4711', { ...verifier, hash: verifier.hash.toUpperCase() })).toBe(true);
  });

  it('refuses a malformed verifier instead of throwing', async () => {
    expect(await verifyOffline('4711', { salt: 'zz', hash: 'ab', iterations: 10 })).toBe(false);
    expect(await verifyOffline('4711', { salt, hash: 'ab', iterations: 0 })).toBe(false);
  });

  it('compares strings fully', () => {
    expect(constantTimeEqual('abc', 'abc')).toBe(true);
    expect(constantTimeEqual('abc', 'abd')).toBe(false);
    expect(constantTimeEqual('abc', 'abcd')).toBe(false);
    expect(constantTimeEqual('', '')).toBe(true);
  });
});
