import * as z from 'zod/mini';
import { en } from 'zod/locales';

// English messages instead of zod/mini's bare "Invalid input" (the mini build ships no locale by default).
z.config(en());

/** Identifier of a set-up entity (site, line, station, characteristic, phase, person): readable slugs are fine. */
export const EntityId = z.string().check(z.minLength(1), z.maxLength(64), z.regex(/^[A-Za-z0-9][A-Za-z0-9_.:-]*$/));
export type EntityId = z.infer<typeof EntityId>;

/** Identifier of a record made on a device: a UUID (v7, time-ordered, made on the tablet). */
export const RecordId = z.uuid();
export type RecordId = z.infer<typeof RecordId>;

/** An instant as an ISO-8601 UTC string with milliseconds, e.g. 2026-12-02T08:00:00.000Z. */
export const Instant = z.iso.datetime();
export type Instant = z.infer<typeof Instant>;

/** A finite measured value (zod 4 numbers reject NaN and ±Infinity). */
export const Measurement = z.number();

export const NonEmptyText = (max: number) => z.string().check(z.trim(), z.minLength(1), z.maxLength(max));
export const OptionalText = (max: number) => z.optional(z.string().check(z.maxLength(max)));

/** Turns a failed safeParse into one readable message, one line per problem with its path. */
export function describeIssues(error: z.core.$ZodError): string {
  return z.prettifyError(error);
}

export { z };
