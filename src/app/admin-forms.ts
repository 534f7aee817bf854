import { NewPersonRequest, NewPin, type Person, type Role, z } from '../schema';

/** What the add-person form holds, as typed. */
export interface NewPersonInput {
  readonly name: string;
  readonly login: string;
  readonly role: Role | '';
  readonly pin: string;
  readonly pinAgain: string;
}

export type PersonField = 'name' | 'login' | 'role' | 'pin' | 'pinAgain';
/** One message per field that is wrong; `form` for what belongs to no one field (the server's answer). */
export type FieldErrors = Partial<Record<PersonField | 'form', string>>;

export type FormCheck<T> = { readonly ok: true; readonly value: T } | { readonly ok: false; readonly errors: FieldErrors };

const FIELD_LABEL: Record<PersonField, string> = { name: 'Name', login: 'Login', role: 'Role', pin: 'PIN', pinAgain: 'PIN again' };

/** The first zod message for each top-level field; zod's generic texts get the field's name. */
function errorsByField(error: z.core.$ZodError): FieldErrors {
  const errors: FieldErrors = {};
  for (const issue of error.issues) {
    const field = issue.path[0] as PersonField | undefined;
    if (!field || errors[field]) continue;
    errors[field] = issue.code === 'custom' || issue.code === 'invalid_format' ? issue.message : friendly(field, issue);
  }
  return errors;
}

function friendly(field: PersonField, issue: z.core.$ZodIssue): string {
  if (field === 'role') return 'Choose a role.';
  if (issue.code === 'too_small') return `${FIELD_LABEL[field]} is needed.`;
  if (issue.code === 'too_big') return `${FIELD_LABEL[field]} is too long (at most ${String((issue as { maximum?: unknown }).maximum)} characters).`;
  return issue.message;
}

/** Checks the add-person form as the server will (schema/admin.ts), plus the repeated PIN and a login already in use here. */
export function checkNewPerson(input: NewPersonInput, people: readonly Person[]): FormCheck<NewPersonRequest> {
  const parsed = NewPersonRequest.safeParse({ name: input.name, login: input.login, role: input.role, pin: input.pin });
  const errors: FieldErrors = parsed.success ? {} : errorsByField(parsed.error);
  const pinAgain = pinAgainProblem(input.pin, input.pinAgain);
  if (pinAgain) errors.pinAgain = pinAgain;
  const login = input.login.trim().toLowerCase();
  const taken = login ? people.find((p) => p.login.toLowerCase() === login) : undefined;
  if (taken && !errors.login) errors.login = `This login is already used by ${taken.name}${taken.active ? '' : ' (access withdrawn)'}.`;
  if (!parsed.success || Object.keys(errors).length) return { ok: false, errors };
  return { ok: true, value: parsed.data };
}

/** Checks a new PIN and its repetition (the reset-PIN form). */
export function checkNewPin(pin: string, pinAgain: string): FormCheck<string> {
  const parsed = NewPin.safeParse(pin);
  const errors: FieldErrors = {};
  if (!parsed.success) errors.pin = parsed.error.issues[0]?.message ?? 'This PIN is not valid.';
  const again = pinAgainProblem(pin, pinAgain);
  if (again) errors.pinAgain = again;
  return Object.keys(errors).length ? { ok: false, errors } : { ok: true, value: pin };
}

function pinAgainProblem(pin: string, pinAgain: string): string | undefined {
  if (!pinAgain) return 'Type the PIN a second time.';
  return pin === pinAgain ? undefined : 'The two PINs are not the same.';
}
