import type { RateLimiter } from './rate-limiter';
import type { ServerStore } from './store/server-store';

/** What every route handler needs: the store, the clock and the rate limiters. */
export interface ServerContext {
  readonly store: ServerStore;
  readonly now: () => Date;
  /** Enrolment attempts per client IP. */
  readonly enrolLimiter: RateLimiter;
  /** Failed sign-ins per device and per login. */
  readonly signInLimiter: RateLimiter;
}
