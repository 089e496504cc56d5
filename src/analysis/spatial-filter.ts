// The questions asked of a spatial filter's pinhole at a lens's focus, answered from the computed
// focal intensity map: how wide is the focal spot (its 1/e² diameter, beside the Gaussian-beam and
// Airy estimates), how much of the beam passes the pinhole sizes people usually pick, and which
// pinhole passes a wanted fraction. Fractions are of the power through the lens, so that light the
// window does not hold counts as stopped; a disc that reaches past the window's edge is flagged.
import { energyCurve, fractionWithin, mapExtent, radiusHolding, type EnergyCurve } from './encircled.js';
import type { IntensityMap } from '../model/intensity-map.js';

/**
 * Pinhole diameters as multiples of the focal spot's 1/e² diameter: 1.5× and 2× are the usual
 * choices for a spatial filter (common practice: 1.5× passes about 99 % of a Gaussian beam and
 * blocks the scattered light around it; 2× passes nearly all of it).
 */
export const COMMON_PINHOLE_MULTIPLES: readonly number[] = [1.5, 2];

/** The fractions answered when the job names none. */
export const DEFAULT_PASSING: readonly number[] = [0.9, 0.99];

/** 1/e²: the level that defines a beam's radius (Siegman, Lasers, ch. 17). */
const E2 = Math.exp(-2);
/** J₁'s first zero: the Airy pattern's first dark ring at v = 3.8317 (Born & Wolf, Principles of Optics, §8.5.2), 2.44λf/D across. */
const J1_FIRST_ZERO = 3.8317059702075125;

export interface RadialProfile {
  /** Mean radius of the samples in each ring (m); rings without samples are left out. */
  radius: Float64Array;
  /** Mean intensity of the samples in each ring. */
  mean: Float64Array;
}

/**
 * The azimuthally averaged intensity about a centre: the map's samples grouped in rings of width
 * `ring` (default half the finer pitch) and averaged, each ring placed at its samples' mean radius.
 * Only measured samples enter (no interpolation); the rings' finite width biases a ring's mean by
 * about I''·ring²/24, far below the map's own accuracy at half a pitch.
 */
export function radialProfile(map: IntensityMap, centre: [number, number], ring = Math.min(map.dx, map.dy) / 2): RadialProfile {
  const [x0, x1, y0, y1] = mapExtent(map);
  let rMax = 0;
  for (const x of [x0, x1]) for (const y of [y0, y1]) rMax = Math.max(rMax, Math.hypot(x - centre[0], y - centre[1]));
  const bins = Math.ceil(rMax / ring) + 1;
  const sumI = new Float64Array(bins);
  const sumR = new Float64Array(bins);
  const count = new Float64Array(bins);
  const inv = 1 / ring;
  for (let row = 0; row < map.ny; row++) {
    const dy = map.y0 + row * map.dy - centre[1];
    const dy2 = dy * dy;
    for (let col = 0; col < map.nx; col++) {
      const dx = map.x0 + col * map.dx - centre[0];
      const r = Math.sqrt(dx * dx + dy2);
      const k = Math.min(bins - 1, Math.floor(r * inv));
      sumI[k]! += map.intensity[row * map.nx + col]!;
      sumR[k]! += r;
      count[k]!++;
    }
  }
  const radius: number[] = [];
  const mean: number[] = [];
  for (let k = 0; k < bins; k++) {
    if (count[k]! === 0) continue;
    radius.push(sumR[k]! / count[k]!);
    mean.push(sumI[k]! / count[k]!);
  }
  return { radius: Float64Array.from(radius), mean: Float64Array.from(mean) };
}

/**
 * The 1/e² diameter of a radial profile: twice the radius where the profile, walking outwards from
 * its maximum, first falls to 1/e² of that maximum (linear interpolation between rings). Null when
 * it never does within the map. `peak` is the profile's maximum (the azimuthal average's, which for
 * a spot centred on its peak is the peak itself).
 */
export function e2Diameter(p: RadialProfile): { diameter: number | null; peak: number } {
  let top = 0;
  for (let k = 1; k < p.mean.length; k++) if (p.mean[k]! > p.mean[top]!) top = k;
  const peak = p.mean[top] ?? 0;
  if (!(peak > 0)) return { diameter: null, peak };
  const level = peak * E2;
  for (let k = top + 1; k < p.mean.length; k++) {
    if (p.mean[k]! <= level) {
      const i0 = p.mean[k - 1]!;
      const i1 = p.mean[k]!;
      const t = i0 > i1 ? (i0 - level) / (i0 - i1) : 0;
      return { diameter: 2 * (p.radius[k - 1]! + t * (p.radius[k]! - p.radius[k - 1]!)), peak };
    }
  }
  return { diameter: null, peak };
}

/** What the focusing optics are, for the textbook estimates beside the measured spot. */
export interface FocusOptics {
  wavelength: number;
  /** Focal length (m), > 0. */
  focal: number;
  /** The Gaussian beam's 1/e² intensity radius at the lens (m), or null: a plane wave. */
  beamRadius: number | null;
  /** The stop's diameter (m), or null: none. */
  stopDiameter: number | null;
}

/** A pinhole of a given multiple of the 1/e² diameter and the fraction of the beam it passes. */
export interface PinholeFraction {
  /** The multiple of the measured 1/e² diameter (common practice: 1.5 and 2). */
  multiple: number;
  diameter: number;
  /** Power through the centred pinhole / power through the lens. */
  fraction: number;
  /** The pinhole reaches past the window's edge: the fraction counts only the part inside (a lower bound). */
  clipped: boolean;
}

/** The pinhole diameter that passes a wanted fraction, or why there is no answer. */
export interface PinholeForFraction {
  fraction: number;
  /** Diameter of the centred pinhole passing `fraction` of the power through the lens; null when not answered. */
  diameter: number | null;
  /**
   * answered: the disc lies inside the window, so the diameter is exact on this map;
   * upper-bound: the disc reaches past the window's edge, where light is not counted, so a smaller
   * pinhole may do; window-holds-less: the window holds less than the fraction, no answer.
   */
  status: 'answered' | 'upper-bound' | 'window-holds-less';
}

export interface SpatialFilterAnswers {
  /** The spot's centre the pinholes are centred on. */
  centre: [number, number];
  /** The azimuthally averaged intensity's maximum (relative to the incident irradiance). */
  peak: number;
  /** Measured 1/e² diameter (m): where the azimuthal average falls to 1/e² of its maximum; null if it never does in the window. */
  e2Diameter: number | null;
  /** The measured diameter in samples of the coarser pitch (below about 4 the measurement is coarse). */
  samplesAcross: number | null;
  /** 2w₀ = 2λf/(πw) for a Gaussian beam of radius w at the lens, unclipped (Siegman, Lasers, ch. 17); null in a plane wave. */
  gaussianDiameter: number | null;
  /** The Airy pattern's first-zero diameter 2.44λf/D of a uniformly lit stop (Born & Wolf §8.5.2); null without a stop. */
  airyDiameter: number | null;
  /** Power in the window / power through the lens: what any pinhole answer can reach at most. */
  windowFraction: number;
  /** Radius of the largest disc about the centre that lies wholly inside the window (m). */
  inscribedRadius: number;
  /** Pinholes of 1.5× and 2× the measured 1/e² diameter (common practice); empty when there is no diameter. */
  commonPractice: PinholeFraction[];
  /** The pinhole passing each wanted fraction. */
  passing: PinholeForFraction[];
}

/** Bin width of the fine encircled-energy curve, in the finer pitch: a quarter, the sub-cells' size. */
const CURVE_STEP = 0.25;
/** Most bins of the fine curve (a 4096² map at a quarter pitch needs about 11 600). */
const CURVE_BINS_MAX = 20000;

/** The encircled energy about the centre on bins a quarter of the finer pitch wide (the curve that pinholes are read from). */
export function fineEnergyCurve(map: IntensityMap, centre: [number, number], powerIn: number): EnergyCurve {
  const [x0, x1, y0, y1] = mapExtent(map);
  let rMax = 0;
  for (const x of [x0, x1]) for (const y of [y0, y1]) rMax = Math.max(rMax, Math.hypot(x - centre[0], y - centre[1]));
  const points = Math.min(CURVE_BINS_MAX, Math.max(400, Math.ceil(rMax / (CURVE_STEP * Math.min(map.dx, map.dy)))));
  return energyCurve(map, centre, powerIn, points);
}

/**
 * The spatial-filter answers for a focal-plane map (2-D), its centre and the power through the lens.
 * The encircled-energy curve is the power through a circular pinhole centred on the spot, exactly
 * (up to the map's sampling), so both the fractions and the diameters are read off it (linear
 * interpolation between bins a quarter of a pitch apart).
 */
export function spatialFilterAnswers(
  map: IntensityMap,
  centre: [number, number],
  powerIn: number,
  optics: FocusOptics,
  passing: readonly number[] = DEFAULT_PASSING,
): SpatialFilterAnswers {
  const { wavelength: lam, focal } = optics;
  const profile = radialProfile(map, centre);
  const { diameter, peak } = e2Diameter(profile);
  const curve = fineEnergyCurve(map, centre, powerIn);
  const windowFraction = curve.fraction[curve.fraction.length - 1]!;
  const [x0, x1, y0, y1] = mapExtent(map);
  const inscribedRadius = Math.max(0, Math.min(centre[0] - x0, x1 - centre[0], centre[1] - y0, y1 - centre[1]));
  const commonPractice: PinholeFraction[] =
    diameter === null
      ? []
      : COMMON_PINHOLE_MULTIPLES.map((multiple) => {
          const d = multiple * diameter;
          return { multiple, diameter: d, fraction: fractionWithin(curve, d / 2), clipped: d / 2 > inscribedRadius };
        });
  const answers = passing.map((fraction): PinholeForFraction => {
    const r = windowFraction >= fraction ? radiusHolding(curve, fraction) : null;
    if (r === null) return { fraction, diameter: null, status: 'window-holds-less' };
    return { fraction, diameter: 2 * r, status: r > inscribedRadius ? 'upper-bound' : 'answered' };
  });
  return {
    centre,
    peak,
    e2Diameter: diameter,
    samplesAcross: diameter === null ? null : diameter / Math.max(map.dx, map.dy),
    gaussianDiameter: optics.beamRadius === null ? null : (2 * lam * focal) / (Math.PI * optics.beamRadius),
    airyDiameter: optics.stopDiameter === null ? null : (((2 * J1_FIRST_ZERO) / Math.PI) * lam * focal) / optics.stopDiameter,
    windowFraction,
    inscribedRadius,
    commonPractice,
    passing: answers,
  };
}
