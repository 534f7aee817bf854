/**
 * Columns of per-subgroup statistics, appended one subgroup at a time.
 * `value` is what the chart plots before any smoothing: the individual value, the subgroup mean,
 * the proportion p, the count (np, c) or the rate u. `spread` is R (X̄-R), s (X̄-S) or the moving
 * range to the previous point of the same phase (individuals), NaN where it does not exist.
 * Columns are typed arrays with spare capacity: read indices below `length` only.
 * While every size is 1 and nothing is excluded (individuals), `size` and `excluded` are one
 * shared read-only column of ones and of zeros: a long series allocates only `value` and
 * `spread`. The first other size or exclusion gives the stats their own column. `count` is
 * kept for attribute charts only.
 */
import { grow, growBytes } from './columns';
import type { ChartKind, SubgroupInput } from './types';

export class EngineInputError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'EngineInputError';
  }
}

export interface BatchSums {
  readonly from: number;
  readonly to: number;
  readonly sum: number;
  readonly mrSum: number;
  readonly mrCount: number;
}

export class SubgroupStats {
  value: Float64Array = new Float64Array(0);
  /** Subgroup size: values in it, items inspected (p, np) or area units (u); 1 for c. Read-only outside this class. */
  size: Float64Array = ones(0);
  /** Defects or defectives (attribute charts; empty for the others). */
  count: Float64Array = new Float64Array(0);
  private spreadColumn: Float64Array = new Float64Array(0);
  // Spreads [0, spreadDone) are stored. Those after it came in by pushValues() and follow from
  // the values (a moving range, NaN at a phase start or for X̄ charts): they are filled in on
  // the first read of `spread`, so a batch of individuals does not write a column it may never need.
  private spreadDone = 0;
  private readonly pendingStarts: number[] = []; // phase starts among the pending spreads
  /** 1 where the subgroup is excluded. Read-only outside this class. */
  excluded: Uint8Array = zeros(0);
  private ownSize = false; // false: `size` is the shared column of ones
  private ownExcluded = false; // false: `excluded` is the shared column of zeros
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
    if (size !== 1 && !this.ownSize) this.ownSizeColumn();
    if (this.ownSize) this.size[i] = size;
    if (this.isAttribute) this.count[i] = count;
    this.storeSpread(i, spread);
    if (sg.excluded === true && !this.ownExcluded) this.ownExcludedColumn();
    if (this.ownExcluded) this.excluded[i] = sg.excluded === true ? 1 : 0;
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
    if (this.ownSize) this.size[i] = 1;
    this.storeSpread(i, this.usesMovingRange && i > phaseStart ? Math.abs(x - this.value[i - 1]!) : NaN);
    if (this.ownExcluded) this.excluded[i] = 0;
    this.length = i + 1;
  }

  /** pushValue for values[from..to), in one loop. */
  pushValues(values: ArrayLike<number>, from: number, to: number, phaseStart: number): void {
    if (this.isAttribute) throw new EngineInputError(`a ${this.kind} chart needs counts, not measured values`);
    const first = this.length;
    const end = first + to - from;
    const typed = values instanceof Float64Array;
    // Into empty stats: the value column is made as a copy of the batch.
    const copied = typed && first === 0 && this.value.length === 0 && end >= 64 && this.deferred <= end;
    if (copied) {
      this.value = new Float64Array(values.subarray(from, to));
      this.deferred = 0;
    }
    this.reserve(end);
    const v = this.value;
    // Moving ranges from the second point of the phase on (none for X̄ charts); not stored here.
    const mrFrom = this.usesMovingRange ? Math.min(end, Math.max(first, phaseStart + 1)) : end;
    if (phaseStart >= first && phaseStart < end) this.pendingStarts.push(phaseStart);
    const prev = first > 0 ? v[first - 1]! : NaN;
    // The point after which moving ranges count: the first point of the batch when the moving range
    // to the point before it is not the batch's own (it starts the phase or follows an earlier batch).
    const mrStart = mrFrom === first && first < end ? first + 1 : mrFrom;
    // A typed array is copied in one block and read back; other arrays value by value. The loops
    // are functions of their own (one array type each), so that they are compiled on their own
    // feedback whatever the code around them has seen (in this method, the loop's doubles were at
    // times left boxed: about 48 bytes allocated per value).
    if (typed) {
      if (!copied) v.set(values.subarray(from, to), first);
      sumValues(v, first, mrStart, end, prev);
    } else {
      copyAndSumValues(values, from - first, v, first, mrStart, end, prev);
    }
    // Σx doubles as the check that every value is finite (a NaN or ±Infinity makes it non-finite);
    // the baseline estimate reuses both sums when its range is this batch (same order of addition).
    const sum = SUMS[0]!;
    const mrSum = SUMS[1]!;
    const mrCount = end - mrStart;
    if (!Number.isFinite(sum)) {
      for (let j = from, i = first; j < to; j++, i++) {
        const x = values[j]!;
        if (!Number.isFinite(x)) throw new EngineInputError(`subgroup ${i}: value ${String(x)} is not a finite number`);
      }
    }
    this.batch = { from: first, to: end, sum, mrSum, mrCount };
    if (this.ownSize) this.size.fill(1, first, end);
    if (this.ownExcluded) this.excluded.fill(0, first, end);
    this.length = end;
  }

  private lastSpread = NaN;
  private deferred = 0; // capacity promised by reserve(n, true) and not yet allocated
  private batch: BatchSums | null = null;

  /**
   * Sums over subgroups [from, to) when exactly they were added by the last pushValues():
   * Σx from `from` on, and the moving ranges after `from` (none for X̄ charts).
   */
  batchSums(from: number, to: number): BatchSums | null {
    const b = this.batch;
    return b && b.from === from && b.to === to ? b : null;
  }

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

  /**
   * Makes room for `n` subgroups (a batch reserves once). `valuesFollow`: the next call is
   * pushValues() with the batch, which, for a Float64Array into empty stats, makes the value column
   * as a copy of it (one allocation without the zero-fill, then one block copy); until then the
   * column is left unallocated.
   */
  reserve(n: number, valuesFollow = false): void {
    if (valuesFollow && this.length === 0 && this.value.length === 0) {
      this.deferred = n;
      this.size = this.ownSize ? grow(this.size, n) : ones(n);
      if (this.isAttribute) this.count = grow(this.count, n);
      this.excluded = this.ownExcluded ? growBytes(this.excluded, n) : zeros(n);
      return;
    }
    this.value = grow(this.value, Math.max(n, this.deferred));
    this.deferred = 0;
    this.size = this.ownSize ? grow(this.size, n) : ones(this.value.length);
    if (this.isAttribute) this.count = grow(this.count, n);
    this.excluded = this.ownExcluded ? growBytes(this.excluded, n) : zeros(this.value.length);
  }

  // The first size other than 1: a column of this series' own, ones so far.
  private ownSizeColumn(): void {
    const own = new Float64Array(this.value.length);
    own.fill(1, 0, this.length);
    this.size = own;
    this.ownSize = true;
  }

  private ownExcludedColumn(): void {
    this.excluded = new Uint8Array(this.value.length);
    this.ownExcluded = true;
  }

  /** R (X̄-R), s (X̄-S) or the moving range (individuals, EWMA, CUSUM); NaN where there is none. Read-only. */
  get spread(): Float64Array {
    if (this.spreadDone < this.length) this.fillSpread();
    return this.spreadColumn;
  }

  private storeSpread(i: number, spread: number): void {
    if (this.spreadDone < i) this.fillSpread();
    this.spreadColumn = grow(this.spreadColumn, this.value.length);
    this.spreadColumn[i] = spread;
    this.spreadDone = i + 1;
  }

  // The pending spreads, as push() would have stored them.
  private fillSpread(): void {
    const n = this.length;
    const sp = (this.spreadColumn = grow(this.spreadColumn, this.value.length));
    const v = this.value;
    let k = 0;
    const starts = this.pendingStarts;
    for (let i = this.spreadDone; i < n; i++) {
      if (!this.usesMovingRange) sp[i] = NaN;
      else if (k < starts.length && starts[k] === i) {
        sp[i] = NaN;
        k++;
      } else sp[i] = Math.abs(v[i]! - v[i - 1]!);
    }
    starts.length = 0;
    this.spreadDone = n;
  }

  /** Every subgroup so far has one value and none is excluded. */
  get singleIncluded(): boolean {
    return !this.ownSize && !this.ownExcluded && !this.isAttribute;
  }

  /** True when subgroups [from, to) all have the size of subgroup `from`. */
  sameSize(from: number, to: number): boolean {
    if (!this.ownSize) return true;
    const sizes = this.size;
    const n = sizes[from]!;
    for (let i = from + 1; i < to; i++) if (sizes[i] !== n) return false;
    return true;
  }
}

// Shared read-only columns (never written: a series that needs other values takes its own copy).
let ONES = new Float64Array(0);
let ZEROS = new Uint8Array(0);

function ones(n: number): Float64Array {
  if (ONES.length < n) ONES = new Float64Array(Math.max(n, 2 * ONES.length, 64)).fill(1);
  return ONES;
}

function zeros(n: number): Uint8Array {
  if (ZEROS.length < n) ZEROS = new Uint8Array(Math.max(n, 2 * ZEROS.length, 64));
  return ZEROS;
}

// Σx and Σ|moving range| of a batch, left in SUMS (no object per call). Points [first, end);
// moving ranges of the points [mrStart, end), each to the point before it (`prev` before `first`).
const SUMS = new Float64Array(2);

function sumValues(v: Float64Array, first: number, mrStart: number, end: number, prev: number): void {
  let sum = 0;
  let mrSum = 0;
  let i = first;
  for (; i < mrStart; i++) {
    const x = v[i]!;
    sum += x;
    prev = x;
  }
  for (; i < end; i++) {
    const x = v[i]!;
    sum += x;
    mrSum += Math.abs(x - prev);
    prev = x;
  }
  SUMS[0] = sum;
  SUMS[1] = mrSum;
}

// The same for a plain array, copying each value into the column (point i is values[i + off]).
function copyAndSumValues(values: ArrayLike<number>, off: number, v: Float64Array, first: number, mrStart: number, end: number, prev: number): void {
  let sum = 0;
  let mrSum = 0;
  let i = first;
  for (; i < mrStart; i++) {
    const x = values[i + off]!;
    sum += x;
    v[i] = x;
    prev = x;
  }
  for (; i < end; i++) {
    const x = values[i + off]!;
    sum += x;
    v[i] = x;
    mrSum += Math.abs(x - prev);
    prev = x;
  }
  SUMS[0] = sum;
  SUMS[1] = mrSum;
}

// Every line of both functions run a few times at load, on 100 values (enough for the engine to
// start recording type feedback, which it does only once a function has done some work): a long
// first batch then has its running loop replaced by compiled code that knows the stores after the
// loop, instead of code that leaves the function at them, over and over, while that code is kept.
{
  const warm = new Float64Array(100);
  const list = new Array<number>(100).fill(0);
  for (let k = 0; k < 4; k++) {
    sumValues(warm, 0, 1, 100, NaN);
    copyAndSumValues(list, 0, warm, 0, 1, 100, NaN);
  }
}
