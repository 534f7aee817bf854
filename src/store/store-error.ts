/** Why a store operation failed, as a stable code the app maps to a message. */
export type StoreErrorCode = 'invalid-record' | 'duplicate-id' | 'storage-full' | 'write-failed';

/** An error from the local database with a code and details (house style §5). */
export class StoreError extends Error {
  constructor(
    readonly code: StoreErrorCode,
    message: string,
    readonly details?: Record<string, unknown>,
  ) {
    super(message);
    this.name = 'StoreError';
  }
}

function errorName(e: unknown): string | undefined {
  return typeof e === 'object' && e !== null && 'name' in e ? String((e as { name: unknown }).name) : undefined;
}

/**
 * True when the browser refused a write because storage is full. The quota error may arrive only as the
 * inner error of an AbortError (sync.md §2.6), so `inner` and `cause` are looked at too.
 */
export function isQuotaError(e: unknown): boolean {
  if (errorName(e) === 'QuotaExceededError') return true;
  if (typeof e !== 'object' || e === null) return false;
  const { inner, cause } = e as { inner?: unknown; cause?: unknown };
  return errorName(inner) === 'QuotaExceededError' || errorName(cause) === 'QuotaExceededError';
}

/** Turns a failed IndexedDB write into a StoreError; a full disk gets its own clear code, never swallowed. */
export function toWriteError(e: unknown, what: string): StoreError {
  if (e instanceof StoreError) return e;
  if (isQuotaError(e)) {
    return new StoreError(
      'storage-full',
      `The tablet's storage is full, so ${what} was NOT saved. Sync, then free space before entering more.`,
      { cause: String(e) },
    );
  }
  if (errorName(e) === 'ConstraintError') {
    return new StoreError('duplicate-id', `${what} was not saved: a record with this id already exists.`, {
      cause: String(e),
    });
  }
  return new StoreError('write-failed', `${what} was not saved: ${e instanceof Error ? e.message : String(e)}`, {
    cause: String(e),
  });
}
