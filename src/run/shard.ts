// Splitting a job's cases into N shards for a cluster's array job: deterministic (every shard
// computes the same split from the same job) and balanced by the planner's cost estimate.

export interface ShardSpec {
  k: number;
  n: number;
}

/** Parses "K/N" (1 ≤ K ≤ N). */
export function parseShard(text: string): ShardSpec {
  const m = /^\s*(\d+)\s*\/\s*(\d+)\s*$/.exec(text);
  if (!m) throw new Error(`--shard: expected K/N such as 2/8, got '${text}'`);
  const k = Number(m[1]);
  const n = Number(m[2]);
  if (n < 1 || k < 1 || k > n) throw new Error(`--shard: expected 1 ≤ K ≤ N, got ${k}/${n}`);
  return { k, n };
}

/**
 * Longest-processing-time-first: cases in decreasing estimated work (ties by index) go to the shard
 * with the least work so far (ties to the lowest shard). Returns the shard (1..n) of each case.
 */
export function assignShards(work: number[], n: number): number[] {
  const order = work.map((w, i) => ({ w: Number.isFinite(w) ? w : 0, i })).sort((a, b) => b.w - a.w || a.i - b.i);
  const load = new Array<number>(n).fill(0);
  const shard = new Array<number>(work.length).fill(0);
  for (const { w, i } of order) {
    let best = 0;
    for (let s = 1; s < n; s++) if (load[s]! < load[best]!) best = s;
    load[best]! += w;
    shard[i] = best + 1;
  }
  return shard;
}
