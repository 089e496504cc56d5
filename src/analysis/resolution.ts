// Are two lines resolved? Two mutually incoherent lines add in intensity; read off the computed
// profile, they are resolved by the Rayleigh criterion when the intensity between them dips to at
// most the dip of two equal sinc² lines one first-zero apart, 8/π² ≈ 81.1 % of the lower peak
// (Born & Wolf, Principles of Optics, §7.6.3; for two Airy patterns at 1.22λ/D the same criterion
// gives 73.6 %). Groundwork for issue 14's doublet answers: it reads any sampled profile.

/** The dip of two equal sinc² lines one first zero apart, at their midpoint: 2·sinc²(½) = 8/π². */
export const RAYLEIGH_DIP = 8 / (Math.PI * Math.PI);

export interface TwoLineReading {
  /** Indices of the two peaks and of the lowest sample between them. */
  peaks: [number, number];
  valley: number;
  /** The valley over the lower of the two peaks (1: no dip at all). */
  dip: number;
  /** dip ≤ RAYLEIGH_DIP (within a hair, 1e-9, for rounding). */
  resolved: boolean;
}

/**
 * Reads a profile for two lines expected near indices a < b: the largest sample within
 * `reach` samples of each (the peaks), the lowest between them (the valley), and the dip. Null
 * where the two peaks are the same sample or adjacent (nothing between them to dip).
 */
export function readTwoLines(profile: ArrayLike<number>, a: number, b: number, reach: number): TwoLineReading | null {
  const n = profile.length;
  const argmax = (c: number) => {
    let best = -1;
    for (let i = Math.max(0, Math.round(c - reach)); i <= Math.min(n - 1, Math.round(c + reach)); i++) if (best < 0 || profile[i]! > profile[best]!) best = i;
    return best;
  };
  const p = argmax(a);
  const q = argmax(b);
  const [lo, hi] = p < q ? [p, q] : [q, p];
  if (hi - lo < 2) return null;
  let valley = lo + 1;
  for (let i = lo + 1; i < hi; i++) if (profile[i]! < profile[valley]!) valley = i;
  const dip = profile[valley]! / Math.min(profile[lo]!, profile[hi]!);
  return { peaks: [lo, hi], valley, dip, resolved: dip <= RAYLEIGH_DIP + 1e-9 };
}
