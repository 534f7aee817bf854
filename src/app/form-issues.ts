/** Shared by the set-up forms: reading typed numbers and turning schema issues into words next to a field. */

export type FieldErrors<F extends string> = Partial<Record<F, string>>;

/** The parts of a zod issue the forms read (zod/mini's issue objects have these). */
export interface SchemaIssue {
  readonly code: string;
  readonly path: readonly PropertyKey[];
  readonly message: string;
  readonly minimum?: number | bigint;
  readonly maximum?: number | bigint;
  readonly origin?: string;
  readonly expected?: string;
  readonly inclusive?: boolean;
}

export type ReadNumber = { readonly ok: true; readonly value: number | undefined } | { readonly ok: false; readonly message: string };

/** A typed number with a decimal point or comma; empty is fine when not required (then undefined). */
export function readNumber(raw: string, required: boolean): ReadNumber {
  const t = raw.trim().replace('−', '-');
  if (t === '') return required ? { ok: false, message: 'Required.' } : { ok: true, value: undefined };
  if (!/^-?(\d+([.,]\d*)?|[.,]\d+)$/.test(t)) return { ok: false, message: `“${raw.trim()}” is not a number.` };
  return { ok: true, value: Number(t.replace(',', '.')) };
}

/** One plain sentence for a schema issue (the schema's own words as the fallback). */
export function describeIssue(issue: SchemaIssue): string {
  const n = (v: number | bigint | undefined) => String(v);
  switch (issue.code) {
    case 'too_small':
      if (issue.origin === 'string') return 'Required.';
      if (issue.origin === 'array') return `Give at least ${n(issue.minimum)}.`;
      if (issue.inclusive === false) return `Must be more than ${n(issue.minimum)}.`;
      return `At least ${n(issue.minimum)}.`;
    case 'too_big':
      if (issue.origin === 'string') return `At most ${n(issue.maximum)} characters.`;
      if (issue.inclusive === false) return `Must be less than ${n(issue.maximum)}.`;
      return `At most ${n(issue.maximum)}.`;
    case 'invalid_type':
      if (issue.expected === 'int') return 'A whole number.';
      if (issue.expected === 'number') return 'Required.';
      return issue.message;
    case 'invalid_format':
      return 'Letters, digits, and - _ . : only.';
    default:
      return issue.message;
  }
}

/** The first issue per form field; `fieldOf` maps an issue's path to a field (undefined: not on this form). */
export function fieldErrorsFrom<F extends string>(issues: readonly SchemaIssue[], fieldOf: (path: readonly PropertyKey[]) => F | undefined): FieldErrors<F> {
  const errors: Partial<Record<F, string>> = {};
  for (const issue of issues) {
    const field = fieldOf(issue.path);
    if (field !== undefined && errors[field] === undefined) errors[field] = describeIssue(issue);
  }
  return errors;
}
