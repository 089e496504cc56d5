// Child process for child-cases.ts: loads the module named in argv through Vite (installed for
// vitest; no new package) and runs the items it is sent, one at a time, answering each with its
// outcome (and whatever the run sends on the side: a plan before the case runs).
import { tsServer } from '../ts-loader.mjs';

const [modulePath, run, threw] = process.argv.slice(2);
const server = await tsServer();
const mod = await server.ssrLoadModule(modulePath);
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
      o = mod[run](d, (side) => process.send({ side }));
    } catch (e) {
      o = mod[threw](d, String(e && e.message));
    }
    process.send({ outcome: o });
  }
  busy = false;
}
