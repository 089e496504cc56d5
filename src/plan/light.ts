// Where the light goes, before anything is computed: the beams an aperture sends out (one for a
// plain aperture, one per diffraction order for a grating), the power each carries, where it lands
// on the screen, and a coarse model of the intensity across the screen. The planner sizes the
// window from it and checks every method's validity where the light actually is — a grating's
// orders at 40° as much as the central lobe.
import type { Aperture, ApertureFacts, Illumination } from '../optics/aperture.js';
import { gratingOf, lensOf } from '../elements/registry.js';
import { directionCosines } from '../optics/source.js';
import { landingOrders } from '../optics/grating.js';
import { orderFraction } from '../analysis/grating-shape.js';
import { significantOrders } from '../optics/grating-profile.js';

export interface Beam {
  /** Diffraction order (gratings), or null for the one beam of a plain aperture. */
  order: number | null;
  /** Direction cosines [α, β] of the beam's axis. */
  dir: [number, number];
  /** Fraction of the power through the aperture (∫|U₀|²) the beam carries (thin-element theory). */
  power: number;
  /** α² + β² < 1: the beam reaches the screen. Evanescent beams decay within a few wavelengths. */
  propagates: boolean;
  /** Where the beam's axis, leaving the aperture's centre, meets the screen: z·α/γ, z·β/γ. */
  landing: [number, number] | null;
}

/** Gratings with more propagating orders than this are modelled as one beam (see lightModel). */
export const MAX_ORDERS = 256;

/** A smooth grating profile's orders beyond those holding all but this of its power are not beams. */
export const SMOOTH_ORDER_TAIL = 1e-7;

export interface LightModel {
  beams: Beam[];
  /** The propagating beams, strongest first. */
  propagating: Beam[];
  /** Fraction of ∫|U₀|² sent into evanescent waves (never reaches the screen). */
  evanescentFraction: number;
  /** Half widths of the illuminated aperture [x, y] (the footprint of every beam on the screen). */
  footprint: [number, number];
  oneD: boolean;
  /** Power through the aperture per unit incident irradiance (m² in 2-D, m in 1-D), as lit. */
  power: number;
  /** Edge measure of the illuminated aperture per unit of its power (for the edge-diffraction tails). */
  edgesPerPower: number;
  /**
   * Per axis, the edge measure behind one beam's tails along that axis, per unit of its power: the
   * whole aperture's edges for a plain one; for a grating's orders the outline's two edges across
   * that axis (2/D_i), since each order is a beam as wide as the grating.
   */
  beamEdgesPerPower: [number, number];
  waist: number;
}

/** Direction cosine γ of a direction (α, β); 0 for evanescent ones. */
function gammaOf(a: number, b: number): number {
  const g2 = 1 - a * a - b * b;
  return g2 > 0 ? Math.sqrt(g2) : 0;
}

export function lightModel(
  a: Aperture,
  f: ApertureFacts,
  ill: Illumination,
  lam: number,
  z: number,
  footprint: [number, number],
  obstructed = false,
): LightModel {
  const [alpha, beta] = directionCosines(ill);
  const oneD = f.oneD;
  const waist = ill.kind === 'gaussian' ? ill.waist : Infinity;
  // A lens's beam converges (or diverges): its footprint on the screen is the cone's, not the aperture's.
  const focusing = lensOf(a);
  if (focusing) footprint = lensFootprint(focusing.focal, lam, z, footprint);
  const edgeWeight = illuminatedEdgeWeight(f, waist, oneD);
  // An obstacle in a Gaussian beam passes about the beam's power beyond the obstacle's near edge.
  const beamPower = oneD ? waist * Math.sqrt(Math.PI / 2) : (Math.PI * waist * waist) / 2;
  const power = obstructed ? Math.max(1e-300, beamPower * edgeWeight) : illuminatedPower(f, waist, oneD);
  const edgesPerPower = (f.edgeMeasure * edgeWeight) / power;
  const land = (s: [number, number]): [number, number] | null => {
    const g = gammaOf(s[0], oneD ? 0 : s[1]);
    return g > 0 ? [(z * s[0]) / g, oneD ? 0 : (z * s[1]) / g] : null;
  };
  const beams: Beam[] = [];
  let beamEdgesPerPower: [number, number] = [edgesPerPower, edgesPerPower];
  const grating = gratingOf(a);
  // One period of a profile is still a grating's worth of directions (a blazed tooth sends its light
  // along its ramp, not along the illumination): its orders, overlapping, are where the light goes.
  // One slit is a plain aperture.
  const orderRange = grating && (grating.count >= 2 || grating.profile) ? landingOrders(alpha, oneD ? 0 : beta, lam, grating.period) : null;
  // A grating with more propagating orders than MAX_ORDERS (a sparse one, period ≫ λ) is modelled
  // as one beam with every slit's edges: its orders are packed closer than the slits' own
  // diffraction spreads them, and they separate on the screen only far beyond its far-field
  // distance. The order table still lists them.
  // A smooth profile (a sinusoid) puts its light into a few orders and none (or next to none)
  // into the rest: only those are beams, or every propagating order would widen the window to 90°.
  // Profiles with steps (slits, binary phase, blazed teeth) keep every order, as slits always have:
  // their 1/m² tails carry light wherever the orders land.
  const smooth = grating?.profile && (grating.profile.kind === 'sinusoidal-amplitude' || grating.profile.kind === 'sinusoidal-phase') ? significantOrders(grating.profile, SMOOTH_ORDER_TAIL) : null;
  const beamRange = orderRange && smooth ? ([Math.max(orderRange[0], smooth[0]), Math.min(orderRange[1], smooth[1])] as [number, number]) : orderRange;
  if (grating && !obstructed && orderRange && beamRange && beamRange[1] - beamRange[0] + 1 <= MAX_ORDERS) {
    const [lo, hi] = orderRange;
    let carried = 0;
    for (let m = lo; m <= hi; m++) {
      const dir: [number, number] = [alpha + (m * lam) / grating.period, oneD ? 0 : beta];
      const p = orderFraction(grating, m);
      // With a tilt along the lines too, an order propagates only while α² + β² < 1.
      const landing = land(dir);
      if (landing) carried += p;
      if (m < beamRange[0] || m > beamRange[1]) continue;
      beams.push({ order: m, dir, power: p, propagates: landing !== null, landing });
    }
    // The first evanescent order on each side, so that reports can show where the cut-off is.
    for (const m of [lo - 1, hi + 1]) {
      beams.push({ order: m, dir: [alpha + (m * lam) / grating.period, oneD ? 0 : beta], power: orderFraction(grating, m), propagates: false, landing: null });
    }
    // Each order is a beam as wide as the grating: its tails come from the grating's outline
    // (two edges in 1-D; the outline's length in 2-D), not from every slit's edges.
    const [fx, fy] = footprint;
    beamEdgesPerPower = [(edgeWeight * 2) / (2 * fx), oneD ? 0 : (edgeWeight * 2) / (2 * fy)];
    beams.sort((x, y) => y.power - x.power);
    return finish(beams, Math.max(0, 1 - carried));
  }
  // A plain aperture: one beam along the illumination. The part of its spectrum beyond 1/λ is
  // evanescent; the edge tail (power beyond spatial frequency F ≈ edges·/(2π²F·power), the same
  // 1/F law as the window's margin) estimates it, with F the distance from the carrier to the
  // circle |f| = 1/λ.
  const dir: [number, number] = [alpha, oneD ? 0 : beta];
  const reach = (1 - Math.hypot(alpha, oneD ? 0 : beta)) / lam;
  const evanescent = reach > 0 ? Math.min(0.5, edgesPerPower / (2 * Math.PI ** 2 * reach)) : 1;
  beams.push({ order: null, dir, power: 1 - evanescent, propagates: reach > 0, landing: land(dir) });
  return finish(beams, evanescent);

  function finish(list: Beam[], evanescentFraction: number): LightModel {
    return {
      beams: list,
      propagating: list.filter((b) => b.propagates),
      evanescentFraction,
      footprint,
      oneD,
      power,
      edgesPerPower,
      beamEdgesPerPower,
      waist,
    };
  }
}

/** j₁,₁/π: the Airy core's first dark ring at (j₁,₁/π)·λz/D (Born & Wolf, Principles of Optics, §8.5.2). */
const AIRY_CORE = 3.8317059702075125 / Math.PI;

/**
 * The footprint of the cone behind a thin lens of focal length f at distance z, per axis: the
 * geometric |1 − z/f|·a of the illuminated half width a (converging to the focus for f > 0, spreading
 * for f < 0), plus the diffraction spread, the Airy core (j₁,₁/π)·λz/(2a) (1.22λf/D at the focus).
 */
export function lensFootprint(focal: number, lam: number, z: number, lit: [number, number]): [number, number] {
  const geo = Math.abs(1 - z / focal);
  const axis = (a: number) => (a > 0 ? geo * a + (AIRY_CORE * lam * z) / (2 * a) : 0);
  return [axis(lit[0]), axis(lit[1])];
}

/**
 * 1/e² radius at distance z of a Gaussian beam whose waist w₀ is at a thin lens of focal length f
 * (ABCD law for the complex beam parameter: 1/q₁ = 1/q₀ − 1/f, q = q₁ + z; Siegman, Lasers, ch. 17
 * and 20): at z = f it is λf/(πw₀)·(1 + (f/z_R)²)^(−1/2), z_R = πw₀²/λ.
 */
export function lensBeamRadius(w0: number, focal: number, lam: number, z: number): number {
  const zr = (Math.PI * w0 * w0) / lam;
  // 1/q₁ = a + ib with a = −1/f, b = −1/z_R; q₁ = (a − ib)/(a² + b²); q = q₁ + z.
  const a = -1 / focal;
  const b = -1 / zr;
  const m = a * a + b * b;
  const qr = a / m + z;
  const qi = -b / m;
  // Im(1/q) = −qᵢ/|q|², and w² = −λ/(π·Im(1/q)).
  return Math.sqrt((lam * (qr * qr + qi * qi)) / (Math.PI * qi));
}

/** Power through the aperture per unit incident irradiance, with a Gaussian beam's own limit. */
export function illuminatedPower(f: ApertureFacts, waist: number, oneD: boolean): number {
  if (!Number.isFinite(waist)) return f.openMeasure;
  const beamPower = oneD ? waist * Math.sqrt(Math.PI / 2) : (Math.PI * waist * waist) / 2;
  return Math.min(f.openMeasure, beamPower);
}

/** A Gaussian beam's intensity at the aperture's nearest edge (1 for a plane wave). */
export function illuminatedEdgeWeight(f: ApertureFacts, waist: number, oneD: boolean): number {
  if (!Number.isFinite(waist)) return 1;
  const edgeDist = oneD ? f.halfExtent[0] : Math.min(f.halfExtent[0], f.halfExtent[1]);
  return Math.exp((-2 * edgeDist * edgeDist) / (waist * waist));
}

/**
 * The model's intensity (relative to the incident irradiance) that beam b puts at (x, y), per
 * axis the smaller of the geometric plateau 1/D (the illuminated aperture's width D shifted to the
 * landing point, filled at unit irradiance) and the far-zone spread of a beam of that width:
 * spectral density 1/(1/D + δf²/T) (peak D; tail T/δf² with T = e/(2π²) from the edge measure e
 * per unit power behind the beam, at least 1/(π²D), the envelope of sinc²), mapped to the
 * screen with dx/dα = z/γ³, δf measured from the footprint's edge. In the far field (D² < λz) the
 * spread is the smaller everywhere and gives the familiar peak (D_x D_y/λz)² per unit power; in the
 * near field the plateau caps it over the shadow and just beyond its edges, and the spread's 1/δf²
 * tail is the edges' diffraction. Either way the power per axis is about one: a far-field axis
 * must not carry a spike 1/D over its tiny footprint, or every other point of the window would be
 * weighed against a peak the light never reaches.
 */
export function beamIntensity(m: LightModel, b: Beam, lam: number, z: number, x: number, y: number): number {
  if (!b.landing) return 0;
  const g = gammaOf(b.dir[0], m.oneD ? 0 : b.dir[1]);
  const scale = (g * g * g) / (lam * z);
  const axis = (u: number, half: number, edges: number) => {
    const d = 2 * half;
    const off = Math.max(0, Math.abs(u) - half);
    const df = off * scale;
    // Tail e/(2π²δf²) from the edges behind the beam (a sparse grating's every slit), at least
    // that of the footprint's own two edges, 1/(π²Dδf²).
    const tail = Math.max(1 / (Math.PI * Math.PI * d), edges / (2 * Math.PI * Math.PI));
    const spread = scale / (1 / d + (df * df) / tail);
    return Math.min(1 / d, spread);
  };
  const px = axis(x - b.landing[0], m.footprint[0], m.beamEdgesPerPower[0]);
  const py = m.oneD ? 1 : axis(y - b.landing[1], m.footprint[1], m.beamEdgesPerPower[1]);
  return b.power * m.power * px * py;
}

/** The model's intensity at (x, y): the beams add in power (their relative phases are not modelled). */
export function modelIntensity(m: LightModel, lam: number, z: number, x: number, y: number): number {
  let s = 0;
  for (const b of m.propagating) s += beamIntensity(m, b, lam, z, x, y);
  return s;
}
