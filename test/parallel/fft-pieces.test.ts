// The parts of a 2-D transform (transformRows, transformColumns) that threads share: all rows, then
// all columns, in any split and in either order of the parts, equal fft2Interleaved bit for bit
// (same kernel, same arithmetic: common practice for a parallel split of a deterministic kernel,
// which is why exact equality, not a tolerance, is asked for). fft2Interleaved itself is checked
// against fft.js and the DFT definition in test/optics/fft-fast.test.ts.
import { beforeAll, describe, expect, it } from 'vitest';
import { createKernel } from '../../src/kernels.js';
import {
  attachSharedFftMemory,
  createSharedFftMemory,
  fft2Interleaved,
  sharedColumns,
  sharedLayout,
  sharedRowsIn,
  sharedRowsOut,
  transformColumns,
  transformRows,
  useFastFftBackend,
  type FastFftBackend,
} from '../../src/optics/fft-fast.js';
import { randomComplex, sameBits } from './fft-data.js';
import { fastBackends } from '../optics/native-fft.js';

const shapes: [number, number][] = [[64, 128], [256, 256], [512, 256], [2, 2], [4, 8], [32, 4], [1024, 16], [16, 1024]];

/** Splits 0..n into pieces of the given sizes (cycled), each an even number unless it ends at n. */
function cuts(n: number, sizes: number[]): [number, number][] {
  const out: [number, number][] = [];
  for (let a = 0, i = 0; a < n; i++) {
    const b = Math.min(n, a + sizes[i % sizes.length]!);
    out.push([a, b]);
    a = b;
  }
  return out;
}

// This file's kernel; each describe chooses its backend.
const kernel = createKernel();

describe.each(fastBackends as FastFftBackend[])('%s kernel', (backend) => {
  beforeAll(() => {
    // ('wasm-simd' throws, with the reason, when the WebAssembly kernel was not built)
    useFastFftBackend(kernel, backend);
  });

  for (const inverse of [false, true]) {
    it(`rows then columns in uneven parts, through a second array, equal fft2Interleaved bit for bit (${inverse ? 'inverse' : 'forward'})`, () => {
      for (const [nx, ny] of shapes) {
        const x = randomComplex(nx * ny, 7 * nx + ny + (inverse ? 1 : 0));
        const whole = x.slice();
        fft2Interleaved(kernel, whole, nx, ny, inverse);
        const tmp = new Float64Array(x.length);
        const src = x.slice();
        // rows out of order, sizes 1, 3, 5, … so that the kernel's groups of rows are cut everywhere
        for (const [a, b] of cuts(ny, [3, 1, 5, 2]).reverse()) expect(transformRows(kernel, src, tmp, nx, ny, a, b, inverse)).toBe(true);
        for (const [a, b] of cuts(nx, [2, 6, 16, 4])) expect(transformColumns(kernel, tmp, src, nx, ny, a, b, inverse)).toBe(true);
        expect(sameBits(src, whole), `${nx}×${ny}`).toBe(true);
      }
    });
  }

  it('in place (dst = src) gives the same bits too', () => {
    const [nx, ny] = [128, 64];
    const x = randomComplex(nx * ny, 99);
    const whole = x.slice();
    fft2Interleaved(kernel, whole, nx, ny, false);
    for (const [a, b] of cuts(ny, [10])) transformRows(kernel, x, x, nx, ny, a, b, false);
    for (const [a, b] of cuts(nx, [32])) transformColumns(kernel, x, x, nx, ny, a, b, false);
    expect(sameBits(x, whole)).toBe(true);
  });

  it('writes nothing when the part is not committed, and says so', () => {
    const [nx, ny] = [64, 32];
    const x = randomComplex(nx * ny, 3);
    const dst = new Float64Array(x.length).fill(7);
    expect(transformRows(kernel, x, dst, nx, ny, 0, ny, false, () => false)).toBe(false);
    expect(transformColumns(kernel, x, dst, nx, ny, 0, nx, false, () => false)).toBe(false);
    expect(dst.every((v) => v === 7)).toBe(true);
    let asked = 0;
    expect(transformRows(kernel, x, dst, nx, ny, 0, 4, false, () => ++asked > 0)).toBe(true);
    expect(asked).toBe(1);
    expect(dst[0]).not.toBe(7);
  });

  it('refuses ranges outside the grid, odd column bounds and arrays of the wrong length', () => {
    const x = new Float64Array(2 * 16 * 8);
    expect(() => transformRows(kernel, x, x, 16, 8, 0, 9, false)).toThrow(/outside/);
    expect(() => transformRows(kernel, x, x, 16, 8, 4, 4, false)).toThrow(/outside/);
    expect(() => transformColumns(kernel, x, x, 16, 8, 1, 4, false)).toThrow(/even/);
    expect(() => transformColumns(kernel, x, new Float64Array(10), 16, 8, 0, 4, false)).toThrow(/values/);
  });
});

describe('the WebAssembly kernel on a shared memory (the parts of a team in one thread)', () => {
  beforeAll(() => {
    // (throws, with the reason, when the WebAssembly kernel was not built)
    useFastFftBackend(kernel, 'wasm-simd');
  });

  it('rows in, columns, rows out, in uneven parts and any order, equal fft2Interleaved bit for bit', () => {
    const memory = createSharedFftMemory(kernel);
    expect(memory).not.toBeNull();
    expect(attachSharedFftMemory(kernel, memory)).toBe(true);
    try {
      for (const inverse of [false, true]) {
        // growing sizes and then a smaller one: the memory grows and is laid out again
        for (const [nx, ny] of [[64, 128], [256, 256], [512, 256], [32, 4], [16, 1024]] as [number, number][]) {
          const x = randomComplex(nx * ny, 5 * nx + ny + (inverse ? 1 : 0));
          const whole = x.slice();
          fft2Interleaved(kernel, whole, nx, ny, inverse);
          const L = sharedLayout(kernel, nx, ny, 3)!;
          expect(L).not.toBeNull();
          const data = x.slice();
          for (const [a, b] of cuts(ny, [3, 1, 8]).reverse()) sharedRowsIn(kernel, L, data, a, b, inverse, 2);
          for (const [a, b] of cuts(nx, [2, 16, 6])) sharedColumns(kernel, L, a, b, inverse, 1);
          expect(sharedRowsOut(kernel, L, data, 0, 1, () => false)).toBe(false);
          for (const [a, b] of cuts(ny, [5, 2])) expect(sharedRowsOut(kernel, L, data, a, b)).toBe(true);
          expect(sameBits(data, whole), `${nx}×${ny}`).toBe(true);
        }
      }
    } finally {
      attachSharedFftMemory(kernel, null);
    }
  });

  it('refuses to work without an attached memory', () => {
    expect(sharedLayout(kernel, 64, 64, 2)).toBeNull();
  });
});
