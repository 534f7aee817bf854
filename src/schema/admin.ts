import { EntityId, Instant, NonEmptyText, z } from './common';
import { Person, Role } from './setup';

/**
 * The site admin's requests and answers (people, tablets, enrolment codes), shared by the server
 * routes and the app's forms, and the one rule both sides enforce: a site always keeps an active admin.
 */

/** In words, for forms and error messages. */
export const PIN_RULE = 'A PIN is 4 to 12 digits, not all the same digit and not a straight run such as 1234 or 9876.';

/** True for a PIN that is one digit repeated, or a run up or down by one (1234, 6543, 0123). */
export function isGuessablePin(pin: string): boolean {
  if (pin.length < 2) return false;
  const steps = new Set<number>();
  for (let i = 1; i < pin.length; i++) steps.add(pin.charCodeAt(i) - pin.charCodeAt(i - 1));
  return steps.size === 1 && [0, 1, -1].includes([...steps][0]!);
}

/** A PIN an admin sets for someone: the sign-in shape (4–12 digits) and not guessable. */
export const NewPin = z.string().check(
  z.regex(/^[0-9]{4,12}$/, { error: 'A PIN is 4 to 12 digits (0–9).' }),
  z.refine((pin) => !isGuessablePin(pin), { error: 'This PIN is too easy to guess: not all the same digit, and not a straight run such as 1234.' }),
);

/** Logins are typed on a tablet: letters, digits, dot, dash and underscore, no spaces. */
export const NewLogin = z.string().check(
  z.trim(),
  z.minLength(2, { error: 'A login has at least 2 characters.' }),
  z.maxLength(40, { error: 'A login has at most 40 characters.' }),
  z.regex(/^[A-Za-z0-9._-]+$/, { error: 'A login uses only letters, digits, dot, dash and underscore (no spaces).' }),
);

/** POST /api/v1/admin/people: a new person with a first PIN. */
export const NewPersonRequest = z.object({
  name: NonEmptyText(80),
  login: NewLogin,
  role: Role,
  pin: NewPin,
});
export type NewPersonRequest = z.infer<typeof NewPersonRequest>;

/** POST /api/v1/admin/people/:id: a new role, or access withdrawn (active false) or given back. */
export const PersonChangeRequest = z.object({ role: z.optional(Role), active: z.optional(z.boolean()) });
export type PersonChangeRequest = z.infer<typeof PersonChangeRequest>;

/** POST /api/v1/admin/pin: a new PIN for a person of the site. */
export const SetPinRequest = z.object({ personId: EntityId, pin: NewPin });
export type SetPinRequest = z.infer<typeof SetPinRequest>;

/** A person as the admin sees them: with when their PIN was last set (never the PIN). */
export const AdminPerson = z.extend(Person, { pinSetAt: z.optional(Instant) });
export type AdminPerson = z.infer<typeof AdminPerson>;

export const PeopleListResponse = z.object({ people: z.array(AdminPerson) });
export type PeopleListResponse = z.infer<typeof PeopleListResponse>;

export const PersonResponse = z.object({ person: Person });
export type PersonResponse = z.infer<typeof PersonResponse>;

/** A tablet as the admin sees it. The server knows when it last sent records and when someone last signed in on it. */
export const AdminDevice = z.object({
  id: EntityId,
  name: NonEmptyText(60),
  enrolledAt: Instant,
  revokedAt: z.nullable(Instant),
  lastUploadAt: z.optional(z.nullable(Instant)),
  lastSignInAt: z.optional(z.nullable(Instant)),
  /**
   * The tablet numbers every record it makes from 1; the server notes each number it receives.
   * `gaps`: numbers below the highest never received (still waiting on the tablet, or lost if it
   * was wiped), at most 20 ranges listed; `missing` counts them all.
   */
  records: z.optional(z.object({
    received: z.int().check(z.minimum(0)),
    highest: z.int().check(z.minimum(0)),
    missing: z.int().check(z.minimum(0)),
    gaps: z.array(z.object({ from: z.int().check(z.minimum(1)), to: z.int().check(z.minimum(1)) })),
  })),
});
export type AdminDevice = z.infer<typeof AdminDevice>;

export const DeviceListResponse = z.object({ devices: z.array(AdminDevice) });
export type DeviceListResponse = z.infer<typeof DeviceListResponse>;

/** POST /api/v1/admin/enrolment-codes → a one-time code and when it stops working. */
export const EnrolmentCodeRequest = z.object({ ttlMinutes: z.optional(z.int().check(z.minimum(1), z.maximum(24 * 60))) });
export const EnrolmentCodeIssued = z.object({ code: NonEmptyText(32), expiresAt: Instant });
export type EnrolmentCodeIssued = z.infer<typeof EnrolmentCodeIssued>;

/**
 * The pinRef of a PIN: the first 16 hex digits of SHA-256 over its offline verifier's salt (a random
 * value made anew at every PIN change). It tells which PIN a cached verifier belongs to and nothing about the PIN.
 */
export async function pinRefOf(verifierSalt: string): Promise<string> {
  const digest = await globalThis.crypto.subtle.digest('SHA-256', new TextEncoder().encode(verifierSalt));
  return Array.from(new Uint8Array(digest).slice(0, 8), (b) => b.toString(16).padStart(2, '0')).join('');
}

/** Counts the active admins once `change` is applied to the person `personId` (the others as they are). */
export function activeAdminsAfter(people: readonly Person[], personId: string, change: PersonChangeRequest): number {
  return people.filter((p) => {
    const next = p.id === personId ? { ...p, ...change } : p;
    return next.active && next.role === 'admin';
  }).length;
}

/**
 * Why a change may not be made, or undefined: the site must keep at least one active admin, or nobody
 * could manage its people and tablets any more.
 */
export function lastAdminProblem(people: readonly Person[], personId: string, change: PersonChangeRequest): string | undefined {
  const target = people.find((p) => p.id === personId);
  if (!target || !(target.active && target.role === 'admin')) return undefined;
  if (activeAdminsAfter(people, personId, change) > 0) return undefined;
  const what = change.active === false ? 'withdraw the access of' : 'change the role of';
  return `You cannot ${what} ${target.name}: they are the site's only active admin, and the site must keep one. Make someone else an admin first.`;
}
