// The workers a run starts before planning (src/run/crew.ts) and keeps for the report's plots
// (src/run/helpers.ts), on the built program (worker threads need dist/src/run/worker.js; the build
// runs in beforeAll unless SPOTCAST_TEST_NO_BUILD=1): the plans they make are the plans this thread
// makes, a worker handed over computes a case, and the plots they draw are the bytes this thread draws.
import { execFileSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';

const repo = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');
const dist = (f: string) => pathToFileURL(join(repo, 'dist', 'src', f)).href;
let work: string;

// Invented jobs: a pinhole swept in distance, a slit pair and a rectangle, so that the planner takes
// several paths (far field, Fresnel forms, 1-D and 2-D).
const JOBS = [
  'name: crew-pinhole\nwavelength: 633 nm\ndistance: {from: 5 mm, to: 2 m, count: 9, spacing: log}\naperture: {shape: circle, diameter: 50 um}\n',
  'name: crew-slits\nwavelength: [532 nm, 633 nm]\ndistance: [20 mm, 1 m]\naperture: {shape: slits, count: 2, width: 20 um, period: 100 um}\n',
  'name: crew-rect\nwavelength: 633 nm\ndistance: [10 mm, 0.5 m]\naperture: {shape: rectangle, width: 100 um, height: 40 um}\n',
];

beforeAll(async () => {
  if (process.env.SPOTCAST_TEST_NO_BUILD !== '1') execFileSync('npm', ['run', 'build'], { cwd: repo, stdio: 'pipe' });
  if (!existsSync(join(repo, 'dist', 'src', 'run', 'worker.js'))) throw new Error('dist/src/run/worker.js is missing: run npm run build');
  work = await mkdtemp(join(tmpdir(), 'spotcast-crew-'));
}, 180_000);
afterAll(async () => {
  await rm(work, { recursive: true, force: true });
});

async function modules() {
  const { startCrew } = (await import(dist('run/crew.js'))) as typeof import('../../src/run/crew.js');
  const { parseJobText } = (await import(dist('job/load.js'))) as typeof import('../../src/job/load.js');
  const { expandJob } = (await import(dist('job/expand.js'))) as typeof import('../../src/job/expand.js');
  const { planCase } = (await import(dist('plan/planner.js'))) as typeof import('../../src/plan/planner.js');
  return { startCrew, parseJobText, expandJob, planCase };
}

describe('a crew of worker threads', () => {
  it('plans every case as this thread plans it, in case order', async () => {
    const { startCrew, parseJobText, expandJob, planCase } = await modules();
    const cases = JOBS.flatMap((j) => expandJob(parseJobText(j).spec));
    expect(cases.length).toBe(15);
    const crew = startCrew(2);
    try {
      const opts = { maxMemoryBytes: 2 * 1024 ** 3 };
      const plans = await crew.plan(cases, opts);
      expect(plans.map((p) => p.case.id)).toEqual(cases.map((c) => c.id));
      // Deep equality of plain data: the structured clone a plan travels by keeps every value.
      expect(plans).toEqual(cases.map((c) => planCase(c, opts)));
    } finally {
      await crew.stop();
    }
  }, 120_000);

  it('hands over a ready worker that computes a case; stopping the crew then leaves it running', async () => {
    const { startCrew, parseJobText, expandJob } = await modules();
    const [c] = expandJob(parseJobText(JOBS[0]!).spec);
    const crew = startCrew(2);
    const [plan] = await crew.plan([c!], {});
    const taken = await crew.take(1);
    expect(taken).toHaveLength(1);
    const w = taken[0]!;
    const exits: number[] = [];
    w.on('exit', (code) => exits.push(code));
    const jobDir = join(work, 'crew-pinhole');
    const { mkdir } = await import('node:fs/promises');
    await mkdir(jobDir, { recursive: true });
    const done = await new Promise<{ type: string; done?: { id: string } }>((res) => {
      w.on('message', (m) => res(m));
      w.postMessage({ type: 'task', task: { plan, jobDir, hash: 'h' } });
    });
    expect(done.type).toBe('done');
    expect(done.done?.id).toBe(c!.id);
    const result = JSON.parse(await readFile(join(jobDir, c!.id, 'result.json'), 'utf8'));
    expect(result.case).toBe(c!.id);
    await crew.stop(); // the handed-over worker is not the crew's any more: still running
    expect(exits).toEqual([]);
    w.postMessage({ type: 'stop' });
    await new Promise((r) => w.once('exit', r));
  }, 120_000);

  it('draws report plots byte for byte as this thread draws them', async () => {
    const { startCrew } = await modules();
    const { plotsOn, stopKept } = (await import(dist('run/helpers.js'))) as typeof import('../../src/run/helpers.js');
    const { renderPlot } = (await import(dist('report/plots.js'))) as typeof import('../../src/report/plots.js');
    const plot = (k: number) => ({
      title: `invented quantity ${k} against distance`,
      x: { label: 'distance', unit: 'm' as const, log: true },
      y: { label: `quantity ${k}`, unit: '1' as const, log: k % 2 === 1 },
      points: Array.from({ length: 30 }, (_, i) => ({ x: 0.01 * 1.2 ** i, y: (k + 1) / (1 + i) })),
      nfBoundary: k === 0 ? 0.05 : null,
    });
    const inputs = [0, 1, 2].map(plot);
    const crew = startCrew(2);
    const workers = await crew.take(2);
    try {
      const drawn = await plotsOn(workers)(inputs);
      for (const [i, p] of inputs.entries()) {
        const here = await renderPlot(p);
        expect(drawn[i]!.svg).toBe(here.svg);
        expect(Buffer.compare(Buffer.from(drawn[i]!.png), here.png)).toBe(0);
      }
    } finally {
      await stopKept(workers);
    }
  }, 120_000);
});
