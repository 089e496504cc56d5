// A faster 2-D complex FFT with the conventions of ./fft.ts (same sign, inverse scaled by 1/n per
// axis, sizes 5-smooth (isFastFftSize: 2^a·3^b·5^c ≥ 2), ny = 1 for a 1-D transform). Two kernels sit behind one interface:
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
// - 'native': the same algorithm in C (native/fft.c, built by `npm run build:native` when the
//   machine has a C compiler and Node's headers; AVX2 + FMA when the processor has them), loaded by
//   src/kernels.ts and handed to createFftKernel. It works in place on the caller's array, blocks of
//   8 rows or 8 adjacent columns at a time, and shares one transform between threads itself
//   (pthreads inside the call: fft2Interleaved's `threads`). Preferred when it loads and passes a
//   self-check against the TypeScript kernel; its bits differ from the other two kernels' in the
//   last places (fused multiply-adds), and are the same for any number of threads.
//
// All: decimation in time on split real and imaginary planes. n = P·Q with P the power of two in
// n: radix-4 stages (one radix-2 stage first when log2 P is odd) make the Q transforms of length P,
// then radix-3 stages, then radix-5 stages, combine them. The input permutation (bit reversal for a
// power of two, mixed-radix digit reversal otherwise) is done while gathering; twiddles and
// permutation are built once per size and kept; columns are gathered in blocks of adjacent columns
// so that each cache line read is used whole. The inverse is the forward transform with the planes
// exchanged. For a power of two the arithmetic is exactly that of the radix-4 kernel alone.
import { isFastFftSize } from './fft.js';

export type FastFftBackend = 'native' | 'wasm-simd' | 'js';

/**
 * In-place 2-D FFT of an ny×nx complex array held as two planes of nx·ny values each (row-major).
 * Same sign and 1/n convention as fft2 in ./fft.ts.
 */
export function fft2Split(k: FftKernel, re: Float64Array, im: Float64Array, nx: number, ny: number, inverse: boolean): void {
  checkShape(nx, ny);
  if (re.length !== nx * ny || im.length !== nx * ny) {
    throw new Error(`fft2Split: planes of ${re.length} and ${im.length} values for a ${nx}×${ny} grid`);
  }
  const b = backendFor(k, nx, ny);
  if (b === 'native') {
    nativeSplit(k, re, im, nx, ny, inverse);
    return;
  }
  if (b === 'wasm-simd' && wasmSplit(k, re, im, nx, ny, inverse)) return;
  jsSplit(k, re, im, nx, ny, inverse);
}

/**
 * Drop-in for fft2 in ./fft.ts: in-place 2-D FFT of an ny×nx interleaved (re, im, …) array.
 * `threads` (the native kernel only) share the transform; the result is the same for any number.
 */
export function fft2Interleaved(k: FftKernel, data: Float64Array, nx: number, ny: number, inverse: boolean, threads = 1): void {
  checkShape(nx, ny);
  if (data.length !== 2 * nx * ny) {
    throw new Error(`fft2Interleaved: ${data.length} values for a ${nx}×${ny} complex grid`);
  }
  const b = backendFor(k, nx, ny);
  if (b === 'native') {
    k.native!.fft2(data, nx, ny, inverse, threads);
    return;
  }
  if (b === 'wasm-simd' && wasmInterleaved(k, data, nx, ny, inverse)) return;
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
  // (the kernel fft2Interleaved uses for the whole transform, so that the parts give its bits)
  const b = backendFor(k, nx, ny);
  if (b === 'native') return nativeRows(k, src, dst, nx, r0, r1, inverse, commit);
  if (b === 'wasm-simd') {
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
  if (c0 % 2 !== 0 || (c1 % 2 !== 0 && c1 !== nx)) throw new Error(`transformColumns: columns ${c0}..${c1} must start and end on even indices (or end at ${nx})`);
  if (ny === 1) {
    // A 1-D transform has no column pass; the part is copied so that dst holds the result.
    if (commit && !commit()) return false;
    if (dst !== src) dst.set(src.subarray(2 * c0, 2 * c1), 2 * c0);
    return true;
  }
  const b = backendFor(k, nx, ny);
  if (b === 'native') return nativeCols(k, src, dst, nx, ny, c0, c1, inverse, commit);
  if (b === 'wasm-simd') {
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

/**
 * Lanes per block of the WebAssembly kernel's column pass over `width` columns: WASM_BLOCK, or the
 * width made even when narrower (the kernel does two lanes per vector; an odd width's last block
 * takes one column of the row padding along, whose result lands in the padding again).
 */
function wasmBlock(width: number): number {
  return width >= WASM_BLOCK ? WASM_BLOCK : width + (width & 1);
}

/**
 * The native kernel transforms NATIVE_LANES rows (or columns) side by side: fewer rows than that
 * leave lanes empty (a 1-D transform: 7 of 8, measured 3-4 times slower than the WebAssembly
 * kernel at 2^16-2^20 points), so such transforms go to the WebAssembly kernel when it is there.
 * Its scratch is 128 bytes per point, so axes longer than NATIVE_MAX_N go there too.
 */
const NATIVE_LANES = 8;
const NATIVE_MAX_N = 2 ** 20;

/** The kernel `k` runs an ny×nx transform on (n = nx, count = ny), its parts included. */
function backendFor(k: FftKernel, n: number, count: number): FastFftBackend {
  if (k.backend !== 'native') return k.backend;
  if (n > NATIVE_MAX_N || count > NATIVE_MAX_N) return k.wasm ? 'wasm-simd' : 'js';
  if (count < NATIVE_LANES && k.wasm) return 'wasm-simd';
  return 'native';
}

/** The kernel `k` uses: 'native' or 'wasm-simd' when it was made with them (and they work), else 'js'. */
export function fastFftBackend(k: FftKernel): FastFftBackend {
  return k.backend;
}

/**
 * Choose the kernel (for tests and benchmarks). Asking for 'wasm-simd' when the module could not
 * be loaded throws, with the reason.
 */
export function useFastFftBackend(k: FftKernel, b: FastFftBackend): void {
  if (b === 'native' && !k.native) throw new Error(`native FFT unavailable: ${k.nativeProblem}`);
  if (b === 'wasm-simd' && !k.wasm) throw new Error(`WebAssembly FFT unavailable: ${k.wasmProblem}`);
  k.backend = b;
}

function checkShape(nx: number, ny: number): void {
  if (!isFastFftSize(nx) || (ny !== 1 && !isFastFftSize(ny))) {
    throw new Error(`FFT sizes must have no prime factor but 2, 3 and 5, got ${nx}×${ny}`);
  }
}

// ---- tables (shared by both kernels) ----------------------------------------------------------

interface Tables {
  /** The input permutation: position i of the gathered transform holds input point rev[i]. */
  rev: Uint32Array;
  /** Its inverse (input point j goes to position inv[j]; the TypeScript kernel scatters columns through it); the same array when rev is an involution (powers of two). */
  inv: Uint32Array;
  /**
   * Twiddles: per radix-4 stage of half-size L ≥ 2 (L < P), L records (w^k, w^2k, w^3k),
   * w = e^{-2πi/4L}; then per radix-p stage (p = 3, then 5) of sub-size L, L records (w^k, …,
   * w^{(p-1)k}), w = e^{-2πi/pL}; each complex value as (re, im).
   */
  tw: Float64Array;
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

/** The odd radices of n's stages in the order they run: the 3s, then the 5s. */
function oddRadices(n: number): number[] {
  const out: number[] = [];
  let q = n / (n & -n);
  for (const p of [3, 5]) {
    while (q % p === 0) {
      out.push(p);
      q /= p;
    }
  }
  return out;
}

/** e^{-2πi j/m} with j reduced mod m first, so that large j lose no accuracy. */
function unitRoot(j: number, m: number): [number, number] {
  const a = (-2 * Math.PI * (j % m)) / m;
  return [Math.cos(a), Math.sin(a)];
}

function tablesFor(n: number): Tables {
  let t = tables.get(n);
  if (t) return t;
  const P = n & -n;
  const bits = log2(P);
  // Bit reversal over the power-of-two part.
  let rev = new Uint32Array(P);
  for (let i = 0; i < P; i++) {
    let r = 0;
    for (let b = 0, x = i; b < bits; b++, x >>= 1) r = (r << 1) | (x & 1);
    rev[i] = r;
  }
  // Each odd stage of radix p combines p transforms of length L, the m-th of the points m + p·j:
  // position m·L + i holds point m + p·(the length-L transform's own point at i).
  const odd = oddRadices(n);
  let L = P;
  for (const p of odd) {
    const next = new Uint32Array(p * L);
    for (let m = 0; m < p; m++) for (let i = 0; i < L; i++) next[m * L + i] = m + p * rev[i]!;
    rev = next;
    L *= p;
  }
  let inv = rev;
  if (odd.length) {
    inv = new Uint32Array(n);
    for (let i = 0; i < n; i++) inv[rev[i]!] = i;
  }
  let len = 0;
  if (P > 1) for (let L4 = firstL(P); L4 < P; L4 *= 4) len += 6 * L4;
  L = P;
  for (const p of odd) {
    len += 2 * (p - 1) * L;
    L *= p;
  }
  const tw = new Float64Array(len);
  let o = 0;
  if (P > 1) {
    for (let L4 = firstL(P); L4 < P; L4 *= 4) {
      for (let k = 0; k < L4; k++) {
        for (let m = 1; m <= 3; m++) {
          const a = (-2 * Math.PI * m * k) / (4 * L4);
          tw[o++] = Math.cos(a);
          tw[o++] = Math.sin(a);
        }
      }
    }
  }
  L = P;
  for (const p of odd) {
    for (let k = 0; k < L; k++) {
      for (let m = 1; m < p; m++) {
        const [c, si] = unitRoot(m * k, p * L);
        tw[o++] = c;
        tw[o++] = si;
      }
    }
    L *= p;
  }
  t = { rev, inv, tw };
  tables.set(n, t);
  return t;
}

/** Twiddles of the radix-4 stages of a length-n transform (f64 values): where the odd stages' start. */
function pow2TwiddleLength(n: number): number {
  const P = n & -n;
  let len = 0;
  if (P > 1) for (let L = firstL(P); L < P; L *= 4) len += 6 * L;
  return len;
}

// The radix-3 and radix-5 butterflies' constants: sin(π/3), cos(2π/5), cos(4π/5), sin(2π/5),
// sin(4π/5) (the WebAssembly kernel has the same values as literals).
const S3 = Math.sqrt(3) / 2;
const C51 = Math.cos((2 * Math.PI) / 5), C52 = Math.cos((4 * Math.PI) / 5);
const S51 = Math.sin((2 * Math.PI) / 5), S52 = Math.sin((4 * Math.PI) / 5);

// ---- the TypeScript kernel ----------------------------------------------------------------------

/**
 * W independent length-n transforms at once, in place on re/im from `off`, point-major (point p of
 * all W transforms is W contiguous values), input in the permuted order of tablesFor(n).rev.
 */
function jsLanes(re: Float64Array, im: Float64Array, off: number, n: number, W: number, tw: Float64Array): void {
  const end = off + n * W;
  const P = n & -n;
  let t0 = 0;
  if (P > 1) {
    jsPow2(re, im, off, end, P, W, tw);
    t0 = pow2TwiddleLength(n);
  }
  let L = P;
  for (const p of oddRadices(n)) {
    if (p === 3) jsRadix3(re, im, off, end, L, W, tw, t0);
    else jsRadix5(re, im, off, end, L, W, tw, t0);
    t0 += 2 * (p - 1) * L;
    L *= p;
  }
}

/** The radix-4 (and radix-2) stages: the length-P transforms held one after another in [off, end). */
function jsPow2(re: Float64Array, im: Float64Array, off: number, end: number, P: number, W: number, tw: Float64Array): void {
  if (log2(P) & 1) {
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
  for (let L = firstL(P); L < P; L *= 4) {
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

/**
 * One radix-3 stage: groups of three length-L transforms (at base, base + L·W, base + 2L·W) become
 * one of length 3L: y_q[k + qL] = Σ_m w^{mk} e^{-2πi mq/3} x_m[k], w = e^{-2πi/3L}.
 */
function jsRadix3(re: Float64Array, im: Float64Array, off: number, end: number, L: number, W: number, tw: Float64Array, t0: number): void {
  const q = L * W;
  for (let base = off; base < end; base += 3 * q) {
    for (let k = 0, t = t0; k < L; k++, t += 4) {
      const w1r = tw[t], w1i = tw[t + 1], w2r = tw[t + 2], w2i = tw[t + 3];
      const p = base + k * W;
      for (let i0 = p; i0 < p + W; i0++) {
        const i1 = i0 + q, i2 = i1 + q;
        const ar = re[i0], ai = im[i0];
        let xr = re[i1], xi = im[i1];
        const br = xr * w1r - xi * w1i, bi = xr * w1i + xi * w1r;
        xr = re[i2];
        xi = im[i2];
        const cr = xr * w2r - xi * w2i, ci = xr * w2i + xi * w2r;
        const sr = br + cr, si = bi + ci, dr = br - cr, di = bi - ci;
        const mr = ar - 0.5 * sr, mi = ai - 0.5 * si;
        re[i0] = ar + sr;
        im[i0] = ai + si;
        re[i1] = mr + S3 * di;
        im[i1] = mi - S3 * dr;
        re[i2] = mr - S3 * di;
        im[i2] = mi + S3 * dr;
      }
    }
  }
}

/** One radix-5 stage, as jsRadix3 with five length-L transforms. */
function jsRadix5(re: Float64Array, im: Float64Array, off: number, end: number, L: number, W: number, tw: Float64Array, t0: number): void {
  const q = L * W;
  for (let base = off; base < end; base += 5 * q) {
    for (let k = 0, t = t0; k < L; k++, t += 8) {
      const w1r = tw[t], w1i = tw[t + 1], w2r = tw[t + 2], w2i = tw[t + 3];
      const w3r = tw[t + 4], w3i = tw[t + 5], w4r = tw[t + 6], w4i = tw[t + 7];
      const p = base + k * W;
      for (let i0 = p; i0 < p + W; i0++) {
        const i1 = i0 + q, i2 = i1 + q, i3 = i2 + q, i4 = i3 + q;
        const ar = re[i0], ai = im[i0];
        let xr = re[i1], xi = im[i1];
        const b1r = xr * w1r - xi * w1i, b1i = xr * w1i + xi * w1r;
        xr = re[i2];
        xi = im[i2];
        const b2r = xr * w2r - xi * w2i, b2i = xr * w2i + xi * w2r;
        xr = re[i3];
        xi = im[i3];
        const b3r = xr * w3r - xi * w3i, b3i = xr * w3i + xi * w3r;
        xr = re[i4];
        xi = im[i4];
        const b4r = xr * w4r - xi * w4i, b4i = xr * w4i + xi * w4r;
        // sums and differences of the conjugate pairs (1, 4) and (2, 3)
        const s1r = b1r + b4r, s1i = b1i + b4i, d1r = b1r - b4r, d1i = b1i - b4i;
        const s2r = b2r + b3r, s2i = b2i + b3i, d2r = b2r - b3r, d2i = b2i - b3i;
        const a1r = ar + C51 * s1r + C52 * s2r, a1i = ai + C51 * s1i + C52 * s2i;
        const a2r = ar + C52 * s1r + C51 * s2r, a2i = ai + C52 * s1i + C51 * s2i;
        const u1r = S51 * d1r + S52 * d2r, u1i = S51 * d1i + S52 * d2i;
        const u2r = S52 * d1r - S51 * d2r, u2i = S52 * d1i - S51 * d2i;
        re[i0] = ar + s1r + s2r;
        im[i0] = ai + s1i + s2i;
        re[i1] = a1r + u1i;
        im[i1] = a1i - u1r;
        re[i4] = a1r - u1i;
        im[i4] = a1i + u1r;
        re[i2] = a2r + u2i;
        im[i2] = a2i - u2r;
        re[i3] = a2r - u2i;
        im[i3] = a2i + u2r;
      }
    }
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
  if (tx.inv !== rev) {
    // A permutation that is not its own inverse: gathered through a scratch row.
    const row = jsBuffers(k, nx);
    for (let r = 0; r < ny; r++) {
      const o = r * nx;
      for (let i = 0; i < nx; i++) {
        row.re[i] = R[o + rev[i]];
        row.im[i] = I[o + rev[i]];
      }
      jsLanes(row.re, row.im, 0, nx, 1, tx.tw);
      for (let i = 0; i < nx; i++) {
        R[o + i] = row.re[i] * sx;
        I[o + i] = row.im[i] * sx;
      }
    }
  }
  for (let r = 0; r < ny && tx.inv === rev; r++) {
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
  const B0 = Math.min(JS_BLOCK, nx);
  const s = jsBuffers(k, B0 * ny);
  const sr = s.re, si = s.im, rv = ty.inv;
  const sy = inverse ? 1 / ny : 1;
  for (let c0 = 0; c0 < nx; c0 += B0) {
    const B = Math.min(B0, nx - c0);
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
  const B0 = Math.min(JS_BLOCK, nx);
  const rv = ty.inv;
  const sy = inverse ? 1 / ny : 1;
  for (let c0 = 0; c0 < nx; c0 += B0) {
    const B = Math.min(B0, nx - c0);
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
  const rv = ty.inv;
  const width = c1 - c0;
  const B0 = Math.min(JS_BLOCK, width);
  const s = pieceBuffers(k, ny * width);
  const sr = inverse ? s.im : s.re, si = inverse ? s.re : s.im;
  const sy = inverse ? 1 / ny : 1;
  for (let b0 = 0; b0 < width; b0 += B0) {
    const B = Math.min(B0, width - b0);
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
  for (let b0 = 0; b0 < width; b0 += B0) {
    const B = Math.min(B0, width - b0);
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
  /** The native kernel when it loaded and passed its self-check (createFftKernel). */
  native: NativeFft | null;
  /** Why the native kernel is not there, or '' (for useFastFftBackend's error and for notes). */
  nativeProblem: string;
  /** Scratch of the native kernel's split planes and parts (fft2Split, transformRows/Columns with commit). */
  nativeScratch: Float64Array;
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
export function createFftKernel(
  bytes: Uint8Array | null, whyMissing = 'no WebAssembly kernel given', native: NativeLoad = { addon: null, why: 'no native kernel given' },
): FftKernel {
  const k: FftKernel = {
    backend: 'js',
    native: null,
    nativeProblem: native.why,
    nativeScratch: new Float64Array(0),
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
  if (native.addon) {
    const problem = nativeSelfCheck(native.addon);
    if (problem === null) {
      k.native = native.addon;
      k.nativeProblem = '';
      k.backend = 'native';
    } else k.nativeProblem = problem;
  }
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
  /** The input permutation (tablesFor(n).rev): both passes gather through it. */
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

/**
 * After the tables: `dataBytes` of data, then two scratch planes of `planeValues` f64 each (and a
 * little more: rowsSplit reads one point past an odd-length row).
 */
function wasmArea(k: FftKernel, w: WasmFft, tx: WasmTables, ty: WasmTables, dataBytes: number, planeValues: number) {
  const base = k.tableTop;
  const plane = align64(8 * planeValues + 64);
  const sre = align64(base + dataBytes);
  const sim = sre + plane;
  if (!reserve(k, w, sim + plane)) return null;
  return { tx, ty, base, sre, sim };
}

function wasmInterleaved(k: FftKernel, data: Float64Array, nx: number, ny: number, inverse: boolean): boolean {
  const w = k.wasm!;
  const R = ny >= 4 ? 4 : 2;
  const B = wasmBlock(nx);
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
  if (ny > 1) wasmColumns(w, base, 0, 16, nx, ny, stride, ty.rev, ty.tw, sre, sim, swap, inverse ? 1 / ny : 1);
  for (let r = 0; r < ny; r++) data.set(k.heap.subarray(at + r * step, at + r * step + rowLen), r * rowLen);
  return true;
}

function wasmSplit(k: FftKernel, re: Float64Array, im: Float64Array, nx: number, ny: number, inverse: boolean): boolean {
  const w = k.wasm!;
  const R = ny >= 4 ? 4 : 2;
  const B = wasmBlock(nx);
  // Padded for the columns, and for an odd row length: rowsSplit writes points in pairs, the last
  // one of an odd row into the padding.
  const stride = ny > 1 || nx % 2 ? 8 * nx + PAD : 8 * nx;
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
  if (ny > 1) wasmColumns(w, pr, pi, 8, nx, ny, stride, ty.rev, ty.tw, sre, sim, swap, inverse ? 1 / ny : 1);
  for (let r = 0; r < ny; r++) {
    re.set(k.heap.subarray(ar + r * step, ar + r * step + nx), r * nx);
    im.set(k.heap.subarray(ai + r * step, ai + r * step + nx), r * nx);
  }
  return true;
}

/**
 * A column pass over `width` columns at byte `a` (and `b`, the imaginary plane of a split layout;
 * `colBytes` per column and plane): blocks of WASM_BLOCK, then the rest as one block made even. An
 * odd width needs one column of padding after each row (the block's extra lane reads and writes it).
 */
function wasmColumns(
  w: WasmFft, a: number, b: number, colBytes: number, width: number, ny: number, stride: number,
  rev: number, tw: number, sre: number, sim: number, swap: number, scale: number,
): void {
  const pass = (at: number, cols: number, B: number) => {
    if (colBytes === 16) w.colsInterleaved(a + at, cols, ny, stride, B, rev, tw, sre, sim, swap, scale);
    else w.colsSplit(a + at, b + at, cols, ny, stride, B, rev, tw, sre, sim, swap, scale);
  };
  const main = width >= WASM_BLOCK ? width - (width % WASM_BLOCK) : 0;
  if (main > 0) pass(0, main, WASM_BLOCK);
  const rest = width - main;
  if (rest > 0) pass(colBytes * main, rest + (rest & 1), rest + (rest & 1));
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
  const B = wasmBlock(width);
  // One block of B columns is read row after row, contiguously; wider parts get the padded rows,
  // and so do odd widths (the last block reaches one column into the padding).
  const stride = width > B || width % 2 ? 16 * width + PAD : 16 * width;
  const ty = wasmTablesFor(k, w, ny);
  if (!ty) return null;
  const L = wasmArea(k, w, ty, ty, stride * ny, ny * B);
  if (!L) return null;
  const at = L.base / 8, step = stride / 8, len = 2 * width;
  for (let r = 0; r < ny; r++) copyValues(src, 2 * (r * nx + c0), k.heap, at + r * step, len);
  wasmColumns(w, L.base, 0, 16, width, ny, stride, ty.rev, ty.tw, L.sre, L.sim, inverse ? 1 : 0, inverse ? 1 / ny : 1);
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
  /** The column pass's permutation, as it gathers (tablesFor(ny).rev). */
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
  const plane = align64(8 * Math.max(nx * 4, ny * wasmBlock(nx)) + 64);
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
  if (c0 % 2 !== 0 || (c1 % 2 !== 0 && c1 !== L.nx)) throw new Error(`sharedColumns: columns ${c0}..${c1} must start and end on even indices (or end at ${L.nx})`);
  wasmColumns(sh.w, L.data + 16 * c0, 0, 16, width, L.ny, L.stride, L.revY, L.twY, sre, sim, inverse ? 1 : 0, inverse ? 1 / L.ny : 1);
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

// ---- the native kernel -------------------------------------------------------------------------

/** The native module's functions (native/fft.c); every transform is in place on the caller's array. */
export interface NativeFft {
  /** fft2Interleaved's transform; `threads` share it. */
  fft2(data: Float64Array, nx: number, ny: number, inverse: boolean, threads: number): void;
  /** The row pass alone over the ny rows of nx points that `data` holds. */
  rows(data: Float64Array, nx: number, ny: number, inverse: boolean, threads: number): void;
  /** The column pass alone over columns [c0, c1) of an ny×nx array. */
  columns(data: Float64Array, nx: number, ny: number, c0: number, c1: number, inverse: boolean, threads: number): void;
  /** The code path this processor runs: 'avx2-fma' or 'generic'. */
  isa(): string;
}

/** What src/kernels.ts found: the loaded module, or null and why not. */
export interface NativeLoad {
  addon: NativeFft | null;
  why: string;
}

/**
 * Null when `addon` transforms small grids as the TypeScript kernel does (to 1e-12 of the largest
 * value; the sizes cover radix 2, 4, 3 and 5 stages, partial blocks, 1-D, both directions, one
 * and two threads), else what went wrong: a module built wrong or for another processor is then
 * not used, and the reason is kept.
 */
function nativeSelfCheck(addon: NativeFft): string | null {
  const ref = createFftKernel(null, 'self-check');
  let seed = 7;
  const shapes: [number, number, number][] = [[16, 8, 1], [12, 10, 2], [30, 1, 1], [8, 27, 2]];
  try {
    for (const [nx, ny, threads] of shapes) {
      for (const inverse of [false, true]) {
        const x = new Float64Array(2 * nx * ny);
        for (let i = 0; i < x.length; i++) {
          seed = (Math.imul(seed, 1103515245) + 12345) >>> 0;
          x[i] = seed / 2 ** 32 - 0.5;
        }
        const want = x.slice();
        fft2Interleaved(ref, want, nx, ny, inverse);
        addon.fft2(x, nx, ny, inverse, threads);
        let d = 0, m = 0;
        for (let i = 0; i < x.length; i++) {
          d = Math.max(d, Math.abs(x[i]! - want[i]!));
          m = Math.max(m, Math.abs(want[i]!));
        }
        if (!(d <= 1e-12 * m)) return `native FFT failed its self-check (${nx}×${ny}, ${inverse ? 'inverse' : 'forward'}: off by ${(d / m).toExponential(1)} of the largest value)`;
      }
    }
  } catch (e) {
    return `native FFT failed its self-check: ${(e as Error).message}`;
  }
  return null;
}

/** `values` numbers of the kernel's native scratch, grown to the largest asked for and kept. */
function nativeScratch(k: FftKernel, values: number): Float64Array {
  if (k.nativeScratch.length < values) k.nativeScratch = new Float64Array(values);
  return k.nativeScratch.subarray(0, values);
}

/** fft2Split through the native kernel: the planes interleaved into scratch, transformed, split again. */
function nativeSplit(k: FftKernel, re: Float64Array, im: Float64Array, nx: number, ny: number, inverse: boolean): void {
  const n = nx * ny;
  const data = nativeScratch(k, 2 * n);
  for (let i = 0; i < n; i++) {
    data[2 * i] = re[i]!;
    data[2 * i + 1] = im[i]!;
  }
  k.native!.fft2(data, nx, ny, inverse, 1);
  for (let i = 0; i < n; i++) {
    re[i] = data[2 * i]!;
    im[i] = data[2 * i + 1]!;
  }
}

function nativeRows(
  k: FftKernel,
  src: Float64Array, dst: Float64Array, nx: number, r0: number, r1: number, inverse: boolean, commit?: () => boolean,
): boolean {
  const part = src.subarray(2 * r0 * nx, 2 * r1 * nx);
  if (commit) {
    // Transformed in this thread's scratch first: nothing is written unless the part is still ours.
    const s = nativeScratch(k, part.length);
    s.set(part);
    k.native!.rows(s, nx, r1 - r0, inverse, 1);
    if (!commit()) return false;
    dst.set(s, 2 * r0 * nx);
    return true;
  }
  if (dst !== src) dst.set(part, 2 * r0 * nx);
  k.native!.rows(dst.subarray(2 * r0 * nx, 2 * r1 * nx), nx, r1 - r0, inverse, 1);
  return true;
}

function nativeCols(
  k: FftKernel,
  src: Float64Array, dst: Float64Array, nx: number, ny: number, c0: number, c1: number, inverse: boolean,
  commit?: () => boolean,
): boolean {
  if (!commit) {
    if (dst !== src) for (let r = 0; r < ny; r++) copyValues(src, 2 * (r * nx + c0), dst, 2 * (r * nx + c0), 2 * (c1 - c0));
    k.native!.columns(dst, nx, ny, c0, c1, inverse, 1);
    return true;
  }
  // The part's columns gathered into scratch (a width×ny array), transformed there, then committed.
  const width = c1 - c0, len = 2 * width;
  const s = nativeScratch(k, len * ny);
  for (let r = 0; r < ny; r++) copyValues(src, 2 * (r * nx + c0), s, r * len, len);
  k.native!.columns(s, width, ny, 0, width, inverse, 1);
  if (!commit()) return false;
  for (let r = 0; r < ny; r++) copyValues(s, r * len, dst, 2 * (r * nx + c0), len);
  return true;
}
