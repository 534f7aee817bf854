/**
 * Batch run-rule detection, 32 points per machine word, in one pass over the values with no
 * allocation except the signals. Each zone test (above the centre, beyond ±1/2/3σ, up or down
 * from the previous point) sets one bit per point in a word; "n in a row" is an AND of shifted
 * copies, "2 of 3" and "4 of 5" are small boolean formulas on shifted copies. A shift reaches
 * back at most 15 points, so every formula needs only the current word and the one before it,
 * which each quantity carries from word to word. Only where some rule fires are the signals
 * built, in the order of the point-by-point RuleEvaluator and from the same patterns, so the
 * signals are exactly its signals (a property test checks this).
 *
 * Zones without a division per point: z = (x − centre)/sigma is monotone in d = x − centre and
 * odd in d (rounding to nearest is symmetric), so for each k there is one double A(k) with
 * z > k ⇔ d > A(k) and z < −k ⇔ d < −A(k), exactly as the evaluator's computed z compares.
 *
 * Bit b of word w stands for point contextStart + 32w + b. The context (points before `from`,
 * at most 16, never before the phase start) gives the windows their history; it never fires.
 */
import { explainCompanion, explainRule } from './rule-text';
import type { RuleSet } from './rule-signals';
import type { RuleCode, Signal } from './types';

/** Points of history a rule window can reach back (15 in a row, plus one for the first difference). */
export const CONTEXT = 16;

/** The companion chart (MR, R or s) checked in the same pass: a spread beyond its limits signals. */
export interface CompanionCheck {
  readonly spread: Float64Array;
  readonly ucl: number;
  /** No lower limit when ≤ 0 (a spread below zero cannot occur). */
  readonly lcl: number;
  readonly rule: RuleCode;
  /** What the explanation calls the spread: "moving range", "subgroup range", … */
  readonly name: string;
  /** The pattern is the point and the one before it (a moving range). */
  readonly pair: boolean;
}

/**
 * Signals at points [from, to) of `values` standardised with one centre and sigma (sigma > 0 and
 * finite), pushed onto `out` in index order (run rules in their fixed order, then the companion
 * chart). Points [contextStart, from) are history only.
 */
export function detectBatch(values: Float64Array, contextStart: number, from: number, to: number, centre: number, sigma: number, set: RuleSet, out: Signal[], companion?: CompanionCheck): void {
  const n = to - contextStart;
  if (n <= 0) return;
  if (!(sigma > 0 && sigma < Infinity && Number.isFinite(centre))) throw new Error('detectBatch needs a finite centre and a positive finite sigma');
  const a0 = zoneBound(sigma, 0);
  const a1 = zoneBound(sigma, 1);
  const a2 = zoneBound(sigma, 2);
  const a3 = zoneBound(sigma, 3);
  const spread = companion ? companion.spread : values;
  const cUcl = companion ? companion.ucl : Infinity;
  const cLcl = companion && companion.lcl > 0 ? companion.lcl : -Infinity;

  // Rule families in use (a word-level formula is skipped when none of its rules is selected).
  const limitRule = set.we1 || set.n1;
  const twoOfThree = set.we2 || set.n5;
  const fourOfFive = set.we3 || set.n6;
  const sameSide = set.we4 || set.n2;
  const texts = ruleTexts();

  const W = (n + 31) >>> 5;
  const planes = scratch(W);
  classify(values, contextStart, n, centre, a0, a1, a2, a3, spread, cUcl, cLcl, planes);
  const { P, O1, UP, Z, E, X2, X3, CF } = planes;
  const firstJ = from - contextStart; // bits below this never fire
  // The previous word of every quantity that is shifted (0 before the context start).
  let pP = 0, pM = 0, pU1 = 0, pD1 = 0, pU2 = 0, pD2 = 0, pUP = 0, pDN = 0;
  let pP2 = 0, pP4 = 0, pM2 = 0, pM4 = 0, pUP2 = 0, pDN2 = 0, pT = 0, pT2 = 0, pT4 = 0;
  let pI = 0, pI2 = 0, pI4 = 0, pI8 = 0, pO = 0, pO2 = 0, pO4 = 0, pA2 = 0, pA4 = 0, pB2 = 0, pB4 = 0;
  for (let w = 0; w < W; w++) {
    const base = contextStart + (w << 5);
    const end = Math.min(32, n - (w << 5));
    const p = P[w]!, o1 = O1[w]!, up = UP[w]!, o2 = X2[w]!, o3 = X3[w]!, cf = CF[w]!;
    const m = ~p & ~Z[w]!; // below the centre: neither above nor on it
    const dn = ~up & ~E[w]!; // down: neither up nor level (nor the first point)
    const U1 = o1 & p, D1 = o1 & m, U2 = o2 & p, D2 = o2 & m;

    let fire = cf;
    if (limitRule) fire |= o3;
    const f23u = U2 & (sh(U2, pU2, 1) | sh(U2, pU2, 2));
    const f23d = D2 & (sh(D2, pD2, 1) | sh(D2, pD2, 2));
    if (twoOfThree) fire |= f23u | f23d;
    const f45u = fourOfFiveOf(U1, pU1);
    const f45d = fourOfFiveOf(D1, pD1);
    if (fourOfFive) fire |= f45u | f45d;
    const P2 = p & sh(p, pP, 1), P4 = P2 & sh(P2, pP2, 2), P8 = P4 & sh(P4, pP4, 4), P9 = P8 & sh(p, pP, 8);
    const M2 = m & sh(m, pM, 1), M4 = M2 & sh(M2, pM2, 2), M8 = M4 & sh(M4, pM4, 4), M9 = M8 & sh(m, pM, 8);
    if (set.we4) fire |= P8 | M8;
    if (set.n2) fire |= P9 | M9;
    const UP2 = up & sh(up, pUP, 1), UP4 = UP2 & sh(UP2, pUP2, 2), rises = UP4 & sh(up, pUP, 4);
    const DN2 = dn & sh(dn, pDN, 1), DN4 = DN2 & sh(DN2, pDN2, 2), falls = DN4 & sh(dn, pDN, 4);
    if (set.n3) fire |= rises | falls;
    // A turn: this difference and the previous one are both non-zero and opposite.
    const T = (up & sh(dn, pDN, 1)) | (dn & sh(up, pUP, 1));
    const T2 = T & sh(T, pT, 1), T4 = T2 & sh(T2, pT2, 2), T8 = T4 & sh(T4, pT4, 4), turns = T8 & sh(T4, pT4, 8);
    if (set.n4) fire |= turns;
    const I = ~o1; // within ±1σ (bits past the last point are never read)
    const I2 = I & sh(I, pI, 1), I4 = I2 & sh(I2, pI2, 2), I8 = I4 & sh(I4, pI4, 4), inside = I8 & sh(I8, pI8, 7);
    if (set.n7) fire |= inside;
    const O2 = o1 & sh(o1, pO, 1), O4 = O2 & sh(O2, pO2, 2), O8 = O4 & sh(O4, pO4, 4);
    const A2 = U1 | sh(U1, pU1, 1), A4 = A2 | sh(A2, pA2, 2), A8 = A4 | sh(A4, pA4, 4);
    const B2 = D1 | sh(D1, pD1, 1), B4 = B2 | sh(B2, pB2, 2), B8 = B4 | sh(B4, pB4, 4);
    const outside = O8 & A8 & B8;
    if (set.n8) fire |= outside;

    if (end < 32) fire &= (1 << end) - 1;
    if ((w << 5) + 32 <= firstJ) fire = 0;
    else if ((w << 5) < firstJ) fire &= -1 << (firstJ - (w << 5));
    while (fire !== 0) {
      const b = 31 - Math.clz32(fire & -fire);
      fire &= fire - 1;
      const i = base + b;
      if (limitRule && (o3 >>> b) & 1) {
        const side = (p >>> b) & 1 ? 'above' : 'below';
        if (set.we1) out.push(sided('we1', i, [i], side, texts));
        if (set.n1) out.push(sided('n1', i, [i], side, texts));
      }
      if (twoOfThree && ((f23u | f23d) >>> b) & 1) {
        const above = (f23u >>> b) & 1;
        const pts = windowPoints(above ? U2 : D2, above ? pU2 : pD2, b, i, 3);
        const side = above ? 'above' : 'below';
        if (set.we2) out.push(sided('we2', i, pts, side, texts));
        if (set.n5) out.push(sided('n5', i, set.we2 ? pts.slice() : pts, side, texts));
      }
      if (fourOfFive && ((f45u | f45d) >>> b) & 1) {
        const above = (f45u >>> b) & 1;
        const pts = windowPoints(above ? U1 : D1, above ? pU1 : pD1, b, i, 5);
        const side = above ? 'above' : 'below';
        if (set.we3) out.push(sided('we3', i, pts, side, texts));
        if (set.n6) out.push(sided('n6', i, set.we3 ? pts.slice() : pts, side, texts));
      }
      if (sameSide) {
        if (set.we4 && ((P8 | M8) >>> b) & 1) out.push(sided('we4', i, run(i, 8), (P8 >>> b) & 1 ? 'above' : 'below', texts));
        if (set.n2 && ((P9 | M9) >>> b) & 1) out.push(sided('n2', i, run(i, 9), (P9 >>> b) & 1 ? 'above' : 'below', texts));
      }
      if (set.n3 && ((rises | falls) >>> b) & 1) out.push(sided('n3', i, run(i, 6), (rises >>> b) & 1 ? 'above' : 'below', texts));
      if (set.n4 && (turns >>> b) & 1) out.push({ rule: 'n4', index: i, points: run(i, 14), explanation: texts.n4 });
      if (set.n7 && (inside >>> b) & 1) out.push({ rule: 'n7', index: i, points: run(i, 15), explanation: texts.n7 });
      if (set.n8 && (outside >>> b) & 1) out.push({ rule: 'n8', index: i, points: run(i, 8), explanation: texts.n8 });
      if ((cf >>> b) & 1) {
        const c = companion!;
        const side = spread[i]! > cUcl ? 'above' : 'below';
        out.push({ rule: c.rule, index: i, points: c.pair ? [i - 1, i] : [i], side, explanation: explainCompanion(c.name, side), companion: true });
      }
    }

    pP = p; pM = m; pU1 = U1; pD1 = D1; pU2 = U2; pD2 = D2; pUP = up; pDN = dn;
    pP2 = P2; pP4 = P4; pM2 = M2; pM4 = M4; pUP2 = UP2; pDN2 = DN2; pT = T; pT2 = T2; pT4 = T4;
    pI = I; pI2 = I2; pI4 = I4; pI8 = I8; pO = o1; pO2 = O2; pO4 = O4; pA2 = A2; pA4 = A4; pB2 = B2; pB4 = B4;
  }
}

interface Planes {
  /** Per word, bit b for point contextStart + 32w + b: above the centre (z > 0), */
  readonly P: Int32Array;
  /** beyond ±1σ, above the previous value, */
  readonly O1: Int32Array;
  readonly UP: Int32Array;
  /** exactly on the centre (z = 0), level with the previous value (or the first point), */
  readonly Z: Int32Array;
  readonly E: Int32Array;
  /** beyond ±2σ, beyond ±3σ, companion spread beyond its limits. */
  readonly X2: Int32Array;
  readonly X3: Int32Array;
  readonly CF: Int32Array;
}

let planesCache: Planes | null = null;

// Word planes reused from call to call (the engine runs on one thread; a batch never nests).
function scratch(W: number): Planes {
  if (!planesCache || planesCache.P.length < W) {
    const size = Math.max(W, 2 * (planesCache?.P.length ?? 0), 64);
    const mk = () => new Int32Array(size);
    planesCache = { P: mk(), O1: mk(), UP: mk(), Z: mk(), E: mk(), X2: mk(), X3: mk(), CF: mk() };
  }
  const c = planesCache;
  c.Z.fill(0, 0, W);
  c.E.fill(0, 0, W);
  c.X2.fill(0, 0, W);
  c.X3.fill(0, 0, W);
  c.CF.fill(0, 0, W);
  return c;
}

// The one loop over the points: three comparisons that come out either way on noisy data become
// bits without a branch; the rare cases (beyond ±2σ, ties, a companion signal) take a branch.
function classify(values: Float64Array, cs: number, n: number, centre: number, a0: number, a1: number, a2: number, a3: number, spread: Float64Array, cUcl: number, cLcl: number, out: Planes): void {
  const { P, O1, UP, Z, E, X2, X3, CF } = out;
  const W = (n + 31) >>> 5;
  let prev = values[cs]!; // the first point has no previous one: level
  for (let w = 0; w < W; w++) {
    const base = cs + (w << 5);
    const end = Math.min(32, n - (w << 5));
    let p = 0, o1 = 0, up = 0;
    for (let b = 0; b < end; b++) {
      const x = values[base + b]!;
      const d = x - centre;
      const ad = Math.abs(d);
      p |= bit(d > a0) << b;
      o1 |= bit(ad > a1) << b;
      up |= bit(x > prev) << b;
      const s = spread[base + b]!;
      if (ad > a2 || ad <= a0 || x === prev || s > cUcl || s < cLcl) {
        if (ad > a2) {
          X2[w]! |= 1 << b;
          if (ad > a3) X3[w]! |= 1 << b;
        }
        if (ad <= a0) Z[w]! |= 1 << b;
        if (x === prev) E[w]! |= 1 << b;
        if (s > cUcl || s < cLcl) CF[w]! |= 1 << b; // NaN (no spread) never
      }
      prev = x;
    }
    P[w] = p;
    O1[w] = o1;
    UP[w] = up;
  }
}

function bit(c: boolean): number {
  return (c as unknown as number) | 0;
}

/** Bit b of the result is bit b − k of the 64-bit string prv:cur (1 ≤ k ≤ 31). */
function sh(cur: number, prv: number, k: number): number {
  return (cur << k) | (prv >>> (32 - k));
}

// Newest bit set and at least 3 of the 4 before it.
function fourOfFiveOf(x: number, px: number): number {
  const a = sh(x, px, 1), b = sh(x, px, 2), c = sh(x, px, 3), d = sh(x, px, 4);
  return x & ((a & b & (c | d)) | (c & d & (a | b)));
}

// Indices of the set bits among the `w` points ending at bit b (point i), oldest first.
function windowPoints(cur: number, prv: number, b: number, i: number, w: number): number[] {
  const pts: number[] = [];
  for (let k = w - 1; k >= 0; k--) {
    const set = b >= k ? (cur >>> (b - k)) & 1 : (prv >>> (32 + b - k)) & 1;
    if (set) pts.push(i - k);
  }
  return pts;
}

function run(index: number, length: number): number[] {
  const pts = new Array<number>(length);
  for (let k = 0; k < length; k++) pts[k] = index - length + 1 + k;
  return pts;
}

type SidedRule = 'we1' | 'n1' | 'we2' | 'n5' | 'we3' | 'n6' | 'we4' | 'n2' | 'n3';
type Texts = Record<`${SidedRule}${'above' | 'below'}` | 'n4' | 'n7' | 'n8', string>;

function sided(rule: SidedRule, index: number, points: number[], side: 'above' | 'below', texts: Texts): Signal {
  return { rule, index, points, side, explanation: texts[`${rule}${side}`] };
}

const SIDED: readonly SidedRule[] = ['we1', 'n1', 'we2', 'n5', 'we3', 'n6', 'we4', 'n2', 'n3'];
let textCache: Texts | undefined;

// Every explanation a batch can give, looked up once.
function ruleTexts(): Texts {
  if (textCache) return textCache;
  const t: Record<string, string> = { n4: explainRule('n4', undefined), n7: explainRule('n7', undefined), n8: explainRule('n8', undefined) };
  for (const r of SIDED) for (const s of ['above', 'below'] as const) t[r + s] = explainRule(r, s);
  return (textCache = t as Texts);
}

// z = d/sigma (rounded) is non-decreasing in d and odd, so {d ≥ 0 : d/sigma ≤ k} is [0, A(k)].
// A(k) is found next to k·sigma (a step or two in the last place), by bisection otherwise.
const f64 = new Float64Array(1);
const u32 = new Uint32Array(f64.buffer);
const LO = new Uint8Array(new Uint32Array([1]).buffer)[0] === 1 ? 0 : 1; // index of the low word
const HI = 1 - LO;

function nextUp(x: number): number {
  // x ≥ 0 and finite
  f64[0] = x;
  if (u32[LO] === 0xffffffff) {
    u32[LO] = 0;
    u32[HI]! += 1;
  } else {
    u32[LO]! += 1;
  }
  return f64[0]!;
}

/** The largest double d ≥ 0 with d / sigma ≤ k (sigma > 0 finite, k ≥ 0). */
export function zoneBound(sigma: number, k: number): number {
  const ok = (d: number): boolean => d / sigma <= k;
  let g = k * sigma;
  if (g < Infinity) {
    for (let step = 0; step < 4; step++) {
      if (ok(g)) {
        const u = nextUp(g);
        if (!ok(u)) return g;
        g = u;
      } else {
        if (g === 0) break; // cannot happen: 0 / sigma = 0 ≤ k
        g = nextDown(g);
      }
    }
  }
  // Bisection over the bit patterns of the non-negative doubles (ordered as the doubles are),
  // each pattern held as two 32-bit halves so that the arithmetic stays exact.
  let loH = 0, loL = 0; // 0: ok
  let hiH = 0x7ff00000, hiL = 0; // Infinity: Infinity / sigma > k
  for (;;) {
    const sumH = loH + hiH;
    let midH = Math.floor(sumH / 2);
    let midL = Math.floor((loL + hiL + (sumH % 2) * 4294967296) / 2);
    if (midL >= 4294967296) {
      midH += 1;
      midL -= 4294967296;
    }
    if ((midH === loH && midL === loL) || (midH === hiH && midL === hiL)) return fromHalves(loH, loL);
    if (ok(fromHalves(midH, midL))) {
      loH = midH;
      loL = midL;
    } else {
      hiH = midH;
      hiL = midL;
    }
  }
}

function fromHalves(h: number, l: number): number {
  u32[HI] = h;
  u32[LO] = l;
  return f64[0]!;
}

function nextDown(x: number): number {
  // x > 0
  f64[0] = x;
  if (u32[LO] === 0) {
    u32[LO] = 0xffffffff;
    u32[HI]! -= 1;
  } else {
    u32[LO]! -= 1;
  }
  return f64[0]!;
}
