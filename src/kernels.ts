// Makes the program's engines (optics/engine.ts): reads the compiled WebAssembly FFT kernel
// (dist/src/optics/wasm/fft.wasm, built by `npm run build:wasm`) for the optics layer, which does
// no file I/O itself. Called by each entry point when it is about to compute: the command line's
// run, each worker thread, a library caller (createEngine from the index). Nothing happens at
// import. Without the file the TypeScript kernel is used, with the same results.
import { readFileSync } from 'node:fs';
import { singleThreadEngine, type Engine } from './optics/engine.js';
import { createFftKernel, type FftKernel } from './optics/fft-fast.js';

/** The kernel file's bytes, or why there are none. */
export function readFftKernel(): { bytes: Uint8Array | null; why: string } {
  // Beside the compiled module, or, when this file runs as TypeScript source (the tests), in the build output.
  const places = [new URL('./optics/wasm/fft.wasm', import.meta.url), new URL('../dist/src/optics/wasm/fft.wasm', import.meta.url)];
  for (const p of places) {
    try {
      return { bytes: readFileSync(p), why: '' };
    } catch {
      continue;
    }
  }
  return { bytes: null, why: `fft.wasm not found (run npm run build:wasm); looked at ${places.map((p) => p.pathname).join(', ')}` };
}

/** A kernel for this thread: the WebAssembly one when it is built and compiles, else the TypeScript one. */
export function createKernel(): FftKernel {
  const { bytes, why } = readFftKernel();
  return createFftKernel(bytes, why);
}

/** An engine for this thread on createKernel()'s kernel. */
export function createEngine(): Engine {
  return singleThreadEngine(createKernel());
}
