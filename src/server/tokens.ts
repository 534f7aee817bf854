import { createHash, randomBytes, randomInt } from 'node:crypto';

/** A bearer token: 32 random bytes, base64url (43 characters). Only its hash is stored. */
export function newToken(): string {
  return randomBytes(32).toString('base64url');
}

/** sha256 hex of a token or code: what the database keeps instead of the secret itself. */
export function hashSecret(secret: string): string {
  return createHash('sha256').update(secret, 'utf8').digest('hex');
}

// No 0/O, 1/I/L, so a code read aloud or copied from a screen is typed right.
const CODE_ALPHABET = '23456789ABCDEFGHJKMNPQRSTUVWXYZ';
const CODE_LENGTH = 10;

/** A one-time enrolment code such as `K7PD3-QXM2A` (10 symbols of 31, about 49 bits). */
export function newEnrolmentCode(): string {
  let code = '';
  for (let i = 0; i < CODE_LENGTH; i++) code += CODE_ALPHABET[randomInt(CODE_ALPHABET.length)];
  return `${code.slice(0, 5)}-${code.slice(5)}`;
}

/** Upper case, without spaces and dashes: `k7pd3 qxm2a` and `K7PD3-QXM2A` are the same code. */
export function normaliseEnrolmentCode(code: string): string {
  return code.toUpperCase().replace(/[\s-]+/g, '');
}

/** A device id: readable prefix plus 8 random bytes (fits the EntityId pattern). */
export function newDeviceId(): string {
  return `dev-${randomBytes(8).toString('hex')}`;
}
