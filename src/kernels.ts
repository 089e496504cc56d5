// Makes the program's engines (optics/engine.ts): reads the compiled WebAssembly FFT kernel
// (dist/src/optics/wasm/fft.wasm, built by `npm run build:wasm`) for the optics layer, which does
// no file I/O itself. Called by each entry point when it is about to compute: the command line's
// run, each worker thread, a library caller (createEngine from the index). Nothing happens at
// import. Without the file the TypeScript kernel is used, with the same results. Also loads the
// native kernel (dist/native/spotcast-fft.node, built by `npm run build:native` when the machine
// can), which createFftKernel prefers once it passes its self-check; without it, or with
// SPOTCAST_FFT=wasm in the environment, the WebAssembly kernel is used.
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { fileURLToPath } from 'node:url';
import { singleThreadEngine, type Engine } from './optics/engine.js';
import { createFftKernel, type FftKernel, type NativeFft, type NativeLoad } from './optics/fft-fast.js';

/** Where the native kernel is looked for: beside the compiled program, or (tests, from the sources) in the build output. */
export const NATIVE_FFT_PLACES = [
  new URL('../native/spotcast-fft.node', import.meta.url),
  new URL('../dist/native/spotcast-fft.node', import.meta.url),
].map((u) => fileURLToPath(u));

/**
 * The native kernel from the first of `places` that exists, or null and why not. Node-API modules
 * load once per process and again in each worker thread (the module is context-aware).
 */
export function loadNativeFft(places: string[] = NATIVE_FFT_PLACES): NativeLoad {
  if (process.env.SPOTCAST_FFT === 'wasm') return { addon: null, why: 'SPOTCAST_FFT=wasm' };
  const require = createRequire(import.meta.url);
  for (const p of places) {
    try {
      return { addon: require(p) as NativeFft, why: '' };
    } catch (e) {
      const err = e as NodeJS.ErrnoException;
      if (err.code === 'MODULE_NOT_FOUND') continue;
      return { addon: null, why: `${p} could not be loaded: ${err.message.split('\n')[0]}` };
    }
  }
  return { addon: null, why: `native FFT kernel not built (npm run build:native needs a C compiler and node_api.h); looked at ${places.join(', ')}` };
}

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

/**
 * A kernel for this thread: the native one when it is built and passes its self-check, else the
 * WebAssembly one when it is built and compiles, else the TypeScript one (kernel.nativeProblem and
 * kernel.wasmProblem say why).
 */
export function createKernel(): FftKernel {
  const { bytes, why } = readFftKernel();
  return createFftKernel(bytes, why, loadNativeFft());
}

/** An engine for this thread on createKernel()'s kernel. */
export function createEngine(): Engine {
  return singleThreadEngine(createKernel());
}
