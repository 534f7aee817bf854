/**
 * Columns of per-subgroup statistics, appended one subgroup at a time.
 * `value` is what the chart plots before any smoothing: the individual value, the subgroup mean,
 * the proportion p, the count (np, c) or the rate u. `spread` is R (X̄-R), s (X̄-S) or the moving
 * range to the previous point of the same phase (individuals), NaN where it does not exist.
 * Columns are typed arrays with spare capacity: read indices below `length` only.
 */
import { grow, growBytes } from './columns';
import type { ChartKind, SubgroupInput } from './types';

export class EngineInputError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'EngineInputError';
  }
}

export class SubgroupStats {
  value: Float64Array = new Float64Array(0);
  /** Subgroup size: values in it, items inspected (p, np) or area units (u); 1 for c. */
  size: Float64Array = new Float64Array(0);
  count: Float64Array = new Float64Array(0);
  spread: Float64Array = new Float64Array(0);
  excluded: Uint8Array = new Uint8Array(0);
  /** Exclusion reasons by subgroup index (sparse). */
  readonly reason = new Map<number, string>();
  /** The measured values of subgroups with 2 or more values, by index (a single value is `value` itself). */
  readonly raw = new Map<number, readonly number[]>();
  length = 0;
  private readonly isAttribute: boolean;
  private readonly usesMovingRange: boolean;

  constructor(private readonly kind: ChartKind) {
    this.isAttribute = kind === 'p' || kind === 'np' || kind === 'c' || kind === 'u';
    this.usesMovingRange = kind === 'xmr' || kind === 'ewma' || kind === 'cusum';
  }

  /** Adds subgroup `sg`; `phaseStart` is the index where its phase began (moving ranges stop there). */
  push(sg: SubgroupInput, phaseStart: number): void {
    const i = this.length;
    if (i === this.value.length) this.reserve(i + 1);
    let value: number;
    let size: number;
    let count = NaN;
    let spread = NaN;
    if (this.isAttribute) {
      const kind = this.kind;
      count = sg.count ?? NaN;
      if (!(Number.isFinite(count) && count >= 0)) throw new EngineInputError(`subgroup ${i}: a ${kind} chart needs a count of 0 or more`);
      if (kind === 'c') {
        size = 1;
        value = count;
      } else {
        size = sg.size ?? NaN;
        if (!(Number.isFinite(size) && size > 0)) throw new EngineInputError(`subgroup ${i}: a ${kind} chart needs a positive size (${kind === 'u' ? 'units inspected' : 'items inspected'})`);
        if ((kind === 'p' || kind === 'np') && count > size) throw new EngineInputError(`subgroup ${i}: ${count} defectives out of ${size} inspected`);
        value = kind === 'np' ? count : count / size;
      }
    } else {
      const vs = sg.values;
      if (!vs || vs.length === 0) throw new EngineInputError(`subgroup ${i}: a ${this.kind} chart needs at least one measured value`);
      size = vs.length;
      if (size === 1) {
        value = vs[0]!;
        if (!Number.isFinite(value)) throw new EngineInputError(`subgroup ${i}: value ${String(value)} is not a finite number`);
        if (this.usesMovingRange && i > phaseStart) spread = Math.abs(value - this.value[i - 1]!);
      } else {
        if (this.kind === 'xmr') throw new EngineInputError(`subgroup ${i}: an individuals (XmR) chart takes one value per subgroup, got ${size}`);
        value = this.summarise(vs, i);
        spread = this.lastSpread;
      }
    }
    this.value[i] = value;
    this.size[i] = size;
    this.count[i] = count;
    this.spread[i] = spread;
    this.excluded[i] = sg.excluded === true ? 1 : 0;
    if (sg.exclusionReason !== undefined) this.reason.set(i, sg.exclusionReason);
    if (size > 1) this.raw.set(i, sg.values!);
    this.length = i + 1;
  }

  /** Fast path for one value per subgroup (individuals, EWMA or CUSUM on individuals). */
  pushValue(x: number, phaseStart: number): void {
    const i = this.length;
    if (i === this.value.length) this.reserve(i + 1);
    if (!Number.isFinite(x)) throw new EngineInputError(`subgroup ${i}: value ${String(x)} is not a finite number`);
    if (this.isAttribute) throw new EngineInputError(`a ${this.kind} chart needs counts, not measured values`);
    this.value[i] = x;
    this.size[i] = 1;
    this.count[i] = NaN;
    this.spread[i] = this.usesMovingRange && i > phaseStart ? Math.abs(x - this.value[i - 1]!) : NaN;
    this.excluded[i] = 0;
    this.length = i + 1;
  }

  /** pushValue for values[from..to), in one loop. */
  pushValues(values: ArrayLike<number>, from: number, to: number, phaseStart: number): void {
    if (this.isAttribute) throw new EngineInputError(`a ${this.kind} chart needs counts, not measured values`);
    const first = this.length;
    this.reserve(first + to - from);
    const v = this.value;
    const sp = this.spread;
    const mr = this.usesMovingRange;
    let prev = first > 0 ? v[first - 1]! : NaN;
    for (let j = from, i = first; j < to; j++, i++) {
      const x = values[j]!;
      if (!Number.isFinite(x)) throw new EngineInputError(`subgroup ${i}: value ${String(x)} is not a finite number`);
      v[i] = x;
      sp[i] = mr && i > phaseStart ? Math.abs(x - prev) : NaN;
      prev = x;
    }
    const end = first + to - from;
    this.size.fill(1, first, end);
    this.count.fill(NaN, first, end);
    this.excluded.fill(0, first, end);
    this.length = end;
  }

  private lastSpread = NaN;

  // Mean of a subgroup of 2 or more values; leaves R or s (n − 1 divisor) in lastSpread.
  private summarise(vs: readonly number[], i: number): number {
    let sum = 0;
    let min = Infinity;
    let max = -Infinity;
    for (const v of vs) {
      if (!Number.isFinite(v)) throw new EngineInputError(`subgroup ${i}: value ${String(v)} is not a finite number`);
      sum += v;
      if (v < min) min = v;
      if (v > max) max = v;
    }
    const mean = sum / vs.length;
    if (this.kind === 'xbar-s') {
      let ss = 0;
      for (const v of vs) ss += (v - mean) * (v - mean);
      this.lastSpread = Math.sqrt(ss / (vs.length - 1));
    } else {
      this.lastSpread = max - min;
    }
    return mean;
  }

  /** Makes room for `n` subgroups (a batch reserves once). */
  reserve(n: number): void {
    this.value = grow(this.value, n);
    this.size = grow(this.size, n);
    this.count = grow(this.count, n);
    this.spread = grow(this.spread, n);
    this.excluded = growBytes(this.excluded, n);
  }
}
