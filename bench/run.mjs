#!/usr/bin/env node
// spotcast benchmarks (not tests): wall-clock timings, printed as a table, or as JSON with --json.
// Runs against the built program (npm run build first; `npm run bench` does).
//   node bench/run.mjs [--json] [--only process|workers|overhead] [--rounds N] [--cli path/to/cli.js]
// Sections:
//   process   a 100-case small far-field sweep run by the command line as a whole process (start to
//             exit, report included) with --workers 1 and --workers 2, rounds interleaved; cases per
//             second, the ratio, and each process's peak resident memory (all its threads); then
//             what bounds the ratio on this machine: two --workers 1 processes side by side (no
//             worker threads, nothing shared), and 2 × wall / CPU of --workers 1.
//   workers   the same kind of sweep inside one process, counted from the first case's start to the
//             last one's end (the run loop alone).
//   overhead  what a case costs outside its propagation, by part, and the job report's time.
// The machine's load average is printed with the results: on a shared machine, trust ratios of
// runs interleaved round by round over absolute times.
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir, availableParallelism, cpus, loadavg } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { runCli, writeUsagePreload } from './cli-process.mjs';
import { HEAP_GROWING_PERCENT } from '../dist/src/run/v8-settings.js';
import { setFlagsFromString } from 'node:v8';

const args = process.argv.slice(2);
const json = args.includes('--json');
const option = (name) => (args.includes(name) ? args[args.indexOf(name) + 1] : null);
const only = option('--only');
const rounds = Math.max(1, Number(option('--rounds') ?? 3));
// The in-process rows run with the heap growth the command line sets for its runs.
setFlagsFromString(`--heap-growing-percent=${HEAP_GROWING_PERCENT}`);
// --cli: another build's dist/src/cli.js (to compare builds with the same measurement).
const cli = option('--cli') ?? fileURLToPath(new URL('../dist/src/cli.js', import.meta.url));
const rows = [];
const loads = [];
const noteLoad = (when) => loads.push({ when, load1: loadavg()[0] });
const median = (a) => {
  const s = a.slice().sort((x, y) => x - y);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
};
const mib = (kb) => `${(kb / 1024).toFixed(0)} MiB`;
/** This process's peak resident memory so far (KiB): an upper bound for an in-process row. */
const selfPeakKb = () => process.resourceUsage().maxRSS;

// The 100-case small far-field sweep of the process and workers rows: a 50 µm pinhole from 0.5 to 2 m
// (N_F 0.002–0.0005), each case the far-field formula on a 401 × 401 window.
const SMALL_SWEEP = `name: bench-sweep
wavelength: 633 nm
distance: {from: 0.5 m, to: 2 m, count: 100}
aperture: {shape: circle, diameter: 50 um}
`;

async function processRow() {
  const dir = await mkdtemp(join(tmpdir(), 'spotcast-bench-'));
  try {
    const jobFile = join(dir, 'sweep.yaml');
    await writeFile(jobFile, SMALL_SWEEP);
    const preload = await writeUsagePreload(dir);
    const runs = { 1: [], 2: [] };
    const pairs = [];
    noteLoad('process row start');
    for (let r = 0; r < rounds; r++) {
      // Interleaved, the order alternating, so that a change in the machine's load falls on both.
      for (const w of r % 2 ? [2, 1] : [1, 2]) {
        const out = join(dir, `out-${r}-${w}`);
        runs[w].push(await runCli(cli, jobFile, out, w, preload, join(dir, `rss-${r}-${w}`)));
        await rm(out, { recursive: true, force: true });
      }
      // Two whole --workers 1 processes at once, each its own 100 cases: the throughput two cores give
      // this workload with nothing shared (no worker threads, two reports), timed to the later exit.
      const t0 = performance.now();
      await Promise.all(['a', 'b'].map((k) => runCli(cli, jobFile, join(dir, `pair-${r}-${k}`), 1, preload, join(dir, `rss-${r}-${k}`))));
      pairs.push((performance.now() - t0) / 1000);
      for (const k of ['a', 'b']) await rm(join(dir, `pair-${r}-${k}`), { recursive: true, force: true });
    }
    noteLoad('process row end');
    const cases = 100;
    const med = (w) => median(runs[w].map((x) => x.seconds));
    for (const w of [1, 2]) {
      rows.push({
        name: `100-case far-field sweep, whole process, --workers ${w}`,
        median: med(w),
        unit: 's',
        extra:
          `${(cases / med(w)).toFixed(2)} cases/s start to exit (report included); runs ${runs[w].map((x) => x.seconds.toFixed(2)).join(', ')} s; ` +
          `CPU ${median(runs[w].map((x) => x.cpuSeconds)).toFixed(1)} s; peak RSS ${mib(Math.max(...runs[w].map((x) => x.maxRssKb)))}`,
        cpuSeconds: median(runs[w].map((x) => x.cpuSeconds)),
        peakRssKb: Math.max(...runs[w].map((x) => x.maxRssKb)),
      });
    }
    const perRound = runs[1].map((x, i) => x.seconds / runs[2][i].seconds);
    rows.push({
      name: 'whole-process speed-up of 2 workers over 1',
      median: med(1) / med(2),
      unit: '×',
      extra: `ratio of the medians; per round ${perRound.map((x) => x.toFixed(2)).join(', ')}; target ≥ 1.8`,
    });
    // What bounds that ratio here. A --workers 1 run already keeps more than one core busy (V8's
    // collector and compiler threads, the file writes' thread pool), so two cores can give at most
    // 2 × its wall / its CPU of it, even were --workers 2 to cost no CPU at all beyond it.
    const w1Cpu = median(runs[1].map((x) => x.cpuSeconds));
    rows.push({
      name: 'two --workers 1 processes side by side, 100 cases each',
      median: median(pairs),
      unit: 's',
      extra: `to the later exit; runs ${pairs.map((x) => x.toFixed(2)).join(', ')} s; throughput ${((2 * med(1)) / median(pairs)).toFixed(2)}× one such process alone`,
    });
    rows.push({
      name: 'ceiling of the 2-worker ratio: 2 × wall / CPU of --workers 1',
      median: (2 * med(1)) / w1Cpu,
      unit: '×',
      extra: `--workers 1 keeps ${(w1Cpu / med(1)).toFixed(2)} cores busy (CPU ${w1Cpu.toFixed(1)} s over ${med(1).toFixed(2)} s)`,
    });
  } finally {
    await rm(dir, { recursive: true, force: true });
  }
}

function timer() {
  let first = null;
  let last = null;
  let n = 0;
  return {
    reporter: {
      jobStart() {},
      caseStart() {
        first ??= performance.now();
      },
      caseDone() {
        n++;
        last = performance.now();
      },
      caseFailed(id, e) {
        throw new Error(`${id}: ${e}`);
      },
      note() {},
      jobEnd() {},
    },
    result: () => ({ cases: n, seconds: (last - first) / 1000 }),
    lastDone: () => last,
  };
}

// The run loop alone: cases per second with 1 and with 2 workers, from the first case's start to the
// last's end (planning before and the report after are left out; the process row has them).
async function workersRow() {
  const { parseJobText } = await import('../dist/src/job/load.js');
  const { runJob } = await import('../dist/src/run/run-job.js');
  const job = parseJobText(SMALL_SWEEP);
  const out = { 1: [], 2: [] };
  noteLoad('workers row start');
  for (let r = 0; r < rounds; r++) {
    for (const workers of r % 2 ? [2, 1] : [1, 2]) {
      const dir = await mkdtemp(join(tmpdir(), 'spotcast-bench-'));
      const t = timer();
      await runJob(job, { outDir: dir, workers, reporter: t.reporter });
      out[workers].push(t.result());
      await rm(dir, { recursive: true, force: true });
    }
  }
  noteLoad('workers row end');
  const med = (w) => median(out[w].map((x) => x.seconds));
  for (const w of [1, 2]) {
    rows.push({
      name: `100-case far-field sweep, run loop only, --workers ${w}`,
      median: med(w),
      unit: 's (cases only)',
      extra: `${(100 / med(w)).toFixed(2)} cases/s; bench process peak RSS so far ${mib(selfPeakKb())}`,
      peakRssKb: selfPeakKb(),
    });
  }
  rows.push({ name: 'run-loop speed-up of 2 workers over 1', median: med(1) / med(2), unit: '×', extra: 'ratio of the medians' });
}

// What a case costs outside its propagation (targets, issue 12: at most the propagation of a 512²
// case, and 30 ms for a small far-field case), by part: the energy curve (timed again alone), the
// rest of the case's analysis (runPlannedCase less a computeCase of the same plan and less the
// curve), and the writing of its folder, with the two intensity pictures, the other pictures
// (profile, zoom, encircled energy), the .npy encoding and the digests timed again alone (the rest
// of the folder: CSVs, result.json, record.json, the file system). Each
// repetition is a different distance, so no case repeats another's analysis.
async function overheadRow() {
  const { parseJobText } = await import('../dist/src/job/load.js');
  const { runJob } = await import('../dist/src/run/run-job.js');
  const { expandJob } = await import('../dist/src/job/expand.js');
  const { planCase, methodWords } = await import('../dist/src/plan/planner.js');
  const { createEngine } = await import('../dist/src/kernels.js');
  const { newCaseContext } = await import('../dist/src/run/context.js');
  const { runPlannedCase } = await import('../dist/src/run/run-case.js');
  const { computeCase } = await import('../dist/src/run/compute.js');
  const { writeCase, caseTitle, digestOf } = await import('../dist/src/output/case-output.js');
  const { energyCurve } = await import('../dist/src/analysis/encircled.js');
  const { renderIntensityPngs } = await import('../dist/src/output/picture.js');
  const { profilePicture, zoomPicture, energyPicture } = await import('../dist/src/output/extra-pictures.js');
  const { isOneD } = await import('../dist/src/model/grid.js');
  const { encodeNpy } = await import('../dist/src/output/npy.js');
  const kinds = [
    ['small far-field case (50 µm pinhole, 0.5–2 m)', 'distance: {from: 0.5 m, to: 2 m, count: 9}\naperture: {shape: circle, diameter: 50 um}'],
    // grid.size 512 by the angular spectrum (asked for: the planner picks direct sums at some of these
    // distances), its FFTs on the padded 2048² grid, a 481² window.
    [
      '512² case (1 mm disc, grid.size 512, angular spectrum, 20–40 mm)',
      'distance: {from: 20 mm, to: 40 mm, count: 5}\naperture: {shape: circle, diameter: 1 mm}\ngrid: {size: 512}\nmethod: angular-spectrum',
    ],
  ];
  noteLoad('overhead row start');
  for (const [name, body] of kinds) {
    const cases = expandJob(parseJobText(`name: bench-overhead\nwavelength: 633 nm\n${body}\n`).spec);
    const ctx = newCaseContext(createEngine());
    const dir = await mkdtemp(join(tmpdir(), 'spotcast-bench-'));
    // Each part in wall-clock ms and in CPU ms of this process (user + system: what the part cost,
    // whatever else the machine ran meanwhile; on an idle machine the two agree for these
    // one-thread parts, the CPU time then also counting the file writes' thread-pool work).
    const part = { prop: [], analysis: [], curve: [], write: [], pictures: [], plots: [], npy: [], digests: [] };
    const cpuPart = { prop: [], analysis: [], curve: [], write: [], pictures: [], plots: [], npy: [], digests: [] };
    const clock = () => ({ wall: performance.now(), cpu: process.cpuUsage() });
    const since = (t) => {
      const c = process.cpuUsage(t.cpu);
      return { wall: performance.now() - t.wall, cpu: (c.user + c.system) / 1000 };
    };
    const keep = (key, d) => {
      part[key].push(d.wall);
      cpuPart[key].push(d.cpu);
    };
    let shape = '';
    for (const c of cases) {
      const plan = planCase(c);
      // Once to fill what the context keeps between cases (a sweep's source spectrum), so that the
      // timed propagation and the one inside runPlannedCase do the same work.
      computeCase(plan, ctx);
      let t = clock();
      computeCase(plan, ctx);
      const tc = since(t);
      t = clock();
      const rec = runPlannedCase(plan, ctx);
      const tr = since(t);
      t = clock();
      await writeCase(dir, rec);
      keep('write', since(t));
      // The parts, each again on its own.
      const centre = rec.metrics.encircled?.centre ?? [0, 0];
      t = clock();
      energyCurve(rec.computed, centre, rec.computed.diagnostics.powerIn);
      keep('curve', since(t));
      t = clock();
      const pngs = renderIntensityPngs({ map: rec.computed, logDecades: plan.case.output.logDecades, title: caseTitle(plan) }, ['shoal', 'gray']);
      keep('pictures', since(t));
      // The other pictures: profile.png, intensity-zoom.png (where the spot is small in its window)
      // and encircled-energy.png.
      t = clock();
      const title = caseTitle(plan);
      const plots = [profilePicture(plan, rec.computed, title), zoomPicture(plan, rec.computed, title), energyPicture(plan, rec.energy, isOneD(rec.computed), title)];
      keep('plots', since(t));
      t = clock();
      const npy = encodeNpy(rec.computed.intensity, [rec.computed.ny, rec.computed.nx], plan.case.output.npy);
      keep('npy', since(t));
      t = clock();
      for (const b of [npy, ...pngs, ...plots]) if (b) digestOf(b);
      keep('digests', since(t));
      keep('prop', tc);
      keep('analysis', { wall: Math.max(0, tr.wall - tc.wall), cpu: Math.max(0, tr.cpu - tc.cpu) });
      shape = `${rec.computed.ny}×${rec.computed.nx} window, ${methodWords(plan.method, plan.form)}, padded ${plan.x.paddedSamples}×${plan.y?.paddedSamples ?? 1}`;
    }
    await rm(dir, { recursive: true, force: true });
    const m = Object.fromEntries(Object.entries(part).map(([k, v]) => [k, median(v)]));
    const mc = Object.fromEntries(Object.entries(cpuPart).map(([k, v]) => [k, median(v)]));
    const over = m.analysis + m.write;
    const parts = (x) =>
      `analysis ${x.analysis.toFixed(1)} (energy curve ${x.curve.toFixed(1)}) + files ${x.write.toFixed(1)} ` +
      `(intensity pictures ${x.pictures.toFixed(1)}, other pictures ${x.plots.toFixed(1)}, .npy ${x.npy.toFixed(1)}, digests ${x.digests.toFixed(1)}, ` +
      `the rest ${Math.max(0, x.write - x.pictures - x.plots - x.npy - x.digests).toFixed(1)}); ` +
      `propagation ${x.prop.toFixed(1)}`;
    rows.push({
      name: `outside the propagation, ${name}`,
      median: over / 1000,
      unit: 's per case',
      extra:
        `${shape}. Wall ms: ${parts(m)}. CPU ms: ${parts(mc)}, outside the propagation ${(mc.analysis + mc.write).toFixed(1)}. ` +
        `Bench process peak RSS so far ${mib(selfPeakKb())}`,
      parts: m,
      cpuParts: mc,
      peakRssKb: selfPeakKb(),
    });
  }
  // The job-level report (summary CSV, plots, contact sheet, report.html) of a 100-case sweep: from
  // the last case's end to runJob's return, as the median of the rounds.
  const job = parseJobText(SMALL_SWEEP);
  const report = [];
  for (let r = 0; r < rounds; r++) {
    const dir = await mkdtemp(join(tmpdir(), 'spotcast-bench-'));
    const t = timer();
    await runJob(job, { outDir: dir, workers: 2, reporter: t.reporter });
    report.push((performance.now() - t.lastDone()) / 1000);
    await rm(dir, { recursive: true, force: true });
  }
  noteLoad('overhead row end');
  rows.push({
    name: 'job report of a 100-case sweep',
    median: median(report),
    unit: 's',
    extra: `runs ${report.map((x) => x.toFixed(2)).join(', ')} s; target < 2 s; bench process peak RSS so far ${mib(selfPeakKb())}`,
    peakRssKb: selfPeakKb(),
  });
}

if (!only || only === 'process') await processRow();
if (!only || only === 'workers') await workersRow();
if (!only || only === 'overhead') await overheadRow();

const loadText = loads.map((l) => `${l.when} ${l.load1.toFixed(2)}`).join('; ');
if (json) {
  console.log(JSON.stringify({ node: process.version, cores: availableParallelism(), cpu: cpus()[0]?.model, loadAverage1min: loads, rows }, null, 2));
} else {
  console.log(`spotcast benchmarks — Node ${process.version}, ${availableParallelism()} cores (${cpus()[0]?.model ?? 'unknown CPU'})`);
  const w = Math.max(...rows.map((r) => r.name.length));
  for (const r of rows) console.log(`${r.name.padEnd(w)}  ${r.median.toFixed(3).padStart(9)} ${r.unit.padEnd(14)} ${r.extra ?? ''}`);
  console.log(`load average (1 min) on ${availableParallelism()} cores: ${loadText}`);
}
