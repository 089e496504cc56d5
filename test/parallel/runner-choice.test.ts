// The runner's choice between one case per worker thread and one case at a time with its FFTs
// split across the threads (src/run/scheduler.ts chooseParallelism), on the compiled program
// (helper threads need it), with jobs of our own: a pinhole seen in the near field on a 1024²
// grid, and a small distance sweep of a slit.
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runJob as runJobFromSources } from '../../src/run/run-job.js';
import { loadJobFile as loadFromSources } from '../../src/job/load.js';
import type { RunReporter } from '../../src/run/progress.js';
import { fromDist, type LoadModule, type RunJobModule, type TeamModule } from './dist.js';

let dir: string;
let run: RunJobModule;
let load: LoadModule;
let team: TeamModule;

const NEAR = (name: string, distance: string) =>
  `name: ${name}\nwavelength: 633 nm\ndistance: ${distance}\naperture: {shape: circle, diameter: 200 um}\nmethod: angular-spectrum\n`;
const SWEEP = 'name: slit-sweep\nwavelength: 633 nm\ndistance: {from: 10 mm, to: 1 m, count: 4, spacing: log}\naperture: {shape: slit, width: 30 um}\n';

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'spotcast-choice-'));
  await writeFile(join(dir, 'one.yaml'), NEAR('pinhole-near', '5 mm'));
  await writeFile(join(dir, 'two.yaml'), NEAR('pinhole-pair', '{from: 5 mm, to: 6 mm, count: 2}'));
  await writeFile(join(dir, 'sweep.yaml'), SWEEP);
  run = await fromDist<RunJobModule>('run/run-job.js');
  load = await fromDist<LoadModule>('job/load.js');
  team = await fromDist<TeamModule>('parallel/fft-team.js');
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

function recorder(onDone?: () => void) {
  const notes: string[] = [];
  let workers = 0;
  const reporter: RunReporter = {
    jobStart: (_j, _f, _t, _s, w) => void (workers = w),
    caseStart() {},
    caseDone: () => onDone?.(),
    caseFailed: (id, e) => notes.push(`failed ${id}: ${e}`),
    note: (l) => notes.push(l),
    jobEnd() {},
  };
  return { notes, reporter, workers: () => workers };
}

describe('the compiled runner', () => {
  it('one large case, 2 workers asked: the case gets both threads, and its result is the same bits as with one', async () => {
    const job = await load.loadJobFile(join(dir, 'one.yaml'));
    const before = team.fftTeamFigures();
    const r = recorder();
    const o = await run.runJob(job, { outDir: join(dir, 'team'), workers: 2, reporter: r.reporter });
    expect(o.error).toBeUndefined();
    expect(o.done).toBe(1);
    expect(r.workers()).toBe(1);
    expect(r.notes).toEqual(['1 case for 2 threads: one case at a time, its FFTs split across 2 threads']);
    const f = team.fftTeamFigures();
    expect(f.threads).toBe(2);
    expect(f.transforms).toBeGreaterThan(before.transforms);
    // (How the parts fell between the threads depends on how busy the machine is; that helpers'
    // parts give the same bits is tested in fft-team.test.ts, where it is certain.)
    expect(f.takeovers).toBe(0);
    expect(team.fftTeamSize()).toBe(1); // stopped with the run

    const alone = await run.runJob(job, { outDir: join(dir, 'alone'), workers: 1, reporter: recorder().reporter });
    expect(alone.done).toBe(1);
    const a = await readFile(join(dir, 'team', 'pinhole-near', '1', 'intensity.npy'));
    const b = await readFile(join(dir, 'alone', 'pinhole-near', '1', 'intensity.npy'));
    expect(a.length).toBeGreaterThan(1000);
    expect(a.equals(b)).toBe(true);
  });

  it('as many cases as workers: one case per worker thread, no team', async () => {
    const job = await load.loadJobFile(join(dir, 'sweep.yaml'));
    const before = team.fftTeamFigures();
    const r = recorder();
    const o = await run.runJob(job, { outDir: join(dir, 'cases'), workers: 2, reporter: r.reporter });
    expect(o.done).toBe(4);
    expect(r.workers()).toBe(2);
    expect(r.notes).toEqual([]);
    expect(team.fftTeamFigures()).toEqual(before);
  });

  it('memory for one case at a time: the cases one after the other with the team; Ctrl-C after the first still stops it', async () => {
    const job = await load.loadJobFile(join(dir, 'two.yaml'));
    const stop = new AbortController();
    const r = recorder(() => stop.abort());
    const { planCase } = await import('../../src/plan/planner.js');
    const { expandJob } = await import('../../src/job/expand.js');
    const largest = Math.max(...expandJob(job.spec).map((c) => planCase(c).memoryBytes));
    const o = await run.runJob(job, { outDir: join(dir, 'mem'), workers: 2, availableMemoryBytes: 1.5 * largest, signal: stop.signal, reporter: r.reporter });
    expect(r.notes.some((n) => /running 1 at a time/.test(n))).toBe(true);
    expect(r.notes).toContain('memory allows 1 case at a time: one case at a time, its FFTs split across 2 threads');
    expect(o.interrupted).toBe(true);
    expect(o.done).toBe(1);
    expect(team.fftTeamSize()).toBe(1);
  });
});

it('from the TypeScript sources there is no team: the case runs in one thread, and the note says why', async () => {
  const job = await loadFromSources(join(dir, 'one.yaml'));
  const r = recorder();
  const o = await runJobFromSources(job, { outDir: join(dir, 'src'), workers: 2, reporter: r.reporter });
  expect(o.done).toBe(1);
  expect(r.notes).toEqual(["1 case for 2 threads: splitting a case's FFTs across threads needs the built program (npm run build)"]);
});
