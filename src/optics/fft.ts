// Complex FFTs on interleaved Float64Arrays. fft2 runs the fast kernels of fft-fast.ts (WebAssembly
// SIMD once installed, else TypeScript); fft2Reference is the straightforward row-then-column use
// of fft.js that they are tested against (to 1e-12; in practice they agree bit for bit). Plans
// (twiddle tables) are made once per size and kept, because sweeps transform many fields alike.
import FFT from 'fft.js';
import { fft2Interleaved } from './fft-fast.js';

const plans = new Map<number, FFT>();
const scratch = new Map<number, { a: Float64Array; b: Float64Array }>();

function plan(n: number): FFT {
  let p = plans.get(n);
  if (!p) {
    p = new FFT(n);
    plans.set(n, p);
  }
  return p;
}

function buffers(n: number) {
  let s = scratch.get(n);
  if (!s) {
    s = { a: new Float64Array(2 * n), b: new Float64Array(2 * n) };
    scratch.set(n, s);
  }
  return s;
}

export function isPowerOfTwo(n: number): boolean {
  return Number.isInteger(n) && n >= 2 && (n & (n - 1)) === 0;
}

export function nextPowerOfTwo(n: number): number {
  let p = 2;
  while (p < n) p *= 2;
  return p;
}

/**
 * Something that can do an fft2 call another way (threads sharing one transform, installed by
 * src/parallel): it answers false to decline, and fft2 then runs in this thread. Its result must be
 * the one fft2Interleaved gives. Kept here as a plain function so that optics knows no threads.
 */
export type Fft2Executor = (data: Float64Array, nx: number, ny: number, inverse: boolean) => boolean;

let executor: Fft2Executor | null = null;

/** Route fft2 through `fn` (null: back to this thread only). */
export function installFft2Executor(fn: Fft2Executor | null): void {
  executor = fn;
}

/**
 * In-place 2-D FFT of an ny×nx interleaved complex array (ny = 1 gives a 1-D transform).
 * Forward: X[k] = Σ x[j] e^{-2πi jk/n}; inverse includes the 1/n factor per axis.
 */
export function fft2(data: Float64Array, nx: number, ny: number, inverse: boolean): void {
  if (executor !== null && ny > 1 && executor(data, nx, ny, inverse)) return;
  fft2Interleaved(data, nx, ny, inverse);
}

/** The same transform by fft.js, row by row then column by column: the reference for the fast kernels. */
export function fft2Reference(data: Float64Array, nx: number, ny: number, inverse: boolean): void {
  if (!isPowerOfTwo(nx) || (ny !== 1 && !isPowerOfTwo(ny))) {
    throw new Error(`FFT sizes must be powers of two, got ${nx}×${ny}`);
  }
  const px = plan(nx);
  const bx = buffers(nx);
  for (let r = 0; r < ny; r++) {
    const row = data.subarray(2 * r * nx, 2 * (r + 1) * nx);
    if (inverse) px.inverseTransform(bx.b, row);
    else px.transform(bx.b, row);
    row.set(bx.b);
  }
  if (ny === 1) return;
  const py = plan(ny);
  const by = buffers(ny);
  const col = by.a;
  for (let c = 0; c < nx; c++) {
    for (let r = 0; r < ny; r++) {
      const i = 2 * (r * nx + c);
      col[2 * r] = data[i]!;
      col[2 * r + 1] = data[i + 1]!;
    }
    if (inverse) py.inverseTransform(by.b, col);
    else py.transform(by.b, col);
    const out = by.b;
    for (let r = 0; r < ny; r++) {
      const i = 2 * (r * nx + c);
      data[i] = out[2 * r]!;
      data[i + 1] = out[2 * r + 1]!;
    }
  }
}

/** Spatial frequency of FFT bin k on an n-point grid of pitch d (bins past n/2 are negative). */
export function binFrequency(k: number, n: number, d: number): number {
  return (k < n / 2 ? k : k - n) / (n * d);
}
