// The fast FFT (src/optics/fft-fast.ts) at sizes that are not powers of two (2^a·3^b·5^c), both
// kernels, whole transforms and the parts that threads share, against the DFT definition
// X[k] = Σ_j x[j] e^{∓2πi jk/n} summed directly (test/reference/dft.ts), and the
// size rules of src/optics/fft.ts against a brute-force factorisation. Powers of two are checked
// against fft.js in fft-fast.test.ts.
import { beforeAll, describe, expect, it } from 'vitest';
import { isFastFftSize, nextEvenFastFftSize, nextFastFftSize } from '../../src/optics/fft.js';
import { directDft } from '../reference/dft.js';
import { createKernel } from '../../src/kernels.js';
import {
  fft2Interleaved,
  fft2Split,
  transformColumns,
  transformRows,
  useFastFftBackend,
} from '../../src/optics/fft-fast.js';
import { fastBackends } from './native-fft.js';

const TOL = 1e-12;

function randomComplex(n: number, seed: number): Float64Array {
  const out = new Float64Array(2 * n);
  let s = seed >>> 0;
  for (let i = 0; i < out.length; i++) {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    out[i] = s / 2 ** 32 - 0.5;
  }
  return out;
}

/** max |got − ref| / max |ref| */
function relErr(ref: Float64Array, got: Float64Array): number {
  expect(got.length).toBe(ref.length);
  let d = 0, m = 0;
  for (let i = 0; i < ref.length; i++) {
    d = Math.max(d, Math.abs(got[i]! - ref[i]!));
    m = Math.max(m, Math.abs(ref[i]!));
  }
  expect(m).toBeGreaterThan(0);
  return d / m;
}

function split(d: Float64Array): [Float64Array, Float64Array] {
  const re = new Float64Array(d.length / 2), im = new Float64Array(d.length / 2);
  for (let i = 0; i < re.length; i++) {
    re[i] = d[2 * i]!;
    im[i] = d[2 * i + 1]!;
  }
  return [re, im];
}

function join(re: Float64Array, im: Float64Array): Float64Array {
  const d = new Float64Array(2 * re.length);
  for (let i = 0; i < re.length; i++) {
    d[2 * i] = re[i]!;
    d[2 * i + 1] = im[i]!;
  }
  return d;
}

const kernel = createKernel();

function viaInterleaved(x: Float64Array, nx: number, ny: number, inverse: boolean): Float64Array {
  const y = x.slice();
  fft2Interleaved(kernel, y, nx, ny, inverse);
  return y;
}

function viaSplit(x: Float64Array, nx: number, ny: number, inverse: boolean): Float64Array {
  const [re, im] = split(x);
  fft2Split(kernel, re, im, nx, ny, inverse);
  return join(re, im);
}

/** Rows in parts of `rowsPer`, then columns in parts of `colsPer`, as the FFT team cuts them. */
function viaParts(x: Float64Array, nx: number, ny: number, inverse: boolean, rowsPer: number, colsPer: number): Float64Array {
  const mid = new Float64Array(x.length), out = new Float64Array(x.length);
  for (let r = 0; r < ny; r += rowsPer) expect(transformRows(kernel, x, mid, nx, ny, r, Math.min(ny, r + rowsPer), inverse)).toBe(true);
  if (ny === 1) return mid;
  for (let c = 0; c < nx; c += colsPer) expect(transformColumns(kernel, mid, out, nx, ny, c, Math.min(nx, c + colsPer), inverse)).toBe(true);
  return out;
}

/** The largest prime factor of n ≥ 2, by trial division. */
function largestPrimeFactor(n: number): number {
  let m = n, largest = 1;
  for (let d = 2; d * d <= m; d++) {
    while (m % d === 0) {
      largest = d;
      m /= d;
    }
  }
  return Math.max(largest, m);
}

describe('size rules', () => {
  it('isFastFftSize holds exactly for n ≥ 2 with no prime factor above 5 (checked by trial division to 5000)', () => {
    for (let n = 1; n <= 5000; n++) {
      const smooth = n >= 2 && largestPrimeFactor(n) <= 5;
      expect(isFastFftSize(n), `n = ${n}`).toBe(smooth);
    }
  });

  it('nextFastFftSize gives the smallest 5-smooth n ≥ m (the 5-smooth, "regular", numbers, OEIS A051037, from memory: 1080, 1125, 1152, 1200, …)', () => {
    expect([1, 2, 7, 11, 13, 17, 1025, 1081, 1126, 1153, 2049].map(nextFastFftSize)).toEqual([2, 2, 8, 12, 15, 18, 1080, 1125, 1152, 1200, 2160]);
    for (let m = 1; m <= 1200; m++) {
      const n = nextFastFftSize(m);
      expect(isFastFftSize(n) && n >= m, `m = ${m}`).toBe(true);
      for (let j = Math.max(2, m); j < n; j++) expect(isFastFftSize(j), `${j} between ${m} and ${n}`).toBe(false);
      const e = nextEvenFastFftSize(m);
      expect(isFastFftSize(e) && e % 2 === 0 && e >= m, `even, m = ${m}`).toBe(true);
      for (let j = Math.max(4, m); j < e; j += 1) if (j % 2 === 0) expect(isFastFftSize(j), `even ${j} between ${m} and ${e}`).toBe(false);
    }
  });

  it('nextFastFftSize answers promptly for sizes no array holds (the planner then refuses them by their count)', () => {
    // 2^60 itself is 5-smooth; above 2^53 the doubles are all even, so this is just "no hang".
    expect(nextFastFftSize(2 ** 60)).toBe(2 ** 60);
    expect(nextFastFftSize(1e22)).toBeGreaterThanOrEqual(1e22);
    expect(nextFastFftSize(1e22)).toBeLessThan(1.1e22);
  });
});

const oneD = [3, 5, 6, 9, 10, 12, 15, 25, 27, 45, 48, 100, 360, 1000, 1080, 1125];
const twoD: [number, number][] = [
  [3, 5], [5, 3], [6, 6], [15, 12], [45, 100], [100, 45], [1080, 15], [6, 1125], [64, 45], [45, 64], [125, 27], [24, 2],
];

describe.each(fastBackends)('%s kernel, sizes 2^a·3^b·5^c', (backend) => {
  beforeAll(() => {
    useFastFftBackend(kernel, backend);
  });

  for (const inverse of [false, true]) {
    const dir = inverse ? 'inverse' : 'forward';
    it(`1-D equals the direct DFT to 1e-12 relative, n = 3 … 1125, ${dir}`, () => {
      for (const n of oneD) {
        const x = randomComplex(n, 3 * n + (inverse ? 1 : 0));
        const ref = directDft(x, n, 1, inverse);
        expect(relErr(ref, viaInterleaved(x, n, 1, inverse)), `interleaved n=${n}`).toBeLessThan(TOL);
        expect(relErr(ref, viaSplit(x, n, 1, inverse)), `split n=${n}`).toBeLessThan(TOL);
        expect(relErr(ref, viaParts(x, n, 1, inverse, 1, 2)), `parts n=${n}`).toBeLessThan(TOL);
      }
    });

    it(`2-D equals the direct DFT to 1e-12 relative, odd and even sizes, ${dir}`, () => {
      for (const [nx, ny] of twoD) {
        const x = randomComplex(nx * ny, 17 * nx + ny + (inverse ? 5 : 0));
        const ref = directDft(x, nx, ny, inverse);
        const whole = viaInterleaved(x, nx, ny, inverse);
        expect(relErr(ref, whole), `interleaved ${nx}×${ny}`).toBeLessThan(TOL);
        expect(relErr(ref, viaSplit(x, nx, ny, inverse)), `split ${nx}×${ny}`).toBeLessThan(TOL);
        // Parts as a team cuts them (even column bounds, the last part ending at an odd nx): the
        // same kernel in pieces gives the whole transform's values exactly.
        for (const [rowsPer, colsPer] of [[1, 2], [4, 16], [7, 32]] as const) {
          expect(viaParts(x, nx, ny, inverse, rowsPer, colsPer), `parts ${rowsPer}/${colsPer} of ${nx}×${ny}`).toEqual(whole);
        }
      }
    });
  }

  it('a unit impulse at (x0, y0) on a 45×12 grid transforms to the plane wave e^{-2πi(kx·x0/nx + ky·y0/ny)}', () => {
    const nx = 45, ny = 12, x0 = 7, y0 = 5;
    const x = new Float64Array(2 * nx * ny);
    x[2 * (y0 * nx + x0)] = 1;
    const got = viaInterleaved(x, nx, ny, false);
    let worst = 0;
    for (let ky = 0; ky < ny; ky++) {
      for (let kx = 0; kx < nx; kx++) {
        const a = -2 * Math.PI * (((kx * x0) % nx) / nx + ((ky * y0) % ny) / ny);
        const i = 2 * (ky * nx + kx);
        worst = Math.max(worst, Math.abs(got[i]! - Math.cos(a)), Math.abs(got[i + 1]! - Math.sin(a)));
      }
    }
    expect(worst).toBeLessThan(1e-14);
  });

  it('forward then inverse gives the input back to 1e-12 relative (1080², 1125×360)', () => {
    for (const [nx, ny] of [[1080, 1080], [1125, 360]] as const) {
      const x = randomComplex(nx * ny, nx + ny);
      const a = x.slice();
      fft2Interleaved(kernel, a, nx, ny, false);
      fft2Interleaved(kernel, a, nx, ny, true);
      expect(relErr(x, a), `${nx}×${ny}`).toBeLessThan(TOL);
    }
  });
});

it('the two kernels agree to 1e-15 relative on a 1080×360 grid', () => {
  const x = randomComplex(1080 * 360, 99);
  useFastFftBackend(kernel, 'js');
  const js = viaSplit(x, 1080, 360, false);
  useFastFftBackend(kernel, 'wasm-simd');
  const wasm = viaSplit(x, 1080, 360, false);
  expect(relErr(js, wasm)).toBeLessThan(1e-15);
});
