// The engine a propagation runs on: the FFT kernel, the threads that share its transforms, and
// where its large sample arrays come from. The runner creates one (src/kernels.ts: createEngine;
// src/parallel/fft-team.ts: a team's engine) and passes it down; nothing in optics keeps one.
import { fastFftBackend, fft2Interleaved, transformRows, type FftKernel } from './fft-fast.js';

export interface Engine {
  /** The kernel and threads in words, for notes and tests ('wasm-simd', 'js', '… on 2 threads'). */
  readonly name: string;
  /** Threads sharing each large 2-D transform, this one included (1: this thread only). */
  readonly threads: number;
  /** This thread's kernel and what it keeps (its WebAssembly module and memory, scratch). */
  readonly kernel: FftKernel;
  /**
   * In-place 2-D FFT of an ny×nx interleaved complex array (ny = 1: 1-D). Forward:
   * X[k] = Σ x[j] e^{-2πi jk/n}; the inverse includes 1/n per axis. Every engine gives the bits
   * fft2Interleaved (fft-fast.ts) gives.
   */
  fft2(data: Float64Array, nx: number, ny: number, inverse: boolean): void;
  /** The row pass alone over rows [r0, r1) (fft-fast.ts transformRows), in this thread. */
  fftRows(src: Float64Array, dst: Float64Array, nx: number, ny: number, r0: number, r1: number, inverse: boolean): void;
  /** A zeroed array of `values` numbers, where this engine's transforms can use it. */
  allocate(values: number): Float64Array;
  /** Gives back a large array nothing will read or write again, for the next allocate of its size. */
  release(a: Float64Array): void;
}

/** Arrays from this many numbers are worth keeping for reuse (4 MB). */
const POOL_MIN_VALUES = 2 ** 19;

/**
 * allocate and release over `fresh`, keeping one large array given back for the next allocation
 * of the same size: on this machine class the first write to each page of a fresh array costs more
 * than the whole zeroing of a used one (a 4096² grid: about 250 ms of page faults against 40 ms),
 * and cases of a sweep mostly ask for the same padded grid.
 */
export function pooledAllocation(fresh: (values: number) => Float64Array): Pick<Engine, 'allocate' | 'release'> {
  let pooled: Float64Array | null = null;
  return {
    allocate(values) {
      const p = pooled;
      if (p && p.length === values) {
        pooled = null;
        return p.fill(0);
      }
      return fresh(values);
    },
    release(a) {
      if (a.length >= POOL_MIN_VALUES) pooled = a;
    },
  };
}

/** An engine on `kernel` (fft-fast.ts createFftKernel) in this thread, with ordinary (pooled) arrays. */
export function singleThreadEngine(kernel: FftKernel): Engine {
  return {
    get name() {
      return fastFftBackend(kernel);
    },
    threads: 1,
    kernel,
    fft2(data, nx, ny, inverse) {
      fft2Interleaved(kernel, data, nx, ny, inverse);
    },
    fftRows(src, dst, nx, ny, r0, r1, inverse) {
      transformRows(kernel, src, dst, nx, ny, r0, r1, inverse);
    },
    ...pooledAllocation((values) => new Float64Array(values)),
  };
}
