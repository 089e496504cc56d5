// A helper thread of an FFT team (fft-team.ts). It loads the FFT kernel, says it is ready, and then
// blocks on the control block until the calling thread posts a transform; it takes parts of it
// (fft-work.ts) until none is left, waits for the row pass to be complete before the column pass,
// and blocks again. The transform's buffers arrive on its own MessagePort, read synchronously,
// because this thread never returns to its event loop while the team lives.
import { parentPort, receiveMessageOnPort, workerData, type MessagePort } from 'node:worker_threads';
import { loadFastKernels } from '../kernels.js';
import { fastFftBackend } from '../optics/fft-fast.js';
import {
  ABORT,
  claimAndDo,
  DONE,
  FAULT,
  HELPER_PARTS,
  jobOf,
  NEXT,
  SEQ,
  STOP,
  type HelperFault,
  type Job,
  type JobMessage,
  type PartHooks,
  type PassIndex,
} from './fft-work.js';

export interface HelperData {
  control: SharedArrayBuffer;
  port: MessagePort;
  fault?: HelperFault;
}

export type FromHelper = { type: 'ready'; backend: string } | { type: 'failed'; error: string };

const { control, port, fault } = workerData as HelperData;
const ctl = new Int32Array(control);
const parent = parentPort!;

loadFastKernels();
parent.postMessage({ type: 'ready', backend: fastFftBackend() } satisfies FromHelper);

/** The message of transform `seq`; older ones (transforms this thread missed) are dropped. */
function take(seq: number): JobMessage | null {
  for (;;) {
    const got = receiveMessageOnPort(port);
    if (!got) return null;
    const m = got.message as JobMessage;
    if (m.seq === seq) return m;
  }
}

const stillOn = (job: Job) => Atomics.load(ctl, SEQ) === job.seq && Atomics.load(ctl, ABORT) === 0 && Atomics.load(ctl, STOP) === 0;

// Faults for the tests of the team's recovery; a real helper has none.
const hooks: PartHooks = {};
if (fault === 'exit-after-claim') hooks.claimed = () => process.exit(3);
if (fault === 'hang-after-claim') hooks.claimed = () => void Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0);
if (fault === 'throw') hooks.claimed = () => {
  throw new Error('fault injected for a test');
};
if (fault === 'exit-while-writing') {
  hooks.writing = (target, job, pass, i) => {
    // half of the part written with nonsense, then gone: the caller must do it again from the source
    const per = pass === 0 ? job.rowsPer * 2 * job.nx : 0;
    if (pass === 0) target.fill(NaN, i * per, i * per + per / 2);
    else for (let r = 0; r < job.ny; r += 2) target.fill(NaN, 2 * (r * job.nx + i * job.colsPer), 2 * (r * job.nx + (i + 1) * job.colsPer));
    process.exit(4);
  };
}

function work(job: Job): void {
  for (const pass of [0, 1] as PassIndex[]) {
    for (;;) {
      if (!stillOn(job)) return;
      const i = Atomics.add(ctl, NEXT + pass, 1);
      if (i >= job.parts[pass]) break;
      if (claimAndDo(ctl, job, pass, i, hooks)) Atomics.add(ctl, HELPER_PARTS, 1);
    }
    if (pass === 1) return;
    // the columns read what every thread's rows wrote
    for (;;) {
      const done = Atomics.load(ctl, DONE);
      if (done >= job.parts[0] || !stillOn(job)) break;
      Atomics.wait(ctl, DONE, done, 50);
    }
  }
}

let seen = 0;
for (;;) {
  if (Atomics.load(ctl, STOP) !== 0) break;
  const seq = Atomics.load(ctl, SEQ);
  if (seq === seen) {
    Atomics.wait(ctl, SEQ, seq);
    continue;
  }
  seen = seq;
  const m = take(seq);
  if (!m) continue;
  try {
    work(jobOf(m));
  } catch (e) {
    // Parts this thread claimed stay claimed: the caller takes them over when it sees FAULT.
    parent.postMessage({ type: 'failed', error: (e as Error).message ?? String(e) } satisfies FromHelper);
    Atomics.store(ctl, FAULT, 1);
    Atomics.notify(ctl, DONE);
    Atomics.notify(ctl, DONE + 1);
    break;
  }
}
port.close();
