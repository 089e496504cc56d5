#!/usr/bin/env node
// `npm run bench`: every benchmark section, one after another, each in its own process (not
// tests; wall-clock on this machine, so run them on an otherwise idle one).
//   npm run bench [-- --json] [-- --no-scipy] [-- --no-fftw]
// Sections: bench/fft.mjs (2-D FFT sizes 512²–4096², against fft.js, SciPy and, where a C compiler
// and libfftw3-dev are present, FFTW 3 compiled at bench time: never a dependency),
// bench/propagate.mjs (a 2048² angular-spectrum case on 1 and 2 threads against SciPy, the
// 64-distance sweep, the automatic-grid sweep shared or not, slit and rectangle cases, peak memory),
// bench/run.mjs (a 100-case sweep as whole processes with --workers 1 and 2, worker scaling inside
// the run loop, the per-case cost outside the propagation), bench/spectrum.mjs (a case of 31
// wavelengths on a 2047² common grid by the command line with --workers 2 against issue 14's 60 s
// target, its peak memory against the plan's estimate, and its lines timed one by one through the
// library). With --json, one JSON document with every section's results.
import { spawnSync } from 'node:child_process';
import { availableParallelism, cpus } from 'node:os';
import { fileURLToPath } from 'node:url';

const args = process.argv.slice(2);
const json = args.includes('--json');
const pass = args.filter((a) => a === '--no-scipy' || a === '--no-fftw');
const sections = ['fft.mjs', 'propagate.mjs', 'run.mjs', 'spectrum.mjs'];
const here = (f) => fileURLToPath(new URL(f, import.meta.url));

const out = { node: process.version, cores: availableParallelism(), cpu: cpus()[0]?.model ?? null, date: new Date().toISOString(), sections: {} };
let failed = false;
for (const s of sections) {
  const passHere = s === 'run.mjs' || s === 'spectrum.mjs' ? [] : pass;
  if (!json) {
    console.log(`\n== ${s.replace('.mjs', '')} ==`);
    const r = spawnSync(process.execPath, [here(s), ...passHere], { stdio: 'inherit' });
    if (r.status !== 0) failed = true;
    continue;
  }
  const r = spawnSync(process.execPath, [here(s), '--json', ...passHere], { encoding: 'utf8', maxBuffer: 1 << 26, stdio: ['ignore', 'pipe', 'inherit'] });
  if (r.status !== 0) {
    failed = true;
    out.sections[s.replace('.mjs', '')] = { error: `exit ${r.status}` };
    continue;
  }
  out.sections[s.replace('.mjs', '')] = JSON.parse(r.stdout);
}
if (json) console.log(JSON.stringify(out, null, 2));
process.exit(failed ? 1 : 0);
