import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { RecordId } from '../../src/schema';
import { createRecordIdGenerator, uuidv7 } from '../../src/sync/ids';

/** Builds the 10 random bytes whose first 74 bits are rand_a (12 bits) then rand_b (62 bits). */
function bytesFor(randA: bigint, randB: bigint): Uint8Array {
  const v = ((randA << 62n) | randB) << 6n; // 74 bits, left-aligned in 80
  const out = new Uint8Array(10);
  for (let i = 9, x = v; i >= 0; i--, x >>= 8n) out[i] = Number(x & 0xffn);
  return out;
}

const timestampOf = (id: string) => parseInt(id.replace(/-/g, '').slice(0, 12), 16);

describe('uuidv7()', () => {
  it('reproduces the RFC 9562 example UUIDv7', () => {
    // source: RFC 9562, Appendix A.6 "Example of a UUIDv7 Value": unix_ts_ms 0x017F22E279B0, rand_a 0xCC3,
    // rand_b 0x18C4DC0C0C07398F → 017F22E2-79B0-7CC3-98C4-DC0C0C07398F (values from memory of the RFC text).
    expect(uuidv7(0x017f22e279b0, bytesFor(0xcc3n, 0x18c4dc0c0c07398fn))).toBe('017f22e2-79b0-7cc3-98c4-dc0c0c07398f');
  });

  it('has the RFC 9562 §5.7 layout: 48-bit time, version 7, variant 10, and passes the RecordId schema', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 2 ** 48 - 1 }), fc.uint8Array({ minLength: 10, maxLength: 10 }), (ms, bytes) => {
        const id = uuidv7(ms, bytes);
        const hex = id.replace(/-/g, '');
        expect(id).toMatch(/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/);
        expect(hex[12]).toBe('7'); // version nibble, octet 6 high bits 0111
        expect(parseInt(hex[16]!, 16) >> 2).toBe(0b10); // variant, octet 8 high bits 10
        expect(timestampOf(id)).toBe(ms);
        expect(RecordId.safeParse(id).success).toBe(true);
      }),
    );
  });

  it('sorts by time: a later millisecond gives a greater id whatever the random bits', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 2 ** 48 - 2 }),
        fc.integer({ min: 1, max: 1000 }),
        fc.uint8Array({ minLength: 10, maxLength: 10 }),
        fc.uint8Array({ minLength: 10, maxLength: 10 }),
        (ms, step, a, b) => {
          const later = Math.min(ms + step, 2 ** 48 - 1);
          expect(uuidv7(ms, a) < uuidv7(later, b)).toBe(true);
        },
      ),
    );
  });

  it('stays strictly increasing within one millisecond and when the clock steps back (RFC 9562 §6.2)', () => {
    const ids: string[] = [];
    let prev: string | undefined;
    const times = [5000, 5000, 5000, 4000, 5000, 5001, 5001];
    for (const [i, t] of times.entries()) {
      prev = uuidv7(t, new Uint8Array(10).fill(16 * i), prev);
      ids.push(prev);
    }
    expect([...ids].sort()).toEqual(ids);
    expect(new Set(ids).size).toBe(ids.length);
    expect(timestampOf(ids[3]!)).toBe(5000); // the stepped-back clock did not move the timestamp back
  });

  it('carries into the timestamp when the 74 random bits are exhausted', () => {
    const full = uuidv7(1000, bytesFor((1n << 12n) - 1n, (1n << 62n) - 1n));
    const next = uuidv7(1000, new Uint8Array(10), full);
    expect(timestampOf(next)).toBe(1001);
    expect(next > full).toBe(true);
  });

  it('refuses a bad time or too few random bytes', () => {
    expect(() => uuidv7(-1, new Uint8Array(10))).toThrow(RangeError);
    expect(() => uuidv7(2 ** 48, new Uint8Array(10))).toThrow(RangeError);
    expect(() => uuidv7(1.5, new Uint8Array(10))).toThrow(RangeError);
    expect(() => uuidv7(0, new Uint8Array(9))).toThrow(/10 random bytes/);
  });
});

describe('createRecordIdGenerator()', () => {
  it('makes unique, ordered ids from a frozen clock', () => {
    const next = createRecordIdGenerator(() => 1_700_000_000_000);
    const ids = Array.from({ length: 1000 }, next);
    expect(new Set(ids).size).toBe(1000);
    expect([...ids].sort()).toEqual(ids);
  });
});
