// --shard K/N is bounded, and splitting cases into shards costs nothing for a large N: the split
// keeps only the shards that can receive a case (a heap of min(N, cases)), and it is the same split
// as the plain longest-processing-time-first scan over every shard (Graham 1969), written here.
import { describe, expect, it } from 'vitest';
import { assignShards, MAX_SHARDS, parseShard } from '../../src/run/shard.js';
import { mulberry32 } from '../helpers.js';

/** LPT by a scan of all n shards: the definition the heap must reproduce exactly. */
function scanAssign(work: number[], n: number): number[] {
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

describe('parseShard: K/N within 1 ≤ K ≤ N ≤ MAX_SHARDS', () => {
  it('accepts the ends of the range', () => {
    expect(parseShard('1/1')).toEqual({ k: 1, n: 1 });
    expect(parseShard(` ${MAX_SHARDS}/${MAX_SHARDS} `)).toEqual({ k: MAX_SHARDS, n: MAX_SHARDS });
    expect(MAX_SHARDS).toBe(100_000);
  });

  it.each(['1/100001', '1/4294967296', '1/1000000000', '1/99999999999999999999', '0/1', '2/1', '1/0', '-1/3', '1.5/3', '1/3/4', '', 'x/y'])(
    'refuses %j, naming --shard and the range',
    (text) => {
      expect(() => parseShard(text)).toThrow(/^--shard: expected K\/N with N from 1 to 100000 and K from 1 to N/);
    },
  );

  it('echoes what it was given escaped and cut', () => {
    let msg = '';
    try {
      parseShard(`\x1b[2J${'9'.repeat(5000)}`);
    } catch (e) {
      msg = (e as Error).message;
    }
    expect(msg).toContain('\\x1b[2J');
    expect(msg).not.toContain('\x1b');
    expect(msg.length).toBeLessThan(300);
  });
});

describe('assignShards', () => {
  it('is the scan over every shard, for random work and shard counts up to twice the cases', () => {
    const rnd = mulberry32(20261202);
    for (let trial = 0; trial < 200; trial++) {
      const m = 1 + Math.floor(rnd() * 40);
      // Ties on purpose: work drawn from a few values, zeros and a non-finite estimate among them.
      const work = Array.from({ length: m }, () => {
        const r = rnd();
        return r < 0.1 ? 0 : r < 0.15 ? Infinity : Math.floor(rnd() * 6) * 1.5;
      });
      const n = 1 + Math.floor(rnd() * 2 * m);
      expect(assignShards(work, n), `work ${work} into ${n}`).toEqual(scanAssign(work, n));
    }
  });

  it('a huge shard count allocates nothing of its size: 3 cases into 2^32 shards go to shards 1–3', () => {
    expect(assignShards([5, 9, 1], 2 ** 32)).toEqual([2, 1, 3]);
    expect(assignShards([], 2 ** 32)).toEqual([]);
  });

  it('refuses a shard count that is not a whole number 1 or more', () => {
    for (const n of [0, -1, 1.5, NaN, Infinity]) expect(() => assignShards([1, 2], n)).toThrow(/shards/);
  });
});
