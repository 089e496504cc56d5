// Overnight sweeps that finish: kill and resume, Ctrl-C, a failing case among good ones, the
// memory guard, shards that cover every case once and gather to the unsharded summary.
import { spawn, spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { mkdtemp, readdir, readFile, rm, stat, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseJobText } from '../../src/job/load.js';
import { expandJob } from '../../src/job/expand.js';
import { planCase } from '../../src/plan/planner.js';
import { LARGE_SWEEP, runJob } from '../../src/run/run-job.js';
import { gatherJob } from '../../src/run/gather.js';
import { assignShards, parseShard } from '../../src/run/shard.js';
import { buildIfStale } from '../build-if-stale.js';

const repo = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');
const cli = join(repo, 'dist', 'src', 'cli.js');
let work = '';

// Invented bench sweep: a 30 µm slit, up to 24 screen distances (1-D cases, tens of ms each). The
// interrupted runs use 24 (they used 40): a kill after 6 or a Ctrl-C after 4 finished cases still
// leaves most of the sweep to do, and every run of the command pays for its cases and the job
// report over all of them.
const SWEEP = (name: string, count: number) =>
  `name: ${name}\nwavelength: 633 nm\ndistance: {from: 1 mm, to: 1 m, count: ${count}, spacing: log}\naperture: {shape: slit, width: 30 um}\n`;

beforeAll(async () => {
  buildIfStale(repo);
  work = await mkdtemp(join(tmpdir(), 'spotcast-overnight-'));
}, 120_000);
afterAll(async () => {
  if (work) await rm(work, { recursive: true, force: true });
});

async function caseDirs(jobDir: string): Promise<string[]> {
  if (!existsSync(jobDir)) return [];
  return (await readdir(jobDir)).filter((d) => /^\d+_/.test(d)).sort();
}

async function completeCases(jobDir: string): Promise<string[]> {
  const out: string[] = [];
  for (const d of await caseDirs(jobDir)) if (existsSync(join(jobDir, d, 'record.json'))) out.push(d);
  return out;
}

function waitFor(cond: () => Promise<boolean>, ms: number): Promise<void> {
  const t0 = Date.now();
  return new Promise((res, rej) => {
    const tick = async () => {
      if (await cond()) return res();
      if (Date.now() - t0 > ms) return rej(new Error('timed out waiting'));
      setTimeout(tick, 50);
    };
    void tick();
  });
}

describe('kill -9 in the middle of a sweep, then the same command again', () => {
  it('keeps every finished case, recomputes none of them, and completes the rest', async () => {
    const file = join(work, 'kill.yaml');
    await writeFile(file, SWEEP('kill-sweep', 24));
    const out = join(work, 'out-kill');
    const jobDir = join(out, 'kill-sweep');
    const child = spawn(process.execPath, [cli, 'run', file, '--out', out, '--workers', '2', '--quiet'], { stdio: 'ignore' });
    await waitFor(async () => (await completeCases(jobDir)).length >= 6, 60_000);
    child.kill('SIGKILL');
    await new Promise((r) => child.once('exit', r));
    const before = await completeCases(jobDir);
    expect(before.length).toBeGreaterThanOrEqual(6);
    expect(before.length).toBeLessThan(24);
    const stamps = new Map<string, number>();
    for (const d of before) stamps.set(d, (await stat(join(jobDir, d, 'record.json'))).mtimeMs);

    const again = spawnSync(process.execPath, [cli, 'run', file, '--out', out, '--workers', '2'], { encoding: 'utf8', timeout: 120_000 });
    expect(again.status).toBe(0);
    expect(again.stdout).toMatch(new RegExp(`${before.length} already done|\\(${before.length} from earlier runs\\)`));
    const after = await completeCases(jobDir);
    expect(after).toHaveLength(24);
    for (const [d, t] of stamps) expect((await stat(join(jobDir, d, 'record.json'))).mtimeMs, d).toBe(t);
    // No half-written leftovers, and the summary has every case, done.
    expect((await readdir(jobDir)).filter((e) => e.includes('.partial-') || e.includes('.old-'))).toEqual([]);
    const summary = (await readFile(join(jobDir, 'summary.csv'), 'utf8')).trim().split('\n');
    expect(summary).toHaveLength(25);
    expect(summary.slice(1).every((l) => l.split(',')[1] === 'done')).toBe(true);
  }, 180_000);
});

describe('changing the job', () => {
  it('recomputes only the cases whose parameters changed', async () => {
    const dir = join(work, 'out-change');
    const text = (distances: string, description: string) =>
      `name: change-sweep\ndescription: ${description}\nwavelength: 633 nm\ndistance: [${distances}]\naperture: {shape: slit, width: 30 um}\n`;
    const first = await runJob(parseJobText(text('10 mm, 20 mm, 40 mm', 'first')), { outDir: dir });
    expect(first.done).toBe(3);
    const jobDir = join(dir, 'change-sweep');
    const stamp = async () => new Map(await Promise.all((await caseDirs(jobDir)).map(async (d) => [d, (await stat(join(jobDir, d, 'record.json'))).mtimeMs] as const)));
    const t1 = await stamp();
    // A new description changes no case; a fourth distance adds one case and leaves the others.
    const second = await runJob(parseJobText(text('10 mm, 20 mm, 40 mm, 80 mm', 'second')), { outDir: dir });
    expect(second.skipped).toBe(3);
    expect(second.done).toBe(4);
    const t2 = await stamp();
    for (const [d, t] of t1) expect(t2.get(d), d).toBe(t);
    // A different slit width changes every case: all are recomputed.
    const third = await runJob(parseJobText(text('10 mm, 20 mm, 40 mm, 80 mm', 'second').replace('30 um', '35 um')), { outDir: dir });
    expect(third.skipped).toBe(0);
    expect(third.done).toBe(4);
  });
});

describe('Ctrl-C', () => {
  it('stops cleanly between cases, says how to go on, and the next run finishes the job', async () => {
    const file = join(work, 'int.yaml');
    await writeFile(file, SWEEP('int-sweep', 24));
    const out = join(work, 'out-int');
    const jobDir = join(out, 'int-sweep');
    const child = spawn(process.execPath, [cli, 'run', file, '--out', out, '--workers', '2', '--quiet'], { stdio: ['ignore', 'pipe', 'pipe'] });
    let stderr = '';
    child.stderr.on('data', (b) => (stderr += String(b)));
    await waitFor(async () => (await completeCases(jobDir)).length >= 4, 60_000);
    child.kill('SIGINT');
    const code = await new Promise<number | null>((r) => child.once('exit', r));
    expect(code).toBe(130);
    expect(stderr).toMatch(/run the same command again/);
    const kept = await completeCases(jobDir);
    expect(kept.length).toBeGreaterThanOrEqual(4);
    // The manifest lists exactly the complete cases.
    const manifest = JSON.parse(await readFile(join(jobDir, 'manifest.json'), 'utf8'));
    expect(Object.keys(manifest.completed).sort()).toEqual(kept);
    const again = spawnSync(process.execPath, [cli, 'run', file, '--out', out], { encoding: 'utf8', timeout: 120_000 });
    expect(again.status).toBe(0);
    expect(await completeCases(jobDir)).toHaveLength(24);
  }, 180_000);
});

describe('a failing case among good ones', () => {
  it.each([
    ['a worker that dies', 'crash', '2'],
    ['a case that throws, in this thread', 'throw', '1'],
  ])('%s: the case is recorded as failed, the others are done, the exit code is 1', async (_what, kind, workers) => {
    const file = join(work, `fault-${kind}.yaml`);
    await writeFile(file, SWEEP(`fault-${kind}`, 6));
    const out = join(work, `out-fault-${kind}`);
    const victim = expandJob(parseJobText(SWEEP(`fault-${kind}`, 6)).spec)[2]!.id;
    const r = spawnSync(process.execPath, [cli, 'run', file, '--out', out, '--workers', workers], {
      encoding: 'utf8',
      timeout: 120_000,
      env: { ...process.env, SPOTCAST_FAULT: `${kind}:${victim}` },
    });
    expect(r.status).toBe(1);
    expect(r.stderr).toContain(victim);
    const jobDir = join(out, `fault-${kind}`);
    const done = await completeCases(jobDir);
    expect(done).toHaveLength(5);
    expect(done).not.toContain(victim);
    const rows = (await readFile(join(jobDir, 'summary.csv'), 'utf8')).trim().split('\n');
    const row = rows.find((l) => l.startsWith(victim))!;
    expect(row.split(',')[1]).toBe('failed');
    expect(row).toMatch(kind === 'crash' ? /worker computing it stopped/ : /fault injected/);
    const manifest = JSON.parse(await readFile(join(jobDir, 'manifest.json'), 'utf8'));
    expect(Object.keys(manifest.failed)).toEqual([victim]);
    // Running again retries the failed case (without the fault it succeeds) and skips the others.
    const again = spawnSync(process.execPath, [cli, 'run', file, '--out', out, '--workers', workers], { encoding: 'utf8', timeout: 120_000 });
    expect(again.status).toBe(0);
    expect(await completeCases(jobDir)).toHaveLength(6);
  }, 180_000);
});

describe('memory guard', () => {
  const job = parseJobText(SWEEP('mem-sweep', 4));
  it('refuses before any work when the largest case cannot fit, with the numbers', async () => {
    const o = await runJob(job, { outDir: join(work, 'out-mem'), workers: 2, availableMemoryBytes: 10 * 1024 ** 2 });
    expect(o.error).toMatch(/needs about [\d.]+ MiB but only 10 MiB is available/);
    expect(await caseDirs(join(work, 'out-mem', 'mem-sweep'))).toEqual([]);
  });
  it('runs fewer cases at once when that is enough, and says so', async () => {
    const largest = Math.max(...expandJob(job.spec).map((c) => planCase(c).memoryBytes));
    const notes: string[] = [];
    const o = await runJob(job, {
      outDir: join(work, 'out-mem2'),
      workers: 2,
      availableMemoryBytes: 1.5 * largest,
      reporter: {
        jobStart: (_j, _f, _t, _s, w) => notes.push(`workers ${w}`),
        caseStart() {},
        caseDone() {},
        caseFailed() {},
        note: (l) => notes.push(l),
        jobEnd() {},
      },
    });
    expect(o.error).toBeUndefined();
    expect(o.done).toBe(4);
    expect(notes).toContain('workers 1');
    expect(notes.some((n) => /running 1 at a time/.test(n))).toBe(true);
  });
});

describe('bounds on input', () => {
  it('asks for --accept-large before a sweep of many thousands of cases, saying the count', async () => {
    // One case over the limit (LARGE_SWEEP.cases, 5000): refused on the count, before any case is
    // planned (src/run/run-job.ts).
    const big = parseJobText(`name: huge\nwavelength: 500 nm\ndistance: {from: 1 mm, to: 1 m, count: ${LARGE_SWEEP.cases + 1}, spacing: log}\naperture: {shape: slit, width: 30 um}\n`);
    const o = await runJob(big, { outDir: join(work, 'out-huge') });
    expect(o.error).toMatch(new RegExp(`${LARGE_SWEEP.cases + 1} cases`));
    expect(o.error).toMatch(/--accept-large/);
    expect(await caseDirs(join(work, 'out-huge', 'huge'))).toEqual([]);
  });
});

describe('shards', () => {
  it('parses K/N and refuses nonsense', () => {
    expect(parseShard('2/5')).toEqual({ k: 2, n: 5 });
    for (const bad of ['0/3', '4/3', '2', 'a/b', '1/0']) expect(() => parseShard(bad)).toThrow(/--shard/);
  });

  it('every case in exactly one shard, loads within the largest case of each other (LPT bound, Graham 1969)', () => {
    const work = [9, 1, 7, 3, 3, 5, 8, 2, 6, 4, 10, 1];
    for (const n of [1, 2, 3, 5]) {
      const s = assignShards(work, n);
      expect(s).toHaveLength(work.length);
      for (const k of s) expect(k >= 1 && k <= n).toBe(true);
      const load = Array.from({ length: n }, (_, i) => work.reduce((acc, w, j) => acc + (s[j] === i + 1 ? w : 0), 0));
      expect(Math.max(...load) - Math.min(...load)).toBeLessThanOrEqual(Math.max(...work));
      // Deterministic: the same split every time.
      expect(assignShards(work, n)).toEqual(s);
    }
  });

  it('three shards into one folder, gathered, give the unsharded summary (timings aside)', async () => {
    const job = parseJobText(SWEEP('shard-sweep', 10));
    const shared = join(work, 'out-shards');
    for (let k = 1; k <= 3; k++) {
      const o = await runJob(job, { outDir: shared, shard: { k, n: 3 } });
      expect(o.error).toBeUndefined();
    }
    const cases = expandJob(job.spec);
    // Each case was computed by exactly one shard.
    const seen = new Map<string, number>();
    for (let k = 1; k <= 3; k++) {
      const m = JSON.parse(await readFile(join(shared, 'shard-sweep', `manifest-shard-${k}-of-3.json`), 'utf8'));
      for (const id of Object.keys(m.completed)) seen.set(id, (seen.get(id) ?? 0) + 1);
    }
    expect([...seen.keys()].sort()).toEqual(cases.map((c) => c.id).sort());
    expect([...seen.values()].every((v) => v === 1)).toBe(true);
    const g = await gatherJob(job, join(shared, 'shard-sweep'), cases);
    expect(g.done).toBe(10);
    expect(g.missing).toEqual([]);
    const single = await runJob(job, { outDir: join(work, 'out-single') });
    expect(single.done).toBe(10);
    const table = async (dir: string) => {
      const [head, ...rows] = (await readFile(join(dir, 'shard-sweep', 'summary.csv'), 'utf8')).trim().split('\n');
      const drop = head!.split(',').indexOf('seconds');
      return rows.map((r) => r.split(',').filter((_, i) => i !== drop).join(','));
    };
    expect(await table(shared)).toEqual(await table(join(work, 'out-single')));
  });

  it('gather while a shard is missing reports the missing cases and still writes the summary', async () => {
    const job = parseJobText(SWEEP('partial-sweep', 6));
    const shared = join(work, 'out-partial');
    await runJob(job, { outDir: shared, shard: { k: 1, n: 2 } });
    const g = await gatherJob(job, join(shared, 'partial-sweep'), expandJob(job.spec));
    expect(g.done + g.missing.length).toBe(6);
    expect(g.missing.length).toBeGreaterThan(0);
    const rows = (await readFile(join(shared, 'partial-sweep', 'summary.csv'), 'utf8')).trim().split('\n').slice(1);
    expect(rows.filter((r) => r.split(',')[1] === 'missing')).toHaveLength(g.missing.length);
  });
});
