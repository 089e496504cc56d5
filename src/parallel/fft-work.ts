// What the threads of an FFT team share: the control block (an Int32Array on a SharedArrayBuffer),
// how one 2-D transform is cut into phases and parts, and the claiming of a part. Used by the
// calling thread (fft-team.ts) and by its helpers (fft-helper.ts) alike, so both follow one protocol.
//
// Every phase is cut into parts, and every thread takes the next part from a shared counter until
// none is left, so a thread that the machine slows down simply does fewer; a phase starts when
// every part of the one before is written. Two ways to cut a transform:
//
// - 'shared' (the WebAssembly kernel): all threads run the kernel on one shared WebAssembly memory.
//   Rows are copied in and transformed, columns transformed in place, rows copied out: the one-
//   thread algorithm, in parts. The data is only written by the last phase, so when a helper is
//   lost earlier the caller simply transforms the data alone; parts of the last phase read memory
//   that no longer changes, so they can be done again.
// - 'parts' (the TypeScript kernel): rows from the data into a scratch array, then columns back,
//   each part copied into the thread's own memory and out (transformRows, transformColumns); every
//   part reads a source that is not written in its phase, so any part can be done again.
//
// Each part has a state cell: (transform number << 3) | code. A thread claims a free part and, in
// a phase that writes the data or the scratch array, may write only after moving the state from
// CLAIMED to WRITING; the caller takes an abandoned part over by moving it to REVOKED first, so a
// helper that wakes up late can no longer write anything. The transform number in the cell keeps a
// helper still busy with an earlier transform from claiming parts of the present one.
import {
  fastFftBackend,
  sharedColumns,
  sharedRowsIn,
  sharedRowsOut,
  transformColumns,
  transformRows,
  useFastFftBackend,
  type FastFftBackend,
  type FftKernel,
  type SharedLayout,
} from '../optics/fft-fast.js';

// control block cells
export const SEQ = 0; // number of the transform posted last; helpers wait on it
export const STOP = 1; // 1: helpers leave
export const ABORT = 2; // 1: the caller finishes the present transform alone
export const FAULT = 3; // 1: a helper failed (it has said why on its port to the parent)
export const NEXT = 4; // + phase: next part to hand out
export const DONE = 8; // + phase: parts written
export const HELPER_PARTS = 12; // parts written by helpers, all transforms (for the team's figures)
const HEAD = 16;

/** Phases of a transform at most, and parts per phase at most (parts grow for larger grids). */
export const MAX_PHASES = 3;
export const MAX_PARTS = 4096;
export const CONTROL_CELLS = HEAD + MAX_PHASES * MAX_PARTS;

export const FREE = 0;
export const CLAIMED = 1;
export const WRITING = 2;
export const WRITTEN = 3;
export const REVOKED = 4;

export type Mode = 'shared' | 'parts';

/** What a helper is told about one transform (on its MessagePort; the control block says when). */
export interface JobMessage {
  seq: number;
  mode: Mode;
  nx: number;
  ny: number;
  inverse: boolean;
  backend: FastFftBackend;
  rowsPer: number;
  colsPer: number;
  data: SharedArrayBuffer;
  /** Names the data buffer across messages (each message brings a new wrapper of it). */
  bufferId: number;
  dataOffset: number;
  /** 'parts': the array between the passes. */
  scratch?: SharedArrayBuffer;
  /** 'shared': where the transform lives in the team's WebAssembly memory. */
  layout?: SharedLayout;
}

export interface Job extends Omit<JobMessage, 'data' | 'dataOffset' | 'scratch'> {
  /** Parts per phase. */
  parts: number[];
  data: Float64Array;
  scratch: Float64Array | null;
}

export function jobOf(m: JobMessage): Job {
  const values = 2 * m.nx * m.ny;
  const rows = Math.ceil(m.ny / m.rowsPer), cols = Math.ceil(m.nx / m.colsPer);
  return {
    ...m,
    parts: m.mode === 'shared' ? [rows, cols, rows] : [rows, cols],
    data: new Float64Array(m.data, m.dataOffset, values),
    scratch: m.scratch ? new Float64Array(m.scratch, 0, values) : null,
  };
}

/** Does this phase write where a part done twice could clash (so parts commit before writing)? */
export function commits(job: Job, phase: number): boolean {
  return job.mode === 'parts' || phase === 2;
}

function floorPow2(x: number): number {
  return x < 1 ? 0 : 2 ** Math.floor(Math.log2(x));
}

/**
 * Part sizes. Rows: about 256 KB (copied in, transformed and copied out while in the core's
 * cache), at least four parts per thread. Columns, 'shared': 64 wide at most (four of the kernel's
 * blocks of 16), at least four parts per thread, for an even share. Columns, 'parts': 512 wide where
 * the grid allows two parts per thread, because each row's piece of a part is a separate copy
 * between shared memory and the thread's own, and those copies dominate (measured with the
 * WebAssembly kernel in this mode on 2048² and 4096² grids: parts 512 wide took about a third less
 * time than parts 128 wide; wider ones gained nothing).
 * No more than MAX_PARTS. Powers of two, so that column parts start on even columns (the kernel's
 * two lanes per vector); on a grid that is not a power of two the last part of a phase is shorter
 * (and may end on an odd column: the kernels take it, see transformColumns).
 */
export function partSizes(mode: Mode, nx: number, ny: number, threads: number): { rowsPer: number; colsPer: number } {
  const rowsPer = Math.max(1, Math.ceil(ny / MAX_PARTS), Math.min(floorPow2(2 ** 14 / nx), floorPow2(ny / (4 * threads))));
  const cols = mode === 'shared' ? Math.min(64, floorPow2(nx / (4 * threads))) : Math.min(512, floorPow2(nx / (2 * threads)));
  const colsPer = Math.max(2, Math.ceil(nx / MAX_PARTS), cols);
  return { rowsPer, colsPer };
}

export function stateCell(phase: number, i: number): number {
  return HEAD + phase * MAX_PARTS + i;
}

/** The number of transforms wraps below 2^28 so that (seq << 3) stays a positive Int32. */
export function nextSeq(seq: number): number {
  return seq >= 2 ** 28 - 1 ? 1 : seq + 1;
}

/**
 * Does part i of a phase; `slot` is the thread's scratch in the shared memory. Where the phase
 * commits, nothing is written unless `commit` allows it, and the answer says whether it was.
 */
export function doPart(k: FftKernel, job: Job, phase: number, i: number, slot: number, commit?: () => boolean): boolean {
  const { nx, ny, inverse } = job;
  const r0 = i * job.rowsPer, r1 = Math.min(ny, r0 + job.rowsPer);
  const c0 = i * job.colsPer, c1 = Math.min(nx, c0 + job.colsPer);
  if (job.mode === 'shared') {
    const L = job.layout!;
    if (phase === 0) sharedRowsIn(k, L, job.data, r0, r1, inverse, slot);
    else if (phase === 1) sharedColumns(k, L, c0, c1, inverse, slot);
    else return sharedRowsOut(k, L, job.data, r0, r1, commit);
    return true;
  }
  // This thread's kernel runs the caller's (the same bits need the same kernel).
  if (fastFftBackend(k) !== job.backend) useFastFftBackend(k, job.backend);
  if (phase === 0) return transformRows(k, job.data, job.scratch!, nx, ny, r0, r1, inverse, commit);
  return transformColumns(k, job.scratch!, job.data, nx, ny, c0, c1, inverse, commit);
}

/** Test-only faults a helper can be told to show (see fft-helper.ts). */
export type HelperFault = 'exit-after-claim' | 'hang-after-claim' | 'exit-while-writing' | 'throw';

export interface PartHooks {
  /** After the claim, before any work. */
  claimed?(job: Job, phase: number, i: number): void;
  /** After the move to WRITING, before the part is written. */
  writing?(job: Job, phase: number, i: number): void;
}

/** Claims part i of the phase if it is free and does it; true when this thread wrote it. */
export function claimAndDo(k: FftKernel, ctl: Int32Array, job: Job, phase: number, i: number, slot: number, hooks?: PartHooks): boolean {
  const at = stateCell(phase, i);
  const tag = job.seq << 3;
  if (Atomics.compareExchange(ctl, at, tag | FREE, tag | CLAIMED) !== (tag | FREE)) return false;
  hooks?.claimed?.(job, phase, i);
  const commit = () => {
    if (Atomics.compareExchange(ctl, at, tag | CLAIMED, tag | WRITING) !== (tag | CLAIMED)) return false;
    hooks?.writing?.(job, phase, i);
    return true;
  };
  if (!doPart(k, job, phase, i, slot, commits(job, phase) ? commit : undefined)) return false;
  Atomics.store(ctl, at, tag | WRITTEN);
  Atomics.notify(ctl, at);
  Atomics.add(ctl, DONE + phase, 1);
  Atomics.notify(ctl, DONE + phase);
  return true;
}
