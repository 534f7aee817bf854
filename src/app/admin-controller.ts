import type { AdminDevice, AdminPerson, EnrolmentCodeIssued, Person, PersonChangeRequest } from '../schema';
import { lastAdminProblem } from '../schema';
import type { AdminApi } from '../sync/admin-api';
import { ApiError } from '../sync/api-client';
import { checkNewPerson, checkNewPin, type FieldErrors, type NewPersonInput } from './admin-forms';

/** What the site admin's screens show; everything in it came from the server just now (online only). */
export interface AdminView {
  readonly loading: boolean;
  readonly people?: readonly AdminPerson[];
  readonly devices?: readonly AdminDevice[];
  /** The last enrolment code issued here, shown until it expires or a new one is made. */
  readonly code?: EnrolmentCodeIssued;
  /** When the code was made (tablet clock), so its remaining time is right at once. */
  readonly codeIssuedAt?: number;
  /** Why the lists could not be loaded or a change was not made, in plain words. */
  readonly problem?: string;
  /** What the last change did. */
  readonly notice?: string;
  readonly loadedAt?: number;
}

export type FormOutcome = { readonly ok: true } | { readonly ok: false; readonly errors: FieldErrors };

/** The admin's actions; each reports trouble in `AdminView.problem` or the form's errors, never by throwing. */
export interface AdminActions {
  adminReload(): Promise<void>;
  adminAddPerson(input: NewPersonInput): Promise<FormOutcome>;
  adminChangePerson(personId: string, change: PersonChangeRequest): Promise<boolean>;
  adminResetPin(personId: string, pin: string, pinAgain: string): Promise<FormOutcome>;
  adminRevokeTablet(deviceId: string): Promise<boolean>;
  /** Gives a withdrawn tablet back: its token works again and its unsent records go at its next sync. */
  adminReinstateTablet(deviceId: string): Promise<boolean>;
  /** A connection code for a new tablet, valid for `ttlMinutes` (the server's 15 minutes when not given). */
  adminIssueCode(ttlMinutes?: number): Promise<boolean>;
}

export interface AdminControllerDeps {
  readonly api?: AdminApi;
  /** The signed-in person's session token from an online sign-in (none after an offline sign-in). */
  readonly sessionToken: () => string | undefined;
  readonly get: () => AdminView | undefined;
  readonly set: (view: AdminView) => void;
  readonly now: () => number;
  /** Told when a change concerned someone; false means the admin screens are closed now (the admin changed themself). */
  readonly onPersonChanged?: (person: Person) => boolean;
}

export const NO_SESSION =
  'You signed in without a connection, so the site server does not know this sign-in. People and tablets are managed online only: sign out and sign in again while the tablet is online.';
export const OFFLINE =
  'The site server cannot be reached from this tablet. People and tablets are managed online only; nothing was changed. Check the network and try again.';
export const SESSION_ENDED =
  'Your sign-in on the site server has ended. Sign out and sign in again while online to manage people and tablets.';

/** A failed admin call in the words a site admin needs. */
export function adminProblemOf(error: unknown): string {
  if (!(error instanceof ApiError)) return `Something went wrong: ${error instanceof Error ? error.message : String(error)}`;
  if (error.code === 'offline') return OFFLINE;
  const code = error.details.serverCode;
  if (error.code === 'unauthorized' && (code === 'session-expired' || code === 'unauthenticated')) return SESSION_ENDED;
  return error.serverMessage ?? error.message;
}

/** The admin screens' controller: loads people and tablets from the server and makes the admin's changes. */
export function createAdminController(deps: AdminControllerDeps): AdminActions {
  const view = (): AdminView => deps.get() ?? { loading: false };
  const patch = (p: Partial<AdminView>) => deps.set({ ...view(), ...p });

  /** Runs one call with the session token; on failure sets the problem and returns undefined. */
  async function withSession<T>(work: (api: AdminApi, session: string) => Promise<T>): Promise<T | undefined> {
    const session = deps.sessionToken();
    if (!deps.api) {
      patch({ problem: 'This app was started without the site server’s admin functions.' });
      return undefined;
    }
    if (!session) {
      patch({ problem: NO_SESSION, loading: false });
      return undefined;
    }
    try {
      return await work(deps.api, session);
    } catch (e) {
      patch({ problem: adminProblemOf(e), loading: false });
      return undefined;
    }
  }

  async function reload(notice?: string): Promise<void> {
    patch({ loading: true });
    const loaded = await withSession(async (api, s) => Promise.all([api.listPeople(s), api.listDevices(s)]));
    if (!loaded) return;
    const { code, codeIssuedAt } = view();
    const stillValid = code && Date.parse(code.expiresAt) > deps.now() ? { code, codeIssuedAt } : {};
    deps.set({ loading: false, people: loaded[0], devices: loaded[1], loadedAt: deps.now(), ...stillValid, ...(notice ? { notice } : {}) });
  }

  const nameOf = (personId: string) => view().people?.find((p) => p.id === personId)?.name ?? personId;

  return {
    adminReload: () => reload(),

    async adminAddPerson(input) {
      const checked = checkNewPerson(input, view().people ?? []);
      if (!checked.ok) return checked;
      patch({ problem: undefined, notice: undefined });
      let refusal: string | undefined;
      const person = await withSession((api, s) =>
        api.addPerson(s, checked.value).catch((e: unknown) => {
          // A refusal of the form's content (login taken, bad PIN) belongs in the form, not at the top of the screen.
          if (e instanceof ApiError && e.code === 'rejected') refusal = adminProblemOf(e);
          else throw e;
          return undefined;
        }),
      );
      if (refusal) {
        const field = /login/i.test(refusal) ? 'login' : /PIN/.test(refusal) ? 'pin' : 'form';
        return { ok: false, errors: { [field]: refusal } };
      }
      if (!person) return { ok: false, errors: { form: view().problem ?? 'The person was not added.' } };
      await reload(`${person.name} can now sign in on any tablet of the site with the login “${person.login}” and the PIN you set.`);
      return { ok: true };
    },

    async adminChangePerson(personId, change) {
      const people = view().people ?? [];
      const local = lastAdminProblem(people, personId, change);
      if (local) {
        patch({ problem: local, notice: undefined });
        return false;
      }
      patch({ problem: undefined, notice: undefined });
      const person = await withSession((api, s) => api.changePerson(s, personId, change));
      if (!person) return false;
      if (deps.onPersonChanged?.(person) === false) return true;
      const what =
        change.active === false
          ? `${person.name} can no longer sign in. Tablets forget their offline sign-in at their next sync.`
          : change.active === true
            ? `${person.name} can sign in again.`
            : `${person.name} is now ${person.role === 'admin' || person.role === 'engineer' ? 'an' : 'a'} ${person.role}.`;
      await reload(what);
      return true;
    },

    async adminResetPin(personId, pin, pinAgain) {
      const checked = checkNewPin(pin, pinAgain);
      if (!checked.ok) return checked;
      patch({ problem: undefined, notice: undefined });
      const done = await withSession(async (api, s) => {
        await api.setPin(s, { personId, pin: checked.value });
        return true;
      });
      if (!done) return { ok: false, errors: { form: view().problem ?? 'The PIN was not changed.' } };
      await reload(
        `${nameOf(personId)}'s PIN is changed. Tablets stop taking the old PIN at their next sync; tell ${nameOf(personId)} the new one.`,
      );
      return { ok: true };
    },

    async adminRevokeTablet(deviceId) {
      patch({ problem: undefined, notice: undefined });
      const name = view().devices?.find((d) => d.id === deviceId)?.name ?? deviceId;
      const done = await withSession(async (api, s) => {
        await api.revokeDevice(s, deviceId);
        return true;
      });
      if (!done) return false;
      await reload(`“${name}” is withdrawn: it can no longer send or receive. Records it has not sent stay on it.`);
      return true;
    },

    async adminReinstateTablet(deviceId) {
      patch({ problem: undefined, notice: undefined });
      const name = view().devices?.find((d) => d.id === deviceId)?.name ?? deviceId;
      const done = await withSession(async (api, s) => {
        await api.reinstateDevice(s, deviceId);
        return true;
      });
      if (!done) return false;
      await reload(`“${name}” is in use again: records it has not sent go to the server at its next sync.`);
      return true;
    },

    async adminIssueCode(ttlMinutes) {
      patch({ problem: undefined, notice: undefined });
      const code = await withSession((api, s) => api.issueEnrolmentCode(s, ttlMinutes));
      if (!code) return false;
      patch({ code, codeIssuedAt: deps.now() });
      return true;
    },
  };
}
