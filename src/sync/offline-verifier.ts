/**
 * Offline PIN check. The derivation matches the server's (src/server/pin-hash.ts):
 * hash = hex(PBKDF2(HMAC-SHA-256, password = UTF-8 PIN, salt = hexDecode(salt), iterations, 32 bytes)).
 * Uses WebCrypto (browsers, and Node 20 via globalThis.crypto.subtle).
 */
export interface OfflineVerifier {
  salt: string;
  hash: string;
  iterations: number;
}

/** How salt and hash are encoded and how long the derived key is; defaults match the server. */
export interface VerifierDerivation {
  saltEncoding: 'hex' | 'utf8';
  lengthBytes: number;
}

export const SERVER_DERIVATION: VerifierDerivation = { saltEncoding: 'hex', lengthBytes: 32 };

function hexToBytes(hex: string): Uint8Array<ArrayBuffer> {
  if (hex.length % 2 !== 0 || !/^[0-9a-fA-F]*$/.test(hex)) throw new TypeError('offline verifier: salt is not hex');
  const out = new Uint8Array(hex.length / 2);
  for (let i = 0; i < out.length; i++) out[i] = parseInt(hex.slice(i * 2, i * 2 + 2), 16);
  return out;
}

function bytesToHex(bytes: Uint8Array): string {
  return Array.from(bytes, (b) => b.toString(16).padStart(2, '0')).join('');
}

/** Derives the verifier hash for a PIN (lower-case hex). */
export async function deriveOfflineVerifier(
  pin: string,
  salt: string,
  iterations: number,
  derivation: VerifierDerivation = SERVER_DERIVATION,
): Promise<OfflineVerifier> {
  if (!Number.isInteger(iterations) || iterations < 1) throw new RangeError('offline verifier: iterations must be a positive integer');
  const subtle = globalThis.crypto.subtle;
  const key = await subtle.importKey('raw', new TextEncoder().encode(pin), 'PBKDF2', false, ['deriveBits']);
  const saltBytes = derivation.saltEncoding === 'hex' ? hexToBytes(salt) : new TextEncoder().encode(salt);
  const bits = await subtle.deriveBits({ name: 'PBKDF2', hash: 'SHA-256', salt: saltBytes, iterations }, key, derivation.lengthBytes * 8);
  return { salt, hash: bytesToHex(new Uint8Array(bits)), iterations };
}

/** Compares two strings in time that depends only on their length, not on where they differ. */
export function constantTimeEqual(a: string, b: string): boolean {
  let diff = a.length ^ b.length;
  const n = Math.max(a.length, b.length);
  for (let i = 0; i < n; i++) diff |= (a.charCodeAt(i) || 0) ^ (b.charCodeAt(i) || 0);
  return diff === 0;
}

/** True when the PIN matches the verifier the server provisioned. A malformed verifier is simply false. */
export async function verifyOffline(
  pin: string,
  verifier: OfflineVerifier,
  derivation: VerifierDerivation = SERVER_DERIVATION,
): Promise<boolean> {
  let derived: OfflineVerifier;
  try {
    derived = await deriveOfflineVerifier(pin, verifier.salt, verifier.iterations, derivation);
  } catch {
    return false; // a malformed verifier cannot match any PIN
  }
  return constantTimeEqual(derived.hash, verifier.hash.toLowerCase());
}
