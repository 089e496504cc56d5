// V8 settings the command line makes for a run, before any worker starts (a process's V8 flags are
// shared by its worker threads, and each isolate reads them as it starts). The library sets none:
// a program that embeds it keeps its own.
import { setFlagsFromString } from 'node:v8';

/**
 * How far V8 lets the JS heap grow between full (mark-compact) collections: factor 1 + this / 100.
 *
 * How V8 decides (from memory of its heap controller, not from its documentation): it starts a full
 * collection when the old generation, plus the external memory allocated since the last one (typed
 * arrays' backing stores count), nears a limit it sets after each collection at 1.1–4 × the live
 * heap, the factor chosen from its measured collection and allocation speeds. A small case
 * allocates about 9 MB of typed arrays (field, map, encodings) on a live heap of about 20 MB, and
 * the process was seen to settle into one full collection a case, each about 30 ms of marking on
 * another core (--trace-gc-nvp). Measured on bench/run.mjs's 100-case small sweep with one
 * worker, from run to run of the same program: 3 to 65 full collections, 7.7 to 11.5 s CPU, 6.3 to
 * 8.5 s wall. With the factor held at 4 every run had about 3 and took the shorter time.
 *
 * The large arrays are not kept longer for it: V8 also starts a collection for each 64 MB or so of
 * new external memory whatever this factor is (the 64 MB from memory; measured: a loop allocating
 * 200 arrays of 32 MB stays under 200 MB resident, with or without the setting).
 */
export const HEAP_GROWING_PERCENT = 300;

/**
 * Settings for a run whose cases go to `workers` worker threads on a machine that runs `cores`
 * threads at once (workers 1: the cases run in this thread).
 *
 * When the workers fill every core, each compiles its hot functions on its own thread
 * (no concurrent recompilation): a background compile thread then has no idle core to run on and
 * only takes turns with the workers, at the cost of the hand-over. Measured on the 100-case small
 * sweep with two workers on two cores, 8 runs each interleaved: 11.3 against 11.9 s CPU (means),
 * 6.16 against 6.49 s wall (medians). With one worker the spare core compiles for free, so it is
 * left on. This thread's isolate, made before, keeps compiling in the background; the workers'
 * isolates, made after, compile on their own threads (seen with --trace-opt: kConcurrent against
 * kSynchronous).
 */
export function settleV8(workers: number, cores: number): void {
  setFlagsFromString(`--heap-growing-percent=${HEAP_GROWING_PERCENT}`);
  if (workers >= 2 && workers >= cores) setFlagsFromString('--no-concurrent-recompilation');
}
