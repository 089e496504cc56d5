#!/usr/bin/env node
// 2-D complex FFT benchmark (not a test): one thread, n×n forward transforms, median wall-clock time
// of several runs after warm-up. Runs against the built program (`npm run build` first; `npm run
// bench` does), and, when python3 with SciPy is on the machine, times scipy.fft.fft2(a,
// workers=1) on the same sizes in the same run as an outside yardstick; likewise FFTW 3 (double
// precision, in place, planned with FFTW_MEASURE, on one thread and on two), when a C compiler and
// FFTW's development headers are on the machine (Debian: libfftw3-dev): bench/fftw/fft2.c is
// compiled here into a temporary directory. FFTW is a yardstick only, never a dependency of the
// program or its tests; without it the rows are skipped with a note.
//   node bench/fft.mjs [--sizes 512,1024,1080,2048,2160,4096] [--runs N] [--no-scipy] [--no-fftw] [--json] [--fast-only]
// (--fast-only: only the native and WebAssembly rows, leaving out fft.js and the TypeScript kernel)
//
// Compared: fft2Reference of src/optics/fft.ts (fft.js rows and gathered columns), and fft2Interleaved /
// fft2Split of src/optics/fft-fast.ts with each of its kernels (native C where it was built,
// WebAssembly SIMD, TypeScript); the native kernel on 2 threads (inside the call) and the
// WebAssembly one with a team of 2 (worker threads) are compared with FFTW on 2 threads. Sizes
// that are not powers of two (5-smooth: 1080 = 2³·3³·5, 2160, …, radix-3 and radix-5 stages) have
// no fft.js row; their agreement is given against the TypeScript kernel instead. The
// variants of one size run in turn, round after round, so that a slow spell of the machine falls on
// all of them (FFTW too: its planned transforms wait in child processes and run one per round,
// after the variants); each run starts from the same random data, restored outside the timing.
// SciPy runs after the rounds, in its own process.
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { fft2Reference as fft2 } from '../dist/src/optics/fft.js';
import { createEngine } from '../dist/src/kernels.js';
import { fft2Interleaved, fft2Split, useFastFftBackend, fastFftBackend } from '../dist/src/optics/fft-fast.js';

// FFT teams (one transform shared by threads) exist from the build that has src/parallel.
let team = null;
try {
  team = await import('../dist/src/parallel/fft-team.js');
} catch {
  team = null;
}

const args = process.argv.slice(2);
const opt = (name, dflt) => (args.includes(name) ? args[args.indexOf(name) + 1] : dflt);
const json = args.includes('--json');
const sizes = opt('--sizes', '512,1024,1080,2048,2160,4096').split(',').map(Number);
const runsArg = opt('--runs', null);
const withScipy = !args.includes('--no-scipy');
const withFftw = !args.includes('--no-fftw');
const fastOnly = args.includes('--fast-only');

const runsFor = (n) => (runsArg ? Number(runsArg) : n <= 1024 ? 15 : n <= 2048 ? 9 : 5);
const median = (xs) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[s.length >> 1] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};

const scipyScript = `
import json, sys, time
import numpy as np, scipy, scipy.fft
n, runs, workers = int(sys.argv[1]), int(sys.argv[2]), int(sys.argv[3])
rng = np.random.default_rng(1)
a = rng.random((n, n)) - 0.5 + 1j * (rng.random((n, n)) - 0.5)
for _ in range(2): scipy.fft.fft2(a, workers=workers)
ts = []
for _ in range(runs):
    t = time.perf_counter(); scipy.fft.fft2(a, workers=workers); ts.append((time.perf_counter() - t) * 1e3)
ts.sort()
print(json.dumps({"median": ts[len(ts) // 2] if len(ts) % 2 else (ts[len(ts)//2 - 1] + ts[len(ts)//2]) / 2, "min": ts[0], "version": scipy.__version__}))
`;

let scipyNote = null;
function scipyTime(n, runs, workers = 1) {
  if (!withScipy || scipyNote) return null;
  const env = { ...process.env };
  // Settings some machines need for old BLAS builds; they slow a current numpy (not its FFT, but
  // unset them for this command alone anyway).
  delete env.OPENBLAS_CORETYPE;
  delete env.OPENBLAS_L2_SIZE;
  const r = spawnSync('python3', ['-c', scipyScript, String(n), String(runs), String(workers)], { env, encoding: 'utf8' });
  if (r.status !== 0) {
    scipyNote = `SciPy not timed: ${(r.stderr || r.error?.message || 'python3 failed').trim().split('\n').pop()}`;
    return null;
  }
  return JSON.parse(r.stdout.trim().split('\n').pop());
}

// FFTW: bench/fftw/fft2.c compiled once per bench run into a temporary directory.
let fftwNote = null;
let fftwDir = null;
let fftwExe = null;
function fftwBuild() {
  if (fftwExe || fftwNote) return fftwExe;
  if (!withFftw) {
    fftwNote = 'FFTW not timed: --no-fftw';
    return null;
  }
  if (!existsSync('/usr/include/fftw3.h')) {
    fftwNote = 'FFTW not timed: /usr/include/fftw3.h missing (Debian: libfftw3-dev)';
    return null;
  }
  fftwDir = mkdtempSync(join(tmpdir(), 'spotcast-fftw-'));
  const exe = join(fftwDir, 'fft2');
  const src = fileURLToPath(new URL('./fftw/fft2.c', import.meta.url));
  const r = spawnSync('cc', ['-O3', src, '-o', exe, '-lfftw3_threads', '-lfftw3', '-lm'], { encoding: 'utf8' });
  if (r.error || r.status !== 0) {
    fftwNote = `FFTW not timed: ${r.error ? 'no C compiler (cc)' : `cc failed: ${(r.stderr || '').trim().split('\n').pop()}`}`;
    return null;
  }
  fftwExe = exe;
  return exe;
}
/**
 * FFTW planned for one size and thread count in a child process (bench/fftw/fft2.c), timed one
 * transform per request so that its runs fall in the same rounds as the variants here. Null when
 * FFTW is not there.
 */
async function fftwStart(n, threads) {
  const exe = fftwBuild();
  if (!exe) return null;
  const child = spawn(exe, [String(n), String(threads)], { stdio: ['pipe', 'pipe', 'inherit'] });
  let buf = '';
  const waiting = [];
  const lines = [];
  child.stdout.setEncoding('utf8');
  child.stdout.on('data', (chunk) => {
    buf += chunk;
    let i;
    while ((i = buf.indexOf('\n')) >= 0) {
      const line = buf.slice(0, i);
      buf = buf.slice(i + 1);
      if (waiting.length) waiting.shift()(line);
      else lines.push(line);
    }
  });
  let failed = null;
  const ended = new Promise((resolve) => child.on('close', (code, signal) => {
    failed = `fft2 ${n} ${threads} ended (${code ?? signal})`;
    while (waiting.length) waiting.shift()(null);
    resolve();
  }));
  child.on('error', (e) => {
    failed = e.message;
  });
  const next = () => (lines.length ? Promise.resolve(lines.shift()) : failed ? Promise.resolve(null) : new Promise((r) => waiting.push(r)));
  const head = await next();
  if (head === null) {
    fftwNote = `FFTW not timed: ${failed}`;
    return null;
  }
  const info = JSON.parse(head);
  return {
    info,
    async run() {
      child.stdin.write('r\n');
      const line = await next();
      if (line === null) throw new Error(`FFTW: ${failed}`);
      const [wall, cpu] = line.split(' ').map(Number);
      return { wall, cpu };
    },
    async stop() {
      child.stdin.end();
      await ended;
    },
  };
}

function relDiff(ref, got) {
  let d = 0;
  let m = 0;
  for (let i = 0; i < ref.length; i++) {
    d = Math.max(d, Math.abs(ref[i] - got[i]));
    m = Math.max(m, Math.abs(ref[i]));
  }
  return d / m;
}

const engine = createEngine();
const hasWasm = engine.kernel.wasm !== null;
const hasNative = (engine.kernel.native ?? null) !== null;
if (!hasNative && !json) console.log(`(no native kernel: ${engine.kernel.nativeProblem})`);
// A team of 2 (worker threads) on the WebAssembly kernel for its shared variant; the one-thread
// variants call the kernels directly, and data in ordinary memory never goes to the team anyway.
if (hasWasm) useFastFftBackend(engine.kernel, 'wasm-simd');
const teamEngine = team && hasWasm ? await team.startFftTeam(2, engine) : engine;
const threads = Math.max(teamEngine.threads, hasNative ? 2 : 1);
const rows = [];
for (const n of sizes) {
  const N = n * n;
  const orig = new Float64Array(2 * N);
  let seed = 12345;
  for (let i = 0; i < orig.length; i++) {
    seed = (Math.imul(seed, 1103515245) + 12345) >>> 0;
    orig[i] = seed / 2 ** 32 - 0.5;
  }
  const origRe = new Float64Array(N);
  const origIm = new Float64Array(N);
  for (let i = 0; i < N; i++) {
    origRe[i] = orig[2 * i];
    origIm[i] = orig[2 * i + 1];
  }
  const d = new Float64Array(2 * N);
  const re = new Float64Array(N);
  const im = new Float64Array(N);
  const inter = () => d.set(orig);
  const dShared = threads > 1 ? new Float64Array(new SharedArrayBuffer(16 * N)) : null;
  const interShared = () => dShared.set(orig);
  const split = () => {
    re.set(origRe);
    im.set(origIm);
  };
  const pow2 = (n & (n - 1)) === 0;
  const allVariants = [
    ...(pow2 ? [{ name: 'fft.js fft2', setup: inter, run: () => fft2(d, n, n, false) }] : []),
    ...(hasNative
      ? [
          { name: `native ${engine.kernel.native.isa()}`, backend: 'native', setup: inter, run: () => fft2Interleaved(engine.kernel, d, n, n, false) },
          { name: 'native, 2 threads', backend: 'native', setup: inter, run: () => fft2Interleaved(engine.kernel, d, n, n, false, 2) },
          { name: 'native split', backend: 'native', setup: split, run: () => fft2Split(engine.kernel, re, im, n, n, false) },
        ]
      : []),
    ...(hasWasm
      ? [
          { name: 'wasm interleaved', backend: 'wasm-simd', setup: inter, run: () => fft2Interleaved(engine.kernel, d, n, n, false) },
          { name: 'wasm split', backend: 'wasm-simd', setup: split, run: () => fft2Split(engine.kernel, re, im, n, n, false) },
        ]
      : []),
    ...(dShared && teamEngine.threads > 1
      ? [{ name: `wasm, ${teamEngine.threads} threads`, backend: 'wasm-simd', setup: interShared, out: dShared, run: () => teamEngine.fft2(dShared, n, n, false) }]
      : []),
    { name: 'ts interleaved', backend: 'js', setup: inter, run: () => fft2Interleaved(engine.kernel, d, n, n, false) },
    { name: 'ts split', backend: 'js', setup: split, run: () => fft2Split(engine.kernel, re, im, n, n, false) },
  ];
  const variants = fastOnly ? allVariants.filter((v) => v.backend === 'native' || v.backend === 'wasm-simd') : allVariants;

  // Agreement with fft.js (other sizes: with the TypeScript kernel), checked on this data before timing.
  inter();
  if (pow2) fft2(d, n, n, false);
  else {
    useFastFftBackend(engine.kernel, 'js');
    fft2Interleaved(engine.kernel, d, n, n, false);
  }
  const ref = d.slice();
  for (const v of variants.filter((v) => v.name !== 'fft.js fft2')) {
    useFastFftBackend(engine.kernel, v.backend);
    v.setup();
    v.run();
    let got = v.out ?? d;
    if (v.setup === split) {
      got = new Float64Array(2 * N);
      for (let i = 0; i < N; i++) {
        got[2 * i] = re[i];
        got[2 * i + 1] = im[i];
      }
    }
    v.diff = relDiff(ref, got);
  }

  const runs = runsFor(n);
  const times = variants.map(() => []);
  const cpus = variants.map(() => []);
  // FFTW on one thread and on two, planned before the rounds, run in each round after the variants.
  const fftws = [];
  for (const th of [1, threads > 1 ? 2 : 0]) {
    if (!th) continue;
    const f = await fftwStart(n, th);
    if (f) fftws.push({ threads: th, f, times: [], cpus: [] });
  }
  for (let round = 0; round < runs + 2; round++) {
    for (let k = 0; k < variants.length; k++) {
      const v = variants[k];
      if (v.backend) useFastFftBackend(engine.kernel, v.backend);
      v.setup();
      const c0 = process.cpuUsage();
      const t0 = performance.now();
      v.run();
      const t = performance.now() - t0;
      const c = process.cpuUsage(c0);
      if (round >= 2) {
        // the first two rounds warm up
        times[k].push(t);
        cpus[k].push((c.user + c.system) / 1000);
      }
    }
    for (const x of fftws) {
      const t = await x.f.run();
      if (round >= 2) {
        x.times.push(t.wall);
        x.cpus.push(t.cpu);
      }
    }
  }
  for (const x of fftws) await x.f.stop();
  const sp = scipyTime(n, runs);
  const sp2 = threads > 1 ? scipyTime(n, runs, 2) : null;
  const fw = fftws.find((x) => x.threads === 1) ?? null;
  const fw2 = fftws.find((x) => x.threads === 2) ?? null;
  // FFTW's X[0, 1] against ours: the same transform of the same data (a check that it is, not of accuracy).
  const fftwX1 = (i) => Math.hypot(i.x1[0] - ref[2], i.x1[1] - ref[3]) / Math.hypot(ref[2], ref[3]);
  const fftwRow = (x) =>
    x ? { medianMs: median(x.times), minMs: Math.min(...x.times), cpuMedianMs: median(x.cpus), planMs: x.f.info.planMs, version: x.f.info.version, x1RelDiff: fftwX1(x.f.info) } : null;
  const row = {
    n,
    runs,
    fftw: fftwRow(fw),
    fftw2: fftwRow(fw2),
    scipy: sp ? { medianMs: sp.median, minMs: sp.min, version: sp.version } : null,
    scipy2: sp2 ? { medianMs: sp2.median, minMs: sp2.min, version: sp2.version } : null,
    variants: {},
  };
  variants.forEach((v, k) => {
    const m = median(times[k]);
    const yard = v.name.includes('threads') ? row.fftw2 : row.fftw;
    row.variants[v.name] = {
      medianMs: m, minMs: Math.min(...times[k]), cpuMedianMs: median(cpus[k]), [pow2 ? 'maxRelDiffVsFftJs' : 'maxRelDiffVsTs']: v.diff ?? 0,
      ...(yard ? { vsFftw: m / yard.medianMs, vsFftwMin: Math.min(...times[k]) / yard.minMs, cpuVsFftw: median(cpus[k]) / yard.cpuMedianMs } : {}),
    };
  });
  rows.push(row);
  if (!json) printRow(row);
}

function printRow(row) {
  const f = (x) => x.toFixed(1).padStart(8);
  if (row === rows[0]) {
    console.log(`2-D complex FFT, n×n, forward, one thread (and a team of threads where said); median (min) ms over the runs shown; ratios to FFTW of the medians (of the mins, of the processor time of all threads: the fairest on a busy machine for one thread); max |Δ|/max|x| vs fft.js (vs the TypeScript kernel where fft.js does not take the size)`);
  }
  console.log(`\n${row.n}×${row.n} (${row.runs} runs)`);
  for (const [name, v] of Object.entries(row.variants)) {
    const yard = name.includes('threads') ? row.scipy2 : row.scipy;
    const ratio = yard ? `  ${(v.medianMs / yard.medianMs).toFixed(2)}× SciPy${name.includes('threads') ? ' workers=2' : ''}` : '';
    const fr = v.vsFftw !== undefined
      ? `  ${v.vsFftw.toFixed(2)}× FFTW${name.includes('threads') ? ' 2 threads' : ''} (min ${v.vsFftwMin.toFixed(2)}×, cpu ${v.cpuVsFftw.toFixed(2)}×)`
      : '';
    const vs = v.maxRelDiffVsFftJs ?? v.maxRelDiffVsTs;
    const diff = name === 'fft.js fft2' ? '' : `  Δ ${vs.toExponential(1)}${v.maxRelDiffVsTs !== undefined ? ' vs ts' : ''}`;
    console.log(`  ${name.padEnd(18)}${f(v.medianMs)} (${v.minMs.toFixed(1)})${fr}${ratio}${diff}`);
  }
  const fx = (r) => (r.x1RelDiff !== null && r.x1RelDiff < 1e-12 ? 'X[0,1] agrees' : `X[0,1] differs by ${r.x1RelDiff?.toExponential(1)}`);
  if (row.fftw) console.log(`  ${'FFTW 1 thread'.padEnd(18)}${f(row.fftw.medianMs)} (${row.fftw.minMs.toFixed(1)}) cpu ${row.fftw.cpuMedianMs.toFixed(1)}  ${row.fftw.version}, FFTW_MEASURE, in place; ${fx(row.fftw)}`);
  if (row.fftw2) console.log(`  ${'FFTW 2 threads'.padEnd(18)}${f(row.fftw2.medianMs)} (${row.fftw2.minMs.toFixed(1)}) cpu ${row.fftw2.cpuMedianMs.toFixed(1)}  the same, fftw_plan_with_nthreads(2)`);
  if (row.scipy) console.log(`  ${`SciPy ${row.scipy.version}`.padEnd(18)}${f(row.scipy.medianMs)} (${row.scipy.minMs.toFixed(1)})  scipy.fft.fft2(a, workers=1)`);
  if (row.scipy2) console.log(`  ${`SciPy ${row.scipy2.version}`.padEnd(18)}${f(row.scipy2.medianMs)} (${row.scipy2.minMs.toFixed(1)})  scipy.fft.fft2(a, workers=2)`);
}

if (teamEngine.threads > 1) await team.stopFftTeam();
if (fftwDir) rmSync(fftwDir, { recursive: true, force: true });
if (json) console.log(JSON.stringify({ rows, scipyNote, fftwNote, threads }, null, 2));
else {
  if (scipyNote) console.log(`\n${scipyNote}`);
  if (fftwNote) console.log(`\n${fftwNote}`);
}
