// The run lock: one run at a time per set of cases in a job folder. Two runs of one job started
// together end with every case complete and verified; a held lock is waited for, then refused with
// the holder named; stale locks (a dead pid on this host, a host that stopped renewing its lock)
// are taken over; shards of one split do not block each other. Job: a 50 µm pinhole at 633 nm,
// three distances (invented).
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { mkdir, mkdtemp, readdir, readFile, rm, stat, utimes, writeFile } from 'node:fs/promises';
import { hostname, tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runJobFile } from '../../src/run/run-job.js';
import { acquireRunLock, LockBusyError, lockName } from '../../src/run/lock.js';
import { caseHash, verifyCase } from '../../src/run/records.js';
import { loadJobFile } from '../../src/job/load.js';
import { expandJob } from '../../src/job/expand.js';
import { recorder } from '../helpers.js';

const JOB = `name: pin
wavelength: 633 nm
distance: {from: 0.5 m, to: 1.5 m, count: 3}
aperture: {shape: circle, diameter: 50 um}
`;

let dir = '';
let n = 0;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'spotcast-lock-'));
});
afterAll(async () => {
  if (dir) await rm(dir, { recursive: true, force: true });
});

async function folder(): Promise<string> {
  const d = join(dir, `job-${++n}`);
  await mkdir(d);
  return d;
}

/** A pid that existed and has ended: a child that has been waited for. */
function deadPid(): number {
  const r = spawnSync(process.execPath, ['-e', '0']);
  return r.pid!;
}

async function lockFiles(d: string): Promise<string[]> {
  return (await readdir(d)).filter((f) => f.endsWith('.lock') || f.includes('.takeover'));
}

describe('acquireRunLock', () => {
  it('holds the lock with pid, host and start time, and removes it on release', async () => {
    const d = await folder();
    const lock = await acquireRunLock(d, null);
    const content = JSON.parse(await readFile(join(d, 'run.lock'), 'utf8'));
    expect(content.pid).toBe(process.pid);
    expect(content.host).toBe(hostname());
    expect(Number.isFinite(Date.parse(content.started))).toBe(true);
    await lock.release();
    expect(await lockFiles(d)).toEqual([]);
  });

  it('refuses a second holder at once with waitMs 0, naming pid, host, start time and the way on', async () => {
    const d = await folder();
    const first = await acquireRunLock(d, null);
    const t0 = Date.now();
    const err = await acquireRunLock(d, null, { waitMs: 0 }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(LockBusyError);
    const msg = (err as Error).message;
    expect(msg).toContain(`is in use by the run of pid ${process.pid} on host ${hostname()}, started ${first.holder.started}`);
    expect(msg).toContain(`delete ${join(d, 'run.lock')}`);
    expect(Date.now() - t0).toBeLessThan(10_000);
    await first.release();
  });

  it('waits for a lock that is released within the bound, saying so once', async () => {
    const d = await folder();
    const first = await acquireRunLock(d, null);
    setTimeout(() => void first.release(), 400);
    const notes: string[] = [];
    const second = await acquireRunLock(d, null, { waitMs: 8000, note: (l) => notes.push(l) });
    expect(notes).toHaveLength(1);
    expect(notes[0]).toMatch(/is in use by the run of pid \d+ .*: waiting up to 8 s for it/);
    await second.release();
    expect(await lockFiles(d)).toEqual([]);
  });

  it('stops waiting when the run is interrupted', async () => {
    const d = await folder();
    const first = await acquireRunLock(d, null);
    const ctl = new AbortController();
    setTimeout(() => ctl.abort(), 200);
    const t0 = Date.now();
    const err = await acquireRunLock(d, null, { waitMs: 60_000, signal: ctl.signal }).catch((e: unknown) => e);
    expect((err as Error).message).toContain('stopped while waiting');
    expect(Date.now() - t0).toBeLessThan(10_000);
    await first.release();
  });

  it('takes over a lock whose process on this host no longer exists, and says whose it was', async () => {
    const d = await folder();
    const pid = deadPid();
    await writeFile(join(d, 'run.lock'), JSON.stringify({ pid, host: hostname(), started: '2026-01-01T00:00:00.000Z', shard: null, tool: 'x', token: 'old' }));
    const notes: string[] = [];
    const lock = await acquireRunLock(d, null, { waitMs: 0, note: (l) => notes.push(l) });
    expect(notes).toEqual([expect.stringContaining(`taking over the stale lock of the run of pid ${pid} on host ${hostname()}, started 2026-01-01T00:00:00.000Z`)]);
    expect(notes[0]).toMatch(/that process no longer exists$/);
    expect(JSON.parse(await readFile(join(d, 'run.lock'), 'utf8')).token).toBe(lock.holder.token);
    await lock.release();
  });

  it('two runs that find the same stale lock at once: one takes it over, the other waits its turn', async () => {
    const d = await folder();
    await writeFile(join(d, 'run.lock'), JSON.stringify({ pid: deadPid(), host: hostname(), started: new Date().toISOString(), shard: null, tool: 'x', token: 'dead' }));
    const intervals: [number, number][] = [];
    const notes: string[] = [];
    const turn = async () => {
      const lock = await acquireRunLock(d, null, { waitMs: 10_000, note: (l) => notes.push(l) });
      const from = Date.now();
      for (let i = 0; i < 4; i++) {
        // While held, the file is this holder's.
        expect(JSON.parse(await readFile(lock.path, 'utf8')).token).toBe(lock.holder.token);
        await new Promise((r) => setTimeout(r, 50));
      }
      intervals.push([from, Date.now()]);
      await lock.release();
    };
    await Promise.all([turn(), turn()]);
    intervals.sort((a, b) => a[0] - b[0]);
    expect(intervals[1]![0]).toBeGreaterThanOrEqual(intervals[0]![1]);
    expect(notes.filter((l) => l.includes('taking over the stale lock'))).toHaveLength(1);
    expect(await lockFiles(d)).toEqual([]);
  });

  it('a lock from another host is live while renewed, stale when not renewed for longer than the bound', async () => {
    const d = await folder();
    const path = join(d, 'run.lock');
    await writeFile(path, JSON.stringify({ pid: 1, host: 'node-elsewhere', started: new Date().toISOString(), shard: null, tool: 'x', token: 't' }));
    // Renewed just now: its pid cannot be checked from here, so it is taken as live.
    await expect(acquireRunLock(d, null, { waitMs: 0 })).rejects.toThrow(/in use by the run of pid 1 on host node-elsewhere/);
    // Not renewed for an hour (past OTHER_HOST_STALE_MS, 5 min): stale.
    const old = new Date(Date.now() - 3600_000);
    await utimes(path, old, old);
    const notes: string[] = [];
    const lock = await acquireRunLock(d, null, { waitMs: 0, note: (l) => notes.push(l) });
    expect(notes[0]).toMatch(/taking over the stale lock of the run of pid 1 on host node-elsewhere.*not renewed it for 60 min/);
    await lock.release();
  });

  it('the heartbeat renews the lock from its own thread while the main thread is busy', async () => {
    const d = await folder();
    const lock = await acquireRunLock(d, null, { heartbeatMs: 50 });
    const old = new Date(Date.now() - 3600_000);
    await utimes(lock.path, old, old);
    // A long case computed in this thread: nothing else runs here for 600 ms.
    const until = Date.now() + 600;
    while (Date.now() < until) {
      /* busy */
    }
    expect(Date.now() - (await stat(lock.path)).mtimeMs).toBeLessThan(2000);
    await lock.release();
  });

  it('an empty lock file (its writer between open and write) is live at first, stale once old', async () => {
    const d = await folder();
    const path = join(d, 'run.lock');
    await writeFile(path, '');
    await expect(acquireRunLock(d, null, { waitMs: 0 })).rejects.toThrow(/a run whose lock file is still being written/);
    const old = new Date(Date.now() - 120_000);
    await utimes(path, old, old);
    const lock = await acquireRunLock(d, null, { waitMs: 0 });
    await lock.release();
  });

  it('shards of one split do not block each other; a whole run and another split conflict with them', async () => {
    const d = await folder();
    const s1 = await acquireRunLock(d, { k: 1, n: 3 });
    const s2 = await acquireRunLock(d, { k: 2, n: 3 }, { waitMs: 0 });
    expect((await lockFiles(d)).sort()).toEqual([lockName({ k: 1, n: 3 }), lockName({ k: 2, n: 3 })]);
    await expect(acquireRunLock(d, { k: 1, n: 3 }, { waitMs: 0 })).rejects.toThrow(/shard 1\/3/);
    await expect(acquireRunLock(d, null, { waitMs: 0 })).rejects.toThrow(/shard [12]\/3/);
    await expect(acquireRunLock(d, { k: 1, n: 2 }, { waitMs: 0 })).rejects.toThrow(/shard [12]\/3/);
    // The refused runs left nothing behind.
    expect((await lockFiles(d)).sort()).toEqual([lockName({ k: 1, n: 3 }), lockName({ k: 2, n: 3 })]);
    await s1.release();
    await s2.release();
    const whole = await acquireRunLock(d, null, { waitMs: 0 });
    await expect(acquireRunLock(d, { k: 3, n: 3 }, { waitMs: 0 })).rejects.toThrow(/in use by the run of pid/);
    await whole.release();
    expect(await lockFiles(d)).toEqual([]);
  });

  it('release leaves alone a lock that is no longer its own', async () => {
    const d = await folder();
    const lock = await acquireRunLock(d, null);
    const other = JSON.stringify({ pid: process.pid, host: hostname(), started: new Date().toISOString(), shard: null, tool: 'x', token: 'someone-else' });
    await writeFile(lock.path, other);
    await lock.release();
    expect(await readFile(lock.path, 'utf8')).toBe(other);
  });
});

describe('runs of one job into one folder', () => {
  let file = '';
  let ids: string[] = [];
  let hashes = new Map<string, string>();
  beforeAll(async () => {
    file = join(dir, 'pin.yaml');
    await writeFile(file, JOB);
    const cases = expandJob((await loadJobFile(file)).spec);
    ids = cases.map((c) => c.id);
    hashes = new Map(cases.map((c) => [c.id, caseHash(c)]));
  });

  it('two runs started together: the second waits for the first, and every case ends complete and verified', async () => {
    const out = join(dir, 'out-twice');
    const a = recorder();
    const b = recorder();
    const [oa, ob] = await Promise.all([
      runJobFile(file, { outDir: out, reporter: a.reporter }),
      runJobFile(file, { outDir: out, reporter: b.reporter }),
    ]);
    expect(oa.error).toBeUndefined();
    expect(ob.error).toBeUndefined();
    expect(oa.done).toBe(3);
    expect(ob.done).toBe(3);
    // Each case computed once, by one of the two; the other skipped them as verified.
    expect([...a.computed, ...b.computed].sort()).toEqual([...ids].sort());
    expect([...a.notes, ...b.notes].filter((l) => /is in use by the run of pid .*: waiting up to/.test(l))).toHaveLength(1);
    const jobDir = join(out, 'pin');
    for (const id of ids) expect((await verifyCase(jobDir, id, hashes.get(id)!)).state).toBe('done');
    expect(await lockFiles(jobDir)).toEqual([]);
    const summary = JSON.parse(await readFile(join(jobDir, 'summary.json'), 'utf8'));
    expect(summary.done).toBe(3);
  }, 60_000);

  it('a refused run (lockWaitMs 0) names the holder and writes nothing', async () => {
    const out = join(dir, 'out-refused');
    const jobDir = join(out, 'pin');
    await mkdir(jobDir, { recursive: true });
    const held = await acquireRunLock(jobDir, null);
    const r = recorder();
    const o = await runJobFile(file, { outDir: out, reporter: r.reporter, lockWaitMs: 0 });
    expect(o.error).toContain(`is in use by the run of pid ${process.pid} on host ${hostname()}`);
    expect(r.computed).toEqual([]);
    expect((await readdir(jobDir)).sort()).toEqual(['run.lock']);
    await held.release();
  });

  it('a stale lock left by a killed run is taken over by the next run, which completes the job', async () => {
    const out = join(dir, 'out-stale');
    const jobDir = join(out, 'pin');
    await mkdir(jobDir, { recursive: true });
    const pid = deadPid();
    await writeFile(join(jobDir, 'run.lock'), JSON.stringify({ pid, host: hostname(), started: new Date().toISOString(), shard: null, tool: 'x', token: 'k9' }));
    const r = recorder();
    const o = await runJobFile(file, { outDir: out, reporter: r.reporter, lockWaitMs: 0 });
    expect(o.error).toBeUndefined();
    expect(o.done).toBe(3);
    expect(r.notes.some((l) => l.includes(`taking over the stale lock of the run of pid ${pid}`))).toBe(true);
    expect(existsSync(join(jobDir, 'run.lock'))).toBe(false);
  }, 60_000);

  it('the lock is released when the run is refused after taking it', async () => {
    const out = join(dir, 'out-refused-late');
    const o = await runJobFile(file, { outDir: out, availableMemoryBytes: 1 });
    expect(o.error).toMatch(/needs about .* but only/);
    expect(await lockFiles(join(out, 'pin'))).toEqual([]);
  });
});
