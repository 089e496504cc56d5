// How many threads this machine runs at once: the cap on workers and FFT teams. Its own module so
// that the command line can check --workers without loading the scheduler.
import { availableParallelism } from 'node:os';

/**
 * Threads this machine runs at once. No run starts more, as workers or as an FFT team: more
 * threads than cores only share the same cores, each with its own memory (256 asked for took
 * 2.3 GB and twice the time; a billion would start threads until memory ran out).
 */
export function machineThreads(): number {
  return Math.max(1, typeof availableParallelism === 'function' ? availableParallelism() : 1);
}
