/**
 * The zone tests of the batch detector (bit-rules.ts) as a small WebAssembly function with
 * 128-bit SIMD: two points per instruction, each comparison's two answers taken out as two bits
 * at once (i64x2.bitmask). For every 32 points it writes five words, bit b standing for point
 * 32w + b: above the centre (d > A(0)), beyond ±1σ (|d| > A(1)), up from the previous value,
 * beyond ±2σ (|d| > A(2)), and the rare cases the caller sorts out exactly (|(|d| − zMid)| ≥ zHalf:
 * on the centre or beyond ±3σ; !(|(|move| − mMid)| < mMid): level with the previous value, or a
 * moving range beyond its limit). These are the comparisons of the JavaScript loop in
 * bit-rules.ts, made on the same doubles with IEEE arithmetic, so the words are the same.
 *
 * The module is assembled here from its instructions (no build step, no binary file); where
 * WebAssembly or its SIMD is missing, or a content security policy forbids compiling it,
 * zoneKernel() gives null and the caller uses its JavaScript loop.
 * Opcodes: WebAssembly core specification 2.0, §5.4 (binary format of instructions), and the
 * SIMD proposal's BinarySIMD.md.
 */

/** The five words per 32 points, interleaved: word j of block w is at 5w + j. */
export const WORDS_PER_BLOCK = 5;

export interface ZoneKernel {
  /**
   * The zone words of values[from, from + n), the value before `from` taken as values[from]
   * (the first point has no previous one: level). Bits past n are unspecified. The returned
   * view is valid until the next call.
   */
  run(values: Float64Array, from: number, n: number, centre: number, a0: number, a1: number, a2: number, zMid: number, zHalf: number, mMid: number): Int32Array;
}

interface WasmMemory {
  readonly buffer: ArrayBuffer;
  grow(pages: number): number;
}
interface WasmApi {
  validate(bytes: Uint8Array): boolean;
  Module: new (bytes: Uint8Array) => object;
  Instance: new (module: object) => { readonly exports: Record<string, unknown> };
}

let kernel: ZoneKernel | null | undefined;
let made: ZoneKernel | null | undefined; // the one instance (compiled once; its code warms up with use)
// Batches shorter than this are classified in JavaScript: copying them into the kernel's memory
// and calling it costs more than it saves.
let minimum = 256;

/** The kernel for a batch of n points, or null: batch too short, or no kernel in this JavaScript engine. */
export function zoneKernel(n: number): ZoneKernel | null {
  if (n < minimum) return null;
  if (kernel === undefined) kernel = instance();
  return kernel;
}

function instance(): ZoneKernel | null {
  if (made === undefined) made = makeKernel();
  return made;
}

/**
 * For tests: 'always' uses the kernel for every batch (and throws where there is none), 'never'
 * classifies in JavaScript only, 'auto' restores the default.
 */
export function useZoneKernel(mode: 'auto' | 'always' | 'never'): void {
  minimum = mode === 'always' ? 1 : 256;
  kernel = mode === 'never' ? null : instance();
  if (mode === 'always' && !kernel) throw new Error('no WebAssembly SIMD here');
}

function makeKernel(): ZoneKernel | null {
  const wasm = (globalThis as { WebAssembly?: WasmApi }).WebAssembly;
  if (!wasm) return null;
  let exports: Record<string, unknown>;
  try {
    const bytes = zoneModule();
    if (!wasm.validate(bytes)) return null; // no SIMD here
    exports = new wasm.Instance(new wasm.Module(bytes)).exports;
  } catch {
    return null; // e.g. a content security policy without 'wasm-unsafe-eval'
  }
  const classify = exports.k as (W: number, out: number, c: number, a0: number, a1: number, a2: number, zMid: number, zHalf: number, mMid: number) => void;
  const memory = exports.m as WasmMemory;
  let f64 = new Float64Array(memory.buffer);
  let i32 = new Int32Array(memory.buffer);
  // A few runs over 2,048 points at once: the engine compiles the function first for a quick start
  // and optimises it once it has run a while, in the background; starting that now means the first
  // real batch is more likely to find the optimised code (as the JavaScript loops are given type
  // feedback at load in subgroup-stats.ts).
  for (let k = 0; k < 4; k++) classify(64, 8 * (32 * 64 + 2), 0, 0, 1, 2, 1.5, 1.5, 1.8);
  return {
    run(values, from, n, centre, a0, a1, a2, zMid, zHalf, mMid) {
      const W = (n + 31) >>> 5;
      // Memory: the previous value, then 32W values (the last block's tail left as it is), then
      // the words, 16-byte aligned.
      const valueBytes = 8 * (32 * W + 1);
      const out = (valueBytes + 15) & ~15;
      const need = out + 4 * WORDS_PER_BLOCK * W;
      if (need > memory.buffer.byteLength) {
        memory.grow(Math.ceil((need - memory.buffer.byteLength) / 65536));
        f64 = new Float64Array(memory.buffer);
        i32 = new Int32Array(memory.buffer);
      }
      f64[0] = values[from]!;
      f64.set(values.subarray(from, from + n), 1);
      classify(W, out, centre, a0, a1, a2, zMid, zHalf, mMid);
      return i32.subarray(out >>> 2, (out >>> 2) + WORDS_PER_BLOCK * W);
    },
  };
}

// ---- The module, assembled ----

const I32 = 0x7f;
const F64 = 0x7c;
const V128 = 0x7b;

function uleb(n: number): number[] {
  const out: number[] = [];
  do {
    let b = n & 0x7f;
    n >>>= 7;
    if (n !== 0) b |= 0x80;
    out.push(b);
  } while (n !== 0);
  return out;
}

function sleb(n: number): number[] {
  const out: number[] = [];
  for (;;) {
    const b = n & 0x7f;
    n >>= 7;
    if ((n === 0 && (b & 0x40) === 0) || (n === -1 && (b & 0x40) !== 0)) {
      out.push(b);
      return out;
    }
    out.push(b | 0x80);
  }
}

const vec = (items: number[][]): number[] => [...uleb(items.length), ...items.flat()];
const section = (id: number, body: number[]): number[] => [id, ...uleb(body.length), ...body];
const name = (s: string): number[] => [...uleb(s.length), ...Array.from(s, (c) => c.charCodeAt(0))];

// Instructions (core §5.4; SIMD: prefix 0xfd and a LEB128 sub-opcode).
const get = (i: number) => [0x20, i];
const set = (i: number) => [0x21, i];
const tee = (i: number) => [0x22, i];
const i32 = (v: number) => [0x41, ...sleb(v)];
const f64 = (v: number) => [0x44, ...new Uint8Array(new Float64Array([v]).buffer)];
const simd = (op: number) => [0xfd, ...uleb(op)];
const I32_ADD = [0x6a], I32_MUL = [0x6c], I32_OR = [0x72], I32_SHL = [0x74], I32_LT_U = [0x49], I32_GE_U = [0x4f];
const i32Store = (offset: number) => [0x36, 2, ...uleb(offset)];
const v128Load = (offset: number) => [...simd(0x00), 3, ...uleb(offset)];
const F64X2_SPLAT = simd(0x14), F64X2_LT = simd(0x49), F64X2_GT = simd(0x4a), F64X2_GE = simd(0x4c);
const V128_NOT = simd(0x4d), V128_OR = simd(0x50), I64X2_BITMASK = simd(0xc4), F64X2_ABS = simd(0xec), F64X2_SUB = simd(0xf1);
const BLOCK = [0x02, 0x40], LOOP = [0x03, 0x40], END = [0x0b];
const br = (depth: number) => [0x0c, depth];
const brIf = (depth: number) => [0x0d, depth];

// Locals: parameters 0–8, then i32 9–17, then v128 18–29.
const W = 0, OUT = 1, C = 2, A0 = 3, A1 = 4, A2 = 5, ZMID = 6, ZHALF = 7, MMID = 8;
const w = 9, at = 10, addr = 11, p = 12, o1 = 13, up = 14, x2 = 15, rare = 16, sh = 17;
const vC = 18, vA0 = 19, vA1 = 20, vA2 = 21, vZMid = 22, vZHalf = 23, vMMid = 24, vZero = 25, x = 26, d = 27, ad = 28, m = 29;

// word |= bitmask(lanes) << sh, with `lanes` the instructions that leave a v128 of lane masks
const orBits = (word: number, lanes: number[]) => [...get(word), ...lanes, ...I64X2_BITMASK, ...get(sh), ...I32_SHL, ...I32_OR, ...set(word)];

/** The module's bytes (exported for the browser test that compiles them under the app's policy). */
export function zoneModule(): Uint8Array {
  const body = [
    ...get(C), ...F64X2_SPLAT, ...set(vC),
    ...get(A0), ...F64X2_SPLAT, ...set(vA0),
    ...get(A1), ...F64X2_SPLAT, ...set(vA1),
    ...get(A2), ...F64X2_SPLAT, ...set(vA2),
    ...get(ZMID), ...F64X2_SPLAT, ...set(vZMid),
    ...get(ZHALF), ...F64X2_SPLAT, ...set(vZHalf),
    ...get(MMID), ...F64X2_SPLAT, ...set(vMMid),
    ...f64(0), ...F64X2_SPLAT, ...set(vZero),
    ...i32(0), ...set(addr), // the byte address of the previous value of the pair
    ...i32(0), ...set(w),
    ...BLOCK,
    ...LOOP,
    ...get(w), ...get(W), ...I32_GE_U, ...brIf(1),
    ...i32(0), ...set(p), ...i32(0), ...set(o1), ...i32(0), ...set(up), ...i32(0), ...set(x2), ...i32(0), ...set(rare), ...i32(0), ...set(sh),
    ...LOOP, // two points a turn: x = the pair, the pair before it one value back
    ...get(addr), ...v128Load(8), ...set(x),
    ...get(x), ...get(vC), ...F64X2_SUB, ...set(d),
    ...get(d), ...F64X2_ABS, ...set(ad),
    ...get(x), ...get(addr), ...v128Load(0), ...F64X2_SUB, ...set(m),
    ...orBits(p, [...get(d), ...get(vA0), ...F64X2_GT]),
    ...orBits(o1, [...get(ad), ...get(vA1), ...F64X2_GT]),
    ...orBits(up, [...get(m), ...get(vZero), ...F64X2_GT]),
    ...orBits(x2, [...get(ad), ...get(vA2), ...F64X2_GT]),
    ...orBits(rare, [
      ...get(ad), ...get(vZMid), ...F64X2_SUB, ...F64X2_ABS, ...get(vZHalf), ...F64X2_GE,
      ...get(m), ...F64X2_ABS, ...get(vMMid), ...F64X2_SUB, ...F64X2_ABS, ...get(vMMid), ...F64X2_LT, ...V128_NOT,
      ...V128_OR,
    ]),
    ...get(addr), ...i32(16), ...I32_ADD, ...set(addr),
    ...get(sh), ...i32(2), ...I32_ADD, ...tee(sh), ...i32(32), ...I32_LT_U, ...brIf(0),
    ...END,
    ...get(OUT), ...get(w), ...i32(4 * WORDS_PER_BLOCK), ...I32_MUL, ...I32_ADD, ...set(at),
    ...get(at), ...get(p), ...i32Store(0),
    ...get(at), ...get(o1), ...i32Store(4),
    ...get(at), ...get(up), ...i32Store(8),
    ...get(at), ...get(x2), ...i32Store(12),
    ...get(at), ...get(rare), ...i32Store(16),
    ...get(w), ...i32(1), ...I32_ADD, ...set(w),
    ...br(0),
    ...END,
    ...END,
    ...END,
  ];
  const locals = vec([[...uleb(9), I32], [...uleb(12), V128]]);
  const code = [...locals, ...body];
  const bytes = [
    0x00, 0x61, 0x73, 0x6d, 0x01, 0x00, 0x00, 0x00,
    ...section(1, vec([[0x60, ...vec([[I32], [I32], [F64], [F64], [F64], [F64], [F64], [F64], [F64]]), ...vec([])]])),
    ...section(3, vec([uleb(0)])),
    ...section(5, vec([[0x00, ...uleb(1)]])),
    ...section(7, vec([[...name('k'), 0x00, ...uleb(0)], [...name('m'), 0x02, ...uleb(0)]])),
    ...section(10, vec([[...uleb(code.length), ...code]])),
  ];
  return new Uint8Array(bytes);
}
