// Worker threads started before a job's cases are planned: they plan the cases between them, then
// compute them (the scheduler takes them over). A worker takes about half a second to start (node's
// own start-up and the modules a case needs) and a 100-case sweep took 2.6 s to plan in one thread;
// started first, the workers' start-up overlaps the main thread's work, and the planning is shared,
// instead of both coming one after the other before the first case.
//
// This module loads no planner until it must plan here itself (a worker stopped), so that the
// command line can start a crew before it loads the rest of the program (cli.ts): the workers'
// start-up then overlaps that loading too.
import { existsSync } from 'node:fs';
import { Worker } from 'node:worker_threads';
import { fileURLToPath } from 'node:url';
import type { Case, Plan } from '../plan/types.js';
import type { PlannerOptions } from '../plan/planner.js';
import type { FromWorker, ToWorker } from './worker.js';

/** The compiled worker module, for the crew and for the scheduler's own workers. */
export const WORKER_FILE = new URL('./worker.js', import.meta.url);

/** Worker threads need the compiled worker module; from TypeScript sources (tests) there is none. */
export function workersAvailable(): boolean {
  return existsSync(fileURLToPath(WORKER_FILE));
}

/**
 * The JS heap limit of a crew's workers (MiB). The scheduler gives a worker it starts itself the
 * largest case's memory estimate plus 512 MiB, known only once the cases are planned; a crew starts
 * before that, with this limit, and the scheduler takes it over only for jobs whose estimate is
 * within it (the others get new workers with their own limit). The cases' large arrays live outside
 * this heap, so it bounds runaway JS objects, not the fields.
 */
export const CREW_HEAP_MB = 2048;

interface Member {
  worker: Worker;
  /** True once the worker said it is ready; false if it stopped before. */
  ready: Promise<boolean>;
  alive: boolean;
  /** The planning request in flight. */
  pending: { resolve: (plans: Plan[]) => void; reject: (e: Error) => void } | null;
  listeners: { message: (m: FromWorker) => void; error: (e: Error) => void; exit: (code: number) => void };
}

export interface Crew {
  /** The JS heap limit its workers were started with (MiB). */
  readonly heapMb: number;
  /** How many workers it was started with. */
  readonly size: number;
  /**
   * Plans the cases on the workers, a few cases per request, in case order; cases a worker that
   * stopped did not plan are planned in this thread. A planner error rejects, as planCase throws.
   */
  plan(cases: Case[], opts: PlannerOptions): Promise<Plan[]>;
  /** Up to n workers that are ready, handed over with the crew's listeners removed; the others are stopped. */
  take(n: number): Promise<Worker[]>;
  /** Stops the workers not handed over (idempotent). */
  stop(): Promise<void>;
}

/** The planner options a worker is sent (the run's options hold functions and signals). */
function plannerOptions(o: PlannerOptions): PlannerOptions {
  const out: PlannerOptions = {};
  if (o.maxMemoryBytes !== undefined) out.maxMemoryBytes = o.maxMemoryBytes;
  if (o.maxWork !== undefined) out.maxWork = o.maxWork;
  if (o.minOutputSamples !== undefined) out.minOutputSamples = o.minOutputSamples;
  if (o.countAnswers !== undefined) out.countAnswers = o.countAnswers;
  return out;
}

export function startCrew(n: number, opts: { maxMemoryBytes?: number } = {}): Crew {
  const workerData = opts.maxMemoryBytes !== undefined ? { maxMemoryBytes: opts.maxMemoryBytes } : {};
  let members: Member[] = [];
  for (let i = 0; i < n; i++) {
    let worker: Worker;
    try {
      worker = new Worker(fileURLToPath(WORKER_FILE), { workerData, resourceLimits: { maxOldGenerationSizeMb: CREW_HEAP_MB } });
    } catch {
      continue; // The scheduler starts its own (and says why if it cannot).
    }
    let said: (ok: boolean) => void = () => {};
    const m: Member = {
      worker,
      ready: new Promise<boolean>((r) => (said = r)),
      alive: true,
      pending: null,
      listeners: {
        message: (msg) => {
          if (msg.type === 'ready') return said(true);
          const p = m.pending;
          m.pending = null;
          if (!p) return;
          if (msg.type === 'planned') p.resolve(msg.plans);
          else if (msg.type === 'plan-failed') p.reject(new Error(msg.error));
        },
        error: (e) => gone(m, e.message),
        exit: (code) => gone(m, `exit code ${code}`),
      },
    };
    const gone = (who: Member, why: string) => {
      who.alive = false;
      said(false);
      const p = who.pending;
      who.pending = null;
      p?.reject(new WorkerLost(why));
    };
    worker.on('message', m.listeners.message);
    worker.on('error', m.listeners.error);
    worker.on('exit', m.listeners.exit);
    members.push(m);
  }

  const request = (m: Member, cases: Case[], o: PlannerOptions) =>
    new Promise<Plan[]>((resolve, reject) => {
      m.pending = { resolve, reject };
      m.worker.postMessage({ type: 'plan', cases, opts: o } satisfies ToWorker);
    });

  const release = (m: Member) => {
    m.worker.off('message', m.listeners.message);
    m.worker.off('error', m.listeners.error);
    m.worker.off('exit', m.listeners.exit);
  };

  return {
    heapMb: CREW_HEAP_MB,
    size: n,
    async plan(cases, opts0) {
      const o = plannerOptions(opts0);
      const plans: (Plan | undefined)[] = new Array(cases.length);
      // Small requests, handed out as workers free up, so that one slow case does not hold up a
      // worker's whole share.
      const size = Math.max(1, Math.min(16, Math.ceil(cases.length / (Math.max(1, members.length) * 6))));
      let next = 0;
      let failure: Error | null = null;
      await Promise.all(
        members.map(async (m) => {
          if (!(await m.ready)) return;
          while (next < cases.length && !failure && m.alive) {
            const from = next;
            next = Math.min(cases.length, next + size);
            try {
              const got = await request(m, cases.slice(from, next), o);
              got.forEach((p, i) => (plans[from + i] = p));
            } catch (e) {
              // A worker that stopped leaves its cases to this thread; a planner error ends the plan.
              if (!(e instanceof WorkerLost)) failure = e as Error;
              return;
            }
          }
        }),
      );
      if (failure) throw failure;
      // What no worker planned (none started, or one stopped): here, as without a crew.
      // (includes, not every: every skips the holes of an array no worker filled.)
      if (!plans.includes(undefined)) return plans as Plan[];
      const { planCase } = await import('../plan/planner.js');
      return plans.map((p, i) => p ?? planCase(cases[i]!, opts0));
    },
    async take(n) {
      const ready = await Promise.all(members.map((m) => m.ready));
      const alive = members.filter((m, i) => ready[i] && m.alive);
      const taken = alive.slice(0, n);
      members = members.filter((m) => !taken.includes(m));
      await this.stop();
      // The crew's listeners come off last, with no wait before the caller puts on its own.
      for (const m of taken) release(m);
      return taken.map((m) => m.worker);
    },
    async stop() {
      const all = members;
      members = [];
      await Promise.all(
        all.map(async (m) => {
          release(m);
          await m.worker.terminate().catch(() => undefined);
        }),
      );
    },
  };
}

class WorkerLost extends Error {}
