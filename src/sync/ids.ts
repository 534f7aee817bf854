/**
 * UUID version 7 (RFC 9562 §5.7): 48-bit big-endian Unix time in ms, 4-bit version 0b0111, 12-bit rand_a,
 * 2-bit variant 0b10, 62-bit rand_b. Monotonic within a millisecond by RFC 9562 §6.2 ("Monotonic Random"):
 * when `now` is not past the previous id's time, the 74 random bits of the previous id are incremented by
 * one (carrying into the timestamp on overflow), so ids made here always sort after earlier ones even when
 * the clock stalls or steps back. The timestamp comes from the device clock: it orders ids, it is not
 * trusted time (sync.md §2.7).
 */
const HEX = /^[0-9a-f]{8}-[0-9a-f]{4}-7[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/;
const MAX_TS = 2 ** 48 - 1;
const RAND_BITS = 74n;
const RAND_MAX = (1n << RAND_BITS) - 1n;

function splitId(id: string): { ts: number; rand: bigint } {
  const hex = id.replace(/-/g, '');
  const ts = parseInt(hex.slice(0, 12), 16);
  const randA = BigInt('0x' + hex.slice(13, 16)); // 12 bits after the version nibble
  const randB = BigInt('0x' + hex.slice(16, 32)) & ((1n << 62n) - 1n); // drop the 2 variant bits
  return { ts, rand: (randA << 62n) | randB };
}

function format(ts: number, rand: bigint): string {
  const randA = Number(rand >> 62n);
  const randB = rand & ((1n << 62n) - 1n);
  const hex =
    ts.toString(16).padStart(12, '0') +
    (0x7000 | randA).toString(16).padStart(4, '0') +
    ((2n << 62n) | randB).toString(16).padStart(16, '0');
  return `${hex.slice(0, 8)}-${hex.slice(8, 12)}-${hex.slice(12, 16)}-${hex.slice(16, 20)}-${hex.slice(20)}`;
}

/**
 * Makes one UUIDv7 (pure).
 * @param now Unix time in ms (integer, 0 … 2^48−1).
 * @param randomBytes At least 10 random bytes; the first 74 bits are used.
 * @param previous The last id made by this generator, for monotonic ordering; omit for the first.
 */
export function uuidv7(now: number, randomBytes: Uint8Array, previous?: string): string {
  if (!Number.isInteger(now) || now < 0 || now > MAX_TS) throw new RangeError(`uuidv7: time ${now} is not a 48-bit ms timestamp`);
  if (randomBytes.length < 10) throw new RangeError('uuidv7: needs at least 10 random bytes');
  if (previous !== undefined && !HEX.test(previous)) throw new RangeError(`uuidv7: previous id ${previous} is not a lower-case UUIDv7`);
  let fresh = 0n;
  for (let i = 0; i < 10; i++) fresh = (fresh << 8n) | BigInt(randomBytes[i] ?? 0);
  fresh >>= 80n - RAND_BITS;
  if (previous !== undefined) {
    const prev = splitId(previous);
    if (now <= prev.ts) {
      if (prev.rand < RAND_MAX) return format(prev.ts, prev.rand + 1n);
      if (prev.ts >= MAX_TS) throw new RangeError('uuidv7: timestamp space exhausted');
      return format(prev.ts + 1, fresh);
    }
  }
  return format(now, fresh);
}

/** Makes a generator that remembers its last id so ids stay in order; clock and randomness are injectable. */
export function createRecordIdGenerator(
  clock: () => number = Date.now,
  fillRandom: (bytes: Uint8Array<ArrayBuffer>) => void = (bytes) => {
    globalThis.crypto.getRandomValues(bytes);
  },
): () => string {
  let last: string | undefined;
  return () => {
    const bytes = new Uint8Array(10);
    fillRandom(bytes);
    last = uuidv7(Math.floor(clock()), bytes, last);
    return last;
  };
}

/** A new record id (UUIDv7) from the system clock and crypto.getRandomValues. */
export const newRecordId: () => string = createRecordIdGenerator();
