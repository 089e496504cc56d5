// The native FFT kernel (native/fft.c through src/optics/fft-fast.ts): against the DFT definition
// summed directly (test/reference/dft.ts) at sizes 2^a·3^b·5^c that are not powers of two, and
// against fft.js (fft2Reference of src/optics/fft.ts, a general-purpose reference library) at
// powers of two, to 1e-12 of the largest value, 1-D and 2-D, both directions, on one thread and
// on two; the same bits for any number of threads and any alignment of the array (common
// practice for a parallel split of a deterministic kernel); loading in a worker thread; and the
// fallback to the WebAssembly kernel, with its reason, when the native one is missing or wrong.
// The transforms are skipped, with the reason, where the native kernel was not built.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Worker } from 'node:worker_threads';
import { describe, expect, it } from 'vitest';
import { createKernel, loadNativeFft, readFftKernel } from '../../src/kernels.js';
import { singleThreadEngine } from '../../src/optics/engine.js';
import { createFftKernel, fastFftBackend, fft2Interleaved, fft2Split, useFastFftBackend, type NativeFft } from '../../src/optics/fft-fast.js';
import { fft2Reference } from '../../src/optics/fft.js';
import { startFftTeam, stopFftTeam } from '../../src/parallel/fft-team.js';
import { randomComplex, sameBits, sharedCopy } from '../parallel/fft-data.js';
import { directDft } from '../reference/dft.js';
import { NATIVE_FILE, NATIVE_SKIP, nativeBuilt } from './native-fft.js';
import { maxDiffOverPeak } from '../helpers.js';

const TOL = 1e-12;

/** max |got − ref| / max |ref| (a zero reference gives NaN, which no bound passes). */
function relErr(ref: Float64Array, got: Float64Array): number {
  expect(got.length).toBe(ref.length);
  return maxDiffOverPeak(got, ref);
}

describe.skipIf(!nativeBuilt)(`native kernel${nativeBuilt ? '' : ` (${NATIVE_SKIP})`}`, () => {
  const kernel = createKernel();
  // The module itself (fft2Interleaved sends 1-D and fewer than 8 rows to the WebAssembly kernel, below).
  const native = (x: Float64Array, nx: number, ny: number, inverse: boolean, threads: number) => {
    const y = x.slice();
    kernel.native!.fft2(y, nx, ny, inverse, threads);
    return y;
  };

  it('is the kernel createKernel chooses, having passed its self-check', () => {
    expect(fastFftBackend(kernel)).toBe('native');
    expect(kernel.nativeProblem).toBe('');
    expect(['avx2-fma', 'generic']).toContain(kernel.native!.isa());
  });

  it('equals the DFT definition at 5-smooth sizes that are not powers of two (1-D and 2-D, both directions, 1 and 2 threads)', () => {
    const shapes: [number, number][] = [[6, 1], [10, 1], [12, 1], [45, 1], [1080, 1], [3, 5], [12, 10], [45, 60], [60, 45], [6, 25], [9, 8]];
    for (const [nx, ny] of shapes) {
      for (const inverse of [false, true]) {
        const x = randomComplex(nx * ny, 13 * nx + ny + (inverse ? 1 : 0));
        const ref = directDft(x, nx, ny, inverse);
        for (const threads of [1, 2]) {
          expect(relErr(ref, native(x, nx, ny, inverse, threads)), `${nx}×${ny} ${inverse ? 'inverse' : 'forward'}, ${threads} threads`).toBeLessThan(TOL);
        }
      }
    }
  });

  it('equals fft.js at powers of two (1-D and 2-D, both directions, 1 and 2 threads)', () => {
    const shapes: [number, number][] = [[2, 1], [4, 1], [8, 1], [4096, 1], [2, 2], [16, 8], [8, 16], [64, 64], [256, 128], [32, 512], [1024, 8]];
    for (const [nx, ny] of shapes) {
      for (const inverse of [false, true]) {
        const x = randomComplex(nx * ny, 7 * nx + ny + (inverse ? 1 : 0));
        const ref = x.slice();
        fft2Reference(ref, nx, ny, inverse);
        for (const threads of [1, 2]) {
          expect(relErr(ref, native(x, nx, ny, inverse, threads)), `${nx}×${ny} ${inverse ? 'inverse' : 'forward'}, ${threads} threads`).toBeLessThan(TOL);
        }
      }
    }
  });

  it('gives the same bits on 1, 2 and 3 threads, on ordinary and shared memory, at any alignment of the array', () => {
    for (const [nx, ny] of [[256, 192], [100, 64], [1080, 24]] as [number, number][]) {
      const x = randomComplex(nx * ny, nx + ny);
      const one = native(x, nx, ny, false, 1);
      for (const threads of [2, 3]) expect(sameBits(native(x, nx, ny, false, threads), one), `${nx}×${ny}, ${threads} threads`).toBe(true);
      const shared = sharedCopy(x);
      fft2Interleaved(kernel, shared, nx, ny, false, 2);
      expect(sameBits(shared, one), `${nx}×${ny}, shared`).toBe(true);
      // the column blocks follow the cache lines, so they start elsewhere at each offset
      for (let skip = 1; skip <= 8; skip++) {
        const big = new Float64Array(x.length + skip);
        const view = big.subarray(skip);
        view.set(x);
        fft2Interleaved(kernel, view, nx, ny, false, 2);
        expect(sameBits(view, one), `${nx}×${ny}, offset ${skip} values`).toBe(true);
        expect(big.subarray(0, skip).every((v) => v === 0)).toBe(true);
      }
    }
  });

  it('random shapes, offsets, directions and threads (fixed seed): equals the TypeScript kernel to 1e-12 and writes nothing outside the array', () => {
    // the TypeScript kernel is itself checked against fft.js and the DFT definition in fft-fast.test.ts and fft-sizes.test.ts
    const js = createKernel();
    useFastFftBackend(js, 'js');
    const sizes = [2, 3, 4, 5, 6, 8, 9, 10, 12, 15, 16, 20, 24, 25, 27, 30, 32, 45, 48, 60, 64, 75, 96, 100, 120, 128, 135, 256, 270, 512, 1080];
    let seed = 3;
    const rnd = () => (seed = (Math.imul(seed, 1103515245) + 12345) >>> 0) / 2 ** 32;
    let cases = 0;
    while (cases < 80) {
      const nx = sizes[Math.floor(rnd() * sizes.length)]!;
      const ny = rnd() < 0.2 ? 1 : sizes[Math.floor(rnd() * sizes.length)]!;
      if (nx * ny > 1 << 16) continue;
      cases++;
      const skip = Math.floor(rnd() * 4);
      const buf = new Float64Array(2 * nx * ny + skip + 3).fill(9);
      const d = buf.subarray(skip, skip + 2 * nx * ny);
      for (let i = 0; i < d.length; i++) d[i] = rnd() - 0.5;
      const want = d.slice();
      const inverse = rnd() < 0.5, threads = 1 + Math.floor(rnd() * 3);
      fft2Interleaved(js, want, nx, ny, inverse);
      fft2Interleaved(kernel, d, nx, ny, inverse, threads);
      const what = `${nx}×${ny} ${inverse ? 'inverse' : 'forward'}, ${threads} threads, offset ${skip}`;
      expect(relErr(want, d), what).toBeLessThan(TOL);
      expect([...buf.subarray(0, skip), ...buf.subarray(skip + d.length)].every((v) => v === 9), what).toBe(true);
    }
  });

  it('fft2Interleaved runs it from 8 rows up, and sends 1-D and fewer rows to the WebAssembly kernel (same bits as that kernel)', () => {
    const wasm = createKernel();
    useFastFftBackend(wasm, 'wasm-simd');
    for (const [nx, ny, viaNative] of [[4096, 1, false], [1080, 6, false], [64, 8, true], [1080, 24, true]] as [number, number, boolean][]) {
      const x = randomComplex(nx * ny, nx + 3 * ny);
      const got = x.slice();
      fft2Interleaved(kernel, got, nx, ny, false);
      const w = x.slice();
      fft2Interleaved(wasm, w, nx, ny, false);
      expect(sameBits(got, viaNative ? native(x, nx, ny, false, 1) : w), `${nx}×${ny}`).toBe(true);
    }
  });

  it('fft2Split equals fft2Interleaved bit for bit', () => {
    const [nx, ny] = [96, 40];
    const x = randomComplex(nx * ny, 5);
    const one = native(x, nx, ny, true, 1);
    const re = new Float64Array(nx * ny), im = new Float64Array(nx * ny);
    for (let i = 0; i < nx * ny; i++) (re[i] = x[2 * i]!), (im[i] = x[2 * i + 1]!);
    fft2Split(kernel, re, im, nx, ny, true);
    const back = new Float64Array(2 * nx * ny);
    for (let i = 0; i < nx * ny; i++) (back[2 * i] = re[i]!), (back[2 * i + 1] = im[i]!);
    expect(sameBits(back, one)).toBe(true);
  });

  it('a team of 2 on the native kernel shares each transform inside the call, with the bits of one thread', async () => {
    const base = singleThreadEngine(createKernel());
    const team = await startFftTeam(2, base, { minValues: 1 });
    try {
      expect(team.threads).toBe(2);
      expect(team.name).toBe('native on 2 threads');
      const x = randomComplex(512 * 256, 3);
      const y = x.slice();
      team.fft2(y, 512, 256, false);
      expect(sameBits(y, native(x, 512, 256, false, 1))).toBe(true);
    } finally {
      await stopFftTeam();
    }
  });

  it('loads in a worker thread too, with the same bits', async () => {
    const [nx, ny] = [120, 64];
    const x = randomComplex(nx * ny, 17);
    const code = `const { parentPort, workerData } = require('node:worker_threads');
      const m = require(workerData.file);
      const d = new Float64Array(workerData.x);
      m.fft2(d, ${nx}, ${ny}, false, 2);
      parentPort.postMessage(d);`;
    const got = await new Promise<Float64Array>((resolve, reject) => {
      const w = new Worker(code, { eval: true, workerData: { file: NATIVE_FILE, x } });
      w.once('message', (d: Float64Array) => {
        resolve(d);
        void w.terminate();
      });
      w.once('error', reject);
    });
    expect(sameBits(got, native(x, nx, ny, false, 1))).toBe(true);
  });

  it('its generic path (for processors without AVX2 and FMA; forced here in a child process) equals the DFT definition too', () => {
    const shapes: [number, number][] = [[12, 10], [45, 6], [16, 8], [30, 1], [9, 25]];
    const script = `
      const m = require(${JSON.stringify(NATIVE_FILE)});
      let s = 5;
      const out = [];
      for (const [nx, ny] of ${JSON.stringify(shapes)}) for (const inverse of [false, true]) for (const threads of [1, 2]) {
        const x = new Float64Array(2 * nx * ny).map(() => (s = (Math.imul(s, 1103515245) + 12345) >>> 0) / 2 ** 32 - 0.5);
        const y = x.slice();
        m.fft2(y, nx, ny, inverse, threads);
        out.push({ nx, ny, inverse, threads, x: [...x], y: [...y] });
      }
      console.log(JSON.stringify({ isa: m.isa(), out }));`;
    const r = spawnSync(process.execPath, ['-e', script], { encoding: 'utf8', env: { ...process.env, SPOTCAST_NATIVE_GENERIC: '1' }, maxBuffer: 1 << 26 });
    expect(r.stderr).toBe('');
    const got = JSON.parse(r.stdout) as { isa: string; out: { nx: number; ny: number; inverse: boolean; threads: number; x: number[]; y: number[] }[] };
    expect(got.isa).toBe('generic');
    expect(got.out.length).toBe(shapes.length * 4);
    for (const c of got.out) {
      const ref = directDft(Float64Array.from(c.x), c.nx, c.ny, c.inverse);
      expect(relErr(ref, Float64Array.from(c.y)), `${c.nx}×${c.ny} ${c.inverse}, ${c.threads} threads`).toBeLessThan(TOL);
    }
  });

  it('refuses sizes with other prime factors and arrays of the wrong length, from the module itself', () => {
    const m = kernel.native!;
    expect(() => m.fft2(new Float64Array(2 * 14), 14, 1, false, 1)).toThrow(/2\^a/);
    expect(() => m.fft2(new Float64Array(2 * 8 * 4 - 2), 8, 4, false, 1)).toThrow(/2·nx·ny/);
    expect(() => m.fft2(new Float32Array(2 * 8 * 4) as unknown as Float64Array, 8, 4, false, 1)).toThrow(/Float64Array/);
  });
});

describe('fallback when the native kernel is missing or wrong', () => {
  const wasm = readFftKernel();

  it('missing: the WebAssembly kernel, and the reason kept', () => {
    const load = loadNativeFft(['/nonexistent/spotcast-fft.node']);
    expect(load.addon).toBeNull();
    expect(load.why).toMatch(/not built.*\/nonexistent\/spotcast-fft\.node/);
    const k = createFftKernel(wasm.bytes, wasm.why, load);
    expect(fastFftBackend(k)).toBe('wasm-simd');
    expect(k.nativeProblem).toBe(load.why);
    expect(() => useFastFftBackend(k, 'native')).toThrow(/native FFT unavailable: native FFT kernel not built/);
  });

  it('a file that is not a module: the WebAssembly kernel, and the loader\'s reason kept', () => {
    const dir = mkdtempSync(join(tmpdir(), 'spotcast-native-'));
    try {
      const file = join(dir, 'spotcast-fft.node');
      writeFileSync(file, 'not a shared object');
      const load = loadNativeFft([file]);
      expect(load.addon).toBeNull();
      expect(load.why).toMatch(/spotcast-fft\.node could not be loaded/);
      expect(fastFftBackend(createFftKernel(wasm.bytes, wasm.why, load))).toBe('wasm-simd');
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it('a module that transforms wrongly fails the self-check: the WebAssembly kernel, and why', () => {
    const wrong: NativeFft = {
      fft2: (d) => d.reverse(),
      rows: () => undefined,
      columns: () => undefined,
      isa: () => 'generic',
    };
    const k = createFftKernel(wasm.bytes, wasm.why, { addon: wrong, why: '' });
    expect(fastFftBackend(k)).toBe('wasm-simd');
    expect(k.native).toBeNull();
    expect(k.nativeProblem).toMatch(/self-check \(16×8, forward: off by/);
  });

  it('SPOTCAST_FFT=wasm leaves the native kernel out', () => {
    const before = process.env.SPOTCAST_FFT;
    process.env.SPOTCAST_FFT = 'wasm';
    try {
      expect(loadNativeFft()).toEqual({ addon: null, why: 'SPOTCAST_FFT=wasm' });
      expect(fastFftBackend(createKernel())).toBe('wasm-simd');
    } finally {
      if (before === undefined) delete process.env.SPOTCAST_FFT;
      else process.env.SPOTCAST_FFT = before;
    }
  });
});
