#!/usr/bin/env node
// spotcast benchmarks (not tests): wall-clock timings, printed as a table, or as JSON with --json.
// Runs against the built program (npm run build first; `npm run bench` does).
//   node bench/run.mjs [--json] [--only workers|overhead]
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir, availableParallelism, cpus } from 'node:os';
import { join } from 'node:path';
import { parseJobText } from '../dist/src/job/load.js';
import { runJob } from '../dist/src/run/run-job.js';

const args = process.argv.slice(2);
const json = args.includes('--json');
const only = args.includes('--only') ? args[args.indexOf('--only') + 1] : null;
const rows = [];

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

// A 100-case distance sweep of a 50 µm pinhole (2-D far and transition fields, 0.1–0.3 s each):
// cases per second with 1 and with 2 workers, counted from the first case's start to the last's
// end (the job's report afterwards is the same for both and is timed apart).
async function workersRow() {
  const job = parseJobText(`name: bench-workers
wavelength: 633 nm
distance: {from: 10 mm, to: 2 m, count: 100, spacing: log}
aperture: {shape: circle, diameter: 50 um}
`);
  const out = [];
  for (const workers of [1, 2]) {
    const dir = await mkdtemp(join(tmpdir(), 'spotcast-bench-'));
    const t = timer();
    const t0 = performance.now();
    await runJob(job, { outDir: dir, workers, reporter: t.reporter });
    const total = (performance.now() - t0) / 1000;
    const r = t.result();
    out.push({ workers, ...r, casesPerSecond: r.cases / r.seconds, totalSeconds: total });
    await rm(dir, { recursive: true, force: true });
  }
  const ratio = out[1].casesPerSecond / out[0].casesPerSecond;
  for (const o of out) {
    rows.push({
      name: `100-case distance sweep, --workers ${o.workers}`,
      median: o.seconds,
      unit: 's (cases only)',
      extra: `${o.casesPerSecond.toFixed(2)} cases/s; whole run with report ${o.totalSeconds.toFixed(1)} s`,
    });
  }
  rows.push({ name: 'speed-up of 2 workers over 1 (cases per second)', median: ratio, unit: '×', extra: 'target ≥ 1.8' });
}

// What a case costs outside its propagation (targets, issue 12: at most the propagation of a 512²
// case, and 30 ms for a small far-field case): the case's analysis (runPlannedCase less a
// computeCase of the same plan) and the writing of its folder (pictures, .npy, CSVs, result.json,
// record.json). Each repetition is a different distance, so no case repeats another's analysis.
async function overheadRow() {
  const { expandJob } = await import('../dist/src/job/expand.js');
  const { planCase } = await import('../dist/src/plan/planner.js');
  const { createEngine } = await import('../dist/src/kernels.js');
  const { newCaseContext } = await import('../dist/src/run/context.js');
  const { runPlannedCase } = await import('../dist/src/run/run-case.js');
  const { computeCase } = await import('../dist/src/run/compute.js');
  const { writeCase } = await import('../dist/src/output/case-output.js');
  const median = (a) => a.slice().sort((x, y) => x - y)[a.length >> 1];
  const kinds = [
    ['small far-field case (50 µm pinhole, 0.5–2 m)', 'distance: {from: 0.5 m, to: 2 m, count: 7}\naperture: {shape: circle, diameter: 50 um}'],
    ['512² case (1 mm disc, angular spectrum, 20–40 mm)', 'distance: {from: 20 mm, to: 40 mm, count: 7}\naperture: {shape: circle, diameter: 1 mm}\ngrid: {size: 512}'],
  ];
  for (const [name, body] of kinds) {
    const cases = expandJob(parseJobText(`name: bench-overhead\nwavelength: 633 nm\n${body}\n`).spec);
    const ctx = newCaseContext(createEngine());
    const dir = await mkdtemp(join(tmpdir(), 'spotcast-bench-'));
    const prop = [], analysis = [], write = [];
    let shape = '';
    for (const c of cases) {
      const plan = planCase(c);
      // Once to fill what the context keeps between cases (a sweep's source spectrum), so that the
      // timed propagation and the one inside runPlannedCase do the same work.
      computeCase(plan, ctx);
      let t = performance.now();
      computeCase(plan, ctx);
      const tc = performance.now() - t;
      t = performance.now();
      const rec = runPlannedCase(plan, ctx);
      const tr = performance.now() - t;
      t = performance.now();
      await writeCase(dir, rec);
      write.push(performance.now() - t);
      prop.push(tc);
      analysis.push(Math.max(0, tr - tc));
      shape = `${rec.computed.ny}×${rec.computed.nx} ${plan.method}`;
    }
    await rm(dir, { recursive: true, force: true });
    const over = median(analysis) + median(write);
    rows.push({
      name: `outside the propagation, ${name}`,
      median: over / 1000,
      unit: 's per case',
      extra: `${shape}: analysis ${median(analysis).toFixed(1)} ms + files ${median(write).toFixed(1)} ms; propagation ${median(prop).toFixed(1)} ms`,
    });
  }
  // The job-level report (summary CSV, plots, contact sheet, report.html) of a 100-case sweep: from
  // the last case's end to runJob's return.
  const job = parseJobText(`name: bench-report
wavelength: 633 nm
distance: {from: 10 mm, to: 2 m, count: 100, spacing: log}
aperture: {shape: circle, diameter: 50 um}
`);
  const dir = await mkdtemp(join(tmpdir(), 'spotcast-bench-'));
  const t = timer();
  await runJob(job, { outDir: dir, workers: 2, reporter: t.reporter });
  const reportSeconds = (performance.now() - t.lastDone()) / 1000;
  await rm(dir, { recursive: true, force: true });
  rows.push({ name: 'job report of a 100-case sweep', median: reportSeconds, unit: 's', extra: 'target < 2 s' });
}

if (!only || only === 'workers') await workersRow();
if (!only || only === 'overhead') await overheadRow();

if (json) {
  console.log(JSON.stringify({ node: process.version, cores: availableParallelism(), cpu: cpus()[0]?.model, rows }, null, 2));
} else {
  console.log(`spotcast benchmarks — Node ${process.version}, ${availableParallelism()} cores (${cpus()[0]?.model ?? 'unknown CPU'})`);
  const w = Math.max(...rows.map((r) => r.name.length));
  for (const r of rows) console.log(`${r.name.padEnd(w)}  ${r.median.toFixed(3).padStart(9)} ${r.unit.padEnd(14)} ${r.extra ?? ''}`);
}
