// What the threads of an FFT team share: the control block (an Int32Array on a SharedArrayBuffer),
// how one 2-D transform is cut into parts, and the claiming of a part. Used by the calling thread
// (fft-team.ts) and by its helpers (fft-helper.ts) alike, so that both follow one protocol.
//
// A transform runs in two passes: rows from the data into a scratch array, then columns from the
// scratch back into the data. Each pass is cut into parts, and every thread takes the next part
// from a shared counter until none is left, so a thread that the machine slows down simply does
// fewer. Reading one array and writing the other is what makes a part safe to do again: when a
// helper stops answering, the caller does its parts over from the untouched source.
//
// Each part has a state cell: (transform number << 3) | code. A thread claims a free part, does
// it in its own memory, and may write it only after moving the state from CLAIMED to WRITING;
// the caller takes an abandoned part over by moving it to REVOKED first, so a helper that wakes up
// late can no longer write anything. The transform number in the cell keeps a helper still busy
// with an earlier transform from claiming parts of the present one.
import {
  fastFftBackend,
  transformColumns,
  transformRows,
  useFastFftBackend,
  type FastFftBackend,
} from '../optics/fft-fast.js';

// control block cells
export const SEQ = 0; // number of the transform posted last; helpers wait on it
export const STOP = 1; // 1: helpers leave
export const ABORT = 2; // 1: the caller finishes the present transform alone
export const FAULT = 3; // 1: a helper failed (it has said why on its port to the parent)
export const NEXT = 4; // + pass: next part to hand out
export const DONE = 6; // + pass: parts written
export const HELPER_PARTS = 8; // parts written by helpers, all transforms (for the team's figures)
const HEAD = 16;

/** Parts per pass at most (the part sizes grow for larger grids). */
export const MAX_PARTS = 4096;
export const CONTROL_CELLS = HEAD + 2 * MAX_PARTS;

export const FREE = 0;
export const CLAIMED = 1;
export const WRITING = 2;
export const WRITTEN = 3;
export const REVOKED = 4;

export type PassIndex = 0 | 1; // rows, columns

/** What a helper is told about one transform (on its MessagePort; the control block says when). */
export interface JobMessage {
  seq: number;
  nx: number;
  ny: number;
  inverse: boolean;
  backend: FastFftBackend;
  rowsPer: number;
  colsPer: number;
  data: SharedArrayBuffer;
  dataOffset: number;
  scratch: SharedArrayBuffer;
}

export interface Job extends Omit<JobMessage, 'data' | 'dataOffset' | 'scratch'> {
  parts: [number, number];
  data: Float64Array;
  scratch: Float64Array;
}

export function jobOf(m: JobMessage): Job {
  const values = 2 * m.nx * m.ny;
  return {
    ...m,
    parts: [Math.ceil(m.ny / m.rowsPer), Math.ceil(m.nx / m.colsPer)],
    data: new Float64Array(m.data, m.dataOffset, values),
    scratch: new Float64Array(m.scratch, 0, values),
  };
}

function floorPow2(x: number): number {
  return x < 1 ? 0 : 2 ** Math.floor(Math.log2(x));
}

/**
 * Part sizes. Rows: about 256 KB (they stay in the core's cache from copy-in to copy-out), at least
 * four parts per thread. Columns: 512 wide where the grid allows two parts per thread, because each
 * row's piece of a column part is a separate copy between shared memory and the thread's own, and
 * those copies dominate: on 2048² and 4096² grids, parts 512 wide took about a third less time than
 * parts 128 wide (about 256 KB per part), and wider ones gained nothing more. No more than
 * MAX_PARTS. Powers of two, like the grid sizes, so that all parts of a pass are equal.
 */
export function partSizes(nx: number, ny: number, threads: number): { rowsPer: number; colsPer: number } {
  const rowsPer = Math.max(1, Math.ceil(ny / MAX_PARTS), Math.min(floorPow2(2 ** 14 / nx), floorPow2(ny / (4 * threads))));
  const colsPer = Math.max(2, Math.ceil(nx / MAX_PARTS), Math.min(512, floorPow2(nx / (2 * threads))));
  return { rowsPer, colsPer };
}

export function stateCell(pass: PassIndex, i: number): number {
  return HEAD + pass * MAX_PARTS + i;
}

/** The number of transforms wraps below 2^28 so that (seq << 3) stays a positive Int32. */
export function nextSeq(seq: number): number {
  return seq >= 2 ** 28 - 1 ? 1 : seq + 1;
}

/** Does part i of a pass, reading the pass's source and (when `commit` allows) writing its target. */
export function doPart(job: Job, pass: PassIndex, i: number, commit?: () => boolean): boolean {
  if (fastFftBackend() !== job.backend) useFastFftBackend(job.backend);
  if (pass === 0) {
    const r0 = i * job.rowsPer;
    return transformRows(job.data, job.scratch, job.nx, job.ny, r0, Math.min(job.ny, r0 + job.rowsPer), job.inverse, commit);
  }
  const c0 = i * job.colsPer;
  return transformColumns(job.scratch, job.data, job.nx, job.ny, c0, Math.min(job.nx, c0 + job.colsPer), job.inverse, commit);
}

/** Test-only faults a helper can be told to show (see fft-helper.ts). */
export type HelperFault = 'exit-after-claim' | 'hang-after-claim' | 'exit-while-writing' | 'throw';

export interface PartHooks {
  /** After the claim, before any work. */
  claimed?(): void;
  /** After the move to WRITING, before the part is written. */
  writing?(target: Float64Array, job: Job, pass: PassIndex, i: number): void;
}

/** Claims part i of the pass if it is free and does it; true when this thread wrote it. */
export function claimAndDo(ctl: Int32Array, job: Job, pass: PassIndex, i: number, hooks?: PartHooks): boolean {
  const at = stateCell(pass, i);
  const tag = job.seq << 3;
  if (Atomics.compareExchange(ctl, at, tag | FREE, tag | CLAIMED) !== (tag | FREE)) return false;
  hooks?.claimed?.();
  const commit = () => {
    if (Atomics.compareExchange(ctl, at, tag | CLAIMED, tag | WRITING) !== (tag | CLAIMED)) return false;
    hooks?.writing?.(pass === 0 ? job.scratch : job.data, job, pass, i);
    return true;
  };
  if (!doPart(job, pass, i, commit)) return false;
  Atomics.store(ctl, at, tag | WRITTEN);
  Atomics.notify(ctl, at);
  Atomics.add(ctl, DONE + pass, 1);
  Atomics.notify(ctl, DONE + pass);
  return true;
}
