// Runs cases on worker threads (worker-threads-pool), one case per task, or in this thread when
// one worker is asked for. A worker that dies fails only the case it had; a new one takes over.
import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import type { Worker } from 'node:worker_threads';
import Pool from 'worker-threads-pool';
import { executeCase, type CaseDone, type CaseTask } from './execute.js';
import { newSearchContext } from './searches.js';
import type { FromWorker, ToWorker } from './worker.js';

export interface SchedulerEvents {
  start(id: string): void;
  done(d: CaseDone): void | Promise<void>;
  failed(id: string, error: string): void | Promise<void>;
  note?(line: string): void;
}

export interface SchedulerOptions {
  workers: number;
  maxMemoryBytes?: number;
  /** Heap limit per worker (MB), from the largest case's memory estimate. */
  heapMb?: number;
  signal?: AbortSignal;
}

const WORKER_FILE = new URL('./worker.js', import.meta.url);

/** Worker threads need the compiled worker module; from TypeScript sources (tests) there is none. */
export function workersAvailable(): boolean {
  return existsSync(fileURLToPath(WORKER_FILE));
}

export async function runTasks(tasks: CaseTask[], opts: SchedulerOptions, ev: SchedulerEvents): Promise<{ interrupted: boolean }> {
  if (opts.workers <= 1 || tasks.length <= 1 || !workersAvailable()) {
    if (opts.workers > 1 && !workersAvailable()) ev.note?.('worker threads need the built program (npm run build); running the cases in this thread');
    return runHere(tasks, opts, ev);
  }
  return runOnWorkers(tasks, opts, ev);
}

async function runHere(tasks: CaseTask[], opts: SchedulerOptions, ev: SchedulerEvents): Promise<{ interrupted: boolean }> {
  const search = newSearchContext(opts.maxMemoryBytes !== undefined ? { maxMemoryBytes: opts.maxMemoryBytes } : {});
  for (const t of tasks) {
    if (opts.signal?.aborted) return { interrupted: true };
    ev.start(t.plan.case.id);
    // Let a pending Ctrl-C be seen between cases (a case itself runs to its end in this thread).
    await new Promise((r) => setImmediate(r));
    if (opts.signal?.aborted) return { interrupted: true };
    try {
      await ev.done(await executeCase(t, search));
    } catch (e) {
      await ev.failed(t.plan.case.id, (e as Error).message);
    }
  }
  return { interrupted: !!opts.signal?.aborted };
}

function runOnWorkers(tasks: CaseTask[], opts: SchedulerOptions, ev: SchedulerEvents): Promise<{ interrupted: boolean }> {
  const queue = [...tasks];
  const n = Math.min(opts.workers, tasks.length);
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
      // Idle workers are told to stop; on an interruption the busy ones are abandoned.
      for (const [w, t] of busy) {
        if (interrupted && t) void w.terminate();
        else w.postMessage({ type: 'stop' } satisfies ToWorker);
      }
      chain.then(() => resolve({ interrupted }));
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
        w.postMessage({ type: 'stop' } satisfies ToWorker);
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
        w.on('message', (m: FromWorker) => {
          if (m.type === 'ready') return feed(w);
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
      });
    };
    for (let i = 0; i < n; i++) spawn();
  });
}
