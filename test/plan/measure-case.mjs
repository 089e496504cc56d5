// Child process for memory-estimate.test.ts (and for hand runs): plans one case from the built
// dist/ and carries it out as a run does (compute, metrics, answers, the case folder written), then
// prints one JSON line: the plan's memory estimate, the process's resident size after the imports
// (the baseline) and its peak resident size (process.resourceUsage().maxRSS, kernel-measured), also
// after each step (compute and metrics, answers, files).
//
//   node test/plan/measure-case.mjs '<case spec JSON>' [--max-memory BYTES] [--plan-only]
//
// The spec is a Case as test/helpers.ts's makeCase builds it (lengths in metres). The WebAssembly
// FFT kernel is loaded as the command line loads it, so its memory counts.
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

const dist = new URL('../../dist/src/', import.meta.url);
const { planCase } = await import(new URL('plan/planner.js', dist).href);
const { runPlannedCase } = await import(new URL('run/run-case.js', dist).href);
const { answerQuestions } = await import(new URL('run/searches.js', dist).href);
const { newCaseContext } = await import(new URL('run/context.js', dist).href);
const { writeCase } = await import(new URL('output/case-output.js', dist).href);
const { createEngine } = await import(new URL('kernels.js', dist).href);
const engine = createEngine();

const args = process.argv.slice(2);
const spec = JSON.parse(args[0]);
const maxAt = args.indexOf('--max-memory');
const maxMemoryBytes = maxAt >= 0 ? Number(args[maxAt + 1]) : undefined;
const planOnly = args.includes('--plan-only');

const c = {
  job: 'memory',
  index: 0,
  id: 'case',
  illumination: { kind: 'plane', tilt: [0, 0] },
  method: 'auto',
  swept: {},
  output: { npy: 'float64', logDecades: 5 },
  analysis: { detectors: [] },
  ...spec,
};

// The baseline: what the process holds before any case-sized array exists (the modules, the
// kernel, the first planning's code compiled: a throw-away plan of the case itself).
planCase(c, maxMemoryBytes !== undefined ? { maxMemoryBytes } : {});
const baseline = process.memoryUsage().rss;
const peakBefore = process.resourceUsage().maxRSS * 1024;

const t0 = performance.now();
const plan = planCase(c, maxMemoryBytes !== undefined ? { maxMemoryBytes } : {});
const planMs = performance.now() - t0;
const out = {
  method: plan.method,
  form: plan.form ?? null,
  layout: plan.layout,
  outputs: [plan.x.output.n, plan.y ? plan.y.output.n : 1],
  estimate: plan.memoryBytes,
  work: plan.work,
  error: plan.error ?? null,
  planMs,
  baseline,
  peakBefore,
};
if (!planOnly && !plan.error) {
  const dir = await mkdtemp(join(tmpdir(), 'spotcast-mem-'));
  const t1 = performance.now();
  // The steps of run/execute.ts's executeCase, with the peak after each.
  const peakNow = () => process.resourceUsage().maxRSS * 1024 - baseline;
  try {
    const ctx = newCaseContext(engine, maxMemoryBytes !== undefined ? { maxMemoryBytes } : {});
    const rec = runPlannedCase(plan, ctx);
    out.afterCompute = peakNow();
    answerQuestions(rec, ctx);
    out.afterAnswers = peakNow();
    await writeCase(dir, rec, '');
    out.afterWrite = peakNow();
  } catch (e) {
    out.failed = String(e && e.message);
  }
  out.runMs = performance.now() - t1;
  await rm(dir, { recursive: true, force: true });
}
out.peak = process.resourceUsage().maxRSS * 1024;
out.used = out.peak - baseline;
out.ratio = out.used / out.estimate;
process.stdout.write(JSON.stringify(out) + '\n');
