/**
 * Engine benchmark (npm run bench:engine). Writes test/bench/engine-results.md.
 * 1. Full analysis of 100,000 individuals (XmR, all 8 Nelson rules) as a ratio to a bare single
 *    pass over the same Float64Array (one loop: sum and sum of |moving range|, the least work any
 *    XmR analysis must do). Target: within 10×.
 * 2. Cost of appending one subgroup to an evaluator holding 1,000 and 100,000 points of history
 *    (limits frozen from a 25-subgroup baseline). Target: at 100,000 within 1.5× of at 1,000.
 * CPU-time medians of repeated runs after warm-up; data from a seeded generator.
 */
import { writeFileSync } from 'node:fs';
import { analyze, Evaluator, type RuleCode, type SubgroupInput } from '../../src/engine';

const NELSON: RuleCode[] = ['n1', 'n2', 'n3', 'n4', 'n5', 'n6', 'n7', 'n8'];

function normals(n: number, seed: number): Float64Array {
  let s = seed | 0;
  const u = () => {
    s = (s + 0x6d2b79f5) | 0; // mulberry32
    let t = Math.imul(s ^ (s >>> 15), 1 | s);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = 10 + Math.sqrt(-2 * Math.log(1 - u())) * Math.cos(2 * Math.PI * u());
  return out;
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[s.length >> 1]!;
}

// CPU time (user + system) in ms, not wall time: the machine is shared, and a preempted run
// would otherwise count other processes' work. `inner` repeats f inside one measurement so that
// short passes stay well above the timer's resolution.
function cpuMs(): number {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1000;
}

function time(f: () => void, reps: number, inner = 1): number {
  for (let i = 0; i < 3; i++) f(); // warm-up
  const ts: number[] = [];
  for (let i = 0; i < reps; i++) {
    const t0 = cpuMs();
    for (let k = 0; k < inner; k++) f();
    ts.push((cpuMs() - t0) / inner);
  }
  return median(ts);
}

const N = 100_000;
const data = normals(N, 20261202);
const subgroups: SubgroupInput[] = Array.from(data, (x) => ({ values: [x] }));

let sink = 0;
const bare = time(() => {
  let sum = 0;
  let mr = 0;
  for (let i = 0; i < data.length; i++) {
    const x = data[i]!;
    sum += x;
    if (i > 0) mr += Math.abs(x - data[i - 1]!);
  }
  sink += sum + mr;
}, 21, 200);

let signals = 0;
const full = time(() => {
  const a = analyze({ chart: 'xmr', individuals: data, rules: NELSON });
  signals = a.signals.length;
}, 21, 5);

const fullObjects = time(() => {
  const a = analyze({ chart: 'xmr', subgroups, rules: NELSON });
  sink += a.signals.length;
}, 21, 5);

const materialise = time(() => {
  const a = analyze({ chart: 'xmr', individuals: data, rules: NELSON });
  sink += a.points.length;
}, 11);

function appendCost(history: number): number {
  const ev = new Evaluator({ chart: 'xmr', rules: NELSON, phases: [{ start: 0, baselineCount: 25 }] });
  ev.appendMany(subgroups.slice(0, history));
  const extra = normals(20_000, history);
  const batch = 1_000;
  const per: number[] = [];
  for (let b = 0; b < extra.length / batch; b++) {
    const sgs = Array.from(extra.subarray(b * batch, (b + 1) * batch), (x) => ({ values: [x] }));
    const t0 = cpuMs();
    for (const sg of sgs) ev.append(sg);
    per.push(((cpuMs() - t0) * 1e6) / batch);
  }
  return median(per.slice(2)); // ns per append, after warm-up batches
}
const append1k = appendCost(1_000);
const append100k = appendCost(100_000);

const ratio = full / bare;
const appendRatio = append100k / append1k;
const lines = [
  '# Engine benchmark results',
  '',
  `Measured ${new Date().toISOString()} on Node ${process.version} (${process.platform}/${process.arch}); CPU time (user + system), medians after warm-up.`,
  'Machine shared with other work (2 cores), so figures vary by about ±30% between runs.',
  '',
  '| measure | value | target |',
  '|---|---|---|',
  `| bare single pass over 100,000 values (sum and moving ranges) | ${bare.toFixed(3)} ms | — |`,
  `| analyze({ individuals }): XmR, 100,000 values from the Float64Array, all 8 Nelson rules (${signals} signals) | ${full.toFixed(2)} ms | — |`,
  `| ratio full / bare | ${ratio.toFixed(1)}× | ≤ 10× |`,
  `| analyze({ subgroups }): the same data as 100,000 { values: [x] } objects | ${fullObjects.toFixed(2)} ms | (${(fullObjects / bare).toFixed(1)}× bare) |`,
  `| analyze() and reading all 100,000 points as objects | ${materialise.toFixed(2)} ms | (for reference) |`,
  `| append one subgroup, 1,000 points of history | ${append1k.toFixed(0)} ns | — |`,
  `| append one subgroup, 100,000 points of history | ${append100k.toFixed(0)} ns | — |`,
  `| append ratio 100,000 / 1,000 | ${appendRatio.toFixed(2)}× | ≤ 1.5× |`,
  '',
  'The full analysis includes building the input statistics, the baseline estimate, limits for every point,',
  'all 8 Nelson rules and the signal list; point objects are built only when `points` is first read.',
  '',
];
writeFileSync(new URL('./engine-results.md', import.meta.url), lines.join('\n'));
console.log(lines.join('\n'));
if (sink === 0) console.log('');
