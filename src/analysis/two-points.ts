// Two mutually incoherent points (illumination kind points, two of them): are their patterns
// resolved on the screen? The profile along the line through where the two land is read by
// analysis/resolution.ts (the two peaks, the valley between, the dip over the lower peak, judged by
// Rayleigh's 8/π²; two Airy patterns at the Rayleigh separation dip to about 73.5 %, Born & Wolf §7.6.3).
import { isOneD, type Grid } from '../model/grid.js';
import type { IntensityMap } from '../model/intensity-map.js';
import { pointShifts } from '../plan/curved-light.js';
import type { Plan } from '../plan/types.js';
import { RAYLEIGH_DIP, readTwoLines } from './resolution.js';

export interface TwoPointResult {
  /** Where the two points' patterns are centred on the screen ([x, y], m). */
  centres: [[number, number], [number, number]];
  /** Their distance apart on the screen (m). */
  separation: number;
  /** Where the reading found the two peaks and the valley ([x, y], m); null if it found no valley. */
  peaks: [[number, number], [number, number]] | null;
  valley: [number, number] | null;
  /** The valley over the lower peak (null: the two peaks merged into one, no dip). */
  dip: number | null;
  /** Rayleigh's criterion, dip ≤ 8/π². */
  resolved: boolean;
  /**
   * Sparrow's limit: two maxima with any dip between them (the pattern's second derivative at the
   * midpoint no longer negative; for two equal Airy patterns at 0.947 λ/D in angle, Born & Wolf
   * §7.6.3 and common practice).
   */
  sparrow: boolean;
  rayleighDip: number;
}

/** Bilinear reading of a map between samples (0 outside). */
function valueAt(m: Grid & { intensity: Float64Array }, x: number, y: number): number {
  const fc = (x - m.x0) / m.dx;
  const c0 = Math.floor(fc);
  const tc = fc - c0;
  const at = (r: number, c: number) => (r >= 0 && r < m.ny && c >= 0 && c < m.nx ? m.intensity[r * m.nx + c]! : 0);
  if (isOneD(m)) return (1 - tc) * at(0, c0) + tc * at(0, c0 + 1);
  const fr = (y - m.y0) / m.dy;
  const r0 = Math.floor(fr);
  const tr = fr - r0;
  return (1 - tr) * ((1 - tc) * at(r0, c0) + tc * at(r0, c0 + 1)) + tr * ((1 - tc) * at(r0 + 1, c0) + tc * at(r0 + 1, c0 + 1));
}

/** The reading for a case lit by exactly two points; null otherwise. */
export function twoPointReading(plan: Plan, map: IntensityMap): TwoPointResult | null {
  const s = plan.case.source;
  if (s?.kind !== 'points' || s.points.length !== 2 || !plan.beams[0]?.landing) return null;
  const oneD = isOneD(map);
  // The centre point lands where the plan's main beam does; each point is moved from there.
  const [lx, ly] = plan.beams[0].landing;
  const shifts = pointShifts(s, plan.case.distance);
  const centres = shifts.map((p) => [lx + p.shift[0], oneD ? 0 : ly + p.shift[1]] as [number, number]) as [[number, number], [number, number]];
  const [a, b] = centres;
  const sep = Math.hypot(b[0] - a[0], b[1] - a[1]);
  const base = { centres, separation: sep, rayleighDip: RAYLEIGH_DIP };
  const none = { ...base, peaks: null, valley: null, dip: null, resolved: false, sparrow: false };
  if (!(sep > 0)) return none;
  // The line from half a separation before the first to half one past the second, sampled at a
  // quarter of the map's pitch (bilinear between samples).
  const step = Math.min(map.dx, oneD ? Infinity : map.dy) / 4;
  const n = Math.max(9, Math.min(20001, Math.ceil((2 * sep) / step) + 1));
  const ux = (b[0] - a[0]) / sep;
  const uy = (b[1] - a[1]) / sep;
  const t = (i: number) => -sep / 2 + (2 * sep * i) / (n - 1);
  const profile = new Float64Array(n);
  for (let i = 0; i < n; i++) profile[i] = valueAt(map, a[0] + ux * t(i), a[1] + uy * t(i));
  const index = (d: number) => ((d + sep / 2) * (n - 1)) / (2 * sep);
  const r = readTwoLines(profile, index(0), index(sep), 0.25 * (index(sep) - index(0)));
  if (!r) return none;
  const pos = (i: number): [number, number] => [a[0] + ux * t(i), a[1] + uy * t(i)];
  // Two maxima (each at least its neighbours) with a valley below both: Sparrow's resolved.
  const isMax = (i: number) => profile[i]! >= (profile[i - 1] ?? -Infinity) && profile[i]! >= (profile[i + 1] ?? -Infinity);
  const sparrow = isMax(r.peaks[0]) && isMax(r.peaks[1]) && r.dip < 1 - 1e-9;
  return { ...base, peaks: [pos(r.peaks[0]), pos(r.peaks[1])], valley: pos(r.valley), dip: r.dip, resolved: r.resolved, sparrow };
}
