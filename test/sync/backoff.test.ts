import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { DEFAULT_BACKOFF, nextDelay, parseRetryAfter } from '../../src/sync/backoff';

const random01 = fc.double({ min: 0, max: 1, maxExcluded: true, noNaN: true });

describe('nextDelay()', () => {
  // Full jitter: sleep = random(0, min(cap, base·2^attempt)) (sync.md §3.4, after the AWS architecture blog
  // "Exponential Backoff And Jitter", as cited there).
  it('stays within [0, min(cap, base·2^attempt)) for every attempt and random draw', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 200 }), random01, (attempt, r) => {
        const d = nextDelay(attempt, () => r);
        const ceiling = Math.min(DEFAULT_BACKOFF.capMs, DEFAULT_BACKOFF.baseMs * 2 ** attempt);
        expect(d).toBeGreaterThanOrEqual(0);
        expect(d).toBeLessThan(ceiling);
        expect(Number.isInteger(d)).toBe(true);
      }),
    );
  });

  it('grows: for the same draw, a later attempt never waits less, until the cap', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 30 }), random01, (attempt, r) => {
        expect(nextDelay(attempt + 1, () => r)).toBeGreaterThanOrEqual(nextDelay(attempt, () => r));
      }),
    );
    expect(nextDelay(0, () => 0.999)).toBe(999);
    expect(nextDelay(3, () => 0.5)).toBe(4_000);
    expect(nextDelay(50, () => 0.5)).toBe(150_000);
  });

  it('is jittered: different draws give different delays at the same attempt', () => {
    const delays = new Set([0.1, 0.3, 0.5, 0.7, 0.9].map((r) => nextDelay(6, () => r)));
    expect(delays.size).toBe(5);
  });

  it('honours Retry-After as a lower bound, held to the cap', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 40 }), random01, fc.integer({ min: 1, max: 10_000_000 }), (attempt, r, retryAfter) => {
        const d = nextDelay(attempt, () => r, DEFAULT_BACKOFF, retryAfter);
        expect(d).toBeGreaterThanOrEqual(Math.min(retryAfter, DEFAULT_BACKOFF.capMs));
        expect(d).toBeLessThanOrEqual(DEFAULT_BACKOFF.capMs);
      }),
    );
  });
});

describe('parseRetryAfter()', () => {
  it('reads delta-seconds and HTTP dates (RFC 9110 §10.2.3)', () => {
    expect(parseRetryAfter('120', 0)).toBe(120_000);
    const now = Date.parse('Wed, 02 Dec 2026 08:00:00 GMT');
    expect(parseRetryAfter('Wed, 02 Dec 2026 08:00:30 GMT', now)).toBe(30_000);
    expect(parseRetryAfter('soon', now)).toBeUndefined();
    expect(parseRetryAfter(null, now)).toBeUndefined();
  });
});
