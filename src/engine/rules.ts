/**
 * Run rules over a stream of standardised points, O(1) work and memory per point.
 * z = (value − centre)/sigma of the plotted statistic. Rules as spc-reference §3:
 * "beyond" a zone line is strictly greater than it (a point on a line is in the inner zone);
 * rules 2/3 (Nelson 5/6) count one side at a time and need the newest point in the pattern;
 * a point exactly on the centre line breaks a same-side run; ties break a trend or an alternation.
 * A rule fires at every point whose window ending there satisfies it (no reset after a signal).
 */
import { explainRule } from './rule-text';
import type { RuleCode, Signal } from './types';

const MASK = 15; // ring of 16 standardised values: more than the longest counting window (5)

export const ALL_RULES: readonly RuleCode[] = ['we1', 'we2', 'we3', 'we4', 'n1', 'n2', 'n3', 'n4', 'n5', 'n6', 'n7', 'n8'];

export class RuleEvaluator {
  private readonly on: Record<RuleCode, boolean>;
  private readonly zs = new Float64Array(MASK + 1);
  private count = 0; // points seen since reset
  private runAbove = 0;
  private runBelow = 0;
  private rises = 0;
  private falls = 0;
  private alternations = 0;
  private lastDiff = 0;
  private lastValue = 0;
  private inC = 0;
  private outC = 0;
  private lastOutAbove = -1; // index of the latest point beyond +1σ
  private lastOutBelow = -1;

  constructor(rules: readonly RuleCode[]) {
    this.on = { we1: false, we2: false, we3: false, we4: false, n1: false, n2: false, n3: false, n4: false, n5: false, n6: false, n7: false, n8: false };
    for (const r of rules) this.on[r] = true;
  }

  /** Forget the history (start of a phase). */
  reset(): void {
    this.count = 0;
    this.runAbove = this.runBelow = this.rises = this.falls = this.alternations = 0;
    this.lastDiff = 0;
    this.inC = this.outC = 0;
    this.lastOutAbove = this.lastOutBelow = -1;
  }

  /** Feed point `index` (plotted `value`, standardised `z`); pushes any signals onto `out`. */
  push(index: number, value: number, z: number, out: Signal[]): void {
    const on = this.on;
    const c = this.count;
    this.zs[index & MASK] = z;

    // Counters first, so each rule below reads the state including this point.
    this.runAbove = z > 0 ? this.runAbove + 1 : 0;
    this.runBelow = z < 0 ? this.runBelow + 1 : 0;
    if (c > 0) {
      const d = value > this.lastValue ? 1 : value < this.lastValue ? -1 : 0;
      this.rises = d > 0 ? this.rises + 1 : 0;
      this.falls = d < 0 ? this.falls + 1 : 0;
      this.alternations = d !== 0 && this.lastDiff !== 0 && d !== this.lastDiff ? this.alternations + 1 : d !== 0 ? 1 : 0;
      this.lastDiff = d;
    }
    this.lastValue = value;
    const az = z < 0 ? -z : z;
    this.inC = az <= 1 ? this.inC + 1 : 0;
    this.outC = az > 1 ? this.outC + 1 : 0;
    if (z > 1) this.lastOutAbove = index;
    else if (z < -1) this.lastOutBelow = index;
    this.count = c + 1;

    if (z > 3 || z < -3) {
      const side = z > 0 ? 'above' : 'below';
      if (on.we1) out.push(signal('we1', index, [index], side));
      if (on.n1) out.push(signal('n1', index, [index], side));
    }
    if ((on.we2 || on.n5) && az > 2) this.countRule(index, z, 2, 3, 2, on.we2, on.n5, 'we2', 'n5', out);
    if ((on.we3 || on.n6) && az > 1) this.countRule(index, z, 1, 5, 4, on.we3, on.n6, 'we3', 'n6', out);
    if (on.we4) this.runRule('we4', index, 8, out);
    if (on.n2) this.runRule('n2', index, 9, out);
    if (on.n3) {
      if (this.rises >= 5) out.push(signal('n3', index, run(index, 6), 'above'));
      else if (this.falls >= 5) out.push(signal('n3', index, run(index, 6), 'below'));
    }
    if (on.n4 && this.alternations >= 13) out.push(signal('n4', index, run(index, 14), undefined));
    if (on.n7 && this.inC >= 15) out.push(signal('n7', index, run(index, 15), undefined));
    if (on.n8 && this.outC >= 8 && this.lastOutAbove > index - 8 && this.lastOutBelow > index - 8) {
      out.push(signal('n8', index, run(index, 8), undefined));
    }
  }

  // "m of w points beyond `limit` sigma on the newest point's side", newest point included.
  private countRule(index: number, z: number, limit: number, w: number, m: number, a: boolean, b: boolean, ra: RuleCode, rb: RuleCode, out: Signal[]): void {
    const span = Math.min(w, this.count);
    const up = z > 0;
    let hits = 0;
    for (let k = 0; k < span; k++) {
      const zk = this.zs[(index - k) & MASK]!;
      if (up ? zk > limit : zk < -limit) hits++;
    }
    if (hits < m) return;
    const points: number[] = [];
    for (let k = span - 1; k >= 0; k--) {
      const zk = this.zs[(index - k) & MASK]!;
      if (up ? zk > limit : zk < -limit) points.push(index - k);
    }
    const side = up ? 'above' : 'below';
    if (a) out.push(signal(ra, index, points, side));
    if (b) out.push(signal(rb, index, points.slice(), side));
  }

  private runRule(rule: RuleCode, index: number, length: number, out: Signal[]): void {
    if (this.runAbove >= length) out.push(signal(rule, index, run(index, length), 'above'));
    else if (this.runBelow >= length) out.push(signal(rule, index, run(index, length), 'below'));
  }
}

function run(index: number, length: number): number[] {
  const pts = new Array<number>(length);
  for (let k = 0; k < length; k++) pts[k] = index - length + 1 + k;
  return pts;
}

function signal(rule: RuleCode, index: number, points: number[], side: 'above' | 'below' | undefined): Signal {
  return side ? { rule, index, points, side, explanation: explainRule(rule, side) } : { rule, index, points, explanation: explainRule(rule, undefined) };
}
