// A worker thread: takes cases from the main thread one at a time, computes and writes each, and
// answers with its small summary; before the cases it may be asked to plan some (run/crew.ts), and
// after them to draw some of the job report's plots (run/helpers.ts). It stays alive between cases, so that its engine (FFT plans, pooled grid), kept source spectrum and
// search cache (one CaseContext) are reused.
import { parentPort, workerData } from 'node:worker_threads';
import { executeCase, type CaseTask } from './execute.js';
import { newCaseContext } from './context.js';
import { createEngine } from '../kernels.js';
import { planCase, type PlannerOptions } from '../plan/planner.js';
import type { Case, Plan } from '../plan/types.js';
import type { PlotInput } from '../report/plots.js';

export type ToWorker =
  | { type: 'task'; task: CaseTask }
  | { type: 'plan'; cases: Case[]; opts: PlannerOptions }
  | { type: 'preload' }
  | { type: 'plot'; index: number; input: PlotInput }
  | { type: 'stop' };
export type FromWorker =
  | { type: 'ready' }
  | { type: 'done'; done: Awaited<ReturnType<typeof executeCase>> }
  | { type: 'failed'; id: string; error: string }
  | { type: 'planned'; plans: Plan[] }
  | { type: 'plan-failed'; error: string }
  | { type: 'plotted'; index: number; svg: string; png: Uint8Array }
  | { type: 'plot-failed'; index: number; error: string };

const port = parentPort;
if (!port) throw new Error('worker.ts runs as a worker thread');
const ctx = newCaseContext(createEngine(), workerData as { maxMemoryBytes?: number });

port.on('message', (msg: ToWorker) => {
  if (msg.type === 'stop') {
    port.close();
    return;
  }
  if (msg.type === 'preload') {
    // Out of cases while others finish theirs: the report's plots may come here next (run/helpers.ts).
    void import('../report/plots.js').then((m) => m.loadPlotting()).catch(() => undefined);
    return;
  }
  if (msg.type === 'plot') {
    import('../report/plots.js')
      .then((m) => m.renderPlot(msg.input))
      .then(
        ({ svg, png }) => port.postMessage({ type: 'plotted', index: msg.index, svg, png } satisfies FromWorker),
        (e: unknown) => port.postMessage({ type: 'plot-failed', index: msg.index, error: (e as Error).message ?? String(e) } satisfies FromWorker),
      );
    return;
  }
  if (msg.type === 'plan') {
    // A share of the job's planning, before the cases (run/crew.ts).
    try {
      port.postMessage({ type: 'planned', plans: msg.cases.map((c) => planCase(c, msg.opts)) } satisfies FromWorker);
    } catch (e) {
      port.postMessage({ type: 'plan-failed', error: (e as Error).message ?? String(e) } satisfies FromWorker);
    }
    return;
  }
  executeCase(msg.task, ctx).then(
    // A contact-sheet tile's samples (up to 400² values) are moved, not copied.
    (done) => port.postMessage({ type: 'done', done } satisfies FromWorker, done.report?.tile ? [done.report.tile.map.intensity.buffer as ArrayBuffer] : []),
    (e: unknown) => port.postMessage({ type: 'failed', id: msg.task.plan.case.id, error: (e as Error).message ?? String(e) } satisfies FromWorker),
  );
});
port.postMessage({ type: 'ready' } satisfies FromWorker);
