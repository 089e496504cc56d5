// Engines own their state: two engines (or kernels) made side by side do not see each other's
// kernel choice or pooled arrays, and an engine's allocate hands back zeroed arrays whether fresh or
// reused. The transforms themselves are checked against fft.js in fft-fast.test.ts; here only that
// the engine's fft2 is that transform on its own kernel (exact equality: the same arithmetic,
// common practice for an identity check).
import { describe, expect, it } from 'vitest';
import { createEngine, createKernel } from '../../src/kernels.js';
import { pooledAllocation, singleThreadEngine } from '../../src/optics/engine.js';
import { fastFftBackend, fft2Interleaved, useFastFftBackend } from '../../src/optics/fft-fast.js';
import { randomComplex, sameBits } from '../parallel/fft-data.js';
import { defaultBackend, fastBackends } from './native-fft.js';

describe('engines and kernels keep no shared state', () => {
  it("one kernel's backend choice leaves another's alone", () => {
    const a = createKernel();
    const b = createKernel();
    expect(fastFftBackend(a)).toBe(defaultBackend);
    useFastFftBackend(a, 'js');
    expect(fastFftBackend(a)).toBe('js');
    expect(fastFftBackend(b)).toBe(defaultBackend);
    expect(singleThreadEngine(a).name).toBe('js');
    expect(singleThreadEngine(b).name).toBe(defaultBackend);
  });

  it("an engine's fft2 is its kernel's transform, bit for bit, on either backend", () => {
    for (const backend of fastBackends) {
      const e = createEngine();
      useFastFftBackend(e.kernel, backend);
      const x = randomComplex(64 * 32, 5);
      const got = x.slice();
      e.fft2(got, 64, 32, false);
      const want = x.slice();
      const k = createKernel();
      useFastFftBackend(k, backend);
      fft2Interleaved(k, want, 64, 32, false);
      expect(sameBits(got, want), backend).toBe(true);
      expect(got.some((v, i) => v !== x[i])).toBe(true);
    }
  });

  it('a released large array comes back zeroed for the same size, and only from its own engine', () => {
    const values = 2 ** 19;
    const one = pooledAllocation((n) => new Float64Array(n));
    const two = pooledAllocation((n) => new Float64Array(n));
    const a = one.allocate(values);
    a.fill(3);
    one.release(a);
    expect(two.allocate(values)).not.toBe(a);
    const again = one.allocate(values);
    expect(again).toBe(a);
    expect(again.every((v) => v === 0)).toBe(true);
    // taken once: the next allocation is fresh
    expect(one.allocate(values)).not.toBe(a);
    // small arrays are not kept
    const small = one.allocate(16);
    one.release(small);
    expect(one.allocate(16)).not.toBe(small);
  });
});
