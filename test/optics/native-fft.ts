// Whether the native FFT kernel is built here (dist/native/spotcast-fft.node, made by `npm run
// build` when the machine has a C compiler and Node's headers), for the FFT tests that cover it:
// they run it when it is there and are skipped, with this reason, when it is not.
import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import type { FastFftBackend } from '../../src/optics/fft-fast.js';

export const NATIVE_FILE = fileURLToPath(new URL('../../dist/native/spotcast-fft.node', import.meta.url));

export const nativeBuilt = existsSync(NATIVE_FILE) && process.env.SPOTCAST_FFT !== 'wasm';

export const NATIVE_SKIP = `skipped: ${NATIVE_FILE} not built (npm run build makes it where cc and node_api.h are)`;

/** The backends createKernel() can offer here, in its order of preference. */
export const fastBackends: FastFftBackend[] = nativeBuilt ? ['native', 'wasm-simd', 'js'] : ['wasm-simd', 'js'];

/** The backend createKernel() chooses here. */
export const defaultBackend: FastFftBackend = fastBackends[0]!;
