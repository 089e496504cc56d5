// Loads the compiled WebAssembly FFT kernel (dist/src/optics/wasm/fft.wasm, built by
// `npm run build:wasm`) into the optics layer, which does no file I/O itself. Called once by each
// entry point: the command line, each worker thread and the library index. Without the file the
// TypeScript kernel is used, with the same results.
import { readFileSync } from 'node:fs';
import { installWasmFft } from './optics/fft-fast.js';

let done = false;

export function loadFastKernels(): boolean {
  if (done) return true;
  // Beside the compiled module, or, when this file runs as TypeScript source (the tests), in the build output.
  const places = [new URL('./optics/wasm/fft.wasm', import.meta.url), new URL('../dist/src/optics/wasm/fft.wasm', import.meta.url)];
  for (const p of places) {
    let bytes: Buffer;
    try {
      bytes = readFileSync(p);
    } catch {
      continue;
    }
    done = installWasmFft(bytes);
    return done;
  }
  installWasmFft(null, `fft.wasm not found (run npm run build:wasm); looked at ${places.map((p) => p.pathname).join(', ')}`);
  return false;
}
