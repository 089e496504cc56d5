// Splitting a job's cases into N shards for a cluster's array job: deterministic (every shard
// computes the same split from the same job) and balanced by the planner's cost estimate.
import { safeEcho } from '../safe-text.js';

export interface ShardSpec {
  k: number;
  n: number;
}

/**
 * Most shards a job may be split into. A cluster array job of more tasks than this is beyond any
 * scheduler's usual array limit, and a typo such as 1/4294967296 must be refused, not planned.
 */
export const MAX_SHARDS = 100_000;

/** Parses "K/N" (1 ≤ K ≤ N ≤ MAX_SHARDS). */
export function parseShard(text: string): ShardSpec {
  const range = `K/N with N from 1 to ${MAX_SHARDS} and K from 1 to N, such as 2/8`;
  const m = /^\s*(\d{1,15})\s*\/\s*(\d{1,15})\s*$/.exec(text);
  if (!m) throw new Error(`--shard: expected ${range}, got '${safeEcho(text, 60)}'`);
  const k = Number(m[1]);
  const n = Number(m[2]);
  if (n < 1 || n > MAX_SHARDS || k < 1 || k > n) throw new Error(`--shard: expected ${range}, got ${k}/${n}`);
  return { k, n };
}

/**
 * Longest-processing-time-first: cases in decreasing estimated work (ties by index) go to the shard
 * with the least work so far (ties to the lowest shard). Returns the shard (1..n) of each case.
 * Only the first min(n, cases) shards can receive a case (an empty shard of lower number is always
 * chosen before a higher one), so only those are kept, in a heap ordered by (load, shard): the
 * split is the one a scan of every shard gives, and a large n costs neither memory nor time.
 */
export function assignShards(work: number[], n: number): number[] {
  if (!Number.isInteger(n) || n < 1) throw new Error(`shards: expected a whole number of shards 1 or more, got ${n}`);
  const order = work.map((w, i) => ({ w: Number.isFinite(w) ? w : 0, i })).sort((a, b) => b.w - a.w || a.i - b.i);
  const used = Math.min(n, work.length);
  // heap[j] is a shard index (0-based); load[s] its work so far. All loads start at 0, so the
  // shards in index order already form a heap.
  const load = new Float64Array(used);
  const heap = Int32Array.from({ length: used }, (_, s) => s);
  const before = (a: number, b: number) => load[a]! < load[b]! || (load[a] === load[b] && a < b);
  const shard = new Array<number>(work.length).fill(0);
  for (const { w, i } of order) {
    const best = heap[0]!;
    load[best]! += w;
    shard[i] = best + 1;
    // The root's load grew: sift it down.
    let j = 0;
    for (;;) {
      const l = 2 * j + 1;
      if (l >= used) break;
      const c = l + 1 < used && before(heap[l + 1]!, heap[l]!) ? l + 1 : l;
      if (!before(heap[c]!, heap[j]!)) break;
      [heap[c], heap[j]] = [heap[j]!, heap[c]!];
      j = c;
    }
  }
  return shard;
}
