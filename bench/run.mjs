#!/usr/bin/env node
// spotcast benchmarks (not tests): wall-clock timings, printed as a table, or as JSON with --json.
// Runs against the built program (npm run build first; `npm run bench` does).
//   node bench/run.mjs [--json] [--only workers]
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

if (!only || only === 'workers') await workersRow();

if (json) {
  console.log(JSON.stringify({ node: process.version, cores: availableParallelism(), cpu: cpus()[0]?.model, rows }, null, 2));
} else {
  console.log(`spotcast benchmarks — Node ${process.version}, ${availableParallelism()} cores (${cpus()[0]?.model ?? 'unknown CPU'})`);
  const w = Math.max(...rows.map((r) => r.name.length));
  for (const r of rows) console.log(`${r.name.padEnd(w)}  ${r.median.toFixed(3).padStart(9)} ${r.unit.padEnd(14)} ${r.extra ?? ''}`);
}
