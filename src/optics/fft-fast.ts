// A faster 2-D complex FFT with the conventions of ./fft.ts (same sign, inverse scaled by 1/n per
// axis, sizes powers of two, ny = 1 for a 1-D transform). Two kernels sit behind one interface:
//
// - 'wasm-simd': WebAssembly with 128-bit SIMD (source: ./wasm/fft.ts, AssemblyScript, compiled by
//   `npm run build:wasm` to dist/src/optics/wasm/fft.wasm; the program's entry points read that
//   file (src/kernels.ts) and hand the bytes to createFftKernel, so this layer does no I/O). The data is
//   copied into the module's memory with each row padded by one cache line (a power-of-two row
//   length would put a whole column in the same few cache sets), the row transforms run as the rows
//   arrive, then the columns, B adjacent ones at a time, then the result is copied back. The
//   module's memory grows to the largest transform asked for (the data, padded, plus O(n)
//   scratch) and is kept, so the first call at a new largest size also pays for that memory.
// - 'js': the same algorithm in TypeScript on split Float64Arrays; used when the WebAssembly file
//   is not installed or cannot be compiled, or when memory for it cannot be had.
//
// Both: radix-4 decimation in time (one radix-2 stage first when log2 n is odd) on split real and
// imaginary planes, bit-reversal permutation done while gathering (or by swaps in place), twiddles
// and permutation built once per size and kept; columns are gathered in blocks of adjacent columns so that each cache
// line read is used whole. The inverse is the forward transform with the planes exchanged.
import { isPowerOfTwo } from './fft.js';

export type FastFftBackend = 'wasm-simd' | 'js';

/**
 * In-place 2-D FFT of an ny×nx complex array held as two planes of nx·ny values each (row-major).
 * Same sign and 1/n convention as fft2 in ./fft.ts.
 */
export function fft2Split(k: FftKernel, re: Float64Array, im: Float64Array, nx: number, ny: number, inverse: boolean): void {
  checkShape(nx, ny);
  if (re.length !== nx * ny || im.length !== nx * ny) {
    throw new Error(`fft2Split: planes of ${re.length} and ${im.length} values for a ${nx}×${ny} grid`);
  }
  if (k.backend === 'wasm-simd' && wasmSplit(k, re, im, nx, ny, inverse)) return;
  jsSplit(k, re, im, nx, ny, inverse);
}

/** Drop-in for fft2 in ./fft.ts: in-place 2-D FFT of an ny×nx interleaved (re, im, …) array. */
export function fft2Interleaved(k: FftKernel, data: Float64Array, nx: number, ny: number, inverse: boolean): void {
  checkShape(nx, ny);
  if (data.length !== 2 * nx * ny) {
    throw new Error(`fft2Interleaved: ${data.length} values for a ${nx}×${ny} complex grid`);
  }
  if (k.backend === 'wasm-simd' && wasmInterleaved(k, data, nx, ny, inverse)) return;
  jsInterleaved(k, data, nx, ny, inverse);
}

/**
 * One pass of fft2Interleaved over part of the array, for threads that share one transform: the
 * row transforms of rows [r0, r1) of `src`, an ny×nx interleaved array, written to the same rows of
 * `dst` (which may be `src`). The kernel and its arithmetic are those of fft2Interleaved, so all
 * rows, then all columns (transformColumns), in any split, give its result bit for bit.
 *
 * `commit`, when given, is asked after the part has been transformed in this thread's own memory
 * and before anything is written: when it answers false nothing is written and the result is false
 * (another thread has taken the part over). Reading `src` and writing `dst` only at the end is what
 * lets a part that a thread abandoned be done again by another from the untouched `src`.
 */
export function transformRows(
  k: FftKernel,
  src: Float64Array, dst: Float64Array, nx: number, ny: number, r0: number, r1: number, inverse: boolean,
  commit?: () => boolean,
): boolean {
  checkPiece(src, dst, nx, ny, r0, r1, ny, 'rows');
  if (k.backend === 'wasm-simd') {
    const done = wasmRows(k, src, dst, nx, r0, r1, inverse, commit);
    if (done !== null) return done;
  }
  return jsRows(k, src, dst, nx, r0, r1, inverse, commit);
}

/**
 * The column transforms of columns [c0, c1) of `src` (c0 and c1 even), written to the same
 * columns of `dst`; see transformRows. `src` must hold the row transforms already.
 */
export function transformColumns(
  k: FftKernel,
  src: Float64Array, dst: Float64Array, nx: number, ny: number, c0: number, c1: number, inverse: boolean,
  commit?: () => boolean,
): boolean {
  checkPiece(src, dst, nx, ny, c0, c1, nx, 'columns');
  if (c0 % 2 !== 0 || c1 % 2 !== 0) throw new Error(`transformColumns: columns ${c0}..${c1} must start and end on even indices`);
  if (ny === 1) {
    // A 1-D transform has no column pass; the part is copied so that dst holds the result.
    if (commit && !commit()) return false;
    if (dst !== src) dst.set(src.subarray(2 * c0, 2 * c1), 2 * c0);
    return true;
  }
  if (k.backend === 'wasm-simd') {
    const done = wasmCols(k, src, dst, nx, ny, c0, c1, inverse, commit);
    if (done !== null) return done;
  }
  return jsCols(k, src, dst, nx, ny, c0, c1, inverse, commit);
}

function checkPiece(
  src: Float64Array, dst: Float64Array, nx: number, ny: number, a: number, b: number, n: number, what: string,
): void {
  checkShape(nx, ny);
  if (src.length !== 2 * nx * ny || dst.length !== 2 * nx * ny) {
    throw new Error(`transform ${what}: ${src.length} and ${dst.length} values for a ${nx}×${ny} complex grid`);
  }
  if (!Number.isInteger(a) || !Number.isInteger(b) || a < 0 || b > n || a >= b) {
    throw new Error(`transform ${what}: range ${a}..${b} outside 0..${n}`);
  }
}

/** Lanes per block for a part `width` columns wide: a power of two dividing it, at most `max`. */
function blockFor(width: number, max: number): number {
  return Math.min(max, width & -width);
}

/** The kernel `k` uses: 'wasm-simd' when it was made with the module's bytes, else 'js'. */
export function fastFftBackend(k: FftKernel): FastFftBackend {
  return k.backend;
}

/**
 * Choose the kernel (for tests and benchmarks). Asking for 'wasm-simd' when the module could not
 * be loaded throws, with the reason.
 */
export function useFastFftBackend(k: FftKernel, b: FastFftBackend): void {
  if (b === 'wasm-simd' && !k.wasm) throw new Error(`WebAssembly FFT unavailable: ${k.wasmProblem}`);
  k.backend = b;
}

function checkShape(nx: number, ny: number): void {
  if (!isPowerOfTwo(nx) || (ny !== 1 && !isPowerOfTwo(ny))) {
    throw new Error(`FFT sizes must be powers of two, got ${nx}×${ny}`);
  }
}

// ---- tables (shared by both kernels) ----------------------------------------------------------

interface Tables {
  rev: Uint32Array; // bit-reversal permutation
  tw: Float64Array; // per radix-4 stage of half-size L ≥ 2: L records (w^k, w^2k, w^3k), w = e^{-2πi/4L}
}

// Memo of a pure function (the permutation and twiddles of size n), not state: every kernel and
// thread may read it; the WebAssembly kernels copy it into their own memory (FftKernel.wasmTables).
const tables = new Map<number, Tables>();

function log2(n: number): number {
  return 31 - Math.clz32(n);
}

/** Half-size of the first twiddled stage: after a radix-2 first stage 2, after a radix-4 one 4. */
function firstL(n: number): number {
  return log2(n) & 1 ? 2 : 4;
}

function tablesFor(n: number): Tables {
  let t = tables.get(n);
  if (t) return t;
  const bits = log2(n);
  const rev = new Uint32Array(n);
  for (let i = 0; i < n; i++) {
    let r = 0;
    for (let b = 0, x = i; b < bits; b++, x >>= 1) r = (r << 1) | (x & 1);
    rev[i] = r;
  }
  let len = 0;
  for (let L = firstL(n); L < n; L *= 4) len += 6 * L;
  const tw = new Float64Array(len);
  let o = 0;
  for (let L = firstL(n); L < n; L *= 4) {
    for (let k = 0; k < L; k++) {
      for (let m = 1; m <= 3; m++) {
        const a = (-2 * Math.PI * m * k) / (4 * L);
        tw[o++] = Math.cos(a);
        tw[o++] = Math.sin(a);
      }
    }
  }
  t = { rev, tw };
  tables.set(n, t);
  return t;
}

// ---- the TypeScript kernel ----------------------------------------------------------------------

/**
 * W independent length-n transforms at once, in place on re/im from `off`, point-major (point p of
 * all W transforms is W contiguous values), input in bit-reversed point order.
 */
function jsLanes(re: Float64Array, im: Float64Array, off: number, n: number, W: number, tw: Float64Array): void {
  const end = off + n * W;
  if (log2(n) & 1) {
    for (let o = off; o < end; o += 2 * W) {
      for (let a = o; a < o + W; a++) {
        const b = a + W;
        const ar = re[a], ai = im[a], br = re[b], bi = im[b];
        re[a] = ar + br;
        im[a] = ai + bi;
        re[b] = ar - br;
        im[b] = ai - bi;
      }
    }
  } else {
    for (let o = off; o < end; o += 4 * W) {
      for (let i0 = o; i0 < o + W; i0++) {
        const i2 = i0 + W, i1 = i2 + W, i3 = i1 + W;
        const b0r = re[i0], b0i = im[i0], b2r = re[i2], b2i = im[i2];
        const b1r = re[i1], b1i = im[i1], b3r = re[i3], b3i = im[i3];
        const t0r = b0r + b2r, t0i = b0i + b2i, t1r = b0r - b2r, t1i = b0i - b2i;
        const t2r = b1r + b3r, t2i = b1i + b3i, t3r = b1r - b3r, t3i = b1i - b3i;
        re[i0] = t0r + t2r;
        im[i0] = t0i + t2i;
        re[i1] = t0r - t2r;
        im[i1] = t0i - t2i;
        re[i2] = t1r + t3i;
        im[i2] = t1i - t3r;
        re[i3] = t1r - t3i;
        im[i3] = t1i + t3r;
      }
    }
  }
  let t0 = 0;
  for (let L = firstL(n); L < n; L *= 4) {
    const q = L * W;
    for (let base = off; base < end; base += 4 * q) {
      for (let k = 0, t = t0; k < L; k++, t += 6) {
        const w1r = tw[t], w1i = tw[t + 1], w2r = tw[t + 2], w2i = tw[t + 3], w3r = tw[t + 4], w3i = tw[t + 5];
        const p = base + k * W;
        for (let i0 = p; i0 < p + W; i0++) {
          const i2 = i0 + q, i1 = i2 + q, i3 = i1 + q;
          const b0r = re[i0], b0i = im[i0];
          let xr = re[i1], xi = im[i1];
          const b1r = xr * w1r - xi * w1i, b1i = xr * w1i + xi * w1r;
          xr = re[i2];
          xi = im[i2];
          const b2r = xr * w2r - xi * w2i, b2i = xr * w2i + xi * w2r;
          xr = re[i3];
          xi = im[i3];
          const b3r = xr * w3r - xi * w3i, b3i = xr * w3i + xi * w3r;
          const t0r = b0r + b2r, t0i = b0i + b2i, t1r = b0r - b2r, t1i = b0i - b2i;
          const t2r = b1r + b3r, t2i = b1i + b3i, t3r = b1r - b3r, t3i = b1i - b3i;
          re[i0] = t0r + t2r;
          im[i0] = t0i + t2i;
          re[i1] = t0r - t2r;
          im[i1] = t0i - t2i;
          re[i2] = t1r + t3i;
          im[i2] = t1i - t3r;
          re[i3] = t1r - t3i;
          im[i3] = t1i + t3r;
        }
      }
    }
    t0 += 6 * L;
  }
}

/** Adjacent columns transformed together (JS kernel). */
const JS_BLOCK = 16;


function jsBuffers(k: FftKernel, len: number) {
  let s = k.jsScratch.get(len);
  if (!s) {
    s = { re: new Float64Array(len), im: new Float64Array(len) };
    k.jsScratch.set(len, s);
  }
  return s;
}

function jsSplit(k: FftKernel, re: Float64Array, im: Float64Array, nx: number, ny: number, inverse: boolean): void {
  // The inverse: the forward transform of the exchanged planes.
  const R = inverse ? im : re, I = inverse ? re : im;
  const tx = tablesFor(nx);
  const rev = tx.rev;
  const sx = inverse ? 1 / nx : 1;
  for (let r = 0; r < ny; r++) {
    const o = r * nx;
    for (let i = 0; i < nx; i++) {
      const j = rev[i];
      if (j > i) {
        const a = o + i, b = o + j;
        let t = R[a];
        R[a] = R[b];
        R[b] = t;
        t = I[a];
        I[a] = I[b];
        I[b] = t;
      }
    }
    jsLanes(R, I, o, nx, 1, tx.tw);
    if (sx !== 1) {
      for (let i = o; i < o + nx; i++) {
        R[i] *= sx;
        I[i] *= sx;
      }
    }
  }
  if (ny === 1) return;
  const ty = tablesFor(ny);
  const B = Math.min(JS_BLOCK, nx);
  const s = jsBuffers(k, B * ny);
  const sr = s.re, si = s.im, rv = ty.rev;
  const sy = inverse ? 1 / ny : 1;
  for (let c0 = 0; c0 < nx; c0 += B) {
    for (let r = 0; r < ny; r++) {
      let src = r * nx + c0;
      let d = rv[r] * B;
      for (let b = 0; b < B; b++, src++, d++) {
        sr[d] = R[src];
        si[d] = I[src];
      }
    }
    jsLanes(sr, si, 0, ny, B, ty.tw);
    for (let r = 0; r < ny; r++) {
      let dst = r * nx + c0;
      let o = r * B;
      for (let b = 0; b < B; b++, dst++, o++) {
        R[dst] = sr[o] * sy;
        I[dst] = si[o] * sy;
      }
    }
  }
}

function jsInterleaved(k: FftKernel, data: Float64Array, nx: number, ny: number, inverse: boolean): void {
  const tx = tablesFor(nx);
  const rev = tx.rev;
  const s = jsBuffers(k, Math.max(nx, ny > 1 ? Math.min(JS_BLOCK, nx) * ny : 0));
  // The inverse: the forward transform with real and imaginary parts exchanged.
  const sr = inverse ? s.im : s.re, si = inverse ? s.re : s.im;
  const sx = inverse ? 1 / nx : 1;
  for (let r = 0; r < ny; r++) {
    const o = 2 * r * nx;
    for (let k = 0; k < nx; k++) {
      const j = o + 2 * rev[k];
      s.re[k] = data[j];
      s.im[k] = data[j + 1];
    }
    jsLanes(sr, si, 0, nx, 1, tx.tw);
    for (let k = 0; k < nx; k++) {
      data[o + 2 * k] = s.re[k] * sx;
      data[o + 2 * k + 1] = s.im[k] * sx;
    }
  }
  if (ny === 1) return;
  const ty = tablesFor(ny);
  const B = Math.min(JS_BLOCK, nx);
  const rv = ty.rev;
  const sy = inverse ? 1 / ny : 1;
  for (let c0 = 0; c0 < nx; c0 += B) {
    for (let r = 0; r < ny; r++) {
      let src = 2 * (r * nx + c0);
      let d = rv[r] * B;
      for (let b = 0; b < B; b++, src += 2, d++) {
        s.re[d] = data[src];
        s.im[d] = data[src + 1];
      }
    }
    jsLanes(sr, si, 0, ny, B, ty.tw);
    for (let r = 0; r < ny; r++) {
      let dst = 2 * (r * nx + c0);
      let o = r * B;
      for (let b = 0; b < B; b++, dst += 2, o++) {
        data[dst] = s.re[o] * sy;
        data[dst + 1] = s.im[o] * sy;
      }
    }
  }
}


function pieceBuffers(k: FftKernel, len: number) {
  if (k.piece.re.length < len) k.piece = { re: new Float64Array(len), im: new Float64Array(len) };
  return k.piece;
}

function jsRows(
  k: FftKernel,
  src: Float64Array, dst: Float64Array, nx: number, r0: number, r1: number, inverse: boolean, commit?: () => boolean,
): boolean {
  const tx = tablesFor(nx);
  const rev = tx.rev;
  const s = pieceBuffers(k, (r1 - r0) * nx);
  const sr = inverse ? s.im : s.re, si = inverse ? s.re : s.im;
  const sx = inverse ? 1 / nx : 1;
  for (let r = r0; r < r1; r++) {
    const o = 2 * r * nx, off = (r - r0) * nx;
    for (let k = 0; k < nx; k++) {
      const j = o + 2 * rev[k];
      s.re[off + k] = src[j];
      s.im[off + k] = src[j + 1];
    }
    jsLanes(sr, si, off, nx, 1, tx.tw);
  }
  if (commit && !commit()) return false;
  for (let r = r0; r < r1; r++) {
    const o = 2 * r * nx, off = (r - r0) * nx;
    for (let k = 0; k < nx; k++) {
      dst[o + 2 * k] = s.re[off + k] * sx;
      dst[o + 2 * k + 1] = s.im[off + k] * sx;
    }
  }
  return true;
}

function jsCols(
  k: FftKernel,
  src: Float64Array, dst: Float64Array, nx: number, ny: number, c0: number, c1: number, inverse: boolean,
  commit?: () => boolean,
): boolean {
  const ty = tablesFor(ny);
  const rv = ty.rev;
  const width = c1 - c0;
  const B = blockFor(width, JS_BLOCK);
  const s = pieceBuffers(k, ny * width);
  const sr = inverse ? s.im : s.re, si = inverse ? s.re : s.im;
  const sy = inverse ? 1 / ny : 1;
  for (let b0 = 0; b0 < width; b0 += B) {
    const off = b0 * ny;
    for (let r = 0; r < ny; r++) {
      let from = 2 * (r * nx + c0 + b0);
      let d = off + rv[r] * B;
      for (let b = 0; b < B; b++, from += 2, d++) {
        s.re[d] = src[from];
        s.im[d] = src[from + 1];
      }
    }
    jsLanes(sr, si, off, ny, B, ty.tw);
  }
  if (commit && !commit()) return false;
  for (let b0 = 0; b0 < width; b0 += B) {
    const off = b0 * ny;
    for (let r = 0; r < ny; r++) {
      let to = 2 * (r * nx + c0 + b0);
      let o = off + r * B;
      for (let b = 0; b < B; b++, to += 2, o++) {
        dst[to] = s.re[o] * sy;
        dst[to + 1] = s.im[o] * sy;
      }
    }
  }
  return true;
}

// ---- the WebAssembly kernel ---------------------------------------------------------------------

// The few WebAssembly globals used here (the project's lib settings do not declare them).
interface WasmMemory {
  readonly buffer: ArrayBuffer;
  grow(pages: number): number;
}
declare const WebAssembly: {
  Module: new (bytes: Uint8Array) => object;
  Instance: new (module: object, imports: object) => { exports: unknown };
  Memory: new (d: { initial: number; maximum: number; shared: boolean }) => WasmMemory;
};

type Pass = (
  a: number, b: number, nx: number, ny: number, stride: number, lanes: number,
  rev: number, tw: number, sre: number, sim: number, swap: number, scale: number,
) => void;

interface WasmFft {
  memory: WasmMemory;
  heapBase(): number;
  rowsInterleaved(
    data: number, nx: number, ny: number, stride: number, R: number,
    rev: number, tw: number, sre: number, sim: number, swap: number, scale: number,
  ): void;
  colsInterleaved(
    data: number, nx: number, ny: number, stride: number, B: number,
    rev: number, tw: number, sre: number, sim: number, swap: number, scale: number,
  ): void;
  rowsSplit: Pass;
  colsSplit: Pass;
}

/** Bytes added to each row in the module's copy of the data. */
const PAD = 64;
/** Adjacent columns transformed together (WebAssembly kernel). */
const WASM_BLOCK = 16;

/**
 * One thread's FFT kernel and everything it keeps: the compiled WebAssembly module (if any) and its
 * memory, the tables written there, the kernel in use, scratch for the TypeScript kernel, and the
 * shared memory of a team it is attached to. Made by createFftKernel and owned by an engine
 * (engine.ts); every function here that transforms takes it, so no state is kept by this module
 * except the per-size tables of tablesFor (a memo of a pure function).
 */
export interface FftKernel {
  backend: FastFftBackend;
  wasm: WasmFft | null;
  /** Why the WebAssembly kernel is not there, for useFastFftBackend's error. */
  wasmProblem: string;
  wasmTables: Map<number, WasmTables>;
  /** End of the tables in the module's memory; the data goes after it, per call. */
  tableTop: number;
  /** View of the module's memory, renewed when it grows. */
  heap: Float64Array;
  /** The compiled module's bytes, kept to instantiate it again on a shared memory. */
  moduleBytes: Uint8Array | null;
  shared: SharedKernel | null;
  jsScratch: Map<number, { re: Float64Array; im: Float64Array }>;
  /** Scratch for the parts (transformRows, transformColumns), grown to the largest part asked for. */
  piece: { re: Float64Array; im: Float64Array };
}

/**
 * A kernel: the WebAssembly one compiled from `bytes` when given and compilable (else the
 * TypeScript one, with `whyMissing` or the compiler's reason kept for useFastFftBackend).
 */
export function createFftKernel(bytes: Uint8Array | null, whyMissing = 'no WebAssembly kernel given'): FftKernel {
  const k: FftKernel = {
    backend: 'js',
    wasm: null,
    wasmProblem: whyMissing,
    wasmTables: new Map(),
    tableTop: 0,
    heap: new Float64Array(0),
    moduleBytes: null,
    shared: null,
    jsScratch: new Map(),
    piece: { re: new Float64Array(0), im: new Float64Array(0) },
  };
  installWasmFft(k, bytes, whyMissing);
  return k;
}


/**
 * Compiles the WebAssembly kernel from its bytes into `k` and makes it k's kernel; false (with the
 * reason kept for useFastFftBackend's error) when it cannot be compiled, which leaves the TypeScript kernel.
 */
function installWasmFft(k: FftKernel, bytes: Uint8Array | null, whyMissing = 'fft.wasm not found'): boolean {
  if (k.wasm) return true;
  if (!bytes) {
    k.wasmProblem = whyMissing;
    return false;
  }
  try {
    const instance = new WebAssembly.Instance(new WebAssembly.Module(bytes), {});
    k.wasm = instance.exports as unknown as WasmFft;
    k.moduleBytes = bytes;
    k.backend = 'wasm-simd';
    return true;
  } catch (e) {
    k.wasmProblem = `fft.wasm could not be compiled: ${(e as Error).message}`;
    return false;
  }
}

interface WasmTables {
  rev: number;
  tw: number;
}


/** Make the module's memory at least `end` bytes; false when it cannot grow. */
function reserve(k: FftKernel, w: WasmFft, end: number): boolean {
  const have = w.memory.buffer.byteLength;
  if (end > have) {
    try {
      w.memory.grow(Math.ceil((end - have) / 65536));
    } catch {
      return false;
    }
  }
  if (k.heap.buffer !== w.memory.buffer) k.heap = new Float64Array(w.memory.buffer);
  return true;
}

function align64(n: number): number {
  return Math.ceil(n / 64) * 64;
}

function wasmTablesFor(k: FftKernel, w: WasmFft, n: number): WasmTables | null {
  let t = k.wasmTables.get(n);
  if (t) return t;
  const js = tablesFor(n);
  if (k.tableTop === 0) k.tableTop = align64(w.heapBase());
  const rev = k.tableTop;
  const tw = align64(rev + 4 * n);
  const end = align64(tw + 8 * Math.max(1, js.tw.length));
  if (!reserve(k, w, end)) return null;
  new Uint32Array(w.memory.buffer, rev, n).set(js.rev);
  k.heap.set(js.tw, tw / 8);
  k.tableTop = end;
  t = { rev, tw };
  k.wasmTables.set(n, t);
  return t;
}

/** Lay out a call: tables, then `dataBytes` of data, then two scratch planes. */
function wasmLayout(k: FftKernel, w: WasmFft, nx: number, ny: number, R: number, B: number, dataBytes: number) {
  const tx = wasmTablesFor(k, w, nx);
  const ty = ny > 1 ? wasmTablesFor(k, w, ny) : tx;
  if (!tx || !ty) return null;
  return wasmArea(k, w, tx, ty, dataBytes, Math.max(nx * R, ny > 1 ? ny * B : 0));
}

/** After the tables: `dataBytes` of data, then two scratch planes of `planeValues` f64 each. */
function wasmArea(k: FftKernel, w: WasmFft, tx: WasmTables, ty: WasmTables, dataBytes: number, planeValues: number) {
  const base = k.tableTop;
  const plane = align64(8 * planeValues);
  const sre = align64(base + dataBytes);
  const sim = sre + plane;
  if (!reserve(k, w, sim + plane)) return null;
  return { tx, ty, base, sre, sim };
}

function wasmInterleaved(k: FftKernel, data: Float64Array, nx: number, ny: number, inverse: boolean): boolean {
  const w = k.wasm!;
  const R = ny >= 4 ? 4 : 2;
  const B = Math.min(WASM_BLOCK, nx);
  const rowLen = 2 * nx; // values per row
  const stride = ny > 1 ? 16 * nx + PAD : 16 * nx; // bytes per row in the module
  const L = wasmLayout(k, w, nx, ny, R, B, stride * ny);
  if (!L) return false;
  const { tx, ty, base, sre, sim } = L;
  const swap = inverse ? 1 : 0;
  const sx = inverse ? 1 / nx : 1;
  const at = base / 8, step = stride / 8;
  // copy R rows in, transform them while they are in cache, go on
  for (let r0 = 0; r0 < ny; r0 += R) {
    const g = Math.min(R, ny - r0);
    for (let r = r0; r < r0 + g; r++) k.heap.set(data.subarray(r * rowLen, (r + 1) * rowLen), at + r * step);
    w.rowsInterleaved(base + r0 * stride, nx, g, stride, R, tx.rev, tx.tw, sre, sim, swap, sx);
  }
  if (ny > 1) w.colsInterleaved(base, nx, ny, stride, B, ty.rev, ty.tw, sre, sim, swap, inverse ? 1 / ny : 1);
  for (let r = 0; r < ny; r++) data.set(k.heap.subarray(at + r * step, at + r * step + rowLen), r * rowLen);
  return true;
}

function wasmSplit(k: FftKernel, re: Float64Array, im: Float64Array, nx: number, ny: number, inverse: boolean): boolean {
  const w = k.wasm!;
  const R = ny >= 4 ? 4 : 2;
  const B = Math.min(WASM_BLOCK, nx);
  const stride = ny > 1 ? 8 * nx + PAD : 8 * nx;
  const L = wasmLayout(k, w, nx, ny, R, B, 2 * stride * ny);
  if (!L) return false;
  const { tx, ty, base, sre, sim } = L;
  const pr = base, pi = base + stride * ny;
  const swap = inverse ? 1 : 0;
  const sx = inverse ? 1 / nx : 1;
  const ar = pr / 8, ai = pi / 8, step = stride / 8;
  for (let r0 = 0; r0 < ny; r0 += R) {
    const g = Math.min(R, ny - r0);
    for (let r = r0; r < r0 + g; r++) {
      k.heap.set(re.subarray(r * nx, (r + 1) * nx), ar + r * step);
      k.heap.set(im.subarray(r * nx, (r + 1) * nx), ai + r * step);
    }
    w.rowsSplit(pr + r0 * stride, pi + r0 * stride, nx, g, stride, R, tx.rev, tx.tw, sre, sim, swap, sx);
  }
  if (ny > 1) w.colsSplit(pr, pi, nx, ny, stride, B, ty.rev, ty.tw, sre, sim, swap, inverse ? 1 / ny : 1);
  for (let r = 0; r < ny; r++) {
    re.set(k.heap.subarray(ar + r * step, ar + r * step + nx), r * nx);
    im.set(k.heap.subarray(ai + r * step, ai + r * step + nx), r * nx);
  }
  return true;
}

// The parts: the data of one part is copied in, transformed, and (if committed) copied out. Null
// when the module's memory cannot be had (the caller then uses the TypeScript kernel).

function wasmRows(
  k: FftKernel,
  src: Float64Array, dst: Float64Array, nx: number, r0: number, r1: number, inverse: boolean, commit?: () => boolean,
): boolean | null {
  const w = k.wasm!;
  const rows = r1 - r0;
  const R = rows >= 4 ? 4 : 2;
  const tx = wasmTablesFor(k, w, nx);
  if (!tx) return null;
  // Rows need no padding: they are read whole, not down a column.
  const L = wasmArea(k, w, tx, tx, 16 * nx * rows, nx * R);
  if (!L) return null;
  const at = L.base / 8;
  k.heap.set(src.subarray(2 * r0 * nx, 2 * r1 * nx), at);
  w.rowsInterleaved(L.base, nx, rows, 16 * nx, R, tx.rev, tx.tw, L.sre, L.sim, inverse ? 1 : 0, inverse ? 1 / nx : 1);
  if (commit && !commit()) return false;
  dst.set(k.heap.subarray(at, at + 2 * rows * nx), 2 * r0 * nx);
  return true;
}

function wasmCols(
  k: FftKernel,
  src: Float64Array, dst: Float64Array, nx: number, ny: number, c0: number, c1: number, inverse: boolean,
  commit?: () => boolean,
): boolean | null {
  const w = k.wasm!;
  const width = c1 - c0;
  const B = blockFor(width, WASM_BLOCK);
  // One block of B columns is read row after row, contiguously; wider parts get the padded rows.
  const stride = width > B ? 16 * width + PAD : 16 * width;
  const ty = wasmTablesFor(k, w, ny);
  if (!ty) return null;
  const L = wasmArea(k, w, ty, ty, stride * ny, ny * B);
  if (!L) return null;
  const at = L.base / 8, step = stride / 8, len = 2 * width;
  for (let r = 0; r < ny; r++) copyValues(src, 2 * (r * nx + c0), k.heap, at + r * step, len);
  w.colsInterleaved(L.base, width, ny, stride, B, ty.rev, ty.tw, L.sre, L.sim, inverse ? 1 : 0, inverse ? 1 / ny : 1);
  if (commit && !commit()) return false;
  for (let r = 0; r < ny; r++) copyValues(k.heap, at + r * step, dst, 2 * (r * nx + c0), len);
  return true;
}

/** Below this many values a plain loop copies faster than set() on a new subarray. */
const SHORT_COPY = 64;

/** dst[to..to+len) = src[from..from+len): set() for long runs, a plain loop for short ones. */
function copyValues(src: Float64Array, from: number, dst: Float64Array, to: number, len: number): void {
  if (len >= SHORT_COPY) {
    dst.set(src.subarray(from, from + len), to);
    return;
  }
  for (let i = 0; i < len; i++) dst[to + i] = src[from + i];
}

// ---- the WebAssembly kernel in memory shared between threads ----------------------------------
//
// For threads that share one transform (src/parallel): every thread instantiates the kernel on one
// shared WebAssembly memory, so that the passes run in place on one padded copy of the data, as
// fft2Interleaved does in one thread, with no copies between the threads' memories. The data is
// copied in row by row as the rows are transformed (sharedRowsIn), the columns are transformed in
// place (sharedColumns), and the result is copied out row by row (sharedRowsOut). Same kernel,
// same layout (padded rows), same arithmetic: all parts together give fft2Interleaved's result.


/** Pages of the shared memory at most (the 4 GiB of 32-bit WebAssembly). */
const SHARED_MAX_PAGES = 65536;

interface SharedKernel {
  memory: WasmMemory;
  w: WasmFft;
  heap: Float64Array;
}


/**
 * The module rewritten to take its memory from the importer ("env", "memory", shared) instead of
 * declaring its own: the memory section goes, an import section with the memory comes after the
 * type section. The kernel itself has no data segments and no memory-size assumptions (the
 * JavaScript side lays everything out), so nothing else changes.
 */
function importingSharedMemory(bytes: Uint8Array): Uint8Array {
  const leb = (n: number) => {
    const out: number[] = [];
    do {
      let b = n & 0x7f;
      n >>>= 7;
      if (n) b |= 0x80;
      out.push(b);
    } while (n);
    return out;
  };
  const name = (t: string) => [...leb(t.length), ...[...t].map((c) => c.charCodeAt(0))];
  const entry = [...name('env'), ...name('memory'), 0x02, 0x03, ...leb(1), ...leb(SHARED_MAX_PAGES)];
  const importSection = [0x02, ...leb(entry.length + 1), 0x01, ...entry];
  const out: number[] = [...bytes.subarray(0, 8)];
  let p = 8;
  let placed = false;
  while (p < bytes.length) {
    const id = bytes[p]!;
    let q = p + 1, size = 0, shift = 0, b: number;
    do {
      b = bytes[q++]!;
      size |= (b & 0x7f) << shift;
      shift += 7;
    } while (b & 0x80);
    const end = q + size;
    if (id === 2) throw new Error('the kernel module already has imports');
    if (!placed && id !== 1 && id !== 0) {
      out.push(...importSection);
      placed = true;
    }
    if (id !== 5) out.push(...bytes.subarray(p, end));
    p = end;
  }
  return new Uint8Array(out);
}

/**
 * A memory for a team's transforms, shared between threads (post it to them); null when the
 * WebAssembly kernel is not installed or shared memory cannot be had.
 */
export function createSharedFftMemory(k: FftKernel): object | null {
  if (!k.moduleBytes) return null;
  try {
    return new WebAssembly.Memory({ initial: 1, maximum: SHARED_MAX_PAGES, shared: true });
  } catch {
    return null;
  }
}

/** Runs this thread's shared passes on `memory` (from createSharedFftMemory); null detaches. */
export function attachSharedFftMemory(k: FftKernel, memory: object | null): boolean {
  if (memory === null) {
    k.shared = null;
    return true;
  }
  if (k.shared && k.shared.memory === memory) return true;
  if (!k.moduleBytes) return false;
  try {
    const m = memory as WasmMemory;
    const instance = new WebAssembly.Instance(new WebAssembly.Module(importingSharedMemory(k.moduleBytes)), { env: { memory: m } });
    k.shared = { memory: m, w: instance.exports as unknown as WasmFft, heap: new Float64Array(m.buffer) };
    return true;
  } catch {
    k.shared = null;
    return false;
  }
}

/** Where one transform lives in the shared memory (byte offsets); plain numbers, posted to helpers. */
export interface SharedLayout {
  nx: number;
  ny: number;
  revX: number;
  twX: number;
  revY: number;
  twY: number;
  data: number;
  stride: number;
  /** Scratch planes: slot k uses [scratch + 2k·plane, scratch + 2(k+1)·plane). */
  scratch: number;
  plane: number;
  end: number;
}

/**
 * Lays out an ny×nx transform for `slots` threads in the attached shared memory, writes its tables
 * there and grows the memory as needed; null when that is not possible. Call it while no thread
 * is transforming in the memory.
 */
export function sharedLayout(k: FftKernel, nx: number, ny: number, slots: number): SharedLayout | null {
  const sh = k.shared;
  if (!sh) return null;
  checkShape(nx, ny);
  const tx = tablesFor(nx), ty = tablesFor(ny);
  const revX = align64(sh.w.heapBase());
  const twX = align64(revX + 4 * nx);
  const revY = align64(twX + 8 * Math.max(1, tx.tw.length));
  const twY = align64(revY + 4 * ny);
  const data = align64(twY + 8 * Math.max(1, ty.tw.length));
  const stride = 16 * nx + PAD;
  const plane = align64(8 * Math.max(nx * 4, ny * Math.min(WASM_BLOCK, nx)));
  const scratch = align64(data + stride * ny);
  const end = scratch + 2 * plane * slots;
  const have = sh.memory.buffer.byteLength;
  if (end > have) {
    try {
      sh.memory.grow(Math.ceil((end - have) / 65536));
    } catch {
      return null;
    }
  }
  const heap = sharedHeap(sh, end);
  new Uint32Array(heap.buffer, revX, nx).set(tx.rev);
  heap.set(tx.tw, twX / 8);
  new Uint32Array(heap.buffer, revY, ny).set(ty.rev);
  heap.set(ty.tw, twY / 8);
  return { nx, ny, revX, twX, revY, twY, data, stride, scratch, plane, end };
}

/** This thread's view of the shared memory, renewed when another thread has grown it. */
function sharedHeap(sh: SharedKernel, end: number): Float64Array {
  if (sh.heap.byteLength < end) sh.heap = new Float64Array(sh.memory.buffer);
  return sh.heap;
}

function attached(k: FftKernel, L: SharedLayout): SharedKernel {
  if (!k.shared) throw new Error('no shared FFT memory attached in this thread (attachSharedFftMemory)');
  if (k.shared.memory.buffer.byteLength < L.end) throw new Error('the shared FFT memory is smaller than the layout');
  return k.shared;
}

/** Rows [r0, r1) of `data` (ny×nx interleaved) copied into the shared memory and transformed there. */
export function sharedRowsIn(k: FftKernel, L: SharedLayout, data: Float64Array, r0: number, r1: number, inverse: boolean, slot: number): void {
  const sh = attached(k, L);
  const heap = sharedHeap(sh, L.end);
  const { nx, stride } = L;
  const R = 4;
  const sre = L.scratch + 2 * slot * L.plane, sim = sre + L.plane;
  const rowLen = 2 * nx, step = stride / 8, at = L.data / 8;
  for (let g0 = r0; g0 < r1; g0 += R) {
    const g = Math.min(R, r1 - g0);
    for (let r = g0; r < g0 + g; r++) heap.set(data.subarray(r * rowLen, (r + 1) * rowLen), at + r * step);
    sh.w.rowsInterleaved(L.data + g0 * stride, nx, g, stride, R, L.revX, L.twX, sre, sim, inverse ? 1 : 0, inverse ? 1 / nx : 1);
  }
}

/** Columns [c0, c1) (even bounds) transformed in place in the shared memory. */
export function sharedColumns(k: FftKernel, L: SharedLayout, c0: number, c1: number, inverse: boolean, slot: number): void {
  const sh = attached(k, L);
  const sre = L.scratch + 2 * slot * L.plane, sim = sre + L.plane;
  const width = c1 - c0;
  if (c0 % 2 !== 0 || width % 2 !== 0) throw new Error(`sharedColumns: columns ${c0}..${c1} must start and end on even indices`);
  sh.w.colsInterleaved(L.data + 16 * c0, width, L.ny, L.stride, blockFor(width, WASM_BLOCK), L.revY, L.twY, sre, sim, inverse ? 1 : 0, inverse ? 1 / L.ny : 1);
}

/** Rows [r0, r1) of the result copied out to `data`, if `commit` (asked first) allows. */
export function sharedRowsOut(k: FftKernel, L: SharedLayout, data: Float64Array, r0: number, r1: number, commit?: () => boolean): boolean {
  const sh = attached(k, L);
  const heap = sharedHeap(sh, L.end);
  if (commit && !commit()) return false;
  const rowLen = 2 * L.nx, step = L.stride / 8, at = L.data / 8;
  for (let r = r0; r < r1; r++) data.set(heap.subarray(at + r * step, at + r * step + rowLen), r * rowLen);
  return true;
}
