// The job report's plots drawn on the case workers a run kept (scheduler.ts, keep): each plot is a
// vega → SVG → resvg job of its own (about 60 ms; a sweep has ten or more), so the workers draw them
// side by side while the main thread draws the contact sheet, instead of the main thread drawing
// all of them after the cases. What a worker does not draw (it stopped, or the plot failed there)
// is drawn in the main thread, as without workers, so a failure is reported the same way.
import type { Worker } from 'node:worker_threads';
import { renderPlot, type PlotInput } from '../report/plots.js';
import type { FromWorker, ToWorker } from './worker.js';

export type PlotDrawer = (inputs: PlotInput[]) => Promise<{ svg: string; png: Uint8Array }[]>;

export function plotsOn(workers: Worker[]): PlotDrawer {
  return async (inputs) => {
    const out: ({ svg: string; png: Uint8Array } | undefined)[] = new Array(inputs.length);
    let next = 0;
    await Promise.all(
      workers.map(
        (w) =>
          new Promise<void>((resolve) => {
            const onMessage = (m: FromWorker) => {
              if (m.type !== 'plotted' && m.type !== 'plot-failed') return;
              if (m.type === 'plotted') out[m.index] = { svg: m.svg, png: m.png };
              give();
            };
            const done = () => {
              w.off('message', onMessage);
              w.off('exit', done);
              resolve();
            };
            const give = () => {
              if (next >= inputs.length) return done();
              const index = next++;
              w.postMessage({ type: 'plot', index, input: inputs[index]! } satisfies ToWorker);
            };
            w.on('message', onMessage);
            w.on('exit', done);
            give();
          }),
      ),
    );
    const all: { svg: string; png: Uint8Array }[] = [];
    for (let i = 0; i < inputs.length; i++) all.push(out[i] ?? (await renderPlot(inputs[i]!)));
    return all;
  };
}

/** Stops the kept workers (idle by then). */
export async function stopKept(workers: Worker[]): Promise<void> {
  await Promise.all(workers.map((w) => w.terminate().catch(() => undefined)));
}
