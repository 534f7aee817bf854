/**
 * Batch run-rule detection, 32 points per machine word. Each zone test (above the centre, beyond
 * ±1/2/3σ, up or down from the previous point) becomes a bit string; "n in a row" is an AND of
 * shifted copies, "2 of 3" and "4 of 5" are small boolean formulas on shifted copies. Only at the
 * points where some rule fires is the state rebuilt and handed to emitSignals, so the signals are
 * exactly those of the point-by-point RuleEvaluator (a property test checks this).
 *
 * Bit j of word j >>> 5 stands for point contextStart + j. The context (points before `from`, at
 * most 16, never before the phase start) gives the windows their history; it never fires.
 */
import { emitSignals, type RuleSet } from './rule-signals';
import type { Signal } from './types';

type Words = Int32Array;

/** Points of history a rule window can reach back (15 in a row, plus one for the first difference). */
export const CONTEXT = 16;

export function detectBatch(values: Float64Array, contextStart: number, from: number, to: number, centre: number, sigma: number, set: RuleSet, out: Signal[]): void {
  const n = to - contextStart;
  if (n <= 0) return;
  const W = (n + 31) >>> 5;
  const P = new Int32Array(W); // z > 0
  const N = new Int32Array(W); // z < 0
  const U1 = new Int32Array(W); // z > 1
  const D1 = new Int32Array(W);
  const U2 = new Int32Array(W);
  const D2 = new Int32Array(W);
  const U3 = new Int32Array(W);
  const D3 = new Int32Array(W);
  const UP = new Int32Array(W); // value above the previous one (no previous at contextStart)
  const DN = new Int32Array(W);
  let prev = values[contextStart]!;
  for (let w = 0; w < W; w++) {
    let p = 0, m = 0, u1 = 0, d1 = 0, u2 = 0, d2 = 0, u3 = 0, d3 = 0, up = 0, dn = 0;
    const base = contextStart + (w << 5);
    const end = Math.min(32, n - (w << 5));
    for (let b = 0; b < end; b++) {
      const v = values[base + b]!;
      const z = (v - centre) / sigma;
      p |= bit(z > 0) << b;
      m |= bit(z < 0) << b;
      u1 |= bit(z > 1) << b;
      d1 |= bit(z < -1) << b;
      u2 |= bit(z > 2) << b;
      d2 |= bit(z < -2) << b;
      u3 |= bit(z > 3) << b;
      d3 |= bit(z < -3) << b;
      up |= bit(v > prev) << b;
      dn |= bit(v < prev) << b;
      prev = v;
    }
    P[w] = p; N[w] = m; U1[w] = u1; D1[w] = d1; U2[w] = u2; D2[w] = d2; U3[w] = u3; D3[w] = d3; UP[w] = up; DN[w] = dn;
  }
  UP[0]! &= ~1; // the first point has no previous one in this window
  DN[0]! &= ~1;

  const fire = new Int32Array(W);
  const any = (x: Words): void => orInto(fire, x);
  const limits = set.we1 || set.n1 ? or(U3, D3) : null;
  if (limits) any(limits);
  if (set.we2 || set.n5) any(or(twoOfThree(U2), twoOfThree(D2)));
  if (set.we3 || set.n6) any(or(fourOfFive(U1), fourOfFive(D1)));
  const P8 = set.we4 || set.n2 ? runs8(P) : null;
  const N8 = set.we4 || set.n2 ? runs8(N) : null;
  const P9 = set.n2 ? and(P8!, shift(P, 8)) : null;
  const N9 = set.n2 ? and(N8!, shift(N, 8)) : null;
  if (set.we4) any(or(P8!, N8!));
  if (set.n2) any(or(P9!, N9!));
  const rises5 = set.n3 ? runs5(UP) : null;
  const falls5 = set.n3 ? runs5(DN) : null;
  if (set.n3) any(or(rises5!, falls5!));
  // A turn: this difference and the previous one are both non-zero and opposite.
  const turns12 = set.n4 ? runs12(or(and(UP, shift(DN, 1)), and(DN, shift(UP, 1)))) : null;
  if (turns12) any(turns12);
  const outside = or(U1, D1);
  const inside15 = set.n7 ? runs15(valid(not(outside), n)) : null;
  if (inside15) any(inside15);
  const outside8 = set.n8 ? and(and(runs8(outside), within8(U1)), within8(D1)) : null;
  if (outside8) any(outside8);

  const first = from - contextStart;
  for (let w = first >>> 5; w < W; w++) {
    let m = fire[w]!;
    if (w === first >>> 5) m &= -1 << (first & 31);
    while (m !== 0) {
      const b = 31 - Math.clz32(m & -m);
      m &= m - 1;
      const j = (w << 5) | b;
      const i = contextStart + j;
      const z = (values[i]! - centre) / sigma;
      // The state the point-by-point evaluator would have here (counters only need their threshold).
      const runAbove = P9 && get(P9, j) ? 9 : P8 && get(P8, j) ? 8 : 0;
      const runBelow = N9 && get(N9, j) ? 9 : N8 && get(N8, j) ? 8 : 0;
      emitSignals(
        set, i, z, window(U2, j, 3), window(D2, j, 3), window(U1, j, 5), window(D1, j, 5),
        runAbove, runBelow,
        rises5 && get(rises5, j) ? 5 : 0, falls5 && get(falls5, j) ? 5 : 0,
        turns12 && get(turns12, j) ? 13 : 0, inside15 && get(inside15, j) ? 15 : 0, outside8 && get(outside8, j) ? 8 : 0,
        outside8 && get(outside8, j) ? i : -1, outside8 && get(outside8, j) ? i : -1,
        out,
      );
    }
  }
}

function bit(c: boolean): number {
  return (c as unknown as number) | 0;
}

function get(x: Words, j: number): number {
  return (x[j >>> 5]! >>> (j & 31)) & 1;
}

// Bits j, j−1, … j−w+1 of x as a mask with the newest in bit 0 (0 before the window's start).
function window(x: Words, j: number, w: number): number {
  let m = 0;
  for (let k = 0; k < w && k <= j; k++) m |= get(x, j - k) << k;
  return m;
}

/** Bit i of the result is bit i − k of x (0 ≤ k < 32), across word boundaries. */
function shift(x: Words, k: number): Words {
  const r = new Int32Array(x.length);
  if (k === 0) {
    r.set(x);
    return r;
  }
  for (let w = 0; w < x.length; w++) r[w] = (x[w]! << k) | (w > 0 ? x[w - 1]! >>> (32 - k) : 0);
  return r;
}

function and(a: Words, b: Words): Words {
  const r = new Int32Array(a.length);
  for (let w = 0; w < a.length; w++) r[w] = a[w]! & b[w]!;
  return r;
}

function or(a: Words, b: Words): Words {
  const r = new Int32Array(a.length);
  for (let w = 0; w < a.length; w++) r[w] = a[w]! | b[w]!;
  return r;
}

function orInto(a: Words, b: Words): void {
  for (let w = 0; w < a.length; w++) a[w]! |= b[w]!;
}

function not(a: Words): Words {
  const r = new Int32Array(a.length);
  for (let w = 0; w < a.length; w++) r[w] = ~a[w]!;
  return r;
}

// Clears the bits past the last point.
function valid(a: Words, n: number): Words {
  const rest = n & 31;
  if (rest !== 0) a[a.length - 1]! &= (1 << rest) - 1;
  return a;
}

// Runs ending at each point: bit i set when bits i−L+1 … i of x are all set.
function runs4(x: Words): Words {
  const r2 = and(x, shift(x, 1));
  return and(r2, shift(r2, 2));
}
function runs5(x: Words): Words {
  return and(runs4(x), shift(x, 4));
}
function runs8(x: Words): Words {
  const r4 = runs4(x);
  return and(r4, shift(r4, 4));
}
function runs12(x: Words): Words {
  const r4 = runs4(x);
  const r8 = and(r4, shift(r4, 4));
  return and(r8, shift(r4, 8));
}
function runs15(x: Words): Words {
  const r8 = runs8(x);
  return and(r8, shift(r8, 7));
}

// Any of the last 8 bits set.
function within8(x: Words): Words {
  const a2 = or(x, shift(x, 1));
  const a4 = or(a2, shift(a2, 2));
  return or(a4, shift(a4, 4));
}

// Newest bit set and at least one of the two before it.
function twoOfThree(x: Words): Words {
  return and(x, or(shift(x, 1), shift(x, 2)));
}

// Newest bit set and at least 3 of the 4 before it.
function fourOfFive(x: Words): Words {
  const a = shift(x, 1);
  const b = shift(x, 2);
  const c = shift(x, 3);
  const d = shift(x, 4);
  const r = new Int32Array(x.length);
  for (let w = 0; w < x.length; w++) {
    const aw = a[w]!, bw = b[w]!, cw = c[w]!, dw = d[w]!;
    r[w] = x[w]! & ((aw & bw & (cw | dw)) | (cw & dw & (aw | bw)));
  }
  return r;
}
