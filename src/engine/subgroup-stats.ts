/**
 * Columns of per-subgroup statistics, appended one subgroup at a time.
 * `value` is what the chart plots before any smoothing: the individual value, the subgroup mean,
 * the proportion p, the count (np, c) or the rate u. `spread` is R (X̄-R), s (X̄-S) or the moving
 * range to the previous point of the same phase (individuals), NaN where it does not exist.
 */
import type { ChartKind, SubgroupInput } from './types';

export class EngineInputError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'EngineInputError';
  }
}

export class SubgroupStats {
  readonly value: number[] = [];
  /** Subgroup size: values in it, items inspected (p, np) or area units (u); 1 for c. */
  readonly size: number[] = [];
  readonly count: number[] = [];
  readonly spread: number[] = [];
  readonly excluded: boolean[] = [];
  readonly reason: (string | undefined)[] = [];
  readonly inputs: SubgroupInput[] = [];

  constructor(private readonly kind: ChartKind) {}

  get length(): number {
    return this.value.length;
  }

  /** Adds subgroup `sg`; `phaseStart` is the index where its phase began (moving ranges stop there). */
  push(sg: SubgroupInput, phaseStart: number): void {
    const i = this.value.length;
    const kind = this.kind;
    let value: number;
    let size: number;
    let count = NaN;
    let spread = NaN;
    if (kind === 'p' || kind === 'np' || kind === 'c' || kind === 'u') {
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
      if (!vs || vs.length === 0) throw new EngineInputError(`subgroup ${i}: a ${kind} chart needs at least one measured value`);
      let sum = 0;
      let min = Infinity;
      let max = -Infinity;
      for (const v of vs) {
        if (!Number.isFinite(v)) throw new EngineInputError(`subgroup ${i}: value ${String(v)} is not a finite number`);
        sum += v;
        if (v < min) min = v;
        if (v > max) max = v;
      }
      size = vs.length;
      if (kind === 'xmr' && size !== 1) throw new EngineInputError(`subgroup ${i}: an individuals (XmR) chart takes one value per subgroup, got ${size}`);
      value = sum / size;
      if (kind === 'xmr' || ((kind === 'ewma' || kind === 'cusum') && size === 1)) {
        spread = i > phaseStart ? Math.abs(value - this.value[i - 1]!) : NaN;
      } else if (size >= 2) {
        if (kind === 'xbar-s') {
          let ss = 0;
          for (const v of vs) ss += (v - value) * (v - value);
          spread = Math.sqrt(ss / (size - 1)); // n − 1 divisor
        } else {
          spread = max - min;
        }
      }
    }
    this.value.push(value);
    this.size.push(size);
    this.count.push(count);
    this.spread.push(spread);
    this.excluded.push(sg.excluded === true);
    this.reason.push(sg.exclusionReason);
    this.inputs.push(sg);
  }
}
