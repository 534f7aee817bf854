export interface BackoffOptions {
  baseMs: number;
  capMs: number;
}

export const DEFAULT_BACKOFF: BackoffOptions = { baseMs: 1_000, capMs: 300_000 };

/**
 * Delay before retry number `attempt` (0 for the first retry): exponential backoff with full jitter,
 * `random(0, min(cap, base·2^attempt))` (sync.md §3.4). A server's Retry-After is honoured as a lower
 * bound, itself held to the cap so a wrong header cannot stall sync for hours.
 * @param random returns a number in [0, 1), e.g. Math.random.
 */
export function nextDelay(
  attempt: number,
  random: () => number,
  options: BackoffOptions = DEFAULT_BACKOFF,
  retryAfterMs?: number,
): number {
  const n = Math.max(0, Math.min(Math.floor(attempt), 60)); // 2^60·base is far past any cap
  const ceiling = Math.min(options.capMs, options.baseMs * 2 ** n);
  const r = Math.min(Math.max(random(), 0), 1);
  const jittered = Math.floor(r * ceiling);
  const floor = retryAfterMs !== undefined && retryAfterMs > 0 ? Math.min(retryAfterMs, options.capMs) : 0;
  return Math.max(jittered, floor);
}

/** Parses a Retry-After header (delta-seconds or an HTTP date) into ms from `now`; undefined if absent or bad. */
export function parseRetryAfter(value: string | null | undefined, now: number): number | undefined {
  if (!value) return undefined;
  const trimmed = value.trim();
  if (/^\d+$/.test(trimmed)) return Number(trimmed) * 1000;
  const at = Date.parse(trimmed);
  return Number.isNaN(at) ? undefined : Math.max(0, at - now);
}
