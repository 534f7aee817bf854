import type { FastifyRequest } from 'fastify';
import type { Person, Role } from '../schema/index';
import { HttpError } from './http-error';
import type { ServerContext } from './server-context';
import type { DeviceRow, SessionRow } from './store/server-store';
import { hashSecret } from './tokens';

/** Header that carries a person's session token (the device token travels in Authorization). */
export const SESSION_HEADER = 'x-plumbline-session';

/** Roles from least to most set-up power; a higher role may do what a lower one may. */
const ROLE_RANK: Readonly<Record<Role, number>> = { operator: 0, supervisor: 1, engineer: 2, admin: 3 };

/** True when `role` is `minimum` or above it. */
export function hasRoleAtLeast(role: Role, minimum: Role): boolean {
  return ROLE_RANK[role] >= ROLE_RANK[minimum];
}

/** "an admin", "a supervisor": the role with its article, for messages. */
export function roleWithArticle(role: Role): string {
  return `${/^[aeiou]/.test(role) ? 'an' : 'a'} ${role}`;
}

/** Throws 403 unless the person holds `minimum` or a higher role. */
export function requireRole(person: Person, minimum: Role, action: string): void {
  if (!hasRoleAtLeast(person.role, minimum)) {
    throw new HttpError(403, 'forbidden', `Only ${roleWithArticle(minimum)} or above may ${action}; ${person.name} is signed in as ${roleWithArticle(person.role)}.`);
  }
}

/** The enrolled device named by `Authorization: Bearer <deviceToken>`; 401 when missing, unknown or revoked. */
export async function authenticateDevice(ctx: ServerContext, request: FastifyRequest): Promise<DeviceRow> {
  const header = request.headers.authorization;
  const match = typeof header === 'string' ? /^Bearer\s+(\S+)$/i.exec(header) : null;
  if (!match?.[1]) {
    throw new HttpError(401, 'unauthenticated', 'This request needs the device token in an "Authorization: Bearer" header; enrol the tablet first.');
  }
  const device = await ctx.store.findDeviceByTokenHash(hashSecret(match[1]));
  if (!device) throw new HttpError(401, 'unauthenticated', 'The device token is not known to this server; enrol the tablet again.');
  if (device.revokedAt !== null) throw new HttpError(401, 'device-revoked', 'This tablet has been withdrawn by an administrator; a site admin can reinstate it (its unsent records then go at its next sync).');
  return device;
}

export interface SignedIn {
  readonly session: SessionRow;
  readonly person: Person;
  /** The site the person belongs to: every change they make is limited to it. */
  readonly siteId: string;
}

/** The person signed in by the session token header; 401 when missing, unknown, expired or the person is no longer active. */
export async function authenticateSession(ctx: ServerContext, request: FastifyRequest): Promise<SignedIn> {
  const token = request.headers[SESSION_HEADER];
  if (typeof token !== 'string' || token.length === 0) {
    throw new HttpError(401, 'unauthenticated', `This request needs a session token in the "${SESSION_HEADER}" header; sign in first.`);
  }
  const session = await ctx.store.findSessionByTokenHash(hashSecret(token));
  if (!session) throw new HttpError(401, 'unauthenticated', 'The session token is not known to this server; sign in again.');
  if (Date.parse(session.expiresAt) <= ctx.now().getTime()) {
    throw new HttpError(401, 'session-expired', 'The session has expired; sign in again.');
  }
  const device = await ctx.store.getDevice(session.deviceId);
  if (!device || device.revokedAt !== null) throw new HttpError(401, 'device-revoked', 'The tablet of this session has been withdrawn; a site admin can reinstate it.');
  const person = await ctx.store.getSetup('person', session.personId);
  if (!person?.body.active) throw new HttpError(401, 'unauthenticated', 'The person of this session is no longer active; sign in again.');
  return { session, person: person.body, siteId: person.siteId };
}
