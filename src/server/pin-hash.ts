import { pbkdf2, randomBytes, scrypt, timingSafeEqual } from 'node:crypto';
import { promisify } from 'node:util';

const scryptAsync = promisify(scrypt) as (pin: string, salt: Buffer, keylen: number, options: { N: number; r: number; p: number; maxmem: number }) => Promise<Buffer>;
const pbkdf2Async = promisify(pbkdf2);

/** scrypt cost for the server-side PIN hash (N = 2^15, r = 8, p = 1: about 32 MiB and tens of ms). */
const SCRYPT = { N: 1 << 15, r: 8, p: 1, maxmem: 64 * 1024 * 1024 } as const;
const SCRYPT_KEY_BYTES = 32;

/** PBKDF2 iterations of the offline verifier (runs on tablets, so kept moderate). */
export const OFFLINE_VERIFIER_ITERATIONS = 100_000;

export interface PinHash {
  readonly salt: string;
  readonly hash: string;
}

/** Server-side PIN hash: scrypt over the PIN with a random 16-byte salt; both hex. */
export async function hashPin(pin: string): Promise<PinHash> {
  const salt = randomBytes(16);
  const key = await scryptAsync(pin, salt, SCRYPT_KEY_BYTES, SCRYPT);
  return { salt: salt.toString('hex'), hash: key.toString('hex') };
}

/** Constant-time check of a PIN against a stored scrypt hash. */
export async function verifyPin(pin: string, stored: PinHash): Promise<boolean> {
  const expected = Buffer.from(stored.hash, 'hex');
  const key = await scryptAsync(pin, Buffer.from(stored.salt, 'hex'), expected.length, SCRYPT);
  return key.length === expected.length && timingSafeEqual(key, expected);
}

export interface OfflineVerifier {
  readonly salt: string;
  readonly hash: string;
  readonly iterations: number;
}

/**
 * The offline verifier sent to tablets in SignInResponse.offlineVerifier. Exact derivation,
 * which the client must reproduce with WebCrypto:
 *
 *   saltBytes = hexDecode(verifier.salt)                   // 16 random bytes, sent as 32 hex chars
 *   pinBytes  = UTF-8 bytes of the PIN string as typed     // digits only, e.g. "2468"
 *   bits      = PBKDF2(PRF = HMAC-SHA-256, password = pinBytes, salt = saltBytes,
 *                      iterations = verifier.iterations, dkLen = 32 bytes)
 *   verifier.hash = lower-case hex of bits                  // 64 hex chars
 *
 * In the browser:
 *   const key = await crypto.subtle.importKey('raw', new TextEncoder().encode(pin), 'PBKDF2', false, ['deriveBits']);
 *   const bits = await crypto.subtle.deriveBits(
 *     { name: 'PBKDF2', hash: 'SHA-256', salt: hexToBytes(v.salt), iterations: v.iterations }, key, 256);
 *   ok = toHex(bits) === v.hash   // compare all 64 characters
 *
 * It is separate from the scrypt hash (different salt, different function), so handing it to
 * a tablet does not reveal the server's stored hash.
 */
export async function deriveOfflineVerifier(pin: string, saltHex: string, iterations: number): Promise<string> {
  const bits = await pbkdf2Async(Buffer.from(pin, 'utf8'), Buffer.from(saltHex, 'hex'), iterations, 32, 'sha256');
  return bits.toString('hex');
}

/** A fresh offline verifier for a PIN (random salt, OFFLINE_VERIFIER_ITERATIONS). */
export async function newOfflineVerifier(pin: string, iterations = OFFLINE_VERIFIER_ITERATIONS): Promise<OfflineVerifier> {
  const salt = randomBytes(16).toString('hex');
  return { salt, hash: await deriveOfflineVerifier(pin, salt, iterations), iterations };
}
