import type { ErrorBody } from '../schema/index';

/** Stable error codes of the API; the client may branch on them. */
export type ErrorCode =
  | 'protocol-mismatch'
  | 'bad-request'
  | 'bad-json'
  | 'unsupported-media-type'
  | 'payload-too-large'
  | 'not-found'
  | 'not-built'
  | 'unauthenticated'
  | 'device-revoked'
  | 'session-expired'
  | 'forbidden'
  | 'enrolment-code-invalid'
  | 'enrolment-code-used'
  | 'enrolment-code-expired'
  | 'sign-in-failed'
  | 'person-inactive'
  | 'login-taken'
  | 'last-admin'
  | 'phase-trail'
  | 'rate-limited'
  | 'internal';

/** An error answered as ErrorBody with this status; `headers` are added (e.g. Retry-After). */
export class HttpError extends Error {
  constructor(
    readonly statusCode: number,
    readonly code: ErrorCode,
    message: string,
    readonly headers: Readonly<Record<string, string>> = {},
  ) {
    super(message);
    this.name = 'HttpError';
  }

  toBody(): ErrorBody {
    return { error: this.code, message: this.message };
  }
}
