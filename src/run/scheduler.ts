// Runs cases on worker threads (worker-threads-pool), one case per task, or in this thread when
// one worker is asked for, or in this thread with an FFT team (src/parallel) when a few large cases
// are better served by sharing each one's FFTs between the threads (chooseParallelism). A worker
// that dies fails only the case it had; a new one takes over.
import { fileURLToPath } from 'node:url';
import type { Worker } from 'node:worker_threads';
import Pool from 'worker-threads-pool';
import { executeCase, type CaseDone, type CaseTask } from './execute.js';
import { newCaseContext } from './context.js';
import type { Engine } from '../optics/engine.js';
import type { FromWorker, ToWorker } from './worker.js';
import type { Plan } from '../plan/types.js';
import { descriptorOf } from '../methods/registry.js';
import { startFftTeam, stopFftTeam, teamsAvailable, TEAM_MIN_VALUES } from '../parallel/fft-team.js';
import { machineThreads } from './threads.js';
import { WORKER_FILE, workersAvailable, type Crew } from './crew.js';

export { machineThreads };

export interface SchedulerEvents {
  start(id: string): void;
  done(d: CaseDone): void | Promise<void>;
  failed(id: string, error: string): void | Promise<void>;
  note?(line: string): void;
}

export interface SchedulerOptions {
  workers: number;
  /** The engine for cases computed in this thread (a team's engine is made from it). */
  engine: Engine;
  maxMemoryBytes?: number;
  /** Heap limit per worker (MB), from the largest case's memory estimate. */
  heapMb?: number;
  signal?: AbortSignal;
  /**
   * Threads sharing each case's large FFTs, this one included: the cases then run one after the
   * other in this thread (workers is not used). Worker threads never start teams of their own.
   */
  threadsPerCase?: number;
  /**
   * Workers started before the planning (run/crew.ts): taken over as case workers when their heap
   * limit covers heapMb, else stopped. Stopped in every case by the time runTasks returns.
   */
  crew?: Crew;
  /**
   * Keep the case workers when the cases are done (not on an interruption): they are returned in
   * `kept`, told to load the report's plotting libraries as they run out of cases, for the job
   * report's plots (run/helpers.ts). The caller stops them.
   */
  keep?: boolean;
}

export interface TasksOutcome {
  interrupted: boolean;
  /** The workers kept (SchedulerOptions.keep), alive and idle; empty when the cases ran in this thread. */
  kept: Worker[];
}

export { workersAvailable };

export interface Parallelism {
  /** Cases at once, one per worker thread. */
  workers: number;
  /** Threads per case (an FFT team) when the cases run one at a time here; 1 otherwise. */
  threadsPerCase: number;
  /**
   * The choice and why, for the run's progress note, when the cases do not simply get one worker
   * each (the job's first line gives the worker count; notes show even in --quiet runs).
   */
  note: string;
}

/** Does the case spend its time in 2-D FFTs large enough to share (fft2 on shared sample arrays)? */
export function sharesFfts(p: Plan): boolean {
  // A spectrum's lines run one after another within the case: its FFTs are its lines' (the case's
  // own method is only its middle line's, which may be a direct sum while others transform).
  if (p.spectrum) return p.spectrum.members.some(sharesFfts);
  if (p.layout !== 'two-d' || !p.y) return false;
  // The transfer forms (two FFTs) and the single-FFT form transform the padded grid; direct sums do not.
  const fft = descriptorOf(p).grid !== 'direct';
  return fft && p.x.paddedSamples * p.y.paddedSamples >= TEAM_MIN_VALUES;
}

/**
 * How `asked` threads (at most machineThreads(), said in the note when lowered) serve these cases.
 * One case per worker thread, when there are at least as many cases as threads and `atOnce` (what
 * the memory guard allows) lets them all run; else the cases one at a time in this thread, each
 * case's large FFTs shared by all the threads, when the cases have such FFTs; else as many workers
 * as there are cases and memory for.
 */
export function chooseParallelism(plans: Plan[], asked: number, atOnce: number): Parallelism {
  const machine = machineThreads();
  const requested = Math.min(Math.max(1, Math.floor(asked) || 1), machine);
  const lowered = asked > machine ? `${asked} threads asked for; this machine runs ${machine} at once: using ${machine}` : '';
  const choice = chooseFor(plans, requested, atOnce);
  return lowered ? { ...choice, note: choice.note ? `${lowered}; ${choice.note}` : lowered } : choice;
}

function chooseFor(plans: Plan[], requested: number, atOnce: number): Parallelism {
  const n = plans.length;
  const cases = `${n} case${n === 1 ? '' : 's'}`;
  const fallback = Math.max(1, Math.min(requested, atOnce, n));
  if (requested <= 1 || n === 0) return { workers: 1, threadsPerCase: 1, note: '' };
  if (n >= requested && atOnce >= requested) return { workers: requested, threadsPerCase: 1, note: '' };
  const why = n < requested ? `${cases} for ${requested} threads` : `memory allows ${atOnce} case${atOnce === 1 ? '' : 's'} at a time`;
  if (!plans.some(sharesFfts)) return { workers: fallback, threadsPerCase: 1, note: '' };
  if (!teamsAvailable()) {
    return { workers: fallback, threadsPerCase: 1, note: `${why}: splitting a case's FFTs across threads needs the built program (npm run build)` };
  }
  return { workers: 1, threadsPerCase: requested, note: `${why}: one case at a time, its FFTs split across ${requested} threads` };
}

export async function runTasks(tasks: CaseTask[], opts: SchedulerOptions, ev: SchedulerEvents): Promise<TasksOutcome> {
  const onWorkers = !((opts.threadsPerCase ?? 1) > 1 && tasks.length > 0) && opts.workers > 1 && tasks.length > 1 && workersAvailable();
  // A crew the cases will not use is stopped before they start (its threads would share the cores).
  const crew = onWorkers && opts.crew && opts.crew.heapMb >= (opts.heapMb ?? 0) ? opts.crew : null;
  if (opts.crew && !crew) await opts.crew.stop();
  if ((opts.threadsPerCase ?? 1) > 1 && tasks.length > 0) return { ...(await runWithTeam(tasks, opts, ev)), kept: [] };
  if (!onWorkers) {
    if (opts.workers > 1 && !workersAvailable()) ev.note?.('worker threads need the built program (npm run build); running the cases in this thread');
    return { ...(await runHere(tasks, opts, ev)), kept: [] };
  }
  const n = Math.min(opts.workers, tasks.length, machineThreads());
  const ready = crew ? await crew.take(n) : [];
  return runOnWorkers(tasks, opts, ev, ready);
}

/** The cases in this thread with an FFT team, which ends with the run, however the run ends. */
async function runWithTeam(tasks: CaseTask[], opts: SchedulerOptions, ev: SchedulerEvents): Promise<{ interrupted: boolean }> {
  const asked = Math.min(opts.threadsPerCase!, machineThreads());
  try {
    const engine = await startFftTeam(asked, opts.engine, { onProblem: (m) => ev.note?.(m) });
    if (engine.threads < asked) ev.note?.(`only ${engine.threads} of ${asked} threads could be started for the FFTs`);
    return await runHere(tasks, { ...opts, engine }, ev);
  } finally {
    await stopFftTeam();
  }
}

async function runHere(tasks: CaseTask[], opts: SchedulerOptions, ev: SchedulerEvents): Promise<{ interrupted: boolean }> {
  // This run's context: the kept spectrum and the searches' cache go with it when the run ends.
  const ctx = newCaseContext(opts.engine, opts.maxMemoryBytes !== undefined ? { maxMemoryBytes: opts.maxMemoryBytes } : {});
  for (const t of tasks) {
    if (opts.signal?.aborted) return { interrupted: true };
    ev.start(t.plan.case.id);
    // Let a pending Ctrl-C be seen between cases (a case itself runs to its end in this thread).
    await new Promise((r) => setImmediate(r));
    if (opts.signal?.aborted) return { interrupted: true };
    try {
      await ev.done(await executeCase(t, ctx));
    } catch (e) {
      await ev.failed(t.plan.case.id, (e as Error).message);
    }
  }
  return { interrupted: !!opts.signal?.aborted };
}

/** The cases on n worker threads: `ready` ones (a crew's, already started) first, the rest started here. */
function runOnWorkers(tasks: CaseTask[], opts: SchedulerOptions, ev: SchedulerEvents, ready: Worker[]): Promise<TasksOutcome> {
  const queue = [...tasks];
  const n = Math.min(opts.workers, tasks.length, machineThreads());
  const pool = new Pool({ max: n });
  const busy = new Map<Worker, CaseTask | null>();
  let outstanding = tasks.length;
  let stopped = false;
  // Results are reported one at a time, in the order they arrive.
  let chain: Promise<void> = Promise.resolve();
  const report = (f: () => void | Promise<void>) => {
    chain = chain.then(f, f);
  };

  return new Promise((resolve) => {
    const finish = (interrupted: boolean) => {
      if (stopped) return;
      stopped = true;
      // Idle workers are told to stop (or kept, when asked); on an interruption the busy ones are abandoned.
      const kept = opts.keep && !interrupted ? [...busy.keys()] : [];
      for (const [w, t] of busy) {
        if (interrupted && t) void w.terminate();
        else if (!kept.includes(w)) w.postMessage({ type: 'stop' } satisfies ToWorker);
      }
      chain.then(() => resolve({ interrupted, kept }));
    };
    opts.signal?.addEventListener('abort', () => finish(true), { once: true });

    const settle = () => {
      outstanding--;
      if (outstanding === 0) finish(false);
    };

    const feed = (w: Worker) => {
      const t = queue.shift();
      if (!t) {
        busy.set(w, null);
        // No case left for it: stop, or (kept for the report) load the plotting libraries meanwhile.
        w.postMessage((opts.keep ? { type: 'preload' } : { type: 'stop' }) satisfies ToWorker);
        return;
      }
      busy.set(w, t);
      ev.start(t.plan.case.id);
      w.postMessage({ type: 'task', task: t } satisfies ToWorker);
    };

    const spawn = () => {
      if (stopped || queue.length === 0) return;
      const resourceLimits = opts.heapMb ? { maxOldGenerationSizeMb: opts.heapMb } : undefined;
      const workerData = opts.maxMemoryBytes !== undefined ? { maxMemoryBytes: opts.maxMemoryBytes } : {};
      pool.acquire(fileURLToPath(WORKER_FILE), { workerData, ...(resourceLimits ? { resourceLimits } : {}) }, (err, w) => {
        if (err) {
          // Cannot start a worker at all: the remaining cases fail with the reason.
          for (const t of queue.splice(0)) report(() => ev.failed(t.plan.case.id, `could not start a worker: ${err.message}`));
          while (outstanding > 0) settle();
          return;
        }
        attach(w);
      });
    };

    const attach = (w: Worker) => {
      w.on('message', (m: FromWorker) => {
        if (m.type === 'ready') return feed(w);
        if (m.type !== 'done' && m.type !== 'failed') return;
        const t = busy.get(w);
        busy.set(w, null);
        if (m.type === 'done') report(() => ev.done(m.done));
        else report(() => ev.failed(m.id, m.error));
        if (t) settle();
        if (!stopped) feed(w);
      });
      const lost = (why: string) => {
        const t = busy.get(w);
        busy.delete(w);
        if (t && !stopped) {
          report(() => ev.failed(t.plan.case.id, `the worker computing it stopped: ${why}`));
          settle();
          spawn();
        }
      };
      w.on('error', (e) => lost(e.message));
      w.on('exit', (code) => lost(`exit code ${code}`));
    };
    // A crew's workers have said they are ready already: they get their first case now.
    for (const w of ready.slice(0, n)) {
      attach(w);
      feed(w);
    }
    for (let i = ready.length; i < n; i++) spawn();
  });
}
