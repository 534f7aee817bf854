/** Growable typed-array columns: one allocation per doubling instead of one object per point. */

export function grow(a: Float64Array, need: number): Float64Array {
  if (need <= a.length) return a;
  const b = new Float64Array(Math.max(need, a.length * 2, 64));
  b.set(a);
  return b;
}

export function growBytes(a: Uint8Array, need: number): Uint8Array {
  if (need <= a.length) return a;
  const b = new Uint8Array(Math.max(need, a.length * 2, 64));
  b.set(a);
  return b;
}

export function growInts(a: Int32Array, need: number): Int32Array {
  if (need <= a.length) return a;
  const b = new Int32Array(Math.max(need, a.length * 2, 64));
  b.set(a);
  return b;
}
