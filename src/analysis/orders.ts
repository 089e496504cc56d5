// Diffraction orders of a grating of slits: where the grating equation puts them and how much of
// the computed power lands around each.
import type { IntensityMap } from './metrics.js';

export interface GratingOrder {
  m: number;
  /** Angle from the axis (rad), from d(sin θ_m − sin θ_i) = mλ. */
  angle: number | null;
  /** Position on the screen, z·tan θ_m (m). */
  position: number | null;
  propagates: boolean;
  /** Power around the order (between the midpoints to its neighbours) / power through the slits. */
  fractionOfTransmitted: number | null;
  /** The same power / power incident on the grating's footprint (count × period). */
  fractionOfIncident: number | null;
  /** False when part of the order's interval lies outside the window. */
  inWindow: boolean;
  /** Resolving power λ/Δλ = |m|·N of the order (Born & Wolf §8.6.3), null for m = 0. */
  resolvingPower: number | null;
}

export interface GratingInput {
  period: number;
  /** Number of lines (slits) illuminated. */
  count: number;
  wavelength: number;
  distance: number;
  /** sin θ_i of the incident light in the plane of the grating's x axis. */
  sinIncidence: number;
  powerTransmitted: number;
  powerIncident: number | null;
  maxOrder?: number;
}

/** Orders with |sin θ_i + mλ/d| ≤ 1 propagate; the others are evanescent. */
export function gratingOrders(map: IntensityMap, g: GratingInput): GratingOrder[] {
  const mMax = g.maxOrder ?? Math.min(50, Math.ceil((2 * g.period) / g.wavelength) + 1);
  const dx = map.pitch[0];
  const xs: { m: number; sin: number; x: number | null }[] = [];
  for (let m = -mMax; m <= mMax; m++) {
    const s = g.sinIncidence + (m * g.wavelength) / g.period;
    const x = Math.abs(s) < 1 ? (g.distance * s) / Math.sqrt(1 - s * s) : null;
    xs.push({ m, sin: s, x });
  }
  const x0 = map.origin[0];
  const x1 = x0 + (map.cols - 1) * dx;
  // Sum of intensity over all rows per column, so that 2-D (finite-length) gratings work too.
  const colPower = new Float64Array(map.cols);
  const cell = map.pitch[1] === null ? dx : dx * map.pitch[1];
  for (let r = 0; r < map.rows; r++) for (let c = 0; c < map.cols; c++) colPower[c] += map.intensity[r * map.cols + c]! * cell;
  const integrate = (a: number, b: number) => {
    // Trapezoid-free: columns whose centres fall in [a, b), with fractional end cells.
    let s = 0;
    const ca = (a - x0) / dx;
    const cb = (b - x0) / dx;
    for (let c = Math.max(0, Math.floor(ca)); c <= Math.min(map.cols - 1, Math.ceil(cb)); c++) {
      const lo = Math.max(ca, c - 0.5);
      const hi = Math.min(cb, c + 0.5);
      if (hi > lo) s += colPower[c]! * (hi - lo);
    }
    return s;
  };
  const out: GratingOrder[] = [];
  for (let i = 0; i < xs.length; i++) {
    const o = xs[i]!;
    if (o.x === null) {
      out.push({
        m: o.m,
        angle: null,
        position: null,
        propagates: false,
        fractionOfTransmitted: null,
        fractionOfIncident: null,
        inWindow: false,
        resolvingPower: null,
      });
      continue;
    }
    const prev = xs[i - 1]?.x ?? null;
    const next = xs[i + 1]?.x ?? null;
    const a = prev !== null ? (prev + o.x) / 2 : o.x - (next !== null ? (next - o.x) / 2 : 0);
    const b = next !== null ? (next + o.x) / 2 : o.x + (prev !== null ? (o.x - prev) / 2 : 0);
    const inWindow = a >= x0 - dx / 2 && b <= x1 + dx / 2;
    const p = integrate(a, b);
    out.push({
      m: o.m,
      angle: Math.asin(o.sin),
      position: o.x,
      propagates: true,
      fractionOfTransmitted: inWindow ? p / g.powerTransmitted : null,
      fractionOfIncident: inWindow && g.powerIncident ? p / g.powerIncident : null,
      inWindow,
      resolvingPower: o.m === 0 ? null : Math.abs(o.m) * g.count,
    });
  }
  // Evanescent orders beyond ±1 say nothing useful; the first ones show where the cut-off is.
  return out.filter((o) => o.propagates || Math.abs(o.m) <= 1);
}
