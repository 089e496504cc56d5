// Child process for random-spectra.ts: loads it through Vite (installed for vitest; no new package)
// and runs the cases it is sent, one at a time, answering each with its outcome.
import { tsServer } from '../ts-loader.mjs';

const server = await tsServer();
const mod = await server.ssrLoadModule('/test/physics/random-spectra.ts');
const queue = [];
let busy = false;
process.on('message', (d) => {
  queue.push(d);
  if (!busy) drain();
});
process.on('disconnect', () => process.exit(0));
function drain() {
  busy = true;
  while (queue.length) {
    const d = queue.shift();
    let o;
    try {
      o = mod.runSpectrumDraw(d);
    } catch (e) {
      o = { draw: d, status: 'threw', oneD: false, codes: [], warned: false, note: String(e && e.message) };
    }
    process.send(o);
  }
  busy = false;
}
