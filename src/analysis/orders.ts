// Diffraction orders of a grating of slits: where the grating equation puts them, how much of the
// computed power lands around each, and what the thin-grating theory predicts for the same number.
//
// Two measures of an order's power, and why both:
// - `fractionOfTransmitted` is ∫|U|² dx over the order's interval on the screen, over ∫|U₀|² through
//   the slits. Both are the same measure (the squared field integrated over a plane), so a correct
//   scalar computation conserves it order by order: it is what the thin-grating coefficient
//   |c_m|²/(w/d) predicts, at any angle.
// - `fluxFraction` is the power that crosses the screen plane: a plane wave of intensity |U|² going
//   at direction cosine γ carries γ|U|² through a plane normal to z, so the order's flux over the
//   flux through the slits is fractionOfTransmitted · γ_m/γ_i = · cos θ_m / cos θ_i (the obliquity
//   of the scalar thin-element model). Σ_m of it is not exactly the transmitted flux: scalar theory
//   does not conserve flux at wide angles, which is one reason it loses accuracy there.
import { cellMeasure } from '../model/grid.js';
import type { IntensityMap } from '../model/intensity-map.js';

/**
 * propagating: lands on the screen inside the window; outside-window: lands, but part or all of
 * its interval lies outside the window (`outside` says which); evanescent: |sin θ_m| > 1, decays
 * within a few wavelengths and carries no power to the screen; grazing: |sin θ_m| = 1 exactly,
 * travels along the screen and never lands on it.
 */
export type OrderStatus = 'propagating' | 'outside-window' | 'evanescent' | 'grazing';

export interface GratingOrder {
  m: number;
  status: OrderStatus;
  /** For outside-window orders: whether part or all of the order's interval is outside. */
  outside?: 'part' | 'all';
  /** sin θ_m = sin θ_i + mλ/d (the x direction cosine; above 1 in magnitude for evanescent orders). */
  sinAngle: number;
  /** Angle from the axis in the x–z plane (rad), asin(sin θ_m); null when |sin θ_m| ≥ 1. */
  angle: number | null;
  /** Position on the screen, z·α_m/γ_m (= z·tan θ_m without a tilt along y); null when it does not land. */
  position: number | null;
  /** Convenience: status is propagating or outside-window. */
  propagates: boolean;
  /** Convenience: status is propagating (the whole interval is inside the window). */
  inWindow: boolean;
  /** The order's interval on the screen: between the midpoints to its neighbours' positions. */
  interval: [number, number] | null;
  /**
   * ∫|U|² over the interval / power through the slits (0 for evanescent and grazing orders; null
   * when part of the interval lies outside the window).
   */
  fractionOfTransmitted: number | null;
  /** The same power / power incident on the grating's footprint (count × period); null without a plane wave. */
  fractionOfIncident: number | null;
  /** Thin-grating theory's value of fractionOfTransmitted: |c_m|²/(w/d) = (w/d)·sinc²(m·w/d) (Goodman §4.4). */
  predictedFraction: number;
  /** Flux through the screen plane over the flux through the slits: fractionOfTransmitted · cos θ_m/cos θ_i. */
  fluxFraction: number | null;
  /** Thin-grating theory's flux fraction: predictedFraction · cos θ_m/cos θ_i (0 when it does not land). */
  predictedFlux: number;
  /** Centroid of the intensity over the interval (m), null when the interval is not wholly in the window or dark. */
  centroid: number | null;
  /**
   * The order's beam is clear of its neighbours' on the screen (each is the grating's footprint
   * about its landing point, widened by three diffraction lobes z·(λ/D)/γ³ on each side): only then
   * is the light in its interval its own. False closer than the orders separate (the grating's
   * near field), where its measured fractions are left empty.
   */
  separated: boolean;
  /** Resolving power λ/Δλ = |m|·N of the order (Born & Wolf §8.6.3), null for m = 0 and for orders that do not land. */
  resolvingPower: number | null;
  /**
   * Angular dispersion dθ/dλ = m/(d·cos θ_m) (rad per metre of wavelength; from the grating
   * equation, Born & Wolf §8.6.1), null for m = 0 and for orders that do not land.
   */
  angularDispersion?: number | null;
  /** Linear dispersion on the flat screen, dx/dλ = z·m/(d·cos³θ_m) (metres per metre of wavelength), from x = z·tan θ_m. */
  linearDispersion?: number | null;
  /** Free spectral range λ/|m| (m): the wavelength span before order m + 1 of a shorter line lands on it (Hecht §10.2.8). */
  freeSpectralRange?: number | null;
  /** The smallest resolvable wavelength difference λ/R (m), null where resolvingPower is (analysis/grating-answers.ts). */
  smallestResolvable?: number | null;
  /**
   * Linear dispersion in the focal plane of a camera lens of focal length f (the job's
   * orders.focal_length), dx/dλ = f·m/(d·cos θ_m) (metres per metre of wavelength); null for m = 0
   * and orders that do not land; absent without a focal length.
   */
  focalDispersion?: number | null;
  /**
   * Reflection gratings: the Littrow angle θ_L, sin θ_L = mλ/(2d); at incidence θ_i = −θ_L the order
   * leaves at θ_m = θ_L = −θ_i, back along the incident beam. Null where |mλ/(2d)| > 1; absent for
   * transmission gratings.
   */
  littrowAngle?: number | null;
}

/** Propagating orders that are left out of the list (only for gratings with thousands of orders). */
export interface OmittedOrders {
  from: number;
  to: number;
  status: 'outside-window';
  outside: 'all';
  /** Σ predictedFraction over the range. */
  predictedFraction: number;
}

export interface OrderTable {
  orders: GratingOrder[];
  /**
   * Fraction of the power through the slits that thin-grating theory sends into evanescent orders
   * (all of them, not only the listed ones): 1 − Σ over orders that land or graze of
   * (w/d)·sinc²(m·w/d), since Σ over all m is 1 (Parseval; Goodman §4.4).
   */
  evanescentFraction: number;
  omitted: OmittedOrders[];
  /**
   * Propagating orders inside the window whose beams overlap a neighbour's (their powers cannot be
   * read off the map), and the distance beyond which the first orders separate (null when they
   * never do: four lobes of a grating of N ≤ 6 lines are as wide as the spacing).
   */
  unresolved: { orders: number[]; separateBeyond: number | null } | null;
}

export interface GratingInput {
  period: number;
  /** Slit width of a grating of equal slits (for the thin-grating prediction), or null for a profile. */
  width: number | null;
  /** The grating's profile when it is not one of equal slits (grating-profile.ts). */
  profile?: GratingProfile | null;
  /** Number of lines (slits) illuminated. */
  count: number;
  wavelength: number;
  distance: number;
  /** sin θ_i (direction cosine α) of the incident light in the plane of the grating's x axis. */
  sinIncidence: number;
  /** Direction cosine β of the incident light along the lines (0 for 1-D gratings). */
  sinIncidenceY?: number;
  powerTransmitted: number;
  powerIncident: number | null;
}

import { landingOrders } from '../optics/grating.js';
import type { GratingProfile } from '../optics/grating-profile.js';
import { gratingHalfWidth, listedOrderReach, orderFraction } from './grating-shape.js';

export { sinc, thinGratingFraction, landingOrders } from '../optics/grating.js';

/** Evanescent orders are listed while thin-grating theory gives them at least this fraction. */
export const EVANESCENT_LISTED = 1e-3;
/** Above this many landing orders, runs of orders wholly outside the window are summarised. */
export const MAX_LISTED_ORDERS = 2001;
/** Outside-window orders kept on each side of the window when the list is summarised. */
const KEPT_OUTSIDE = 50;

/** Power per column (integrated over the column's width and over all rows). */
export function columnPower(map: IntensityMap): Float64Array {
  const colPower = new Float64Array(map.nx);
  const cell = cellMeasure(map);
  for (let r = 0; r < map.ny; r++) for (let c = 0; c < map.nx; c++) colPower[c] += map.intensity[r * map.nx + c]! * cell;
  return colPower;
}

/**
 * ∫ over [a, b] of the column power (and of x times it, for centroids): each column is a cell of
 * width dx centred on its sample, counted by the part of it inside [a, b].
 */
export function integrateColumns(colPower: Float64Array, map: IntensityMap, a: number, b: number): { power: number; moment: number } {
  const dx = map.dx;
  const x0 = map.x0;
  const ca = (a - x0) / dx;
  const cb = (b - x0) / dx;
  let power = 0;
  let moment = 0;
  for (let c = Math.max(0, Math.floor(ca)); c <= Math.min(map.nx - 1, Math.ceil(cb)); c++) {
    const lo = Math.max(ca, c - 0.5);
    const hi = Math.min(cb, c + 0.5);
    if (hi > lo) {
      const p = colPower[c]! * (hi - lo);
      power += p;
      // The covered part of the cell has its own centre.
      moment += p * (x0 + ((lo + hi) / 2) * dx);
    }
  }
  return { power, moment };
}

/** The window's extent along x: the cells of the outer samples included. */
export function windowExtent(map: IntensityMap): [number, number] {
  const dx = map.dx;
  return [map.x0 - dx / 2, map.x0 + (map.nx - 0.5) * dx];
}

/** The order table with its evanescent total; see OrderTable. */
export function gratingOrderTable(map: IntensityMap, g: GratingInput): OrderTable {
  const beta = g.sinIncidenceY ?? 0;
  const gammaI = Math.sqrt(Math.max(0, 1 - g.sinIncidence ** 2 - beta ** 2));
  const [lo, hi] = landingOrders(g.sinIncidence, beta, g.wavelength, g.period);
  const sinOf = (m: number) => g.sinIncidence + (m * g.wavelength) / g.period;
  const gammaOf = (m: number) => Math.sqrt(Math.max(0, 1 - sinOf(m) ** 2 - beta ** 2));
  const positionOf = (m: number) => (g.distance * sinOf(m)) / gammaOf(m);
  const [w0, w1] = windowExtent(map);
  const colPower = columnPower(map);

  // Orders that land: intervals between the midpoints to the neighbours; the outermost ones reach
  // as far out as half their inner gap, or to the window's edge when the order's own beam (the
  // grating's footprint about its landing point) is inside: the planner sizes the window to hold
  // the outer orders with their tails, and everything beyond the last order on that side is its
  // light (what the window misses is the window loss, reported apart).
  const landing: GratingOrder[] = [];
  let carried = 0;
  const core = gratingHalfWidth(g);
  for (let m = lo; m <= hi; m++) {
    const x = positionOf(m);
    const prev = m > lo ? positionOf(m - 1) : null;
    const next = m < hi ? positionOf(m + 1) : null;
    let a = prev !== null ? (prev + x) / 2 : next !== null ? x - (next - x) / 2 : -Infinity;
    let b = next !== null ? (next + x) / 2 : prev !== null ? x + (x - prev) / 2 : Infinity;
    // ... with at least three of the order's diffraction lobes (λ/D in angle, z·(λ/D)/γ³ on the
    // screen) beyond its footprint, or most of its light may be past the window's edge.
    const lobe = (g.distance * (g.wavelength / (2 * core))) / Math.max(1e-6, gammaOf(m) ** 3);
    if (prev === null && a < w0 && x - core - 3 * lobe >= w0) a = w0;
    if (next === null && b > w1 && x + core + 3 * lobe <= w1) b = w1;
    const inWindow = a >= w0 && b <= w1;
    const outside = inWindow ? undefined : b < w0 || a > w1 ? ('all' as const) : ('part' as const);
    const predicted = orderFraction(g, m);
    carried += predicted;
    const obliquity = gammaOf(m) / gammaI;
    // Spread beyond the footprint: three far-field lobes λz/D, or in the grating's near field three
    // Fresnel zones √(λz) (its edge waves), whichever is wider, stretched by 1/γ³ at angle.
    const spread = 3 * Math.max((g.distance * g.wavelength) / (2 * core), Math.sqrt(g.wavelength * g.distance));
    const reachOf = (k: number) => core + spread / Math.max(1e-6, gammaOf(k) ** 3);
    const separated = (prev === null || x - prev >= reachOf(m) + reachOf(m - 1)) && (next === null || next - x >= reachOf(m) + reachOf(m + 1));
    let measured: number | null = null;
    let centroid: number | null = null;
    if (inWindow) {
      const { power, moment } = integrateColumns(colPower, map, a, b);
      if (separated) measured = power / g.powerTransmitted;
      centroid = power > 0 ? moment / power : null;
    }
    landing.push({
      m,
      status: inWindow ? 'propagating' : 'outside-window',
      ...(outside ? { outside } : {}),
      sinAngle: sinOf(m),
      angle: Math.asin(sinOf(m)),
      position: x,
      propagates: true,
      inWindow,
      interval: [a, b],
      fractionOfTransmitted: measured,
      fractionOfIncident: measured !== null && g.powerIncident ? (measured * g.powerTransmitted) / g.powerIncident : null,
      predictedFraction: predicted,
      fluxFraction: measured !== null ? measured * obliquity : null,
      predictedFlux: predicted * obliquity,
      centroid,
      separated,
      resolvingPower: m === 0 ? null : Math.abs(m) * g.count,
      ...dispersionOf(m, Math.asin(sinOf(m)), g),
    });
  }

  // Orders that do not land, outwards from the cut-off on each side: the first one always, then
  // as far as thin-grating theory gives one at least EVANESCENT_LISTED of the transmitted power.
  // The sinc² envelope (w/d)/(π m w/d)² bounds how far that can be.
  const reach = listedOrderReach(g, EVANESCENT_LISTED);
  let grazing = 0;
  const beyond = (start: number, step: 1 | -1): GratingOrder[] => {
    const out: GratingOrder[] = [];
    let last = 0;
    for (let k = 0, m = start; k === 0 || Math.abs(m) <= reach; k++, m += step) {
      const p = orderFraction(g, m);
      const s = sinOf(m);
      const graze = Math.abs(Math.abs(s) - Math.sqrt(Math.max(0, 1 - beta * beta))) < 1e-12;
      if (graze) grazing += p;
      out.push({
        m,
        status: graze ? 'grazing' : 'evanescent',
        sinAngle: s,
        angle: null,
        position: null,
        propagates: false,
        inWindow: false,
        interval: null,
        fractionOfTransmitted: 0,
        fractionOfIncident: g.powerIncident ? 0 : null,
        predictedFraction: p,
        fluxFraction: 0,
        predictedFlux: 0,
        centroid: null,
        separated: true,
        resolvingPower: null,
      });
      if (k === 0 || p >= EVANESCENT_LISTED || graze) last = out.length;
      if (k > 4 * reach + 8) break;
    }
    return out.slice(0, Math.max(1, last));
  };
  const low = beyond(lo - 1, -1).reverse();
  const high = beyond(hi + 1, 1);
  const evanescentFraction = Math.max(0, 1 - carried - grazing);

  // Gratings with thousands of landing orders (a double slit far apart): runs wholly outside the
  // window beyond KEPT_OUTSIDE on each side are summarised, so that records stay small.
  const omitted: OmittedOrders[] = [];
  let kept = landing;
  if (landing.length > MAX_LISTED_ORDERS) {
    const inside = landing.map((o, i) => (o.outside === 'all' ? -1 : i)).filter((i) => i >= 0);
    const first = inside.length ? inside[0]! : Math.floor(landing.length / 2);
    const lastIn = inside.length ? inside[inside.length - 1]! : first;
    const keepFrom = Math.max(0, first - KEPT_OUTSIDE);
    const keepTo = Math.min(landing.length - 1, lastIn + KEPT_OUTSIDE);
    const sum = (os: GratingOrder[]) => os.reduce((s, o) => s + o.predictedFraction, 0);
    if (keepFrom > 0) {
      const run = landing.slice(0, keepFrom);
      omitted.push({ from: run[0]!.m, to: run[run.length - 1]!.m, status: 'outside-window', outside: 'all', predictedFraction: sum(run) });
    }
    if (keepTo < landing.length - 1) {
      const run = landing.slice(keepTo + 1);
      omitted.push({ from: run[0]!.m, to: run[run.length - 1]!.m, status: 'outside-window', outside: 'all', predictedFraction: sum(run) });
    }
    kept = landing.slice(keepFrom, keepTo + 1);
  }
  // Orders in the window whose beams overlap, and where they separate: near the axis the first
  // orders are z·λ/d apart and each reaches D/2 + 3·max(λz/D, √(λz)) from its landing point, so
  // they separate once z·λ/d ≥ D + 6λz/D (z ≥ D/(λ/d − 6λ/D), possible only when 6d < D) and
  // z·λ/d ≥ D + 6√(λz) (a quadratic in √z).
  const crowded = landing.filter((o) => o.inWindow && !o.separated).map((o) => o.m);
  const D = 2 * core;
  let separateBeyond: number | null = null;
  if (6 * g.period < D) {
    const s = g.wavelength / g.period;
    const byLobes = D / (s - (6 * g.wavelength) / D);
    const root = (6 * Math.sqrt(g.wavelength) + Math.sqrt(36 * g.wavelength + 4 * s * D)) / (2 * s);
    separateBeyond = Math.max(g.distance, byLobes, root * root);
  }
  const unresolved = crowded.length ? { orders: crowded, separateBeyond } : null;
  return { orders: [...low, ...kept, ...high], evanescentFraction, omitted, unresolved };
}

/** The orders alone (see gratingOrderTable). */
export function gratingOrders(map: IntensityMap, g: GratingInput): GratingOrder[] {
  return gratingOrderTable(map, g).orders;
}

/**
 * What a spectroscopist reads off an order that lands: dθ/dλ = m/(d cos θ_m) by differentiating the
 * grating equation d(sin θ_m − sin θ_i) = mλ at fixed incidence; on a flat screen x = z·tan θ_m, so
 * dx/dλ = z·sec²θ_m·dθ/dλ; the free spectral range λ/|m|. Zero order: none (it does not disperse).
 */
function dispersionOf(m: number, angle: number, g: { period: number; distance: number; wavelength: number }): Pick<GratingOrder, 'angularDispersion' | 'linearDispersion' | 'freeSpectralRange'> {
  if (m === 0) return { angularDispersion: null, linearDispersion: null, freeSpectralRange: null };
  const c = Math.cos(angle);
  const dTheta = m / (g.period * c);
  return { angularDispersion: dTheta, linearDispersion: (g.distance * dTheta) / (c * c), freeSpectralRange: g.wavelength / Math.abs(m) };
}
