// Are two close lines of a spectrum resolved by a grating? Read on the computed pattern (the sum
// of the lines' intensities), in every order where both land, for every pair of neighbouring
// lines closer than a few resolution elements: the two peaks near where the grating equation puts
// the lines, the valley between them and the dip over the lower peak, judged by Rayleigh's
// criterion (resolution.ts: a dip to 8/π² ≈ 81 % between equal lines), beside the textbook answer
// λ/Δλ ≤ R = |m|·N (Born & Wolf, Principles of Optics, §8.6.3).
import type { GratingOrder } from './orders.js';
import { readTwoLines } from './resolution.js';
import type { IntensityMap } from '../model/intensity-map.js';

/** A line's order table (each line of a spectrum gets its own). */
export interface LineOrders {
  wavelength: number;
  weight: number;
  orders: GratingOrder[];
}

export interface LinePair {
  order: number;
  wavelengths: [number, number];
  /** Where the grating equation puts the two lines on the screen (m). */
  positions: [number, number];
  /** The valley over the lower peak (1: one peak, no dip); null where the lines fall within two output samples. */
  dip: number | null;
  /** Resolved on the computed pattern by Rayleigh's criterion (dip ≤ 8/π²). */
  resolved: boolean;
  /** Sparrow's limit: two maxima with any dip between them. */
  sparrow: boolean;
  /** The order's resolving power |m|·N, and the pair's λ/Δλ. */
  resolvingPower: number | null;
  needed: number;
  /** The textbook answer: λ/Δλ ≤ |m|·N. */
  expected: boolean | null;
}

/** Pairs farther apart than this many resolution elements λ/R are plainly separate: not listed. */
export const CLOSE_PAIR_ELEMENTS = 3;

/** Every close pair of neighbouring lines in every order where both land in the window. */
export function linePairs(map: IntensityMap, lines: LineOrders[]): LinePair[] {
  const sorted = [...lines].sort((a, b) => a.wavelength - b.wavelength);
  const out: LinePair[] = [];
  for (let i = 1; i < sorted.length; i++) {
    const [p, q] = [sorted[i - 1]!, sorted[i]!];
    const lam = (p.wavelength + q.wavelength) / 2;
    const needed = lam / (q.wavelength - p.wavelength);
    // An order counts where both lines land on the map (a window given around one order leaves
    // its neighbours, and so the order's own interval, outside: its status says so, not its lines).
    const lo = map.x0;
    const hi = map.x0 + (map.nx - 1) * map.dx;
    const lands = (o: GratingOrder) => o.propagates && o.position !== null && o.position >= lo && o.position <= hi;
    for (const op of p.orders) {
      if (op.m === 0 || !lands(op)) continue;
      const oq = q.orders.find((o) => o.m === op.m && lands(o));
      if (!oq) continue;
      const R = op.resolvingPower;
      if (R !== null && needed > 0 && R / needed > CLOSE_PAIR_ELEMENTS) continue;
      const reading = readPair(map, op.position!, oq.position!);
      out.push({
        order: op.m,
        wavelengths: [p.wavelength, q.wavelength],
        positions: [op.position!, oq.position!],
        ...reading,
        resolvingPower: R,
        needed,
        expected: R === null ? null : needed <= R,
      });
    }
  }
  return out;
}

/** The two lines read off the row through them (the row of the brighter one in a 2-D map). */
function readPair(map: IntensityMap, xa: number, xb: number): { dip: number | null; resolved: boolean; sparrow: boolean } {
  const a = (xa - map.x0) / map.dx;
  const b = (xb - map.x0) / map.dx;
  if (Math.abs(b - a) < 2) return { dip: null, resolved: false, sparrow: false };
  let row = 0;
  if (map.ny > 1) {
    const col = Math.min(map.nx - 1, Math.max(0, Math.round(a)));
    for (let r = 1; r < map.ny; r++) if (map.intensity[r * map.nx + col]! > map.intensity[row * map.nx + col]!) row = r;
  }
  const profile = map.intensity.subarray(row * map.nx, (row + 1) * map.nx);
  const [lo, hi] = a < b ? [a, b] : [b, a];
  const r = readTwoLines(profile, lo, hi, Math.max(1, (hi - lo) / 2 - 0.5));
  // One peak where two lines were expected (the two searches meet on its flank, not on two
  // maxima): no dip at all.
  const isMax = (i: number) => profile[i]! >= (profile[i - 1] ?? -Infinity) && profile[i]! >= (profile[i + 1] ?? -Infinity);
  if (!r || !isMax(r.peaks[0]) || !isMax(r.peaks[1])) return { dip: 1, resolved: false, sparrow: false };
  return { dip: Math.min(1, r.dip), resolved: r.resolved, sparrow: r.dip < 1 - 1e-9 };
}
