// FFT helpers, and fft2Reference: the straightforward row-then-column use of fft.js that the fast
// kernels (fft-fast.ts, run through an Engine, engine.ts) are tested against (to 1e-12; in
// practice they agree bit for bit). Plans (twiddle tables) are made once per size and kept, because
// sweeps transform many fields alike: the maps below are memos of pure functions (and fft.js's
// scratch rows), not state that changes a result.
import FFT from 'fft.js';

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
 * Sizes the fast kernels (fft-fast.ts) transform: n ≥ 2 with no prime factor but 2, 3 and 5
 * ("5-smooth"). Powers of two run as radix-4 (and one radix-2) stages, the factors 3 and 5 as
 * radix-3 and radix-5 stages after them.
 */
export function isFastFftSize(n: number): boolean {
  if (!Number.isInteger(n) || n < 2) return false;
  let m = n;
  for (const p of [2, 3, 5]) while (m % p === 0) m /= p;
  return m === 1;
}

/**
 * The smallest size the fast kernels transform that is at least m (the next 5-smooth number, the
 * "next fast length" general FFT libraries offer): between two powers of two there are several
 * (1080 = 2³·3³·5, 1125 = 3²·5³, 1152, 1200, …), so a grid need not double to get room.
 */
export function nextFastFftSize(m: number): number {
  const target = Math.max(2, Math.ceil(m));
  if (!Number.isFinite(target)) return target;
  // Every 3^b·5^c up to the target, each times the least power of two that reaches it: O(log² m)
  // products, so that sizes no array holds (which the planner refuses by their count) come promptly.
  let best = Infinity;
  for (let f5 = 1; f5 < 2 * target; f5 *= 5) {
    for (let f35 = f5; f35 < 2 * target; f35 *= 3) {
      let n = f35;
      while (n < target) n *= 2;
      if (n < best) best = n;
    }
  }
  return best;
}

/**
 * The smallest even size the fast kernels transform that is at least m: for an algorithm that
 * swaps the halves of each axis (the single-FFT form puts x = 0 on index n/2 and back).
 */
export function nextEvenFastFftSize(m: number): number {
  return 2 * nextFastFftSize(Math.ceil(m / 2));
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
