/**
 * Small seeded random generators for the demo data: the same seed always gives the same
 * numbers, so the demo (and its tests) are reproducible.
 */
export type Random = () => number;

/** mulberry32: a 32-bit seeded generator of uniform numbers in [0, 1). */
export function mulberry32(seed: number): Random {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** A standard normal draw by the Box–Muller transform. */
export function normal(random: Random): number {
  const u1 = 1 - random(); // (0, 1]: log never sees 0
  const u2 = random();
  return Math.sqrt(-2 * Math.log(u1)) * Math.cos(2 * Math.PI * u2);
}

/** A Poisson draw (Knuth's product of uniforms; fine for the small means of the demo). */
export function poisson(random: Random, mean: number): number {
  const limit = Math.exp(-mean);
  let k = 0;
  let p = random();
  while (p > limit) {
    k += 1;
    p *= random();
  }
  return k;
}

/** A binomial draw as the sum of n Bernoulli trials. */
export function binomial(random: Random, n: number, p: number): number {
  let k = 0;
  for (let i = 0; i < n; i++) if (random() < p) k += 1;
  return k;
}

/** A whole number from min to max inclusive. */
export function integerBetween(random: Random, min: number, max: number): number {
  return min + Math.floor(random() * (max - min + 1));
}

/** A UUIDv7-shaped id (RFC 9562 layout) with the given millisecond time and seeded random bits. */
export function seededUuidV7(random: Random, ms: number): string {
  const hex = (digits: number) => Array.from({ length: digits }, () => Math.floor(random() * 16).toString(16)).join('');
  const time = Math.floor(ms).toString(16).padStart(12, '0').slice(-12);
  const variant = (8 + Math.floor(random() * 4)).toString(16);
  return `${time.slice(0, 8)}-${time.slice(8)}-7${hex(3)}-${variant}${hex(3)}-${hex(12)}`;
}
