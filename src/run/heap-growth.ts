// How far V8 lets the JS heap grow between full collections, set once by the command line.
//
// V8 starts a full (mark-compact) collection when the old generation, plus the external memory
// allocated since the last one (typed arrays' backing stores count), nears a limit it sets after each
// collection at 1.1–4 × the live heap, the factor chosen from its measured collection and allocation
// speeds. A small case allocates about 9 MB of typed arrays (field, map, encodings) on a live heap of
// about 20 MB, so once the factor drops the process settles into one full collection a case, each
// about 35 ms of marking on another core. Measured on
// bench/run.mjs's 100-case small sweep with one worker, from run to run of the same program: 3 to 65
// full collections, 7.7 to 11.5 s CPU, 6.3 to 8.5 s wall. With the factor held at 4 (growing 300 %)
// every run had about 3 and took the shorter time.
//
// The large arrays are not kept longer for it: V8 also starts a collection for each 64 MB or so of
// new external memory whatever this factor is (a loop allocating 200 arrays of 32 MB stays under
// 200 MB resident, with or without it). The process's V8 flags are shared by its worker threads, so
// one call before they start covers them. The library does not call this: a program that embeds it
// keeps its own heap settings.
import { setFlagsFromString } from 'node:v8';

/** The factor is 1 + this / 100. */
export const HEAP_GROWING_PERCENT = 300;

export function steadyHeapGrowth(): void {
  setFlagsFromString(`--heap-growing-percent=${HEAP_GROWING_PERCENT}`);
}
