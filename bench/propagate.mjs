#!/usr/bin/env node
// Propagation benchmarks (not tests), against the built program (`npm run build` first; `npm run
// bench` does). Each measurement runs in a fresh child process, so that its peak memory (the
// process's maximum resident set, less what the process held before the case) is its own.
//   node bench/propagate.mjs [--json] [--only asm,sweep,auto,one-d] [--runs N] [--no-scipy]
//
// asm    one band-limited angular-spectrum case with a 2048² source grid, padded as the planner
//        pads it, end to end (source, padding, transforms, transfer, window), with 1 thread and
//        (when the program has FFT teams) 2; beside it the same propagation alone (pad, FFT,
//        transfer, inverse FFT, window) and the equivalent SciPy script, workers=1 and 2.
// sweep  a 64-distance sweep of one aperture on one grid: 64 independent cases against the same
//        64 with the source's spectrum computed once (compute and metrics; no files).
// auto   a 16-distance sweep of one rectangle with the grids the planner picks: every case on
//        its own grid against the planner's runs of cases on shared grids (plan/shared-grids.ts).
// one-d  a long slit (1-D), a rectangle (two 1-D problems) and a 1000-slit grating whose orders
//        leave at up to 45° (the exact integral, per period), cases per second.
// pad    the grid the planner pads an aperture of 1100 samples a side to (the angular spectrum's
//        transforms): the cheapest 5-smooth size that holds the linear convolution, not 4096.
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';

const args = process.argv.slice(2);
const opt = (name, dflt) => (args.includes(name) ? args[args.indexOf(name) + 1] : dflt);
const json = args.includes('--json');
const only = opt('--only', 'asm,sweep,auto,one-d,pad').split(',');
const runs = Number(opt('--runs', '5'));
const withScipy = !args.includes('--no-scipy');
const child = opt('--child', null);

const median = (xs) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[s.length >> 1] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};
const um = 1e-6;
const mm = 1e-3;

// ---- the cases ------------------------------------------------------------------------------

/** A case as the job expander makes it (only the physics given; the planner picks the rest). */
function makeCase(s) {
  return {
    job: 'bench',
    index: s.index ?? 0,
    id: s.id ?? 'case',
    wavelength: s.wavelength,
    distance: s.distance,
    aperture: s.aperture,
    illumination: { kind: 'plane', tilt: [0, 0] },
    ...(s.grid ? { grid: s.grid } : {}),
    ...(s.window ? { window: s.window } : {}),
    method: s.method ?? 'auto',
    swept: {},
    output: { npy: 'float64', logDecades: 5 },
    analysis: { detectors: [] },
  };
}

// A 0.6 mm pinhole 2 mm behind it at 633 nm (N_F ≈ 71): near field, angular spectrum; the grid
// is given as 2048² at 0.5 µm so that the source is 2048² whatever the accuracy rules would pick.
const ASM_CASE = {
  wavelength: 633e-9,
  distance: 2 * mm,
  aperture: { shape: 'circle', diameter: 0.6 * mm, opaque: false },
  method: 'angular-spectrum',
  grid: { size: 2048, pitch: 0.5 * um },
};

// 64 distances, 0.5 to 8 mm, of a 150 µm pinhole on a 512² grid at 0.5 µm (angular spectrum).
const SWEEP = Array.from({ length: 64 }, (_, i) => ({
  index: i,
  id: `z${i}`,
  wavelength: 633e-9,
  distance: 0.5 * mm * 16 ** (i / 63),
  aperture: { shape: 'circle', diameter: 150 * um, opaque: false },
  method: 'angular-spectrum',
  grid: { size: 512, pitch: 0.5 * um },
  window: [0.25 * mm, 0.25 * mm],
}));

// 16 distances, 1.25 to 2 mm, of a 500 × 300 µm rectangle at 633 nm (N_F 14–36): the planner
// takes the angular spectrum, on a grid per distance whose pitch follows the steepest ray.
const AUTO_SWEEP = Array.from({ length: 16 }, (_, i) => ({
  index: i,
  id: `z${i}`,
  wavelength: 633e-9,
  distance: 1.25 * mm + (0.75 * mm * i) / 15,
  aperture: { shape: 'rectangle', width: 500 * um, height: 300 * um, opaque: false },
}));

const ONE_D = [
  { name: 'slit 40 µm, 20 mm (1-D)', wavelength: 633e-9, distance: 20 * mm, aperture: { shape: 'slit', width: 40 * um, opaque: false } },
  {
    name: 'rectangle 300×120 µm, 15 mm (two 1-D problems)',
    wavelength: 633e-9,
    distance: 15 * mm,
    aperture: { shape: 'rectangle', width: 300 * um, height: 120 * um, opaque: false },
  },
  {
    // Orders to ±45°, N_F ≈ 1.2: the exact integral, one period summed over the 1000 (with the order
    // table and its checks).
    name: 'grating 1000 × 1 µm at 1.667 µm, 589 nm, 1 m (exact, orders to 45°)',
    wavelength: 589e-9,
    distance: 1,
    aperture: { shape: 'slits', count: 1000, width: 1 * um, period: 1.667 * um, opaque: false },
  },
];

// ---- measurements (each in its own child process) -------------------------------------------

async function load() {
  const dist = new URL('../dist/src/', import.meta.url);
  const m = {
    ...(await import(new URL('kernels.js', dist))),
    ...(await import(new URL('plan/planner.js', dist))),
    ...(await import(new URL('plan/share.js', dist))),
    ...(await import(new URL('plan/shared-grids.js', dist)).catch(() => ({}))),
    ...(await import(new URL('run/compute.js', dist))),
    ...(await import(new URL('run/run-case.js', dist))),
    ...(await import(new URL('run/context.js', dist))),
    ...(await import(new URL('optics/field.js', dist))),
    ...(await import(new URL('optics/spectral.js', dist))),
    ...(await import(new URL('optics/aperture.js', dist)).catch(() => ({}))),
  };
  try {
    m.team = await import(new URL('parallel/fft-team.js', dist));
  } catch {
    m.team = null;
  }
  m.engine = m.createEngine();
  return m;
}

const rss = () => process.resourceUsage().maxRSS * 1024;

/**
 * A sweep's plans run one after another in one fresh context (as one worker runs them, keeping a
 * shared spectrum), after an untimed warm-up case in a context of its own: seconds and how many
 * cases reused a kept spectrum.
 */
function timeSweep(m, plans, warmUp) {
  m.runPlannedCase(warmUp, m.newCaseContext(m.engine));
  const ctx = m.newCaseContext(m.engine);
  const t0 = performance.now();
  let reused = 0;
  for (const p of plans) {
    const rec = m.runPlannedCase(p, ctx);
    if (rec.computed.diagnostics.sourceSpectrum === 'reused') reused++;
  }
  return { s: (performance.now() - t0) / 1000, reused };
}

async function measure(kind, threads) {
  const m = await load();
  if (threads > 1) {
    if (!m.team) return { skipped: 'this build has no FFT teams (in-case threads)' };
    m.engine = await m.team.startFftTeam(threads, m.engine);
  }
  // One context per measurement, as a run has (its kept spectrum and search cache go with it).
  let ctx = m.newCaseContext(m.engine);
  const base = rss();
  const out = { threads };
  try {
    if (kind === 'asm-case' || kind === 'asm-propagation') {
      const plan = m.planCase(makeCase(ASM_CASE), {});
      out.plan = { source: [plan.x.inputSamples, plan.y.inputSamples], padded: [plan.x.paddedSamples, plan.y.paddedSamples], memoryBytes: plan.memoryBytes, method: plan.method, window: plan.x.output.n };
      const times = [];
      if (kind === 'asm-case') {
        for (let k = 0; k < runs + 1; k++) {
          const t0 = performance.now();
          m.computeCase(plan, ctx);
          if (k > 0) times.push(performance.now() - t0);
        }
      } else {
        // The propagation alone, as the SciPy script does it: pad, transform, multiply, invert, cut.
        const src = m.createField(m.fftAxis(plan.x.inputSamples, plan.x.inputPitch), m.fftAxis(plan.y.inputSamples, plan.y.inputPitch), plan.case.wavelength);
        const r = plan.case.aperture.diameter / 2;
        for (let i = 0; i < src.ny; i++) {
          const y = src.y0 + i * src.dy;
          for (let j = 0; j < src.nx; j++) {
            const x = src.x0 + j * src.dx;
            if (x * x + y * y <= r * r) src.data[2 * (i * src.nx + j)] = 1;
          }
        }
        for (let k = 0; k < runs + 1; k++) {
          const t0 = performance.now();
          const g = m.padField(src, plan.x.paddedSamples, plan.y.paddedSamples, m.engine);
          m.propagateAngularSpectrum(m.engine, g, plan.case.distance);
          const w = plan.x.output.n;
          const c0 = Math.round((plan.x.output.start - g.x0) / g.dx);
          const win = new Float64Array(2 * w * w);
          for (let i = 0; i < w; i++) win.set(g.data.subarray(2 * ((i + c0) * g.nx + c0), 2 * ((i + c0) * g.nx + c0 + w)), 2 * i * w);
          if (k > 0) times.push(performance.now() - t0);
        }
      }
      out.medianMs = median(times);
      out.minMs = Math.min(...times);
      out.runs = times.length;
    } else if (kind === 'sweep-independent' || kind === 'sweep-shared') {
      const plans = SWEEP.map((s) => m.planCase(makeCase(s), {}));
      if (kind === 'sweep-shared') m.shareSourceSpectra(plans);
      // one case first, untimed, so that both variants start warm
      const { s, reused } = timeSweep(m, plans, m.planCase(makeCase(SWEEP[0]), {}));
      Object.assign(out, {
        cases: plans.length,
        seconds: s,
        secondsPerDistance: s / plans.length,
        reused,
        grid: [plans[0].x.paddedSamples, plans[0].y.paddedSamples],
        memoryBytes: plans[0].memoryBytes,
      });
    } else if (kind === 'auto-own' || kind === 'auto-shared') {
      const cases = AUTO_SWEEP.map(makeCase);
      if (kind === 'auto-shared' && !m.planCases) return { skipped: 'this build has no shared grids' };
      const plans = kind === 'auto-shared' ? m.planCases(cases, {}) : cases.map((c) => m.planCase(c, {}));
      m.shareSourceSpectra(plans);
      const { s, reused } = timeSweep(m, plans, m.planCase(cases[cases.length - 1], {}));
      const grids = new Set(plans.map((p) => `${p.x.paddedSamples}×${p.y?.paddedSamples}`));
      Object.assign(out, { cases: plans.length, seconds: s, secondsPerDistance: s / plans.length, reused, grids: grids.size, methods: [...new Set(plans.map((p) => p.method))].join(', ') });
    } else if (kind === 'one-d') {
      out.cases = [];
      for (const c of ONE_D) {
        const plan = m.planCase(makeCase(c), {});
        const times = [];
        const t = performance.now();
        let k = 0;
        // at least `runs` repetitions and half a second, after one warm-up
        m.runPlannedCase(plan, ctx);
        while (k < runs || performance.now() - t < 500) {
          const t0 = performance.now();
          m.runPlannedCase(plan, ctx);
          times.push(performance.now() - t0);
          k++;
        }
        const med = median(times);
        out.cases.push({ name: c.name, method: `${plan.method}${plan.form ? ` (${plan.form})` : ''}`, layout: plan.layout, samples: plan.x.paddedSamples, medianMs: med, casesPerSecond: 1000 / med, runs: times.length });
      }
    }
  } finally {
    if (threads > 1) await m.team.stopFftTeam();
  }
  out.peakBytes = rss() - base;
  return out;
}

if (child) {
  const [kind, threads] = child.split(':');
  const r = await measure(kind, Number(threads));
  process.stdout.write(`\n@@${JSON.stringify(r)}\n`);
  process.exit(0);
}

function inChild(kind, threads) {
  const r = spawnSync(process.execPath, [fileURLToPath(import.meta.url), '--child', `${kind}:${threads}`, '--runs', String(runs)], {
    encoding: 'utf8',
    maxBuffer: 1 << 24,
  });
  if (r.status !== 0) return { error: (r.stderr || `exit ${r.status}`).trim().split('\n').slice(-3).join(' | ') };
  const line = r.stdout.split('\n').find((l) => l.startsWith('@@'));
  return line ? JSON.parse(line.slice(2)) : { error: 'no result' };
}

// ---- SciPy, the outside yardstick ------------------------------------------------------------

const scipyScript = `
import json, sys, time, resource
import numpy as np, scipy, scipy.fft as sf
n, npad, dx, lam, z, a, win, workers, runs = (int(sys.argv[1]), int(sys.argv[2]), float(sys.argv[3]), float(sys.argv[4]),
    float(sys.argv[5]), float(sys.argv[6]), int(sys.argv[7]), int(sys.argv[8]), int(sys.argv[9]))
x = (np.arange(n) - n // 2) * dx
src = ((x[None, :] ** 2 + x[:, None] ** 2) <= a * a).astype(np.complex128)
base = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss
def propagate():
    g = np.zeros((npad, npad), np.complex128)
    o = (npad - n) // 2
    g[o:o + n, o:o + n] = src
    F = sf.fft2(g, workers=workers, overwrite_x=True)
    f = sf.fftfreq(npad, dx)
    L = npad * dx
    lim = 1 / (lam * np.sqrt((2 * z / L) ** 2 + 1))
    f2 = f[None, :] ** 2 + f[:, None] ** 2
    arg = np.maximum(1 / lam ** 2 - f2, 0)
    H = np.exp(2j * np.pi * z * (np.sqrt(arg) - 1 / lam))
    H[(np.abs(f)[None, :] > lim) | (np.abs(f)[:, None] > lim) | (f2 >= 1 / lam ** 2)] = 0
    F *= H
    u = sf.ifft2(F, workers=workers, overwrite_x=True)
    c = npad // 2 - win // 2
    return u[c:c + win, c:c + win].copy()
propagate()
ts = []
for _ in range(runs):
    t = time.perf_counter(); propagate(); ts.append((time.perf_counter() - t) * 1e3)
ts.sort()
m = ts[len(ts) // 2] if len(ts) % 2 else (ts[len(ts) // 2 - 1] + ts[len(ts) // 2]) / 2
peak = (resource.getrusage(resource.RUSAGE_SELF).ru_maxrss - base) * 1024
print(json.dumps({"medianMs": m, "minMs": ts[0], "version": scipy.__version__, "peakBytes": peak}))
`;

function scipyPropagation(plan, workers) {
  if (!withScipy) return { skipped: '--no-scipy' };
  const env = { ...process.env };
  delete env.OPENBLAS_CORETYPE;
  delete env.OPENBLAS_L2_SIZE;
  const r = spawnSync(
    'python3',
    ['-c', scipyScript, ...[plan.source[0], plan.padded[0], ASM_CASE.grid.pitch, ASM_CASE.wavelength, ASM_CASE.distance, ASM_CASE.aperture.diameter / 2, plan.window, workers, runs].map(String)],
    { env, encoding: 'utf8' },
  );
  if (r.status !== 0) return { skipped: `SciPy not timed: ${(r.stderr || r.error?.message || 'python3 failed').trim().split('\n').pop()}` };
  return JSON.parse(r.stdout.trim().split('\n').pop());
}

// ---- the report -------------------------------------------------------------------------------

const rows = [];
const MB = (b) => `${(b / 1024 ** 2).toFixed(0)} MB`;

if (only.includes('asm')) {
  const one = inChild('asm-case', 1);
  const two = inChild('asm-case', 2);
  const prop1 = inChild('asm-propagation', 1);
  const prop2 = inChild('asm-propagation', 2);
  const plan = one.plan ?? prop1.plan;
  const padded = plan ? plan.padded[0] * plan.padded[1] : 0;
  const arrays = (b) => (padded ? `${(b / (16 * padded)).toFixed(2)} padded arrays` : '');
  const label = plan ? `${plan.source.join('×')} → ${plan.padded.join('×')}` : '2048²';
  for (const [name, r] of [
    [`angular-spectrum case ${label}, 1 thread`, one],
    [`angular-spectrum case ${label}, 2 threads`, two],
    [`  propagation alone, 1 thread`, prop1],
    [`  propagation alone, 2 threads`, prop2],
  ]) {
    if (r.error || r.skipped) {
      rows.push({ section: 'asm', name, skipped: r.error ?? r.skipped });
      continue;
    }
    rows.push({
      section: 'asm',
      name,
      medianMs: r.medianMs,
      minMs: r.minMs,
      casesPerSecond: 1000 / r.medianMs,
      peakBytes: r.peakBytes,
      plannedBytes: plan?.memoryBytes,
      note: `peak ${MB(r.peakBytes)} = ${arrays(r.peakBytes)}${name.includes('case') ? `; plan says ${MB(plan.memoryBytes)}` : ''}`,
    });
  }
  if (plan) {
    for (const w of [1, 2]) {
      const s = scipyPropagation(plan, w);
      const ours = (w === 1 ? prop1 : prop2).medianMs;
      if (s.skipped) rows.push({ section: 'asm', name: `  SciPy propagation, workers=${w}`, skipped: s.skipped });
      else {
        rows.push({
          section: 'asm',
          name: `  SciPy ${s.version} propagation, workers=${w}`,
          medianMs: s.medianMs,
          minMs: s.minMs,
          peakBytes: s.peakBytes,
          ratio: ours ? ours / s.medianMs : null,
          note: `ours / SciPy = ${ours ? (ours / s.medianMs).toFixed(2) : '—'}; peak ${MB(s.peakBytes)} = ${arrays(s.peakBytes)}`,
        });
      }
    }
  }
}

if (only.includes('sweep')) {
  const ind = inChild('sweep-independent', 1);
  const sh = inChild('sweep-shared', 1);
  for (const [name, r] of [
    ['64-distance sweep, 64 independent cases', ind],
    ['64-distance sweep, source spectrum shared', sh],
  ]) {
    if (r.error) rows.push({ section: 'sweep', name, skipped: r.error });
    else
      rows.push({
        section: 'sweep',
        name,
        medianMs: 1000 * r.secondsPerDistance,
        casesPerSecond: 1 / r.secondsPerDistance,
        peakBytes: r.peakBytes,
        note: `${r.cases} cases in ${r.seconds.toFixed(1)} s on ${r.grid.join('×')}; ${r.reused} reused the spectrum; peak ${MB(r.peakBytes)}`,
      });
  }
  if (!ind.error && !sh.error) {
    rows.push({ section: 'sweep', name: '  fewer seconds per distance, shared vs independent', ratio: ind.secondsPerDistance / sh.secondsPerDistance, note: 'target ≥ 1.8' });
  }
}

if (only.includes('auto')) {
  const own = inChild('auto-own', 1);
  const sh = inChild('auto-shared', 1);
  for (const [name, r] of [
    ['16-distance sweep, automatic grids, one each', own],
    ['16-distance sweep, automatic grids, shared by runs', sh],
  ]) {
    if (r.error || r.skipped) rows.push({ section: 'auto', name, skipped: r.error ?? r.skipped });
    else
      rows.push({
        section: 'auto',
        name,
        medianMs: 1000 * r.secondsPerDistance,
        casesPerSecond: 1 / r.secondsPerDistance,
        peakBytes: r.peakBytes,
        note: `${r.cases} cases in ${r.seconds.toFixed(1)} s (${r.methods}) on ${r.grids} grid(s); ${r.reused} reused a spectrum; peak ${MB(r.peakBytes)}`,
      });
  }
  if (!own.error && !sh.error && !sh.skipped) {
    rows.push({ section: 'auto', name: '  fewer seconds per distance, shared grids vs one each', ratio: own.secondsPerDistance / sh.secondsPerDistance });
  }
}

if (only.includes('one-d')) {
  const r = inChild('one-d', 1);
  if (r.error) rows.push({ section: 'one-d', name: '1-D cases', skipped: r.error });
  else
    for (const c of r.cases) {
      rows.push({ section: 'one-d', name: c.name, medianMs: c.medianMs, casesPerSecond: c.casesPerSecond, note: `${c.method}, ${c.layout}, ${c.samples} samples, ${c.runs} runs` });
    }
}

if (only.includes('pad')) {
  // A disc at 1 µm pitch whose diameter makes the illuminated aperture exactly 1100 samples a side
  // (the planner adds its own margin to the diameter, so the diameter is searched for).
  const { planCase } = await import('../dist/src/plan/planner.js');
  const { isFastFftSize } = await import('../dist/src/optics/fft.js');
  let found = null;
  for (let d = 900; d <= 1000 && !found; d++) {
    const c = makeCase({ wavelength: 633e-9, distance: 5 * mm, aperture: { shape: 'circle', diameter: d * um, opaque: false } });
    const p = planCase({ ...c, grid: { pitch: 1 * um }, method: 'angular-spectrum' });
    if (!p.error && p.x.inputSamples === 1100) found = { d, p };
  }
  if (!found) rows.push({ section: 'pad', name: 'an aperture of 1100 samples a side', skipped: 'no diameter gave 1100 samples' });
  else {
    const n = found.p.x.paddedSamples;
    const f = factors(n);
    rows.push({
      section: 'pad',
      name: 'an aperture of 1100 samples a side pads to',
      text: `${n} × ${found.p.y?.paddedSamples ?? 1} (${f}; 5-smooth: ${isFastFftSize(n)}); the next power of two and twice that, the rule before 5-smooth sizes, gave ${2 * 2 ** Math.ceil(Math.log2(1100))}; disc ${found.d} µm at 1 µm pitch, angular spectrum`,
    });
  }
}

/** n as a product of prime powers, e.g. 2·3²·5³. */
function factors(n) {
  const parts = [];
  for (const q of [2, 3, 5, 7, 11, 13]) {
    let k = 0;
    while (n % q === 0) {
      n /= q;
      k++;
    }
    if (k) parts.push(k === 1 ? `${q}` : `${q}^${k}`);
  }
  if (n > 1) parts.push(String(n));
  return parts.join('·');
}

if (json) console.log(JSON.stringify({ rows }, null, 2));
else {
  console.log('propagation: median ms per case (or per distance), cases per second, peak memory');
  const w = Math.max(...rows.map((r) => r.name.length));
  for (const r of rows) {
    if (r.skipped) {
      console.log(`${r.name.padEnd(w)}  skipped: ${r.skipped}`);
      continue;
    }
    if (r.text) {
      console.log(`${r.name.padEnd(w)}  ${r.text}`);
      continue;
    }
    const t = r.medianMs !== undefined ? `${r.medianMs.toFixed(1).padStart(9)} ms` : `${r.ratio.toFixed(2).padStart(9)} × `;
    const cps = r.casesPerSecond !== undefined ? `${r.casesPerSecond.toFixed(2).padStart(8)}/s` : ''.padStart(10);
    console.log(`${r.name.padEnd(w)}  ${t} ${cps}  ${r.note ?? ''}`);
  }
}
