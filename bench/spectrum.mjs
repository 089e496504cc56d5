#!/usr/bin/env node
// A case of many wavelengths (not a test): issue 14's speed target, "a polychromatic case of 31
// wavelengths on a 2048² output grid runs in under 60 s on 2 cores". Runs against the built program
// (`npm run build` first; `npm run bench` does).
//   node bench/spectrum.mjs [--json] [--only cli,lines] [--rounds N] [--workers 1,2] [--cli path/to/cli.js]
//
// The case: an 8 mm square opening lit by untilted plane light, a screen 300 mm behind it (Fresnel
// number about 120 at 550 nm), 31 lines spread evenly over 450–650 nm. The planner puts the 31 lines
// on one common output grid of 2047² samples, each line by its own method (the angular spectrum on
// an FFT lattice through the grid's points, or the boundary form of the Rayleigh–Sommerfeld integral).
//
// cli    the command line as a child process (`spotcast run --workers N`: a single large case gets an
//        FFT team of N threads, as for a user), start to exit, report included: seconds, seconds per
//        wavelength, CPU time of all threads, the process's peak resident memory against the plan's
//        memory estimate, and the 60 s verdict.
// lines  the same case through the library in one thread (a child process), each line timed as it
//        is added in (run/spectrum-case.ts computeSpectrum's onLine): seconds per wavelength by method.
// The machine's load average is printed with the results: on a shared machine wall times are noisy;
// CPU time says how much work a run was.
import { spawnSync } from 'node:child_process';
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { availableParallelism, cpus, loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { runCli, writeUsagePreload } from './cli-process.mjs';

const args = process.argv.slice(2);
const json = args.includes('--json');
const opt = (name, dflt) => (args.includes(name) ? args[args.indexOf(name) + 1] : dflt);
const only = opt('--only', 'cli,lines').split(',');
const rounds = Math.max(1, Number(opt('--rounds', '1')));
const workerCounts = opt('--workers', '2').split(',').map(Number);
const cli = opt('--cli', fileURLToPath(new URL('../dist/src/cli.js', import.meta.url)));
const dist = new URL('./', pathToFileURL(cli)).href;
const child = opt('--child', null);

// 31 lines of equal power at the midpoints of 450–650 nm (as a 31-sample flat band would have them):
// given as lines so that the planner keeps 31 (for a band it would add samples: this near field's
// fringes at the window's corners ask for about 480).
const LINES = Array.from({ length: 31 }, (_, i) => `{wavelength: ${(450 + ((i + 0.5) * 200) / 31).toFixed(4)} nm, power: 1}`).join(', ');
const JOB = `name: spectrum-bench
description: 8 mm square opening, screen at 300 mm, 31 lines over 450-650 nm
distance: 300 mm
aperture: {shape: rectangle, width: 8 mm, height: 8 mm}
spectrum: {lines: [${LINES}]}
`;
const TARGET_S = 60;
const mib = (bytes) => `${(bytes / 1024 ** 2).toFixed(0)} MiB`;
const median = (xs) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[s.length >> 1] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};
const loads = [];
let workPerSecond = 1e9;
const noteLoad = (when) => loads.push({ when, load1: loadavg()[0] });

/** The case's plan through the library: the common grid, each line's method and lattice, the memory estimate. */
async function planOf() {
  const { parseJobText } = await import(new URL('job/load.js', dist));
  const { expandJob } = await import(new URL('job/expand.js', dist));
  const { planCase } = await import(new URL('plan/planner.js', dist));
  const { LIMITS } = await import(new URL('plan/limits.js', dist));
  workPerSecond = LIMITS.workPerSecond;
  const c = expandJob(parseJobText(JOB).spec)[0];
  const t0 = performance.now();
  const plan = planCase(c);
  const planSeconds = (performance.now() - t0) / 1000;
  if (plan.error) throw new Error(`the bench case is refused: ${plan.error}`);
  return { c, plan, planSeconds };
}

function methodOf(m) {
  return m.form ? `${m.method} (${m.form})` : m.method;
}

function planSummary(plan, planSeconds) {
  const members = plan.spectrum.members;
  const byMethod = new Map();
  for (const m of members) byMethod.set(methodOf(m), (byMethod.get(methodOf(m)) ?? 0) + 1);
  const lattices = new Map();
  for (const m of members) {
    if (m.sharedSpectrum || m.x.paddedSamples > 1) {
      const k = `${m.x.paddedSamples}×${m.y.paddedSamples} at ${(m.x.inputPitch * 1e6).toFixed(3)} µm`;
      lattices.set(k, (lattices.get(k) ?? 0) + 1);
    }
  }
  return {
    grid: [plan.x.output.n, plan.y.output.n],
    step: plan.x.output.step,
    wavelengths: members.length,
    methods: Object.fromEntries(byMethod),
    perLine: members.map((m) => ({ nm: +(m.case.wavelength * 1e9).toFixed(2), method: methodOf(m), padded: [m.x.paddedSamples, m.y.paddedSamples], shared: m.sharedSpectrum?.id ?? null })),
    lattices: Object.fromEntries(lattices),
    sharedLines: members.filter((m) => m.sharedSpectrum).length,
    memoryBytes: plan.memoryBytes,
    largestLineBytes: Math.max(...members.map((m) => m.memoryBytes)),
    workSeconds: plan.work / workPerSecond,
    planSeconds,
  };
}

async function cliRows(summary) {
  const dir = await mkdtemp(join(tmpdir(), 'spotcast-bench-'));
  const rows = [];
  try {
    const jobFile = join(dir, 'spectrum.yaml');
    await writeFile(jobFile, JOB);
    const preload = await writeUsagePreload(dir);
    const runs = new Map(workerCounts.map((w) => [w, []]));
    for (let r = 0; r < rounds; r++) {
      // Interleaved, the order alternating, so that a change in the machine's load falls on all.
      for (const w of r % 2 ? [...workerCounts].reverse() : workerCounts) {
        const out = join(dir, `out-${r}-${w}`);
        noteLoad(`cli --workers ${w} round ${r + 1} start`);
        runs.get(w).push(await runCli(cli, jobFile, out, w, preload, join(dir, `rss-${r}-${w}`)));
        noteLoad(`cli --workers ${w} round ${r + 1} end`);
        await rm(out, { recursive: true, force: true });
      }
    }
    for (const [w, rs] of runs) {
      const s = median(rs.map((x) => x.seconds));
      const cpu = median(rs.map((x) => x.cpuSeconds));
      const peak = Math.max(...rs.map((x) => x.maxRssKb)) * 1024;
      const n = summary.wavelengths;
      rows.push({
        name: `${n} wavelengths on ${summary.grid[0]}×${summary.grid[1]}, whole process, --workers ${w}`,
        median: s,
        unit: 's',
        extra:
          `${(s / n).toFixed(2)} s per wavelength; runs ${rs.map((x) => x.seconds.toFixed(1)).join(', ')} s; CPU ${cpu.toFixed(1)} s (all threads); ` +
          `peak RSS ${mib(peak)} against the plan's estimate ${mib(summary.memoryBytes)} (${(summary.memoryBytes / peak).toFixed(2)}×); ` +
          `target < ${TARGET_S} s on 2 cores: ${w === 2 ? (s < TARGET_S ? 'met' : 'NOT met') : 'n/a (1 worker)'}${w === 2 && !(s < TARGET_S) ? ` at load ${loads.at(-1).load1.toFixed(1)}` : ''}`,
        workers: w,
        seconds: rs.map((x) => x.seconds),
        cpuSeconds: cpu,
        peakRssBytes: peak,
        memoryEstimateBytes: summary.memoryBytes,
        estimateOverPeak: summary.memoryBytes / peak,
        targetMet: w === 2 ? s < TARGET_S : null,
      });
    }
  } finally {
    await rm(dir, { recursive: true, force: true });
  }
  return rows;
}

/** In a child process: every line through the library in this thread, each one's seconds. */
async function linesChild() {
  const { plan } = await planOf();
  const { createEngine } = await import(new URL('kernels.js', dist));
  const { newCaseContext } = await import(new URL('run/context.js', dist));
  const { computeSpectrum } = await import(new URL('run/spectrum-case.js', dist));
  const ctx = newCaseContext(createEngine());
  const cpu0 = process.cpuUsage();
  const t0 = performance.now();
  let last = t0;
  const lines = [];
  computeSpectrum(plan, ctx, (member, _w, m) => {
    const now = performance.now();
    lines.push({ nm: +(member.case.wavelength * 1e9).toFixed(2), method: methodOf(member), seconds: (now - last) / 1000, source: m.diagnostics.sourceSpectrum ?? null });
    last = now;
  });
  const cpu = process.cpuUsage(cpu0);
  console.log(JSON.stringify({ seconds: (performance.now() - t0) / 1000, cpuSeconds: (cpu.user + cpu.system) / 1e6, lines, maxRssKb: process.resourceUsage().maxRSS }));
}

function linesRows(summary) {
  noteLoad('lines start');
  const r = spawnSync(process.execPath, [fileURLToPath(import.meta.url), '--child', 'lines', '--cli', cli], { encoding: 'utf8', maxBuffer: 1 << 26, stdio: ['ignore', 'pipe', 'inherit'] });
  noteLoad('lines end');
  if (r.status !== 0) throw new Error(`the lines child exited with ${r.status}`);
  const got = JSON.parse(r.stdout);
  const by = new Map();
  for (const l of got.lines) {
    const k = `${l.method}${l.source ? `, source spectrum ${l.source}` : ''}`;
    const e = by.get(k) ?? { n: 0, s: 0 };
    by.set(k, { n: e.n + 1, s: e.s + l.seconds });
  }
  const rows = [
    {
      name: `${summary.wavelengths} wavelengths through the library, one thread (lines only)`,
      median: got.seconds,
      unit: 's',
      extra: `${(got.seconds / summary.wavelengths).toFixed(2)} s per wavelength; CPU ${got.cpuSeconds.toFixed(1)} s; child peak RSS ${mib(got.maxRssKb * 1024)}`,
      seconds: got.seconds,
      cpuSeconds: got.cpuSeconds,
      peakRssBytes: got.maxRssKb * 1024,
    },
  ];
  for (const [k, e] of by) rows.push({ name: `  per line: ${k}`, median: e.s / e.n, unit: 's per line', extra: `${e.n} lines, ${e.s.toFixed(1)} s together`, lines: e.n });
  return { rows, lines: got.lines };
}

if (child === 'lines') {
  await linesChild();
} else {
  noteLoad('start');
  const { plan, planSeconds } = await planOf();
  const summary = planSummary(plan, planSeconds);
  const rows = [];
  let lines = null;
  if (only.includes('cli')) rows.push(...(await cliRows(summary)));
  if (only.includes('lines')) {
    const l = linesRows(summary);
    rows.push(...l.rows);
    lines = l.lines;
  }
  noteLoad('end');
  const loadText = loads.map((l) => `${l.when} ${l.load1.toFixed(2)}`).join('; ');
  if (json) {
    console.log(JSON.stringify({ node: process.version, cores: availableParallelism(), cpu: cpus()[0]?.model, loadAverage1min: loads, plan: summary, rows, lines }, null, 2));
  } else {
    console.log(`spotcast spectrum benchmark — Node ${process.version}, ${availableParallelism()} cores (${cpus()[0]?.model ?? 'unknown CPU'})`);
    console.log(
      `case: 8 mm square, 300 mm, 31 lines over 450–650 nm; ${summary.wavelengths} wavelengths on one ${summary.grid[0]}×${summary.grid[1]} grid at ${(summary.step * 1e6).toFixed(3)} µm; ` +
        `methods ${Object.entries(summary.methods).map(([k, n]) => `${k} ×${n}`).join(', ')}; FFT lattices ${Object.entries(summary.lattices).map(([k, n]) => `${k} ×${n}`).join(', ') || 'none'}; ` +
        `${summary.sharedLines} lines share a source spectrum; planned in ${summary.planSeconds.toFixed(2)} s; estimate ${mib(summary.memoryBytes)} (largest line ${mib(summary.largestLineBytes)}), work about ${summary.workSeconds.toFixed(0)} s`,
    );
    console.log(`per line: ${summary.perLine.map((l) => `${l.nm} nm ${l.method}${l.shared ? ' (shared)' : ''}`).join('; ')}`);
    const w = Math.max(...rows.map((r) => r.name.length));
    for (const r of rows) console.log(`${r.name.padEnd(w)}  ${r.median.toFixed(3).padStart(9)} ${r.unit.padEnd(12)} ${r.extra ?? ''}`);
    console.log(`load average (1 min) on ${availableParallelism()} cores: ${loadText}`);
  }
}
