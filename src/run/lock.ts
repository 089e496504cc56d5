// One run at a time per set of cases in a job folder. Two runs of one job into one folder would
// compute the same cases side by side, and the second's clean-up of half-written folders could
// remove the first's folder while it is being written. A run therefore holds a lock file in the job
// folder: run.lock for a whole job, run-shard-K-of-N.lock for a shard. Shards of one split (same N)
// hold different cases and run at once by design, on one machine or many; every other pair of
// locks conflicts (a whole run overlaps every shard, and shards of different splits overlap).
//
// The lock file is created with O_EXCL (flag wx) and holds the holder's pid, host, start time and a
// token of its own. A lock is stale, and is taken over with a note, when its holder is on this host
// and its pid no longer exists (kill -9, a crash, a power cut), or when it is from another host and
// its heartbeat (the file's mtime, touched every HEARTBEAT_MS by a small thread of the holder that
// keeps going while cases keep the main thread busy) is older than OTHER_HOST_STALE_MS. A run that
// finds a live lock waits up to a bound for it, then refuses, naming the holder and the way on.
import { hostname } from 'node:os';
import { open, readFile, readdir, stat, unlink } from 'node:fs/promises';
import { readFileSync, unlinkSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { randomBytes } from 'node:crypto';
import { Worker } from 'node:worker_threads';
import { safeEcho } from '../safe-text.js';
import { writeError } from '../output/atomic.js';
import { TOOL_VERSION } from '../version.js';

export interface LockHolder {
  pid: number;
  host: string;
  /** ISO time the holder started. */
  started: string;
  /** "K/N" for a shard, null for the whole job. */
  shard: string | null;
  tool: string;
  /** Random, to tell this lock from a later one of the same pid (and to release only one's own). */
  token: string;
}

export interface LockOptions {
  /** How long to wait for a live lock before refusing (ms). */
  waitMs?: number;
  signal?: AbortSignal;
  note?: (line: string) => void;
  /** Test hooks: the heartbeat interval and the other-host staleness bound. */
  heartbeatMs?: number;
  otherHostStaleMs?: number;
}

export interface HeldLock {
  path: string;
  holder: LockHolder;
  release(): Promise<void>;
}

/** Default wait for a live lock: a run started just as another ends goes through; a double start learns who holds the folder within seconds. */
export const LOCK_WAIT_MS = 30_000;
export const HEARTBEAT_MS = 20_000;
/**
 * A lock from another host is stale after this long without a heartbeat. Generous against clock
 * skew between cluster nodes and a network file system's cached file times (tens of seconds), short
 * enough that a shard requeued on another node after its first node died goes on by itself.
 */
export const OTHER_HOST_STALE_MS = 5 * 60_000;
/** A lock file that is still empty or partly written (its holder is between open and write) is given this long. */
const UNREADABLE_GRACE_MS = 30_000;
/** A takeover marker left by a run killed during a takeover is ignored after this long. */
const TAKEOVER_STALE_MS = 30_000;

export class LockBusyError extends Error {}

type Shard = { k: number; n: number } | null;

export function lockName(shard: Shard): string {
  return shard ? `run-shard-${shard.k}-of-${shard.n}.lock` : 'run.lock';
}

const LOCK_FILE = /^run(?:-shard-(\d+)-of-(\d+))?\.lock$/;

/** Two locks conflict unless both are shards of one split with different K. */
function conflicts(mine: Shard, name: string): boolean {
  const m = LOCK_FILE.exec(name);
  if (!m) return false;
  if (!mine || m[1] === undefined) return true;
  const k = Number(m[1]);
  const n = Number(m[2]);
  return n !== mine.n || k === mine.k;
}

interface Seen {
  holder: LockHolder | null;
  ageMs: number;
}

async function readLock(path: string): Promise<Seen | null> {
  let text: string;
  let mtime: number;
  try {
    mtime = (await stat(path)).mtimeMs;
    text = await readFile(path, 'utf8');
  } catch {
    return null; // gone meanwhile
  }
  let holder: LockHolder | null = null;
  try {
    const h = JSON.parse(text) as LockHolder;
    if (h && Number.isSafeInteger(h.pid) && h.pid > 0 && typeof h.host === 'string' && typeof h.token === 'string') holder = h;
  } catch {
    holder = null;
  }
  return { holder, ageMs: Date.now() - mtime };
}

function pidAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (e) {
    // EPERM: the process exists but belongs to someone else.
    return (e as NodeJS.ErrnoException).code !== 'ESRCH';
  }
}

/** Why a lock is stale, or null when it is live. */
function staleness(seen: Seen, staleMs: number): string | null {
  const h = seen.holder;
  if (!h) return seen.ageMs > UNREADABLE_GRACE_MS ? `the lock file is unreadable and untouched for ${seconds(seen.ageMs)}` : null;
  if (h.host === hostname()) return pidAlive(h.pid) ? null : 'that process no longer exists';
  return seen.ageMs > staleMs ? `its host has not renewed it for ${seconds(seen.ageMs)} (a live run renews it every ${seconds(HEARTBEAT_MS)})` : null;
}

function seconds(ms: number): string {
  const s = Math.max(0, Math.round(ms / 1000));
  if (s < 120) return `${s} s`;
  if (s < 7200) return `${Math.round(s / 60)} min`;
  return `${(s / 3600).toFixed(1)} h`;
}

function describeHolder(h: LockHolder | null): string {
  if (!h) return 'a run whose lock file is still being written';
  const started = Date.parse(h.started);
  const since = Number.isFinite(started) ? `, started ${safeEcho(h.started, 40)} (${seconds(Date.now() - started)} ago)` : '';
  return `the run of pid ${h.pid} on host ${safeEcho(h.host, 100)}${h.shard ? ` (shard ${safeEcho(h.shard, 40)})` : ''}${since}`;
}

function staleNote(path: string, seen: Seen, why: string): string {
  return `${safeEcho(path, 400)}: taking over the stale lock of ${describeHolder(seen.holder)}: ${why}`;
}

/**
 * Removes a stale lock, unless it changed since it was judged: a takeover marker (O_EXCL too) makes
 * sure that of two runs finding the same stale lock only one removes it, and never the fresh lock
 * the other has just made in its place.
 */
async function takeOver(path: string, judged: Seen): Promise<boolean> {
  const marker = `${path}.takeover`;
  let fd;
  try {
    fd = await open(marker, 'wx');
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code !== 'EEXIST') throw e;
    try {
      if (Date.now() - (await stat(marker)).mtimeMs > TAKEOVER_STALE_MS) await unlink(marker);
    } catch {
      // gone meanwhile
    }
    return false;
  }
  try {
    await fd.close();
    const now = await readLock(path);
    if (!now) return true; // removed meanwhile: free
    const same = judged.holder && now.holder ? now.holder.token === judged.holder.token : !judged.holder && !now.holder;
    if (!same) return false;
    await unlink(path).catch(() => undefined);
    return true;
  } finally {
    await unlink(marker).catch(() => undefined);
  }
}

async function tryCreate(path: string, holder: LockHolder): Promise<boolean> {
  let fd;
  try {
    fd = await open(path, 'wx');
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === 'EEXIST') return false;
    throw writeError(e, dirname(path));
  }
  try {
    await fd.writeFile(JSON.stringify(holder) + '\n');
  } catch (e) {
    await fd.close().catch(() => undefined);
    await unlink(path).catch(() => undefined);
    throw writeError(e, dirname(path));
  }
  await fd.close();
  return true;
}

/** Locks this process holds, removed if it exits without releasing them (process.exit on a second Ctrl-C). */
const held = new Map<string, string>();
let exitHook = false;
function removeOnExit(): void {
  for (const [path, token] of held) {
    try {
      if ((JSON.parse(readFileSync(path, 'utf8')) as LockHolder).token === token) unlinkSync(path);
    } catch {
      // already gone, or not ours any more
    }
  }
}

/**
 * Touches the lock file every `ms` from a thread of its own, so that the heartbeat goes on while a
 * long case keeps the main thread busy; it ends with the process (a kill -9 stops it too).
 */
function startHeartbeat(path: string, ms: number): Worker | null {
  const code = `
    const { workerData } = require('node:worker_threads');
    const { utimesSync } = require('node:fs');
    setInterval(() => { try { const t = new Date(); utimesSync(workerData.path, t, t); } catch {} }, workerData.ms);
  `;
  try {
    const w = new Worker(code, { eval: true, workerData: { path, ms }, resourceLimits: { maxOldGenerationSizeMb: 16 } });
    w.unref();
    w.on('error', () => undefined);
    return w;
  } catch {
    return null;
  }
}

const sleep = (ms: number, signal?: AbortSignal) =>
  new Promise<void>((res) => {
    const t = setTimeout(done, ms);
    function done() {
      clearTimeout(t);
      signal?.removeEventListener('abort', done);
      res();
    }
    signal?.addEventListener('abort', done, { once: true });
  });

/**
 * Takes the run lock of `jobDir` for the whole job (shard null) or one shard, waiting up to
 * opts.waitMs for a live conflicting lock; throws LockBusyError when it stays held (or the wait is
 * interrupted), and a write error naming the folder when the lock cannot be written.
 */
export async function acquireRunLock(jobDir: string, shard: Shard, opts: LockOptions = {}): Promise<HeldLock> {
  const waitMs = opts.waitMs ?? LOCK_WAIT_MS;
  const staleMs = opts.otherHostStaleMs ?? OTHER_HOST_STALE_MS;
  const path = join(jobDir, lockName(shard));
  const holder: LockHolder = {
    pid: process.pid,
    host: hostname(),
    started: new Date().toISOString(),
    shard: shard ? `${shard.k}/${shard.n}` : null,
    tool: TOOL_VERSION,
    token: randomBytes(8).toString('hex'),
  };
  const t0 = Date.now();
  let told = false;
  for (;;) {
    // The lock that stands in the way, if any: our own name first (O_EXCL), then conflicting ones.
    let blocker: { path: string; seen: Seen } | null = null;
    if (await tryCreate(path, holder)) {
      for (const name of await readdir(jobDir)) {
        if (name === lockName(shard) || !conflicts(shard, name)) continue;
        const seen = await readLock(join(jobDir, name));
        if (!seen) continue;
        const why = staleness(seen, staleMs);
        if (why && (await takeOver(join(jobDir, name), seen))) {
          opts.note?.(staleNote(join(jobDir, name), seen, why));
          continue;
        }
        // Live, or another run is taking the stale lock over right now: wait as for a live one.
        blocker = { path: join(jobDir, name), seen };
        break;
      }
      if (!blocker) return hold(path, holder, opts.heartbeatMs ?? HEARTBEAT_MS);
      // Step back so that the other run, which may be checking for us, can go on.
      await unlink(path).catch(() => undefined);
    } else {
      const seen = await readLock(path);
      if (!seen) continue; // released meanwhile: try again at once
      const why = staleness(seen, staleMs);
      if (why) {
        if (await takeOver(path, seen)) opts.note?.(staleNote(path, seen, why));
        else await sleep(100, opts.signal); // another run is taking it over: look again shortly
        if (opts.signal?.aborted) throw new LockBusyError(`the job folder ${safeEcho(jobDir, 400)} was being taken over from a stale lock; stopped while waiting`);
        continue;
      }
      blocker = { path, seen };
    }
    const waited = Date.now() - t0;
    const who = describeHolder(blocker.seen.holder);
    if (opts.signal?.aborted || waited >= waitMs) {
      throw new LockBusyError(
        `the job folder ${safeEcho(jobDir, 400)} is in use by ${who}` +
          (opts.signal?.aborted ? '; stopped while waiting for it' : waitMs > 0 ? `; waited ${seconds(waited)}` : '') +
          `. Let that run finish (the same command then skips its finished cases) or stop it, and run again; ` +
          `if that process no longer exists (on a machine that went down), delete ${safeEcho(blocker.path, 400)} and run again`,
      );
    }
    if (!told) {
      opts.note?.(`the job folder ${safeEcho(jobDir, 400)} is in use by ${who}: waiting up to ${seconds(waitMs)} for it`);
      told = true;
    }
    // Jitter, so that two runs that stepped back for each other do not meet again and again.
    await sleep(Math.min(waitMs - waited, 200 + Math.random() * 300), opts.signal);
  }
}

function hold(path: string, holder: LockHolder, heartbeatMs: number): HeldLock {
  held.set(path, holder.token);
  if (!exitHook) {
    process.on('exit', removeOnExit);
    exitHook = true;
  }
  const beat = startHeartbeat(path, heartbeatMs);
  let released = false;
  return {
    path,
    holder,
    async release() {
      if (released) return;
      released = true;
      held.delete(path);
      await beat?.terminate();
      // Only our own lock: had it been taken over (judged stale wrongly), the new holder's stays.
      const seen = await readLock(path);
      if (seen?.holder?.token === holder.token) await unlink(path).catch(() => undefined);
    },
  };
}
