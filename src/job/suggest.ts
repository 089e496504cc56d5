// "Did you mean" hints for misspelt keys and choices.

/** Edit distance with adjacent transpositions (optimal string alignment). */
export function editDistance(a: string, b: string): number {
  const m = a.length;
  const n = b.length;
  const d: number[][] = Array.from({ length: m + 1 }, (_, i) => {
    const row = new Array<number>(n + 1).fill(0);
    row[0] = i;
    return row;
  });
  for (let j = 0; j <= n; j++) d[0]![j] = j;
  for (let i = 1; i <= m; i++) {
    for (let j = 1; j <= n; j++) {
      const cost = a[i - 1] === b[j - 1] ? 0 : 1;
      let v = Math.min(d[i - 1]![j]! + 1, d[i]![j - 1]! + 1, d[i - 1]![j - 1]! + cost);
      if (i > 1 && j > 1 && a[i - 1] === b[j - 2] && a[i - 2] === b[j - 1]) v = Math.min(v, d[i - 2]![j - 2]! + 1);
      d[i]![j] = v;
    }
  }
  return d[m]![n]!;
}

/**
 * Longest word a suggestion is searched for. A slip of the keyboard keeps a word near the length
 * of a key (the longest is 13 characters); the edit distance costs length × length, so a 100 kB
 * key is not compared with anything.
 */
export const MAX_SUGGEST_LENGTH = 40;

/** The closest candidate, when it is close enough to be a plausible slip of the keyboard. */
export function closest(word: string, candidates: readonly string[]): string | undefined {
  if (word.length > MAX_SUGGEST_LENGTH) return undefined;
  const w = word.toLowerCase();
  let best: string | undefined;
  let bestD = Infinity;
  for (const c of candidates) {
    const dist = editDistance(w, c.toLowerCase());
    if (dist < bestD) {
      bestD = dist;
      best = c;
    }
  }
  const allowed = Math.max(1, Math.ceil(Math.min(w.length, (best ?? '').length) / 3));
  return bestD <= allowed ? best : undefined;
}
