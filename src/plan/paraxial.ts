// How far the paraxial (Fresnel) approximation is from the exact kernel where the light lands.
// The Fresnel kernel replaces k·r by k·(z + ρ²/2z); what it drops, k(√(z²+ρ²) − z − ρ²/2z), moves
// light landing at wide angles (a grating's order at z·sin θ instead of z·tan θ) and bends the
// wavefront of every beam. What matters for intensities at a screen point is how much the dropped
// phase varies over the aperture as seen from that point; what matters for the answer is how much
// light lands there. So the check weighs the variation by the light the planner's model puts at
// each point of the window — every beam, every order — not only at the central spot.
import type { LightModel } from './light.js';
import { modelIntensity } from './light.js';

/** The phase the Fresnel kernel drops at lateral distance ρ: −kρ⁴/(2z(√(z²+ρ²)+z)²), without cancellation. */
export function droppedPhase(k: number, z: number, rho: number): number {
  const r = Math.sqrt(z * z + rho * rho);
  const rho2 = rho * rho;
  return (-k * rho2 * rho2) / (2 * z * (r + z) * (r + z));
}

/**
 * Peak-to-peak of the dropped phase over the illuminated aperture (a box of half widths ax, ay
 * about the origin) seen from (x, y): it is monotonic in ρ, so the nearest and farthest aperture
 * points bound it.
 */
export function paraxialVariation(k: number, z: number, ax: number, ay: number, x: number, y: number, absolute = false): number {
  const nx = Math.max(0, Math.abs(x) - ax);
  const ny = Math.max(0, Math.abs(y) - ay);
  const fx = Math.abs(x) + ax;
  const fy = Math.abs(y) + ay;
  const far = droppedPhase(k, z, Math.hypot(fx, fy));
  // Against a free wave whose phase is exact, the dropped phase itself shifts the interference, not
  // only its variation over the aperture: then the largest |φ| counts (φ is monotonic in ρ, ≤ 0).
  if (absolute) return Math.abs(far);
  return Math.abs(far - droppedPhase(k, z, Math.hypot(nx, ny)));
}

const MAX_POINTS = 400;

export interface ParaxialEstimate {
  /** Largest weighted variation, weight·min(Δφ, 2π) (rad): the decision quantity. */
  error: number;
  /** The point where it is largest, its unweighted Δφ and the weight there. */
  at: [number, number];
  phase: number;
  weight: number;
}

export interface ParaxialInputs {
  lam: number;
  z: number;
  model: LightModel;
  /** Half widths of the illuminated aperture. */
  aperture: [number, number];
  centre: [number, number];
  half: [number, number];
  /**
   * Behind an obstacle (Babinet: free beam − hole) the hole's field interferes with the free beam
   * of amplitude ≈ 1, so an error in it shows linearly: weight 2|U_hole| instead of I/I_peak.
   */
  interferesWithFreeBeam: boolean;
}

/**
 * Samples the window (an even grid, plus every beam's landing point and footprint edges) and
 * returns the largest weight·min(Δφ, 2π). The weight is the model's intensity relative to its
 * peak: a beam carrying a tenth of the peak intensity may be off by ten times more phase before
 * it disturbs the map by as much. Δφ saturates at 2π: past that the light is simply misplaced and
 * the error is the light itself.
 */
export function paraxialEstimate(p: ParaxialInputs): ParaxialEstimate {
  const { lam, z, model } = p;
  const k = (2 * Math.PI) / lam;
  const axes = model.oneD ? [0] : [0, 1];
  const points: number[][] = [[], []];
  for (const i of axes) {
    const c = p.centre[i]!;
    const h = p.half[i]!;
    const even = model.oneD ? 81 : 33;
    const set = new Set<number>();
    for (let j = 0; j < even; j++) set.add(c - h + (2 * h * j) / (even - 1));
    for (const b of model.propagating) {
      if (!b.landing) continue;
      for (const u of [-1, -0.5, 0, 0.5, 1]) {
        const x = b.landing[i]! + u * model.footprint[i]!;
        if (Math.abs(x - c) <= h) set.add(x);
      }
    }
    // At most MAX_POINTS per axis (evenly thinned): the check costs points² × beams in 2-D.
    const all = [...set].sort((a, b) => a - b);
    const stride = Math.max(1, Math.ceil(all.length / MAX_POINTS));
    points[i] = all.filter((_, j) => j % stride === 0);
  }
  if (model.oneD) points[1] = [0];
  // The model's peak: at some beam's landing point.
  let peak = 0;
  for (const b of model.propagating) if (b.landing) peak = Math.max(peak, modelIntensity(model, lam, z, b.landing[0], b.landing[1]));
  if (p.interferesWithFreeBeam) peak = Math.max(1, peak);
  let best: ParaxialEstimate = { error: 0, at: [p.centre[0], p.centre[1]], phase: 0, weight: 0 };
  if (!(peak > 0)) return best;
  for (const x of points[0]!) {
    for (const y of points[1]!) {
      const phase = paraxialVariation(k, z, p.aperture[0], model.oneD ? 0 : p.aperture[1], x, y, p.interferesWithFreeBeam);
      if (phase === 0) continue;
      const i = modelIntensity(model, lam, z, x, y);
      const weight = p.interferesWithFreeBeam ? Math.min(1, 2 * Math.sqrt(i)) : Math.min(1, i / peak);
      const e = weight * Math.min(phase, 2 * Math.PI);
      if (e > best.error) best = { error: e, at: [x, y], phase, weight };
    }
  }
  return best;
}

/** A thin lens's paraxial model against an ideal lens, over the cone that carries its light. */
export interface LensParaxial {
  focal: number;
  /** Radius of the lit pupil that carries the power (the stop, or two beam radii). */
  radius: number;
  /**
   * R/|f| plus the lit pupil's diffraction spread and the tilt's sine: the steepest ray that carries
   * power.
   */
  na: number;
  /**
   * How far the thin lens's quadratic phase is from an ideal lens's wavefront over the lit pupil,
   * rad: on the axis k(√(f² + R²) − |f| − R²/(2|f|)) ≈ kR⁴/(8|f|³) at the rim (Goodman,
   * Introduction to Fourier Optics, §5.1); for tilted light the variation of the same dropped phase
   * across the pupil seen from where the tilted light focuses, |f|·tan θ, which adds the off-axis
   * terms (≈ kR·tan³θ: the focus moved from |f|·sin θ to |f|·tan θ, and blurred).
   */
  phase: number;
  /** About NA²/2: the relative error in positions of the paraxial (tangent) mapping against the sine. */
  positionError: number;
  /**
   * kR·|tan θ − sin θ| (rad): the linear phase across the lit pupil between a tilted beam focused by
   * an ideal (Fourier-transform) lens, at z·sin θ, and by the thin quadratic phase's undeviated
   * chief ray, at z·tan θ. In units of the spot scale λz/(2R) the shift is this over π, at any z.
   */
  tiltPhase: number;
}

/**
 * The lit pupil's diffraction spread as a direction: 2λ/(π·radius), which is λ/(πw) for a Gaussian
 * beam of radius w (radius = 2w; Siegman, Lasers, ch. 17) and 0.64λ/R for a stop, near the Airy
 * core's 0.61λ/R (Born & Wolf, Principles of Optics, §8.5.2). A pupil of a few wavelengths spreads
 * its light over wide angles whatever the lens does.
 */
export function pupilSpread(lam: number, radius: number): number {
  return radius > 0 ? (2 * lam) / (Math.PI * radius) : 1;
}

/**
 * kR·(tan θ − sin θ) for a tilt of direction sine s (LensParaxial.tiltPhase), written without the
 * cancellation of tan θ − sin θ = s·(1 − c)/c = s³/(c(1 + c)), c = cos θ.
 */
export function lensTiltPhase(lam: number, radius: number, s: number): number {
  const a = Math.min(Math.abs(s), 1 - 1e-12);
  const c = Math.sqrt(1 - a * a);
  return ((2 * Math.PI) / lam) * radius * ((a * a * a) / (c * (1 + c)));
}

/**
 * For a lens, the paraxial check is on the cone behind it, not on the aperture seen from the screen:
 * its quadratic phase and the Fresnel kernel drop the same order (Goodman §5.2), so together they
 * give an ideal lens's focus, and what is left is the paraxial mapping of the cone's directions
 * (NA²/2 in positions, the NA counting the pupil's own diffraction spread). The estimate carries
 * the lens's phase against an ideal lens's on the axis, kR⁴/(8f³), at the main beam's landing
 * point, for the checks and the Fresnel forms' notes; `lens.phase` adds a tilt's off-axis terms for
 * the methods that propagate the quadratic phase exactly.
 */
export function lensParaxial(lam: number, focal: number, radius: number, tiltSine: number, at: [number, number]): { lens: LensParaxial; estimate: ParaxialEstimate } {
  const k = (2 * Math.PI) / lam;
  const f = Math.abs(focal);
  const s = Math.min(Math.abs(tiltSine), 1 - 1e-12);
  const tan = s / Math.sqrt(1 - s * s);
  // The dropped phase is monotonic in ρ: over the disc seen from L = |f|·tan θ it spans
  // [max(0, L − R), L + R]; on the axis (L = 0) that is kR⁴/(8f³).
  const L = f * tan;
  const phase = Math.abs(droppedPhase(k, f, L + radius) - droppedPhase(k, f, Math.max(0, L - radius)));
  const na = radius / f + pupilSpread(lam, radius) + s;
  const tiltPhase = lensTiltPhase(lam, radius, s);
  // The Fresnel forms give an ideal lens's field, so what their checks and notes weigh is the axis's
  // kR⁴/(8f³) (what the result is not: the quadratic phase's own spherical aberration), and for a
  // tilt the linear part of the phase the Fresnel kernel drops across the lit pupil seen from the
  // landing point, 2kR·(tan θ − sin θ) from rim to rim: the paraxial kernel puts the spot at z·sin θ,
  // the exact one (the chief ray) at z·tan θ. (The lens-chirp form warns of the latter from a lower
  // limit: fresnel-lens.ts LENS_TILT_PHASE.)
  const onAxis = Math.abs(droppedPhase(k, f, radius));
  const error = Math.max(onAxis, 2 * tiltPhase);
  return {
    lens: { focal, radius, na, phase, positionError: (na * na) / 2, tiltPhase },
    estimate: { error, at, phase: error, weight: 1 },
  };
}
