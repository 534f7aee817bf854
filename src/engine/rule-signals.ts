/**
 * Turning a rule state at one point into signals, shared by the point-by-point evaluator
 * (rules.ts) and the word-parallel batch detector (bit-rules.ts), so both give identical signals.
 */
import { explainRule } from './rule-text';
import type { RuleCode, Signal } from './types';

export interface RuleSet {
  readonly we1: boolean;
  readonly n1: boolean;
  readonly we2: boolean;
  readonly n5: boolean;
  readonly we3: boolean;
  readonly n6: boolean;
  readonly we4: boolean;
  readonly n2: boolean;
  readonly n3: boolean;
  readonly n4: boolean;
  readonly n7: boolean;
  readonly n8: boolean;
}

export function ruleSet(rules: readonly RuleCode[]): RuleSet {
  const on = new Set(rules);
  return {
    we1: on.has('we1'), n1: on.has('n1'), we2: on.has('we2'), n5: on.has('n5'), we3: on.has('we3'), n6: on.has('n6'),
    we4: on.has('we4'), n2: on.has('n2'), n3: on.has('n3'), n4: on.has('n4'), n7: on.has('n7'), n8: on.has('n8'),
  };
}

/** Number of set bits in a 5-bit window mask. */
export const BITS = Array.from({ length: 32 }, (_, m) => (m & 1) + ((m >> 1) & 1) + ((m >> 2) & 1) + ((m >> 3) & 1) + ((m >> 4) & 1));

/**
 * Signals at point `index`, in a fixed rule order. Masks: bit k is the point k places back beyond
 * +2σ (b2u), −2σ (b2d), +1σ (b1u), −1σ (b1d). Counters are run lengths ending at this point
 * (any value at or above a rule's threshold acts the same). lastOut*: latest index beyond ±1σ.
 */
export function emitSignals(
  set: RuleSet, index: number, z: number, b2u: number, b2d: number, b1u: number, b1d: number,
  runAbove: number, runBelow: number, rises: number, falls: number, alternations: number, inC: number, outC: number,
  lastOutAbove: number, lastOutBelow: number, out: Signal[],
): void {
  if (z > 3 || z < -3) {
    const side = z > 0 ? 'above' : 'below';
    if (set.we1) out.push(signal('we1', index, [index], side));
    if (set.n1) out.push(signal('n1', index, [index], side));
  }
  if ((set.we2 || set.n5) && (b2u & 1 ? BITS[b2u]! >= 2 : b2d & 1 ? BITS[b2d]! >= 2 : false)) {
    windowSignals(index, b2u & 1 ? b2u : b2d, 3, b2u & 1 ? 'above' : 'below', set.we2, set.n5, 'we2', 'n5', out);
  }
  if ((set.we3 || set.n6) && (b1u & 1 ? BITS[b1u]! >= 4 : b1d & 1 ? BITS[b1d]! >= 4 : false)) {
    windowSignals(index, b1u & 1 ? b1u : b1d, 5, b1u & 1 ? 'above' : 'below', set.we3, set.n6, 'we3', 'n6', out);
  }
  if (set.we4) runSignal('we4', index, 8, runAbove, runBelow, out);
  if (set.n2) runSignal('n2', index, 9, runAbove, runBelow, out);
  if (set.n3) {
    if (rises >= 5) out.push(signal('n3', index, run(index, 6), 'above'));
    else if (falls >= 5) out.push(signal('n3', index, run(index, 6), 'below'));
  }
  if (set.n4 && alternations >= 13) out.push(signal('n4', index, run(index, 14), undefined));
  if (set.n7 && inC >= 15) out.push(signal('n7', index, run(index, 15), undefined));
  if (set.n8 && outC >= 8 && lastOutAbove > index - 8 && lastOutBelow > index - 8) out.push(signal('n8', index, run(index, 8), undefined));
}

// "m of w beyond a line on the newest point's side": the points come from the window mask.
function windowSignals(index: number, mask: number, w: number, side: 'above' | 'below', a: boolean, b: boolean, ra: RuleCode, rb: RuleCode, out: Signal[]): void {
  const points: number[] = [];
  for (let k = w - 1; k >= 0; k--) if ((mask >> k) & 1) points.push(index - k);
  if (a) out.push(signal(ra, index, points, side));
  if (b) out.push(signal(rb, index, a ? points.slice() : points, side));
}

function runSignal(rule: RuleCode, index: number, length: number, runAbove: number, runBelow: number, out: Signal[]): void {
  if (runAbove >= length) out.push(signal(rule, index, run(index, length), 'above'));
  else if (runBelow >= length) out.push(signal(rule, index, run(index, length), 'below'));
}

function run(index: number, length: number): number[] {
  const pts = new Array<number>(length);
  for (let k = 0; k < length; k++) pts[k] = index - length + 1 + k;
  return pts;
}

function signal(rule: RuleCode, index: number, points: number[], side: 'above' | 'below' | undefined): Signal {
  return side ? { rule, index, points, side, explanation: explainRule(rule, side) } : { rule, index, points, explanation: explainRule(rule, undefined) };
}
