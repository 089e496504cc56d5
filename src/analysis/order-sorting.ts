// Order sorting for a grating used over a wavelength range: which other orders put which
// wavelengths on the same place, and the filter that removes them. On the same screen position
// (the same angle, at fixed incidence) order n of λ' lands where order m of λ does when
// nλ' = mλ (the grating equation, Born & Wolf §8.6.1), so the range [a, b] used in order m meets
// [ma/n, mb/n] of order n. Higher orders (n > m) bring shorter wavelengths, which a long-pass
// filter with its cut-on between the longest of them and a removes; lower orders (0 < n < m) bring
// longer ones, which a short-pass edge between b and the shortest of them removes. Without limits
// on the light these are mb/(m + 1) and ma/(m − 1); where mb/(m + 1) ≥ a the range is wider than
// the free spectral range and no filter separates the orders. Limits on the light (its lowest and
// highest wavelength) clip the overlaps, and may make a filter unnecessary or possible.

export interface OrderOverlap {
  /** The other order. */
  order: number;
  /** The wavelengths of that order landing on the range's positions (m), clipped to the light's spectrum. */
  from: number;
  to: number;
}

export interface OrderSorting {
  order: number;
  range: [number, number];
  /** Overlapping orders of the same sign, nearest first, where the light holds those wavelengths. */
  overlaps: OrderOverlap[];
  /**
   * The long-pass filter's cut-on window (any cut-on in (low, high] passes the range and blocks every
   * higher order's wavelengths in the light), or null where none separates the orders or none is
   * needed (longPassNeeded says which).
   */
  longPass: { low: number; high: number } | null;
  /** Some higher order puts light of the spectrum on the range. */
  longPassNeeded: boolean;
  /** For m ≥ 2: the short-pass edge window [low, high) removing the lower orders' longer wavelengths; null for m = 1, where none works or none is needed. */
  shortPass: { low: number; high: number } | null;
  /** Some lower order (|n| < |m|) puts light of the spectrum on the range. */
  shortPassNeeded: boolean;
}

/**
 * Order sorting for range [a, b] (m) used in order m (≠ 0), for light spanning `spectrum` (m;
 * default: everything from 0 to ∞). Orders of the other sign land on the other side and never meet
 * this range.
 */
export function orderSorting(m: number, range: [number, number], spectrum: [number, number] = [0, Infinity], maxOrder = 20): OrderSorting {
  if (!Number.isInteger(m) || m === 0) throw new RangeError('order sorting: the order must be a non-zero integer');
  const [a, b] = range;
  if (!(a > 0 && b >= a)) throw new RangeError('order sorting: expected a range [from, to] of positive wavelengths');
  const M = Math.abs(m);
  const overlaps: OrderOverlap[] = [];
  for (let n = 1; n <= Math.max(maxOrder, M + 1); n++) {
    if (n === M) continue;
    const from = Math.max((M * a) / n, spectrum[0]);
    const to = Math.min((M * b) / n, spectrum[1]);
    if (to >= from) overlaps.push({ order: Math.sign(m) * n, from, to });
  }
  overlaps.sort((p, q) => Math.abs(Math.abs(p.order) - M) - Math.abs(Math.abs(q.order) - M));
  const higher = overlaps.filter((o) => Math.abs(o.order) > M);
  const lower = overlaps.filter((o) => Math.abs(o.order) < M);
  // Unlimited light: the (m + 1)th order's longest wavelength mb/(m + 1) is the one to block.
  const lpLow = higher.length ? Math.max(...higher.map((o) => o.to)) : (M * b) / (M + 1);
  const longPass = lpLow < a ? { low: lpLow, high: a } : null;
  const spHigh = lower.length ? Math.min(...lower.map((o) => o.from)) : M >= 2 ? (M * a) / (M - 1) : Infinity;
  const shortPass = M >= 2 && b < spHigh ? { low: b, high: spHigh } : null;
  return { order: m, range: [a, b], overlaps, longPass, longPassNeeded: higher.length > 0, shortPass, shortPassNeeded: lower.length > 0 };
}
