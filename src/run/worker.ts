// A worker thread: takes cases from the main thread one at a time, computes and writes each, and
// answers with its small summary. It stays alive between cases, so that its FFT plans and search
// cache are reused.
import { parentPort, workerData } from 'node:worker_threads';
import { executeCase, type CaseTask } from './execute.js';
import { newSearchContext } from './searches.js';
import { loadFastKernels } from '../kernels.js';

export type ToWorker = { type: 'task'; task: CaseTask } | { type: 'stop' };
export type FromWorker =
  | { type: 'ready' }
  | { type: 'done'; done: Awaited<ReturnType<typeof executeCase>> }
  | { type: 'failed'; id: string; error: string };

loadFastKernels();
const port = parentPort;
if (!port) throw new Error('worker.ts runs as a worker thread');
const search = newSearchContext(workerData as { maxMemoryBytes?: number });

port.on('message', (msg: ToWorker) => {
  if (msg.type === 'stop') {
    port.close();
    return;
  }
  executeCase(msg.task, search).then(
    (done) => port.postMessage({ type: 'done', done } satisfies FromWorker),
    (e: unknown) => port.postMessage({ type: 'failed', id: msg.task.plan.case.id, error: (e as Error).message ?? String(e) } satisfies FromWorker),
  );
});
port.postMessage({ type: 'ready' } satisfies FromWorker);
