#!/usr/bin/env node
// Builds the optional native FFT kernel (native/fft.c) into dist/native/spotcast-fft.node with the
// machine's C compiler, called directly (no build tool): `npm run build` runs it last. Optional: when
// there is no compiler or no Node-API headers, or the compile fails, it prints one line and ends
// with success, and the program uses the WebAssembly kernel (src/kernels.ts says why in its
// reason). SPOTCAST_NO_NATIVE=1 skips it; CC chooses the compiler (default cc); NODE_API_HEADERS
// names the folder holding node_api.h when it is not beside this Node.
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, rmSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = fileURLToPath(new URL('..', import.meta.url));
const out = join(root, 'dist', 'native', 'spotcast-fft.node');
const say = (why) => console.log(`native FFT kernel not built (${why}); the WebAssembly kernel will be used`);

function headers() {
  const places = [
    process.env.NODE_API_HEADERS,
    join(dirname(dirname(process.execPath)), 'include', 'node'),
    '/usr/include/node',
    '/usr/local/include/node',
  ].filter(Boolean);
  return places.find((p) => existsSync(join(p, 'node_api.h'))) ?? null;
}

function main() {
  // A stale build must not outlive a failed one.
  rmSync(out, { force: true });
  if (process.env.SPOTCAST_NO_NATIVE === '1') return say('SPOTCAST_NO_NATIVE=1');
  const inc = headers();
  if (!inc) return say('node_api.h not found; set NODE_API_HEADERS');
  mkdirSync(dirname(out), { recursive: true });
  const cc = process.env.CC || 'cc';
  // -fno-strict-aliasing: the kernel reads its double arrays through vector types.
  const args = ['-O3', '-shared', '-fPIC', '-fno-strict-aliasing', '-std=gnu11', '-I', inc, join(root, 'native', 'fft.c'), '-o', out, '-lm', '-lpthread'];
  const r = spawnSync(cc, args, { encoding: 'utf8' });
  if (r.error) return say(`no C compiler: ${cc} ${r.error.code ?? r.error.message}`);
  if (r.status !== 0) {
    rmSync(out, { force: true });
    const first = (r.stderr || '').split('\n').find((l) => /error/.test(l)) ?? `${cc} exited with ${r.status}`;
    return say(`compile failed: ${first.trim()}`);
  }
}

main();
