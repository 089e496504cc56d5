// An FFT team: this thread and helper threads share each large 2-D fft2, so that one big case uses
// every core. The call stays synchronous: this thread posts the transform in the control block,
// wakes the helpers, does parts itself, and waits (Atomics.wait) for the rest of each phase. With
// the WebAssembly kernel all threads work in one shared WebAssembly memory; the protocol is in
// fft-work.ts, the helper's side in fft-helper.ts.
//
// startFftTeam gives an Engine (optics/engine.ts) for the runner to pass to the propagations: its
// fft2 goes through the team, and its allocate puts large sample arrays on a SharedArrayBuffer
// (only those can be shared). Everything else — 1-D and small transforms, data in ordinary memory —
// it leaves to the engine it was made from, in this thread.
//
// A helper that fails, or makes no progress for `stallMs`, does not stop the case: this thread
// takes its parts over, or, before anything is written to the data, transforms the data alone
// (the same bits either way), stops the team and goes on alone.
//
// With the native kernel (fft-fast.ts) there are no helper threads: it shares each transform
// between threads itself, inside the call (nativeTeamEngine).
//
// Memory: with the WebAssembly kernel the shared memory holds one padded copy of the largest
// transform (the copy one thread's kernel keeps, now shared); with the TypeScript kernel a scratch
// array of the largest transform is kept instead. Both live until the team stops.
import { existsSync } from 'node:fs';
import { setFlagsFromString } from 'node:v8';
import { runInNewContext } from 'node:vm';
import { fileURLToPath } from 'node:url';
import { MessageChannel, Worker, type MessagePort } from 'node:worker_threads';
import type { Engine } from '../optics/engine.js';
import { pooledAllocation } from '../optics/engine.js';
import { isFastFftSize } from '../optics/fft.js';
import { attachSharedFftMemory, createSharedFftMemory, fastFftBackend, fft2Interleaved, sharedLayout } from '../optics/fft-fast.js';
import {
  ABORT,
  claimAndDo,
  commits,
  CONTROL_CELLS,
  doPart,
  DONE,
  FAULT,
  FREE,
  HELPER_PARTS,
  jobOf,
  NEXT,
  nextSeq,
  partSizes,
  REVOKED,
  SEQ,
  stateCell,
  STOP,
  WRITING,
  WRITTEN,
  type HelperFault,
  type Job,
  type JobMessage,
  type Mode,
} from './fft-work.js';
import type { FromHelper, HelperData } from './fft-helper.js';

const HELPER_FILE = new URL('./fft-helper.js', import.meta.url);

/** Shared arrays from this size (bytes) are preceded by a garbage collection. */
const COLLECT_FROM_BYTES = 64 * 1024 ** 2;
let collector: (() => void) | undefined | null = null;

/**
 * The collector, as a fresh context exposes it once the flag is set (asked for when the first team
 * starts; only contexts made afterwards see a `gc` global, nothing else in the process changes).
 */
function collectGarbage(): void {
  if (collector === null) {
    setFlagsFromString('--expose-gc');
    collector = runInNewContext('gc') as (() => void) | undefined;
  }
  collector?.();
}

/**
 * Transforms of fewer complex values than this stay in one thread: measured with a team of two,
 * 256² gained nothing (the hand-off costs tens of µs of a 0.5 ms transform), 512² about 1.3×,
 * 1024² and up 1.7–1.9×.
 */
export const TEAM_MIN_VALUES = 2 ** 18;
/** Sample arrays of at least this many complex values go to shared memory while a team runs. */
export const SHARED_MIN_VALUES = 2 ** 18;
/** No part finished for this long while helpers hold parts: they are taken to be lost. */
const STALL_MS = 10_000;
/** A helper that has not said it is ready by then is left out. */
const READY_MS = 20_000;

export interface TeamOptions {
  /** Smallest transform (complex values) shared; default TEAM_MIN_VALUES. */
  minValues?: number;
  /** Smallest sample array (complex values) allocated in shared memory; default SHARED_MIN_VALUES. */
  sharedMinValues?: number;
  /** How long the caller waits without progress before it gives up on the helpers (ms). */
  stallMs?: number;
  /** Told, once, why the team stopped on its own (a helper lost). */
  onProblem?: (message: string) => void;
  /** For tests of the recovery: every helper shows this fault in its first part. */
  faultForTests?: HelperFault;
  /**
   * For tests: this thread draws no parts of its own (it still does the parts a helper drew and
   * left), so that the helpers' share is certain however busy the machine is.
   */
  callerIdleForTests?: boolean;
}

export interface TeamFigures {
  threads: number;
  transforms: number;
  /** Of those, transforms done in the shared WebAssembly memory (the rest: in parts, copied). */
  inSharedMemory: number;
  partsByHelpers: number;
  partsByCaller: number;
  /** Transforms this thread finished alone after losing a helper. */
  takeovers: number;
  /** Why the team stopped on its own, if it did. */
  problem?: string;
}

interface Helper {
  worker: Worker;
  port: MessagePort;
  ready: boolean;
  /** It runs the kernel on the team's shared memory. */
  shared: boolean;
  lost: boolean;
}

interface Team {
  /** The engine the team was made from: what it declines, and a failed transform, run there. */
  base: Engine;
  ctl: Int32Array;
  /** The shared WebAssembly memory, attached in this thread too; null: 'parts' mode only. */
  memory: object | null;
  helpers: Helper[];
  scratch: SharedArrayBuffer | null;
  seq: number;
  minValues: number;
  stallMs: number;
  callerIdle: boolean;
  onProblem?: (message: string) => void;
  figures: TeamFigures;
  stopped: boolean;
}

let team: Team | null = null;
/** The team on the native kernel, while it runs: no helpers, only its size and figures. */
let nativeTeam: { threads: number; figures: TeamFigures; stopped: boolean } | null = null;
let lastFigures: TeamFigures = { threads: 1, transforms: 0, inSharedMemory: 0, partsByHelpers: 0, partsByCaller: 0, takeovers: 0 };

/** Helper threads need the compiled helper module; from TypeScript sources (tests) there is none. */
export function teamsAvailable(): boolean {
  return existsSync(fileURLToPath(HELPER_FILE));
}

/** Threads sharing each large fft2 now, this one included (1: no team). */
export function fftTeamSize(): number {
  if (nativeTeam && !nativeTeam.stopped) return nativeTeam.threads;
  if (!team || team.stopped) return 1;
  return 1 + team.helpers.filter((h) => !h.lost).length;
}

/** What the present team (or the last one) has done. */
export function fftTeamFigures(): TeamFigures {
  if (nativeTeam) return { ...nativeTeam.figures };
  if (team) team.figures.partsByHelpers = Atomics.load(team.ctl, HELPER_PARTS);
  return { ...(team ? team.figures : lastFigures) };
}

/**
 * Starts a team of `threads` threads in all, this one included, and resolves to the engine that
 * routes fft2 through it (parts go to the helpers as they become ready) and allocates large
 * sample arrays in shared memory. Its `threads` is the number of threads ready: 1 when no helper
 * could start or the compiled helper module is missing, and then the engine is `base` itself.
 * A team already running is stopped first; once stopped, the team's engine does what `base` does.
 */
export async function startFftTeam(threads: number, base: Engine, opts: TeamOptions = {}): Promise<Engine> {
  await stopFftTeam();
  const n = Math.floor(threads);
  if (!(n > 1)) return base;
  if (fastFftBackend(base.kernel) === 'native') return nativeTeamEngine(n, base, opts.minValues ?? TEAM_MIN_VALUES);
  if (!teamsAvailable()) return base;
  const ctl = new Int32Array(new SharedArrayBuffer(4 * CONTROL_CELLS));
  let memory = createSharedFftMemory(base.kernel);
  if (memory && !attachSharedFftMemory(base.kernel, memory)) memory = null;
  const t: Team = {
    base,
    ctl,
    memory,
    helpers: [],
    scratch: null,
    seq: 0,
    minValues: opts.minValues ?? TEAM_MIN_VALUES,
    stallMs: opts.stallMs ?? STALL_MS,
    callerIdle: opts.callerIdleForTests === true,
    ...(opts.onProblem ? { onProblem: opts.onProblem } : {}),
    figures: { threads: n, transforms: 0, inSharedMemory: 0, partsByHelpers: 0, partsByCaller: 0, takeovers: 0 },
    stopped: false,
  };
  team = t;
  const readies: Promise<void>[] = [];
  for (let k = 1; k < n; k++) {
    const { port1, port2 } = new MessageChannel();
    const data: HelperData = {
      control: ctl.buffer as SharedArrayBuffer,
      port: port2,
      slot: k,
      memory,
      ...(opts.faultForTests ? { fault: opts.faultForTests } : {}),
    };
    let worker: Worker;
    try {
      worker = new Worker(fileURLToPath(HELPER_FILE), { workerData: data, transferList: [port2], execArgv: helperExecArgv() });
    } catch (e) {
      port1.close();
      giveUp(t, `an FFT helper thread could not start: ${(e as Error).message}`);
      break;
    }
    port1.unref();
    const h: Helper = { worker, port: port1, ready: false, shared: false, lost: false };
    t.helpers.push(h);
    const ready = new Promise<void>((resolve) => {
      const timer = setTimeout(resolve, READY_MS);
      timer.unref();
      const lost = (why: string) => {
        clearTimeout(timer);
        resolve();
        if (h.lost) return;
        h.lost = true;
        if (!t.stopped) giveUp(t, `an FFT helper thread stopped (${why}); going on in one thread`);
      };
      worker.on('message', (m: FromHelper) => {
        if (m.type === 'ready') {
          h.ready = true;
          h.shared = m.shared;
          clearTimeout(timer);
          resolve();
        } else lost(m.error);
      });
      worker.on('error', (e) => lost(e.message));
      worker.on('exit', (code) => lost(`exit code ${code}`));
    });
    // A library caller's process must be able to end while the team waits for work, but not
    // before the helpers have started (startFftTeam is awaited). Listeners added after unref()
    // would hold the process again, so it comes after them.
    void ready.then(() => worker.unref());
    readies.push(ready);
  }
  if (t.stopped) return base;
  const sharedMin = 2 * (opts.sharedMinValues ?? SHARED_MIN_VALUES);
  const allocation = pooledAllocation((values) => {
    if (t.stopped || values < sharedMin) return base.allocate(values);
    // Shared buffers do not press this thread's collector the way ordinary ones do, so the grids
    // of finished cases would pile up (measured: 4.6 padded grids at the peak of a 4096² case,
    // against 2.5 in one thread); a full collection before each large one keeps them to what
    // is live. Its cost (milliseconds) is small beside a transform of that size.
    if (8 * values >= COLLECT_FROM_BYTES) collectGarbage();
    return new Float64Array(new SharedArrayBuffer(8 * values));
  });
  await Promise.all(readies);
  const size = fftTeamSize();
  return {
    name: `${base.name} on ${size} threads`,
    threads: size,
    kernel: base.kernel,
    fft2(data, nx, ny, inverse) {
      if (!execute(t, data, nx, ny, inverse)) base.fft2(data, nx, ny, inverse);
    },
    fftRows: base.fftRows,
    allocate: allocation.allocate,
    // Arrays of the team's engine stay with it (a shared one must not go to base's pool).
    release: allocation.release,
  };
}

/**
 * The engine of a team on the native kernel: its fft2 runs the native transform on `threads`
 * threads (started inside each call), for 2-D transforms of at least `minValues` complex values,
 * in ordinary memory (nothing needs sharing). The bits are those of one thread. Should the
 * kernel be switched to another backend meanwhile, it does what `base` does.
 */
function nativeTeamEngine(threads: number, base: Engine, minValues: number): Engine {
  const t = { threads, figures: { threads, transforms: 0, inSharedMemory: 0, partsByHelpers: 0, partsByCaller: 0, takeovers: 0 }, stopped: false };
  nativeTeam = t;
  return {
    name: `${base.name} on ${threads} threads`,
    threads,
    kernel: base.kernel,
    fft2(data, nx, ny, inverse) {
      if (!t.stopped && fastFftBackend(base.kernel) === 'native' && ny > 1 && nx * ny >= minValues) {
        fft2Interleaved(base.kernel, data, nx, ny, inverse, threads);
        t.figures.transforms++;
      } else base.fft2(data, nx, ny, inverse);
    },
    fftRows: base.fftRows,
    allocate: base.allocate,
    release: base.release,
  };
}

/** Stops the team (fft2 is back to this thread at once); resolves when the helpers have ended. */
export async function stopFftTeam(): Promise<void> {
  if (nativeTeam) {
    nativeTeam.stopped = true;
    lastFigures = nativeTeam.figures;
    nativeTeam = null;
  }
  const t = team;
  if (!t) return;
  const ends = halt(t);
  team = null;
  await ends;
}

/**
 * The caller's Node options minus those about the main script (`node --input-type=module -e …`
 * would otherwise stop a helper before it starts).
 */
function helperExecArgv(): string[] {
  const out: string[] = [];
  const a = process.execArgv;
  for (let i = 0; i < a.length; i++) {
    const o = a[i]!;
    if (o === '-e' || o === '--eval' || o === '-p' || o === '--print') i++;
    else if (o === '--input-type') i++;
    else if (!o.startsWith('--input-type=') && !o.startsWith('--eval=') && !o.startsWith('--print=')) out.push(o);
  }
  return out;
}

/** Takes the team out of service and ends its threads. */
function halt(t: Team): Promise<unknown> {
  if (!t.stopped) {
    t.stopped = true;
    if (t.memory) attachSharedFftMemory(t.base.kernel, null);
    Atomics.store(t.ctl, STOP, 1);
    Atomics.notify(t.ctl, SEQ);
    t.figures.partsByHelpers = Atomics.load(t.ctl, HELPER_PARTS);
    lastFigures = t.figures;
  }
  return Promise.all(t.helpers.map((h) => h.worker.terminate().catch(() => undefined)));
}

function giveUp(t: Team, why: string): void {
  if (t.stopped) return;
  t.figures.problem = why;
  void halt(t);
  t.onProblem?.(why);
}

const bufferIds = new WeakMap<SharedArrayBuffer, number>();
let lastBufferId = 0;

function bufferIdOf(b: SharedArrayBuffer): number {
  let id = bufferIds.get(b);
  if (id === undefined) {
    id = ++lastBufferId;
    bufferIds.set(b, id);
  }
  return id;
}

function execute(t: Team, data: Float64Array, nx: number, ny: number, inverse: boolean): boolean {
  if (t.stopped || ny < 2 || !isFastFftSize(nx) || !isFastFftSize(ny) || data.length !== 2 * nx * ny) return false;
  if (nx * ny < t.minValues || !(data.buffer instanceof SharedArrayBuffer)) return false;
  const live = t.helpers.filter((h) => !h.lost);
  if (live.length === 0) return false;
  const threads = t.helpers.length + 1;
  // The shared memory when every helper can work in it (one that cannot yet is not ready yet).
  let mode: Mode = t.memory && fastFftBackend(t.base.kernel) === 'wasm-simd' && live.every((h) => h.shared || !h.ready) ? 'shared' : 'parts';
  const layout = mode === 'shared' ? sharedLayout(t.base.kernel, nx, ny, threads) : null;
  if (!layout) mode = 'parts';
  const { rowsPer, colsPer } = partSizes(mode, nx, ny, live.length + 1);
  if (Math.ceil(ny / rowsPer) < 2 || Math.ceil(nx / colsPer) < 2) return false;

  const values = 2 * nx * ny;
  if (mode === 'parts' && (!t.scratch || t.scratch.byteLength < 8 * values)) t.scratch = new SharedArrayBuffer(8 * values);
  const message: JobMessage = {
    seq: nextSeq(t.seq), mode, nx, ny, inverse, backend: fastFftBackend(t.base.kernel), rowsPer, colsPer,
    data: data.buffer, bufferId: bufferIdOf(data.buffer as SharedArrayBuffer), dataOffset: data.byteOffset,
    ...(mode === 'parts' ? { scratch: t.scratch! } : { layout: layout! }),
  };
  const job = jobOf(message);
  touchPages(data);
  const ctl = t.ctl;
  const seq = (t.seq = message.seq);
  const tag = seq << 3;
  for (let phase = 0; phase < job.parts.length; phase++) {
    for (let i = 0; i < job.parts[phase]!; i++) Atomics.store(ctl, stateCell(phase, i), tag | FREE);
    Atomics.store(ctl, NEXT + phase, 0);
    Atomics.store(ctl, DONE + phase, 0);
  }
  Atomics.store(ctl, ABORT, 0);
  for (const h of live) h.port.postMessage(message);
  // The message is queued before the number changes, so a helper that sees the number finds it.
  Atomics.store(ctl, SEQ, seq);
  Atomics.notify(ctl, SEQ);

  let alone: string | null = null;
  for (let phase = 0; phase < job.parts.length; phase++) {
    if (alone === null) {
      alone = share(t, job, phase);
      if (alone === null) continue;
      Atomics.store(ctl, ABORT, 1);
      Atomics.notify(ctl, DONE + phase);
      if (!commits(job, phase)) {
        // Nothing has been written to the data yet: transform it here, as if there were no team.
        t.base.fft2(data, nx, ny, inverse);
        break;
      }
    }
    finishAlone(t, job, phase);
  }
  t.figures.transforms++;
  if (mode === 'shared') t.figures.inSharedMemory++;
  if (alone !== null) {
    t.figures.takeovers++;
    giveUp(t, alone);
  }
  return true;
}

/**
 * Writes each 4 KB page of the data once, here, before the threads write it all. A freshly
 * allocated array's pages are mapped by the system on first write, and two threads taking those
 * faults at once were measured to be slower than one taking them all (2048², fresh array: 200 ms
 * against 90 ms for one thread alone); on pages already mapped this costs microseconds.
 */
function touchPages(data: Float64Array): void {
  for (let i = 0; i < data.length; i += 512) data[i] = data[i]!;
}

/** This thread's side of one phase; null when it went well, else why it has to go on alone. */
function share(t: Team, job: Job, phase: number): string | null {
  const ctl = t.ctl;
  const n = job.parts[phase]!;
  for (;;) {
    if (t.callerIdle) break;
    const i = Atomics.add(ctl, NEXT + phase, 1);
    if (i >= n) break;
    if (claimAndDo(t.base.kernel, ctl, job, phase, i, 0)) t.figures.partsByCaller++;
  }
  // parts whose number a helper still busy with an earlier transform drew from the counter
  const free = (job.seq << 3) | FREE;
  const leftovers = () => {
    for (let i = 0; i < n; i++) {
      if (Atomics.load(ctl, stateCell(phase, i)) === free && claimAndDo(t.base.kernel, ctl, job, phase, i, 0)) t.figures.partsByCaller++;
    }
  };
  // (An idle caller, in tests, leaves the helpers time to draw the parts first.)
  if (!t.callerIdle) leftovers();
  let done = Atomics.load(ctl, DONE + phase);
  let since = Date.now();
  while (done < n) {
    if (Atomics.load(ctl, FAULT) !== 0) return 'an FFT helper thread failed; going on in one thread';
    Atomics.wait(ctl, DONE + phase, done, 20);
    const now = Atomics.load(ctl, DONE + phase);
    if (now !== done) {
      done = now;
      since = Date.now();
    } else if (Date.now() - since > t.stallMs) {
      return `an FFT helper thread did not answer for ${t.stallMs / 1000} s; going on in one thread`;
    } else if (t.callerIdle && Date.now() - since > Math.min(200, t.stallMs / 4)) {
      leftovers();
    }
  }
  return null;
}

/**
 * Does every part of a committing phase that is not written yet, after revoking it so that no
 * helper can write it any more. A part being written is waited for; one that stays half-written
 * for stallMs belongs to a helper that died writing it, and is done again over what it left.
 */
function finishAlone(t: Team, job: Job, phase: number): void {
  const ctl = t.ctl;
  const tag = job.seq << 3;
  for (let i = 0; i < job.parts[phase]!; i++) {
    const at = stateCell(phase, i);
    let waited = 0;
    for (;;) {
      const s = Atomics.load(ctl, at);
      if (s === (tag | WRITTEN)) break;
      if (s === (tag | WRITING) && waited < t.stallMs) {
        const t0 = Date.now();
        Atomics.wait(ctl, at, s, Math.min(50, t.stallMs - waited));
        waited += Math.max(1, Date.now() - t0);
        continue;
      }
      if (s === (tag | REVOKED) || Atomics.compareExchange(ctl, at, s, tag | REVOKED) === s) {
        doPart(t.base.kernel, job, phase, i, 0);
        t.figures.partsByCaller++;
        break;
      }
    }
  }
}
