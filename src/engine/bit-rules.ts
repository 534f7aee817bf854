/**
 * Batch run-rule detection, 32 points per machine word, in one pass over the values with no
 * allocation except the signals. Each zone test (above the centre, beyond ±1/2/3σ, up or down
 * from the previous point) sets one bit per point in a word (two points per instruction in the
 * WebAssembly SIMD kernel of zone-kernel.ts where the JavaScript engine has one); "n in a row" is an AND of shifted
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
import { WORDS_PER_BLOCK, zoneKernel } from './zone-kernel';

/** Points of history a rule window can reach back (15 in a row, plus one for the first difference). */
export const CONTEXT = 16;

/** The companion chart (MR, R or s) checked in the same pass: a spread beyond its limits signals. */
export interface CompanionCheck {
  /** The spread column; null: the moving range, taken from the values. */
  readonly spread: Float64Array | null;
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
  const W = (n + 31) >>> 5;
  const pl = scratch(W);
  // Each rule adds the points where it fires to F, masked by whether it is selected (all bits
  // or none: no branch per word); only the patterns of the selected rules are computed.
  const r1 = set.we1 || set.n1 ? -1 : 0;
  const r23 = set.we2 || set.n5 ? -1 : 0;
  const r45 = set.we3 || set.n6 ? -1 : 0;
  const r8 = set.we4 ? -1 : 0;
  const r9 = set.n2 ? -1 : 0;
  const rTrend = set.n3 ? -1 : 0;
  const rTurn = set.n4 ? -1 : 0;
  const rIn = set.n7 ? -1 : 0;
  const rOut = set.n8 ? -1 : 0;
  classify(values, contextStart, n, centre, sigma, companion, r1, r23, r45, r8, r9, rTrend, rTurn, rIn, rOut, pl);
  const F = pl.F;
  const firstJ = from - contextStart; // bits below this never fire
  // Bits past the last point and before `from` never fire.
  if ((n & 31) !== 0) F[W - 1]! &= (1 << (n & 31)) - 1;
  for (let w = 0; w < firstJ >>> 5; w++) F[w] = 0;
  if ((firstJ & 31) !== 0) F[firstJ >>> 5]! &= -1 << (firstJ & 31);
  buildSignals(values, contextStart, W, set, pl, out, companion, r1, r23, r45, r8, r9, rTrend, rTurn, rIn, rOut);
}

// The signals at the points where F is set, in index order (a function of its own: the
// compiler's inlining budget then goes to the small builders it calls).
function buildSignals(
  values: Float64Array, contextStart: number, W: number, set: RuleSet, pl: Planes, out: Signal[], companion: CompanionCheck | undefined,
  r1: number, r23: number, r45: number, r8: number, r9: number, rTrend: number, rTurn: number, rIn: number, rOut: number,
): void {
  const { F, X3, F23, F45, S8, S9, TREND, TURN, IN, OUT, CF, UP } = pl;
  const t = ruleTexts();
  const cAbove = companion ? explainCompanion(companion.name, 'above') : '';
  const cBelow = companion ? explainCompanion(companion.name, 'below') : '';
  const { P, U1, D1, U2, D2 } = pl;
  for (let w = 0; w < W; w++) {
    let f = F[w]!;
    if (f === 0) continue;
    const base = contextStart + (w << 5);
    // A pattern's side is the side of its newest point: above the centre (P) for the zone and
    // same-side rules, up from the previous value (UP) for the trend.
    const x3 = X3[w]!, p = P[w]!, f23 = F23[w]!, f45 = F45[w]!;
    const s8 = S8[w]!, s9 = S9[w]!, up = UP[w]!, trend = TREND[w]!;
    const turn = TURN[w]!, inside = IN[w]!, outside = OUT[w]!, cf = CF[w]!;
    while (f !== 0) {
      const b = 31 - Math.clz32(f & -f);
      f &= f - 1;
      const i = base + b;
      // The evaluator's rule order, then the companion chart.
      if (r1 & (x3 >>> b) & 1) {
        const above = (p >>> b) & 1;
        if (set.we1) out.push(sided('we1', i, [i], above, t.we1));
        if (set.n1) out.push(sided('n1', i, [i], above, t.n1));
      }
      if (r23 & (f23 >>> b) & 1) {
        const above = (p >>> b) & 1;
        const plane = above ? U2 : D2;
        const pts = window3(olderBits(plane[w]!, w > 0 ? plane[w - 1]! : 0, b, 2), i);
        if (set.we2) out.push(sided('we2', i, pts, above, t.we2));
        if (set.n5) out.push(sided('n5', i, set.we2 ? pts.slice() : pts, above, t.n5));
      }
      if (r45 & (f45 >>> b) & 1) {
        const above = (p >>> b) & 1;
        const plane = above ? U1 : D1;
        const pts = window5(olderBits(plane[w]!, w > 0 ? plane[w - 1]! : 0, b, 4), i);
        if (set.we3) out.push(sided('we3', i, pts, above, t.we3));
        if (set.n6) out.push(sided('n6', i, set.we3 ? pts.slice() : pts, above, t.n6));
      }
      if (r8 & (s8 >>> b) & 1) out.push(sided('we4', i, run8(i), (p >>> b) & 1, t.we4));
      if (r9 & (s9 >>> b) & 1) out.push(sided('n2', i, run9(i), (p >>> b) & 1, t.n2));
      if (rTrend & (trend >>> b) & 1) out.push(sided('n3', i, run6(i), (up >>> b) & 1, t.n3));
      if (rTurn & (turn >>> b) & 1) out.push({ rule: 'n4', index: i, points: run14(i), explanation: t.n4 });
      if (rIn & (inside >>> b) & 1) out.push({ rule: 'n7', index: i, points: run15(i), explanation: t.n7 });
      if (rOut & (outside >>> b) & 1) out.push({ rule: 'n8', index: i, points: run8(i), explanation: t.n8 });
      if ((cf >>> b) & 1) {
        const c = companion!;
        const above = (c.spread ? c.spread[i]! : Math.abs(values[i]! - values[i - 1]!)) > c.ucl;
        out.push({ rule: c.rule, index: i, points: c.pair ? [i - 1, i] : [i], side: above ? 'above' : 'below', explanation: above ? cAbove : cBelow, companion: true });
      }
    }
  }
}

/** One word per 32 points for each zone test, the rule patterns, and which points fire. */
interface Planes {
  // From the values: above the centre (z > 0), above the previous value, beyond ±3σ, companion
  // spread beyond its limits. (Beyond ±1σ and ±2σ, on the centre, below it, down from and level
  // with the previous value are used within the classification only.)
  readonly P: Int32Array;
  readonly UP: Int32Array;
  readonly X3: Int32Array;
  readonly CF: Int32Array;
  // Derived: beyond +1σ, −1σ, +2σ, −2σ.
  readonly U1: Int32Array;
  readonly D1: Int32Array;
  readonly U2: Int32Array;
  readonly D2: Int32Array;
  // Patterns ending at each point.
  // (either side: the side is that of the newest point, so one plane per pattern)
  readonly F23: Int32Array;
  readonly F45: Int32Array;
  readonly S8: Int32Array;
  readonly S9: Int32Array;
  readonly TREND: Int32Array;
  readonly TURN: Int32Array;
  readonly IN: Int32Array;
  readonly OUT: Int32Array;
  /** Any selected rule or the companion chart fires. */
  readonly F: Int32Array;
}

let planesCache: Planes | null = null;

// Planes reused from call to call (the engine runs on one thread and a batch never nests); every
// word below W is written before it is read.
function scratch(W: number): Planes {
  if (!planesCache || planesCache.P.length < W) {
    const size = Math.max(W, 2 * (planesCache?.P.length ?? 0), 64);
    const a = (): Int32Array => new Int32Array(size);
    // A literal keeps the object's shape fixed (fast property access in the loops).
    planesCache = {
      P: a(), UP: a(), X3: a(), CF: a(), U1: a(), D1: a(), U2: a(), D2: a(),
      F23: a(), F45: a(), S8: a(), S9: a(), TREND: a(), TURN: a(), IN: a(), OUT: a(), F: a(),
    };
  }
  return planesCache;
}

// The one loop over the points, 32 at a time: the zone tests, then every selected rule's pattern
// on those 32 points (each pattern carries its words of the previous 32 points), so the zone
// words are used while they are in registers. The comparisons that come out either way on noisy
// data become bits without a branch (in the SIMD kernel of zone-kernel.ts where there is one,
// else in JavaScript); the rare cases (beyond ±3σ, on the centre, level with the previous value,
// a companion signal) are marked in one word and sorted out afterwards.
function classify(
  values: Float64Array, cs: number, n: number, centre: number, sigma: number, companion: CompanionCheck | undefined,
  r1: number, r23: number, r45: number, r8: number, r9: number, rTrend: number, rTurn: number, rIn: number, rOut: number, pl: Planes,
): void {
  const a0 = zoneBound(sigma, 0);
  const a1 = zoneBound(sigma, 1);
  const a2 = zoneBound(sigma, 2);
  const a3 = zoneBound(sigma, 3);
  const movingRange = companion !== undefined && companion.spread === null;
  const spreadColumn = companion?.spread ?? null; // R or s: compared point by point
  const spread = spreadColumn ?? values;
  const cUcl = companion ? companion.ucl : Infinity;
  const cLcl = companion && companion.lcl > 0 ? companion.lcl : -Infinity;
  // Rare-case tests as one comparison each, sorted out exactly below: |d| outside (A(0), A(3)]
  // (on the centre or beyond ±3σ) gives |(|d| − zMid)| ≥ zHalf, and so does a point exactly at
  // A(3) (harmless); a move from the previous value outside (0, limit] (a tie, or a moving range
  // beyond its limit) gives |(|x − prev| − mMid)| ≥ mMid. Both follow from rounding being
  // monotone. The limit without a moving-range chart is far beyond any move of the data.
  const zMid = (a0 + a3) / 2;
  const zHalf = Math.min(zMid - a0, a3 - zMid);
  const mLimit = movingRange ? cUcl : 1e6 * sigma;
  const mMid = mLimit > 0 && mLimit < Infinity ? mLimit / 2 : Infinity; // Infinity: every point to the exact tests
  const { P, UP, X3, CF, U1, D1, U2, D2, F, S8, S9, TREND, TURN, F23, F45, IN, OUT } = pl;
  const W = (n + 31) >>> 5;
  const same = r8 | r9, moves = rTrend | rTurn, windows = r23 | r45, band = rIn | rOut;
  // Each pattern's words of the previous 32 points.
  let pP = 0, pP2 = 0, pP4 = 0, pM = 0, pM2 = 0, pM4 = 0;
  let pU = 0, pU2 = 0, pD = 0, pD2 = 0, pT = 0, pT2 = 0, pT4 = 0;
  let pu1 = 0, pd1 = 0, pu2 = 0, pd2 = 0;
  let pI = 0, pI2 = 0, pI4 = 0, pI8 = 0, pO = 0, pO2 = 0, pO4 = 0, pA = 0, pA2 = 0, pA4 = 0, pB = 0, pB2 = 0, pB4 = 0;
  let prev = values[cs]!; // the first point has no previous one: level
  // The zone words of the moving-range case from the SIMD kernel where there is one (zone-kernel.ts).
  const kernel = spreadColumn === null ? zoneKernel(n) : null;
  const raw = kernel ? kernel.run(values, cs, n, centre, a0, a1, a2, zMid, zHalf, mMid) : null;
  for (let w = 0; w < W; w++) {
    const base = cs + (w << 5);
    const end = Math.min(32, n - (w << 5));
    let p = 0, o1 = 0, up = 0, x2 = 0, rare = 0;
    if (raw !== null) {
      const k = w * WORDS_PER_BLOCK;
      const valid = end === 32 ? -1 : (1 << end) - 1; // the kernel's bits past the last point are not zero
      p = raw[k]! & valid;
      o1 = raw[k + 1]! & valid;
      up = raw[k + 2]! & valid;
      x2 = raw[k + 3]! & valid;
      rare = raw[k + 4]! & valid;
    } else if (spreadColumn === null) {
      // From the newest point of the word back, so each flag shifts in at bit 0.
      let i = base + end - 1;
      if ((end & 1) === 1) {
        const x = values[i]!;
        const d = x - centre;
        const ad = Math.abs(d);
        const dx = i > cs ? x - values[i - 1]! : 0; // > 0 exactly when x > prev, 0 exactly when equal
        p = bit(d > a0);
        o1 = bit(ad > a1);
        up = bit(dx > 0);
        x2 = bit(ad > a2);
        rare = bit(Math.abs(ad - zMid) >= zHalf) | bit(!(Math.abs(Math.abs(dx) - mMid) < mMid));
        i--;
      }
      // Two points a turn (i and i − 1; i − 1 > cs except for the first pair of the context),
      // the point before them read once and carried to the next turn as its newest point.
      let x = i > base ? values[i]! : 0;
      for (; i > base; i -= 2) {
        const y = values[i - 1]!;
        const before = i - 1 > cs ? values[i - 2]! : y;
        const dX = x - centre;
        const dY = y - centre;
        const aX = Math.abs(dX);
        const aY = Math.abs(dY);
        const mX = x - y;
        const mY = y - before;
        p = (p << 2) | (bit(dX > a0) << 1) | bit(dY > a0);
        o1 = (o1 << 2) | (bit(aX > a1) << 1) | bit(aY > a1);
        up = (up << 2) | (bit(mX > 0) << 1) | bit(mY > 0);
        x2 = (x2 << 2) | (bit(aX > a2) << 1) | bit(aY > a2);
        rare =
          (rare << 2) |
          ((bit(Math.abs(aX - zMid) >= zHalf) | bit(!(Math.abs(Math.abs(mX) - mMid) < mMid))) << 1) |
          bit(Math.abs(aY - zMid) >= zHalf) |
          bit(!(Math.abs(Math.abs(mY) - mMid) < mMid));
        x = before;
      }
    } else {
      for (let b = 0; b < end; b++) {
        const x = values[base + b]!;
        const d = x - centre;
        const ad = Math.abs(d);
        const dx = x - prev;
        const s = spreadColumn[base + b]!;
        p |= bit(d > a0) << b;
        o1 |= bit(ad > a1) << b;
        up |= bit(dx > 0) << b;
        x2 |= bit(ad > a2) << b;
        rare |= (bit(Math.abs(ad - zMid) >= zHalf) | bit(!(Math.abs(Math.abs(dx) - mMid) < mMid)) | bit(s > cUcl) | bit(s < cLcl)) << b; // NaN: never
        prev = x;
      }
    }
    let x3 = 0, z = 0, e = 0, cf = 0;
    while (rare !== 0) {
      const b = 31 - Math.clz32(rare & -rare);
      rare &= rare - 1;
      const i = base + b;
      const x = values[i]!;
      const ad = Math.abs(x - centre);
      const s = !movingRange ? spread[i]! : i === cs ? NaN : Math.abs(x - values[i - 1]!);
      x3 |= bit(ad > a3) << b;
      z |= bit(ad <= a0) << b;
      e |= bit(i === cs || x === values[i - 1]) << b;
      cf |= bit(s > cUcl || s < cLcl) << b;
    }
    const m = ~p & ~z; // below: neither above nor on the centre (bits past the last point are never read)
    const dn = ~up & ~e;
    const u1 = o1 & p, d1 = o1 & m, u2 = x2 & p, d2 = x2 & m;
    P[w] = p; UP[w] = up; X3[w] = x3; CF[w] = cf;
    U1[w] = u1; D1[w] = d1; U2[w] = u2; D2[w] = d2;
    let fire = cf | (r1 & x3);
    if (same !== 0) {
      // 8 and 9 in a row on one side (doubling: runs of 2, 4, 8).
      const P2 = p & sh(p, pP, 1), P4 = P2 & sh(P2, pP2, 2), p8 = P4 & sh(P4, pP4, 4);
      const M2 = m & sh(m, pM, 1), M4 = M2 & sh(M2, pM2, 2), m8 = M4 & sh(M4, pM4, 4);
      const s8 = p8 | m8, s9 = (p8 & sh(p, pP, 8)) | (m8 & sh(m, pM, 8));
      S8[w] = s8;
      S9[w] = s9;
      fire |= (r8 & s8) | (r9 & s9);
      pP = p; pP2 = P2; pP4 = P4; pM = m; pM2 = M2; pM4 = M4;
    }
    if (moves !== 0) {
      // 6 in a row rising or falling (5 moves one way) and 14 alternating (13 turns in a row).
      const U2 = up & sh(up, pU, 1), U4 = U2 & sh(U2, pU2, 2);
      const D2 = dn & sh(dn, pD, 1), D4 = D2 & sh(D2, pD2, 2);
      const trend = (U4 & sh(up, pU, 4)) | (D4 & sh(dn, pD, 4));
      // A turn: this move and the previous one are both moves and opposite.
      const t = (up & sh(dn, pD, 1)) | (dn & sh(up, pU, 1));
      const T2 = t & sh(t, pT, 1), T4 = T2 & sh(T2, pT2, 2), T8 = T4 & sh(T4, pT4, 4);
      const turn = T8 & sh(T4, pT4, 8);
      TREND[w] = trend;
      TURN[w] = turn;
      fire |= (rTrend & trend) | (rTurn & turn);
      pU = up; pU2 = U2; pD = dn; pD2 = D2; pT = t; pT2 = T2; pT4 = T4;
    }
    if (windows !== 0) {
      // 2 of 3 beyond 2σ and 4 of 5 beyond 1σ on one side, the newest point among them.
      const f23 = (u2 & (sh(u2, pu2, 1) | sh(u2, pu2, 2))) | (d2 & (sh(d2, pd2, 1) | sh(d2, pd2, 2)));
      // 4 of 5: the newest point and at least 3 of the 4 before it (written out: the loop is too
      // large for the compiler to inline a helper here)
      const ua = sh(u1, pu1, 1), ub = sh(u1, pu1, 2), uc = sh(u1, pu1, 3), ud = sh(u1, pu1, 4);
      const da = sh(d1, pd1, 1), db = sh(d1, pd1, 2), dc = sh(d1, pd1, 3), dd = sh(d1, pd1, 4);
      const f45 = (u1 & ((ua & ub & (uc | ud)) | (uc & ud & (ua | ub)))) | (d1 & ((da & db & (dc | dd)) | (dc & dd & (da | db))));
      F23[w] = f23;
      F45[w] = f45;
      fire |= (r23 & f23) | (r45 & f45);
      pu1 = u1; pd1 = d1; pu2 = u2; pd2 = d2;
    }
    if (band !== 0) {
      // 15 in a row within ±1σ; 8 in a row beyond ±1σ with points on both sides among them.
      const I = ~o1; // 0 before the context start: pI starts at 0
      const I2 = I & sh(I, pI, 1), I4 = I2 & sh(I2, pI2, 2), I8 = I4 & sh(I4, pI4, 4);
      const inside = I8 & sh(I8, pI8, 7);
      const O2 = o1 & sh(o1, pO, 1), O4 = O2 & sh(O2, pO2, 2), O8 = O4 & sh(O4, pO4, 4);
      const A2 = u1 | sh(u1, pA, 1), A4 = A2 | sh(A2, pA2, 2), A8 = A4 | sh(A4, pA4, 4);
      const B2 = d1 | sh(d1, pB, 1), B4 = B2 | sh(B2, pB2, 2), B8 = B4 | sh(B4, pB4, 4);
      const outside = O8 & A8 & B8;
      IN[w] = inside;
      OUT[w] = outside;
      fire |= (rIn & inside) | (rOut & outside);
      pI = I; pI2 = I2; pI4 = I4; pI8 = I8; pO = o1; pO2 = O2; pO4 = O4; pA = u1; pA2 = A2; pA4 = A4; pB = d1; pB2 = B2; pB4 = B4;
    }
    F[w] = fire;
  }
}

function bit(c: boolean): number {
  return (c as unknown as number) | 0;
}

/** Bit b of the result is bit b − k of the 64-bit string prv:cur (1 ≤ k ≤ 31). */
function sh(cur: number, prv: number, k: number): number {
  return (cur << k) | (prv >>> (32 - k));
}

// The points of a "2 of 3" window ending at i, oldest first: i and the one or two of the two
// before it that are set in the window (bit 1: point i − 1, bit 0: point i − 2), as an array literal.
function window3(older: number, i: number): number[] {
  return older === 3 ? [i - 2, i - 1, i] : older === 2 ? [i - 1, i] : [i - 2, i];
}

// The points of a "4 of 5" window ending at i, oldest first: i and the three or four of the four
// before it that are set (bit 3: point i − 1 … bit 0: point i − 4).
function window5(older: number, i: number): number[] {
  switch (older) {
    case 15:
      return [i - 4, i - 3, i - 2, i - 1, i];
    case 14:
      return [i - 3, i - 2, i - 1, i];
    case 13:
      return [i - 4, i - 2, i - 1, i];
    case 11:
      return [i - 4, i - 3, i - 1, i];
    default: // 7
      return [i - 4, i - 3, i - 2, i];
  }
}

// The `k` bits before bit b (point i) in the 64-bit string prv:cur, the newest in bit k − 1.
function olderBits(cur: number, prv: number, b: number, k: number): number {
  const span = b >= k ? cur >>> (b - k) : sh(cur, prv, k - b);
  return span & ((1 << k) - 1);
}

// The points of a run of 6, 8, 9, 14 or 15 ending at i, oldest first (array literals: one
// allocation each, of a fixed size).
function run6(i: number): number[] {
  return [i - 5, i - 4, i - 3, i - 2, i - 1, i];
}
function run8(i: number): number[] {
  return [i - 7, i - 6, i - 5, i - 4, i - 3, i - 2, i - 1, i];
}
function run9(i: number): number[] {
  return [i - 8, i - 7, i - 6, i - 5, i - 4, i - 3, i - 2, i - 1, i];
}
function run14(i: number): number[] {
  return [i - 13, i - 12, i - 11, i - 10, i - 9, i - 8, i - 7, i - 6, i - 5, i - 4, i - 3, i - 2, i - 1, i];
}
function run15(i: number): number[] {
  return [i - 14, i - 13, i - 12, i - 11, i - 10, i - 9, i - 8, i - 7, i - 6, i - 5, i - 4, i - 3, i - 2, i - 1, i];
}

type SidedRule = 'we1' | 'n1' | 'we2' | 'n5' | 'we3' | 'n6' | 'we4' | 'n2' | 'n3';
/** Explanations: [above, below] for the rules with a side, one text for the others. */
type Texts = Record<SidedRule, readonly [string, string]> & Record<'n4' | 'n7' | 'n8', string>;

function sided(rule: SidedRule, index: number, points: number[], above: number, texts: readonly [string, string]): Signal {
  return above ? { rule, index, points, side: 'above', explanation: texts[0] } : { rule, index, points, side: 'below', explanation: texts[1] };
}

let textCache: Texts | undefined;

// Every explanation a batch can give, looked up once.
function ruleTexts(): Texts {
  if (textCache) return textCache;
  const two = (r: SidedRule) => [explainRule(r, 'above'), explainRule(r, 'below')] as const;
  textCache = {
    we1: two('we1'), n1: two('n1'), we2: two('we2'), n5: two('n5'), we3: two('we3'), n6: two('n6'), we4: two('we4'), n2: two('n2'), n3: two('n3'),
    n4: explainRule('n4', undefined), n7: explainRule('n7', undefined), n8: explainRule('n8', undefined),
  };
  return textCache;
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
