// What thin-grating theory predicts for a grating of equal slits (its width) or of any profile
// (grating-profile.ts): the share of the transmitted power each order gets, one period's spectrum
// for the far-field model of the order checks, and the grating's half width. The slits keep their
// own formulas, (w/d)·sinc²(m·w/d), so that their results stay as they were to the last bit.
import { meanTransmission, orderEfficiency, significantOrders, type GratingProfile } from '../optics/grating-profile.js';
import { sinc, thinGratingFraction } from '../optics/grating.js';
import { periodTransform } from '../optics/grating-transform.js';

export interface GratingShape {
  count: number;
  period: number;
  /** Slit width of a binary amplitude grating of equal slits, or null for a profile. */
  width: number | null;
  profile?: GratingProfile | null;
}

/** Order m's share of the power through the grating (thin-grating theory, before obliquity). */
export function orderFraction(g: GratingShape, m: number): number {
  if (g.profile) return orderEfficiency(g.profile, m) / meanTransmission(g.profile);
  return thinGratingFraction(g.width!, g.period, m);
}

/** Half the grating's full width: from its first slit's edge to its last's, or count periods. */
export function gratingHalfWidth(g: GratingShape): number {
  return g.profile ? (g.count * g.period) / 2 : ((g.count - 1) * g.period + g.width!) / 2;
}

/** ∫|t|² over one period: the slit width, or d·mean|t|². */
export function periodPower(g: GratingShape): number {
  return g.profile ? g.period * meanTransmission(g.profile) : g.width!;
}

/** |T̂(f)|² of one period (f in 1/m): the envelope of the orders. */
export function periodSpectrum2(g: GratingShape, f: number): number {
  if (!g.profile) return (g.width! * sinc(g.width! * f)) ** 2;
  const [re, im] = periodTransform(g.profile, g.period, f);
  return re * re + im * im;
}

/**
 * How far out (|m|) thin-grating theory gives an order at least `tol` of the transmitted power: for
 * slits the sinc² envelope (w/d)/(π m w/d)² bounds it; for a profile, the orders that hold all but
 * `tol` of its power, and one more.
 */
export function listedOrderReach(g: GratingShape, tol: number): number {
  if (!g.profile) {
    const duty = g.width! / g.period;
    return Math.ceil(Math.sqrt(1 / (duty * Math.PI ** 2 * tol))) + 1;
  }
  const [lo, hi] = significantOrders(g.profile, Math.max(1e-12, Math.min(tol, 0.49)));
  return Math.max(Math.abs(lo), Math.abs(hi)) + 1;
}
