// The fast 2-D FFT (src/optics/fft-fast.ts), each of its kernels (the native one where it is built), against two references from
// outside it: fft.js (through fft2Reference of src/optics/fft.ts, the row-then-column use of fft.js) on
// random data, and the DFT definition summed directly on small sizes.
import { beforeAll, describe, expect, it } from 'vitest';
import { fft2Reference as fft2 } from '../../src/optics/fft.js';
import { createKernel } from '../../src/kernels.js';
import {
  fastFftBackend,
  fft2Interleaved,
  fft2Split,
  useFastFftBackend,
  type FastFftBackend,
} from '../../src/optics/fft-fast.js';
import { defaultBackend, fastBackends } from './native-fft.js';

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

function split(d: Float64Array): [Float64Array, Float64Array] {
  const re = new Float64Array(d.length / 2);
  const im = new Float64Array(d.length / 2);
  for (let i = 0; i < re.length; i++) {
    re[i] = d[2 * i];
    im[i] = d[2 * i + 1];
  }
  return [re, im];
}

function join(re: Float64Array, im: Float64Array): Float64Array {
  const d = new Float64Array(2 * re.length);
  for (let i = 0; i < re.length; i++) {
    d[2 * i] = re[i];
    d[2 * i + 1] = im[i];
  }
  return d;
}

/** max |got − ref| / max |ref| */
function relErr(ref: Float64Array, got: Float64Array): number {
  expect(got.length).toBe(ref.length);
  let d = 0;
  let m = 0;
  for (let i = 0; i < ref.length; i++) {
    d = Math.max(d, Math.abs(got[i] - ref[i]));
    m = Math.max(m, Math.abs(ref[i]));
  }
  expect(m).toBeGreaterThan(0);
  return d / m;
}

function viaFftJs(x: Float64Array, nx: number, ny: number, inverse: boolean): Float64Array {
  const y = x.slice();
  fft2(y, nx, ny, inverse);
  return y;
}

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

/** The DFT definition, summed directly: X[ky,kx] = Σ x[y,x] e^{∓2πi(kx·x/nx + ky·y/ny)} (÷ nx·ny inverse). */
function directDft(x: Float64Array, nx: number, ny: number, inverse: boolean): Float64Array {
  const out = new Float64Array(x.length);
  const sign = inverse ? 1 : -1;
  const scale = inverse ? 1 / (nx * ny) : 1;
  for (let ky = 0; ky < ny; ky++) {
    for (let kx = 0; kx < nx; kx++) {
      let sr = 0;
      let si = 0;
      for (let y = 0; y < ny; y++) {
        for (let xx = 0; xx < nx; xx++) {
          // reduce the phase exactly in integers before taking cos/sin
          const turns = ((kx * xx) % nx) / nx + ((ky * y) % ny) / ny;
          const a = sign * 2 * Math.PI * turns;
          const c = Math.cos(a);
          const s = Math.sin(a);
          const i = 2 * (y * nx + xx);
          sr += x[i] * c - x[i + 1] * s;
          si += x[i] * s + x[i + 1] * c;
        }
      }
      out[2 * (ky * nx + kx)] = sr * scale;
      out[2 * (ky * nx + kx) + 1] = si * scale;
    }
  }
  return out;
}

const oneD = Array.from({ length: 12 }, (_, i) => 2 ** (i + 1)); // 2 … 4096
const twoD: [number, number][] = [
  [2, 2], [2, 4], [4, 2], [8, 8], [16, 4], [4, 16], [32, 64], [64, 32], [128, 128],
  [256, 8], [8, 256], [512, 64], [64, 512], [1024, 16], [2, 1024], [1024, 2], [256, 256],
];

// This file's kernel: each describe below chooses its backend (the WebAssembly or TypeScript kernel).
const kernel = createKernel();

it(`loads the ${defaultBackend} kernel (npm run build makes it)`, () => {
  expect(fastFftBackend(kernel)).toBe(defaultBackend);
});

describe.each(fastBackends as FastFftBackend[])('%s kernel', (backend) => {
  beforeAll(() => {
    useFastFftBackend(kernel, backend);
  });

  describe('equals fft.js to 1e-12 relative', () => {
    for (const inverse of [false, true]) {
      const dir = inverse ? 'inverse' : 'forward';
      it(`1-D (ny = 1), n = 2 … 4096, ${dir}`, () => {
        for (const n of oneD) {
          const x = randomComplex(n, n + (inverse ? 7 : 0));
          const ref = viaFftJs(x, n, 1, inverse);
          expect(relErr(ref, viaInterleaved(x, n, 1, inverse)), `interleaved n=${n}`).toBeLessThan(TOL);
          expect(relErr(ref, viaSplit(x, n, 1, inverse)), `split n=${n}`).toBeLessThan(TOL);
        }
      });
      it(`2-D, square and not (nx ≠ ny), ${dir}`, () => {
        for (const [nx, ny] of twoD) {
          const x = randomComplex(nx * ny, 31 * nx + ny);
          const ref = viaFftJs(x, nx, ny, inverse);
          expect(relErr(ref, viaInterleaved(x, nx, ny, inverse)), `interleaved ${nx}×${ny}`).toBeLessThan(TOL);
          expect(relErr(ref, viaSplit(x, nx, ny, inverse)), `split ${nx}×${ny}`).toBeLessThan(TOL);
        }
      });
    }

    it('a large transform, then a small one, then a new size (memory and tables kept across calls)', () => {
      for (const [nx, ny] of [[1024, 512], [4, 4], [2048, 32], [8, 2], [1024, 512], [16, 2048]] as const) {
        const x = randomComplex(nx * ny, nx ^ ny);
        const ref = viaFftJs(x, nx, ny, false);
        expect(relErr(ref, viaInterleaved(x, nx, ny, false)), `interleaved ${nx}×${ny}`).toBeLessThan(TOL);
        expect(relErr(ref, viaSplit(x, nx, ny, false)), `split ${nx}×${ny}`).toBeLessThan(TOL);
      }
    });
  });

  it('forward then inverse gives the input back to 1e-12 relative', () => {
    for (const [nx, ny] of [[4096, 1], [2, 2], [64, 64], [256, 128], [16, 512]] as const) {
      const x = randomComplex(nx * ny, 5 * nx + ny);
      const a = x.slice();
      fft2Interleaved(kernel, a, nx, ny, false);
      fft2Interleaved(kernel, a, nx, ny, true);
      expect(relErr(x, a), `interleaved ${nx}×${ny}`).toBeLessThan(TOL);
      const [re, im] = split(x);
      fft2Split(kernel, re, im, nx, ny, false);
      fft2Split(kernel, re, im, nx, ny, true);
      expect(relErr(x, join(re, im)), `split ${nx}×${ny}`).toBeLessThan(TOL);
    }
  });

  it('equals the DFT definition summed directly (n ≤ 64) to 1e-12 relative', () => {
    const shapes: [number, number][] = [
      ...[2, 4, 8, 16, 32, 64].map((n): [number, number] => [n, 1]),
      [2, 2], [8, 4], [4, 16], [16, 16], [32, 2], [2, 32], [64, 8],
    ];
    for (const [nx, ny] of shapes) {
      for (const inverse of [false, true]) {
        const x = randomComplex(nx * ny, 11 * nx + ny + (inverse ? 1 : 0));
        const ref = directDft(x, nx, ny, inverse);
        expect(relErr(ref, viaInterleaved(x, nx, ny, inverse)), `interleaved ${nx}×${ny} ${inverse}`).toBeLessThan(TOL);
        expect(relErr(ref, viaSplit(x, nx, ny, inverse)), `split ${nx}×${ny} ${inverse}`).toBeLessThan(TOL);
      }
    }
  });

  it('a unit impulse at (x0, y0) transforms to the plane wave e^{-2πi(kx·x0/nx + ky·y0/ny)}', () => {
    const nx = 32, ny = 8, x0 = 5, y0 = 3;
    const x = new Float64Array(2 * nx * ny);
    x[2 * (y0 * nx + x0)] = 1;
    const got = viaInterleaved(x, nx, ny, false);
    let worst = 0;
    for (let ky = 0; ky < ny; ky++) {
      for (let kx = 0; kx < nx; kx++) {
        const a = -2 * Math.PI * (((kx * x0) % nx) / nx + ((ky * y0) % ny) / ny);
        const i = 2 * (ky * nx + kx);
        worst = Math.max(worst, Math.abs(got[i] - Math.cos(a)), Math.abs(got[i + 1] - Math.sin(a)));
      }
    }
    expect(worst).toBeLessThan(1e-14);
  });

  it('refuses sizes with a prime factor above 5 and arrays of the wrong length', () => {
    expect(() => fft2Interleaved(kernel, new Float64Array(2 * 14), 14, 1, false)).toThrow(/no prime factor but 2, 3 and 5/);
    expect(() => fft2Interleaved(kernel, new Float64Array(2 * 8 * 7), 8, 7, false)).toThrow(/no prime factor but 2, 3 and 5/);
    expect(() => fft2Interleaved(kernel, new Float64Array(2), 1, 1, false)).toThrow(/no prime factor but 2, 3 and 5/);
    expect(() => fft2Interleaved(kernel, new Float64Array(2 * 8 * 4 - 2), 8, 4, false)).toThrow(/values for a 8×4/);
    expect(() => fft2Split(kernel, new Float64Array(32), new Float64Array(31), 8, 4, false)).toThrow(/planes/);
  });
});
