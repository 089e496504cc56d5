// A helper thread of an FFT team (fft-team.ts). It loads the FFT kernel, attaches the team's shared
// WebAssembly memory, says it is ready, and then blocks on the control block until the calling
// thread posts a transform; it takes parts of each phase (fft-work.ts) until none is left, waits
// for the phase to be complete before the next one, and blocks again. The transform's buffers
// arrive on its own MessagePort, read synchronously, because this thread never returns to its
// event loop while the team lives.
import { setFlagsFromString } from 'node:v8';
import { runInNewContext } from 'node:vm';
import { parentPort, receiveMessageOnPort, workerData, type MessagePort } from 'node:worker_threads';
import { createKernel } from '../kernels.js';
import { attachSharedFftMemory, fastFftBackend } from '../optics/fft-fast.js';
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
} from './fft-work.js';

export interface HelperData {
  control: SharedArrayBuffer;
  port: MessagePort;
  /** This thread's scratch in the shared memory. */
  slot: number;
  /** The team's shared WebAssembly memory, when the WebAssembly kernel is in use. */
  memory: object | null;
  fault?: HelperFault;
}

export type FromHelper = { type: 'ready'; backend: string; shared: boolean } | { type: 'failed'; error: string };

const { control, port, slot, memory, fault } = workerData as HelperData;
const ctl = new Int32Array(control);
const parent = parentPort!;

// This thread's own kernel (the thread is an entry point: it owns what it makes).
const kernel = createKernel();
const attached = memory !== null && attachSharedFftMemory(kernel, memory);
parent.postMessage({ type: 'ready', backend: fastFftBackend(kernel), shared: attached } satisfies FromHelper);

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
if (fault === 'throw') {
  hooks.claimed = () => {
    throw new Error('fault injected for a test');
  };
}
if (fault === 'exit-while-writing') {
  hooks.writing = (job, phase, i) => {
    // half of the part written with nonsense, then gone: the caller must do it again
    const target = phase === 0 && job.scratch ? job.scratch : job.data;
    if (phase === 1) {
      for (let r = 0; r < job.ny; r += 2) target.fill(NaN, 2 * (r * job.nx + i * job.colsPer), 2 * (r * job.nx + (i + 1) * job.colsPer));
    } else {
      const per = job.rowsPer * 2 * job.nx;
      target.fill(NaN, i * per, i * per + per / 2);
    }
    process.exit(4);
  };
}

function work(job: Job): void {
  for (let phase = 0; phase < job.parts.length; phase++) {
    for (;;) {
      if (!stillOn(job)) return;
      const i = Atomics.add(ctl, NEXT + phase, 1);
      if (i >= job.parts[phase]!) break;
      if (claimAndDo(kernel, ctl, job, phase, i, slot, hooks)) Atomics.add(ctl, HELPER_PARTS, 1);
    }
    if (phase === job.parts.length - 1) return;
    // the next phase reads what every thread wrote in this one
    for (;;) {
      const done = Atomics.load(ctl, DONE + phase);
      if (done >= job.parts[phase]! || !stillOn(job)) break;
      Atomics.wait(ctl, DONE + phase, done, 50);
    }
  }
}

// This thread allocates almost nothing, so its garbage collector seldom runs, and every data
// buffer it was sent stays alive here until it does: a sweep of big cases would hold one padded
// grid per case. So it collects its garbage when a new buffer arrives (about a millisecond on this
// small heap), with the collector that a fresh context exposes once the flag is set.
setFlagsFromString('--expose-gc');
const collect = runInNewContext('gc') as (() => void) | undefined;

let seen = 0;
let lastBuffer = 0;
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
  if (m.bufferId !== lastBuffer) {
    lastBuffer = m.bufferId;
    collect?.();
  }
  try {
    work(jobOf(m));
  } catch (e) {
    // Parts this thread claimed stay claimed: the caller takes them over when it sees FAULT.
    parent.postMessage({ type: 'failed', error: (e as Error).message ?? String(e) } satisfies FromHelper);
    Atomics.store(ctl, FAULT, 1);
    for (let phase = 0; phase < 3; phase++) Atomics.notify(ctl, DONE + phase);
    break;
  }
}
port.close();
