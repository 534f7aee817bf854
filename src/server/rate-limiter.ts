/**
 * Fixed-window counter kept in memory: at most `max` hits per key per `windowMs`.
 * Enough for one server process; behind a load balancer each instance counts on its own.
 */
export class RateLimiter {
  private readonly windows = new Map<string, { start: number; count: number }>();

  constructor(
    readonly max: number,
    readonly windowMs: number,
  ) {}

  /** Seconds until `key` may try again, or 0 when it is not blocked. */
  retryAfterSeconds(key: string, now: number): number {
    const w = this.current(key, now);
    return w && w.count >= this.max ? Math.ceil((w.start + this.windowMs - now) / 1000) : 0;
  }

  /** Counts one hit for `key`. */
  hit(key: string, now: number): void {
    const w = this.current(key, now);
    if (w) w.count += 1;
    else this.windows.set(key, { start: now, count: 1 });
    if (this.windows.size > 10_000) this.sweep(now);
  }

  reset(key: string): void {
    this.windows.delete(key);
  }

  private current(key: string, now: number): { start: number; count: number } | undefined {
    const w = this.windows.get(key);
    if (w && now - w.start >= this.windowMs) {
      this.windows.delete(key);
      return undefined;
    }
    return w;
  }

  private sweep(now: number): void {
    for (const [key, w] of this.windows) if (now - w.start >= this.windowMs) this.windows.delete(key);
  }
}
