// Running property-test cases in child processes (child-worker.mjs, which loads the test module
// through Vite, already installed for vitest): a case may not come back (a plan that never ends has
// been seen), so one that has not answered after `timeoutMs` is counted by `lost` and its process
// replaced. A guard against hanging, not a measurement: the limits are generous.
import { fork, type ChildProcess } from 'node:child_process';
import { fileURLToPath } from 'node:url';

export interface ChildCases<D, O, S> {
  /** The module the worker loads (a path from the repository root, such as /test/physics/random-cases.ts). */
  module: string;
  /** Its export that runs one item: (item, send(side)) → outcome; and the one that makes a thrown item's outcome. */
  run: string;
  threw: string;
  workers: number;
  timeoutMs: number;
  /** The outcome of an item that did not come back: its process died, or it timed out; `side` is the last side message. */
  lost: (item: D, why: { dead: boolean; side: S | undefined }) => O;
  onOutcome?: (o: O, elapsedMs: number) => void;
}

export async function runInChildProcesses<D, O, S = unknown>(items: D[], opts: ChildCases<D, O, S>): Promise<O[]> {
  const script = fileURLToPath(new URL('./child-worker.mjs', import.meta.url));
  const results: O[] = new Array(items.length);
  let next = 0;
  const lane = async () => {
    let child: ChildProcess | null = null;
    const start = () => fork(script, [opts.module, opts.run, opts.threw], { stdio: ['ignore', 'ignore', 'inherit', 'ipc'], serialization: 'advanced' });
    try {
      while (next < items.length) {
        const i = next++;
        const d = items[i]!;
        child ??= start();
        const c = child;
        const t0 = Date.now();
        let side: S | undefined;
        const o = await new Promise<O | null>((resolve) => {
          const timer = setTimeout(() => done(null), opts.timeoutMs);
          const onMsg = (m: { side: S } | { outcome: O }) => {
            if ('side' in m) side = m.side;
            else done(m.outcome);
          };
          const onExit = () => done(null);
          function done(v: O | null) {
            clearTimeout(timer);
            c.off('message', onMsg);
            c.off('exit', onExit);
            resolve(v);
          }
          c.on('message', onMsg);
          c.on('exit', onExit);
          c.send(d);
        });
        if (o) results[i] = o;
        else {
          const dead = c.exitCode !== null || c.signalCode !== null;
          c.kill('SIGKILL');
          child = null;
          results[i] = opts.lost(d, { dead, side });
        }
        opts.onOutcome?.(results[i]!, Date.now() - t0);
      }
    } finally {
      child?.kill('SIGKILL');
    }
  };
  await Promise.all(Array.from({ length: opts.workers }, lane));
  return results;
}
