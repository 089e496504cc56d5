// Light whose wavefront is curved at the aperture: a point source at a distance, a Gaussian beam
// whose waist lies before the aperture, an extended incoherent source (a sum of point sources). By
// the Fresnel scaling theorem (Goodman, Introduction to Fourier Optics, §4.2; common practice), an
// aperture t lit by a spherical wave of radius R, t(ξ)·exp(ikξ²/2R), seen at distance z equals the
// same aperture under flat light seen at z_eff = zR/(R + z), magnified by M = (R + z)/R, with the
// intensity divided by M² (by M for a 1-D problem, whose Fresnel kernel carries 1/√(λz)):
//   ∫t·e^{ikξ²/2R}·e^{ik(x−ξ)²/2z}dξ = e^{ikx²/2z}·∫t·e^{ikξ²/2z_eff}·e^{−ikξ(x/M)/z_eff}dξ.
// So a curved-light case is planned and computed as a flat-light case (any method the planner
// picks) and its grid is mapped back. The theorem is paraxial on both legs, source to aperture and
// aperture to screen, whatever method computes the flat case: both are checked here.
//
// This module is pure: the planner calls planCurvedLight with itself as the flat planner.
import type { Illumination } from '../optics/aperture.js';
import { apertureFacts } from '../optics/aperture.js';
import { lensOf } from '../elements/registry.js';
import { warning } from '../warnings/catalogue.js';
import { LIMITS } from './limits.js';
import { nextFastFftSize } from '../optics/fft.js';
import { droppedPhase, lensTiltPhase, paraxialVariation } from './paraxial.js';
import { bytes, fmt, len, seconds } from './words.js';
import type { AxisPlan, Case, Plan } from './types.js';

/** Light with a curved wavefront at the aperture, in SI units (Case.source). */
export type CaseSource =
  /** A point at `distance` before the aperture, at [ξ, η] across the axis. */
  | { kind: 'point'; distance: number; at: [number, number] }
  /** A Gaussian beam of waist radius `waist` whose waist lies `waistDistance` before the aperture. */
  | { kind: 'gaussian'; waist: number; waistDistance: number; tilt: [number, number] }
  /**
   * A uniform, incoherent source at `distance`, centred at [ξ, η]: a disc (size[0] its diameter), a
   * slit (size[0] its width along x, long along y) or a rectangle (size: [width, height]).
   */
  | { kind: 'extended'; shape: 'disc' | 'slit' | 'rectangle'; size: [number, number]; distance: number; at: [number, number] }
  /**
   * Mutually incoherent points, each with its irradiance at the aperture's centre (`power`, any
   * unit: only the ratios count): at `distance`, each `at` a position [ξ, η] across the axis; at
   * infinity (distance null), each `at` the direction of its light, angles [θx, θy].
   */
  | { kind: 'points'; distance: number | null; points: { at: [number, number]; power: number }[] };

/** The points' power-weighted centre (positions, or angles at infinity): the flat case's point. */
export function pointsCentre(source: Extract<CaseSource, { kind: 'points' }>): [number, number] {
  const total = source.points.reduce((t, p) => t + p.power, 0);
  const c: [number, number] = [0, 0];
  for (const p of source.points) {
    c[0] += (p.power / total) * p.at[0];
    c[1] += (p.power / total) * p.at[1];
  }
  return c;
}

/**
 * Each point's pattern is the centre point's moved on the screen by a shift, with a weight (its
 * share of the power): at a distance s by −(ξ − ξ_c)·z/s (the paraxial shift theorem), at infinity
 * by z·(tan θ − tan θ_c) (where a tilted plane wave lands; paraxial likewise).
 */
export function pointShifts(source: Extract<CaseSource, { kind: 'points' }>, z: number): { shift: [number, number]; weight: number }[] {
  const total = source.points.reduce((t, p) => t + p.power, 0);
  const c = pointsCentre(source);
  return source.points.map((p) => ({
    weight: p.power / total,
    shift:
      source.distance === null
        ? [z * (Math.tan(p.at[0]) - Math.tan(c[0])), z * (Math.tan(p.at[1]) - Math.tan(c[1]))]
        : [(-(p.at[0] - c[0]) * z) / source.distance, (-(p.at[1] - c[1]) * z) / source.distance],
  }));
}

/** The Gaussian beam's Rayleigh range πw₀²/λ (Siegman, Lasers, ch. 17). */
export function rayleighRange(waist: number, lam: number): number {
  return (Math.PI * waist * waist) / lam;
}

/** A Gaussian beam's radius d past its waist: w₀√(1 + (d/z_R)²) (Siegman, Lasers, ch. 17). */
export function beamRadiusAfter(waist: number, lam: number, d: number): number {
  const zr = rayleighRange(waist, lam);
  return waist * Math.sqrt(1 + (d / zr) ** 2);
}

/**
 * The wavefront's radius of curvature at the aperture (m, positive: diverging): a point's axial
 * distance s, or a Gaussian beam's d(1 + (z_R/d)²) (Siegman, Lasers, ch. 17; Saleh & Teich).
 */
export function curvatureRadius(source: CaseSource, lam: number): number {
  if (source.kind === 'gaussian') {
    const d = source.waistDistance;
    const zr = rayleighRange(source.waist, lam);
    return d + (zr * zr) / d;
  }
  // (Points at infinity: flat light, R = ∞.)
  if (source.kind === 'points') return source.distance ?? Infinity;
  return source.distance;
}

/**
 * The flat light that stands in for the source at the aperture: the envelope and the direction.
 * A point (or an extended source's centre) at [ξ, η] sends its light along the direction from it to
 * the aperture's centre, so its tilts are asin of (−ξ, −η)/√(ξ² + η² + s²); a Gaussian keeps its
 * own tilt and has the radius w(d) at the aperture.
 */
export function flatIllumination(source: CaseSource, lam: number): Illumination {
  if (source.kind === 'gaussian') return { kind: 'gaussian', waist: beamRadiusAfter(source.waist, lam, source.waistDistance), tilt: source.tilt };
  if (source.kind === 'points' && source.distance === null) return { kind: 'plane', tilt: pointsCentre(source) };
  const [xi, eta] = source.kind === 'points' ? pointsCentre(source) : source.at;
  const distance = source.kind === 'points' ? source.distance! : source.distance;
  const r = Math.hypot(xi, eta, distance);
  // (`|| 0`: a source on the axis gives tilts of 0, not −0.)
  return { kind: 'plane', tilt: [Math.asin(-xi / r) || 0, Math.asin(-eta / r) || 0] };
}

export interface FlatEquivalent {
  /** Wavefront radius at the aperture (m). */
  radius: number;
  /** z_eff = zR/(R + z). */
  zEff: number;
  /** M = (R + z)/R: the real screen's coordinates are M times the flat case's. */
  magnification: number;
  /**
   * The real intensity over the flat case's at corresponding points: 1/M², or 1/M for a slit source
   * on a 1-D aperture (a line source along the slits: nothing spreads along y).
   */
  intensityScale: number;
  /** The flat case: distance z_eff, a given window divided by M, no source, no answers asked. */
  case: Case;
}

/** The flat-light case equivalent to c (which has a source). */
export function flatEquivalent(c: Case & { source: CaseSource }, oneD: boolean): FlatEquivalent {
  const R = curvatureRadius(c.source, c.wavelength);
  const z = c.distance;
  // (R = ∞, points at infinity: the flat case is the case itself, M = 1.)
  const M = Number.isFinite(R) ? (R + z) / R : 1;
  const zEff = z / M;
  const { source: _source, ...rest } = c;
  const flat: Case = {
    ...rest,
    illumination: flatIllumination(c.source, c.wavelength),
    distance: zEff,
    ...(c.window ? { window: [c.window[0] / M, c.window[1] / M] as [number, number] } : {}),
    // The answers (detectors, searches) are read on the real screen, off the mapped result.
    analysis: { detectors: [] },
  };
  // In a 1-D problem (invariant along y) the Fresnel kernel carries 1/√(λz) per axis: the x-problem
  // scales the intensity by 1/M. A source of points also spreads its light along the slits, its
  // free wave falling by 1/M along y too, uniformly near the axis (paraxial): 1/M² in all. Only a
  // slit source, a line along y, does not spread along y: 1/M.
  const line = oneD && c.source.kind === 'extended' && c.source.shape === 'slit';
  return { radius: R, zEff, magnification: M, intensityScale: line ? 1 / M : 1 / (M * M), case: flat };
}

/** What the flat plan carries for computeCase to map its result back (Plan.flatLight). */
export interface FlatLight {
  plan: Plan;
  magnification: number;
  intensityScale: number;
}

/**
 * The source leg's paraxial error: the spherical wave's phase beyond its quadratic expansion,
 * −kρ⁴/(8s³) with ρ measured from the source point's foot on the aperture plane, peak to peak over
 * the lit aperture (half widths ax, ay); for a tilted Gaussian beam, its sphere's terms along the tilt.
 */
export function sourcePhase(source: CaseSource, lam: number, ax: number, ay: number): number {
  const k = (2 * Math.PI) / lam;
  if (source.kind === 'gaussian') {
    // The beam is itself a paraxial solution; but tilted by θ, its sphere of radius R is centred on
    // its own axis, and the flat tilt times a sphere about the normal misses the sphere's
    // expansion along the tilt, √(R² − 2Rx·sin θ + x²) = R − x·sin θ + x²cos²θ/(2R) + x³sin θ·cos²θ/(2R²) + …:
    // kx²sin²θ/(2R) + kx³|sin θ|/(2R²) at the lit edge x.
    const R = curvatureRadius(source, lam);
    const sin = Math.hypot(Math.sin(source.tilt[0]), Math.sin(source.tilt[1]));
    const x = Math.max(ax, ay);
    return (k * x * x * sin * sin) / (2 * R) + (k * x * x * x * sin) / (2 * R * R);
  }
  if (source.kind === 'points') {
    const s = source.distance;
    if (s === null) {
      // At infinity a point's pattern is the centre direction's moved by z·(tan θ − tan θ_c); what
      // that drops is the difference of their kR·(tan θ − sin θ) across the lit aperture (the
      // paraxial kernel's sine against the chief ray's tangent; plan/paraxial.ts lensTiltPhase).
      const c = pointsCentre(source);
      const r = Math.hypot(ax, ay);
      const tp = (a: [number, number]) => lensTiltPhase(lam, r, Math.hypot(Math.sin(a[0]), Math.sin(a[1])));
      return Math.max(...source.points.map((p) => 2 * Math.abs(tp(p.at) - tp(c))));
    }
    return Math.max(...source.points.map((p) => paraxialVariation(k, s, ax, ay, Math.abs(p.at[0]), Math.abs(p.at[1]))));
  }
  // An extended source's farthest point from the aperture's centre is the worst.
  const [hx, hy] = source.kind === 'extended' ? [source.size[0] / 2, source.shape === 'slit' ? 0 : source.size[1] / 2] : [0, 0];
  return paraxialVariation(k, source.distance, ax, ay, Math.abs(source.at[0]) + hx, Math.abs(source.at[1]) + hy);
}

/**
 * The screen leg's paraxial error in the real geometry: the phase the Fresnel kernel drops, peak to
 * peak over the lit aperture, seen from where the light lands on the real screen (each beam's
 * landing point and the edges of its footprint, weighted by the beam's power against the
 * strongest). The flat case's own checks are made at z_eff, where the aperture subtends a wider
 * angle; the real leg is the one the answer depends on. (On the axis the dropped phase over the
 * lit aperture, ka⁴/(8z³), counts in full.)
 */
export function screenPhase(lam: number, z: number, ax: number, ay: number, beams: { landing: [number, number] | null; power: number }[], footprint: [number, number]): number {
  const k = (2 * Math.PI) / lam;
  const peak = Math.max(...beams.map((b) => b.power), 0);
  let worst = Math.abs(droppedPhase(k, z, Math.hypot(ax, ay)));
  for (const b of beams) {
    if (!b.landing || !(peak > 0)) continue;
    const w = b.power / peak;
    // The footprint's centre at the beam's weight, the middles of its edges at a quarter of it: a
    // lit region's edge holds a quarter of its intensity (the straight edge's Fresnel pattern at the
    // geometric shadow, |½|²; Born & Wolf §8.7).
    for (const [u, v, share] of [[0, 0, 1], [-1, 0, 0.25], [1, 0, 0.25], [0, -1, 0.25], [0, 1, 0.25]] as const) {
      const x = b.landing[0] + u * footprint[0];
      const y = b.landing[1] + v * footprint[1];
      worst = Math.max(worst, share * w * Math.min(2 * Math.PI, paraxialVariation(k, z, ax, ay, x, y)));
    }
  }
  return worst;
}

/** Words for the source, for the plan's reasons. */
export function sourceWords(source: CaseSource, lam: number): string {
  const off = (at: [number, number]) => (at[0] === 0 && at[1] === 0 ? 'on the axis' : `at [${len(at[0])}, ${len(at[1])}] across the axis`);
  if (source.kind === 'point') return `point source ${len(source.distance)} before the aperture, ${off(source.at)}`;
  if (source.kind === 'gaussian') {
    const zr = rayleighRange(source.waist, lam);
    return `Gaussian beam of waist radius ${len(source.waist)} ${len(source.waistDistance)} before the aperture (Rayleigh range ${len(zr)}): at the aperture its radius is ${len(beamRadiusAfter(source.waist, lam, source.waistDistance))}`;
  }
  if (source.kind === 'points') {
    const where = source.distance === null ? 'at infinity (directions' : `${len(source.distance)} before the aperture (positions`;
    const list = source.points.map((p) => (source.distance === null ? `[${fmt(p.at[0], 4)}, ${fmt(p.at[1], 4)}] rad` : `[${len(p.at[0])}, ${len(p.at[1])}]`) + ` × ${fmt(p.power, 4)}`).join(', ');
    return `${source.points.length} mutually incoherent points ${where} × power: ${list})`;
  }
  const size = source.shape === 'rectangle' ? `${len(source.size[0])} × ${len(source.size[1])}` : len(source.size[0]);
  return `uniform incoherent ${source.shape} source ${size} wide, ${len(source.distance)} before the aperture, centred ${off(source.at)}`;
}

/**
 * Plans a curved-light case: the flat equivalent planned by `planFlat` (the planner itself), its
 * output axes, window and beams mapped to the real screen, the reasons said, and a warning where
 * either leg is beyond the paraxial limit. The returned plan's case is the real one; computeCase
 * computes `flatLight.plan` and maps the result back.
 */
export function planCurvedLight(c: Case & { source: CaseSource }, planFlat: (c: Case) => Plan, limits: { maxMemoryBytes: number; maxWork: number }): Plan {
  const lam = c.wavelength;
  const facts = apertureFacts(c.aperture);
  const eq = flatEquivalent(c, facts.oneD);
  const inner = planFlat(eq.case);
  const M = eq.magnification;
  const mapAxis = (a: AxisPlan): AxisPlan => ({
    ...a,
    output: { n: a.output.n, start: a.output.start * M, step: a.output.step * M },
    windowHalf: a.windowHalf * M,
    windowCentre: a.windowCentre * M,
  });
  const s = c.source;
  const ill = eq.case.illumination;
  // The lit aperture: the aperture, or three beam radii of a narrower Gaussian.
  const reach = ill.kind === 'gaussian' ? LIMITS.gaussianReach * ill.waist : Infinity;
  const ax = Math.min(facts.halfExtent[0], reach);
  const ay = facts.oneD ? 0 : Math.min(facts.halfExtent[1], reach);
  const beams = inner.beams.map((b) => ({ ...b, landing: b.landing ? ([b.landing[0] * M, b.landing[1] * M] as [number, number]) : null }));
  const footprint: [number, number] = [ax * M, ay * M];
  const fromSource = sourcePhase(s, lam, ax, ay);
  // The screen leg in the real geometry, where it differs from the flat case's: not for light at
  // infinity (M = 1, the flat case is the real one), nor behind a lens, whose own paraxial check
  // (the thin lens's kR⁴/(8f³) and its cone, plan/paraxial.ts lensParaxial) the flat plan makes
  // and which does not depend on the distance.
  const lensed = lensOf(c.aperture) !== null;
  const moves = s.kind === 'points' ? pointShifts(s, c.distance).map((p) => p.shift) : [[0, 0] as [number, number]];
  // Several points at a distance: each one's pattern is the centre's moved, so the scaling's screen
  // leg is checked where each lands. (At infinity nothing is scaled: the flat case's own checks
  // hold for its pattern, and moving it costs the tilt phase counted on the source leg.)
  const landed = beams
    .filter((b) => b.propagates)
    .flatMap((b) => moves.map((m) => ({ ...b, landing: b.landing ? ([b.landing[0] + m[0], b.landing[1] + m[1]] as [number, number]) : null })));
  const ownCheck = lensed || !Number.isFinite(eq.radius);
  const toScreen = ownCheck ? 0 : screenPhase(lam, c.distance, ax, ay, landed, footprint);
  const words = sourceWords(s, lam);
  const scaleWords =
    eq.intensityScale * M > 1 - 1e-12
      ? `divided by M = ${fmt(M, 4)} (a line source along the slits: it does not spread along them)`
      : `divided by M² = ${fmt(M * M, 4)}${facts.oneD ? ' (along the slits the light spreads freely, by M, the same at every y near the axis)' : ''}`;
  const reasons = [
    !Number.isFinite(eq.radius)
    ? `${words}: their light is flat at the aperture, computed at z = ${len(c.distance)} for the centre direction; intensities are relative to the incident irradiance at the aperture's centre (1).`
    : `${words}: its wavefront at the aperture is a sphere of radius R = ${len(eq.radius)}, taken paraxially (the Fresnel scaling theorem, Goodman §4.2): computed as flat light at z_eff = zR/(R + z) = ${len(eq.zEff)} and magnified ×${fmt(M, 4)} (M = (R + z)/R), intensities ${scaleWords}; intensities are relative to the incident irradiance at the aperture's centre (1), and the Fresnel number below is a²/(λ·z_eff) = a²(1/R + 1/z)/λ.`,
    `The flat case's own reasons and warnings below speak of its distance z_eff and its window: lengths across the screen there are M times smaller than on the real screen (this plan's window and result are the real screen's).`,
    `The paraxial phase the scaling drops: ${fmt(fromSource, 2)} rad from the source to the lit aperture (kρ⁴/(8s³) across it, ρ from the source point's foot)${ownCheck ? '; from the aperture to the screen the flat case\'s own checks (below) hold' : ` and ${fmt(toScreen, 2)} rad from the aperture to where the light lands on the screen`} (limit ${LIMITS.paraxialWeightedPhase} rad).`,
  ];
  if (s.kind === 'points') {
    reasons.push(
      `The points are mutually incoherent: their intensities are summed with their shares of the power, each the centre point's pattern moved by ${s.distance === null ? 'z·(tan θ − tan θ_c)' : '−(ξ − ξ_c)·z/s'} (the paraxial shift theorem), the window widened by the largest move; intensities are relative to the points' total irradiance at the aperture's centre.`,
    );
  }
  if (s.kind === 'extended') {
    const b = Math.max(s.size[0], s.shape === 'rectangle' ? s.size[1] : 0);
    reasons.push(
      `The source is incoherent: the intensities of its points are summed, each the on-centre pattern shifted by −(ξ, η)·z/s (the paraxial shift theorem), so the pattern is convolved with the source's outline scaled by z/s = ${fmt(c.distance / s.distance, 4)} (${len(b * (c.distance / s.distance))} across), the window widened by as much; its light is coherent over about λs/b = ${len((lam * s.distance) / b)} at the aperture (van Cittert–Zernike, Born & Wolf §10.4).`,
    );
  }
  const warnings = [...inner.warnings];
  if (fromSource > LIMITS.paraxialWeightedPhase || toScreen > LIMITS.paraxialWeightedPhase) {
    warnings.push(warning('curved-light-paraxial', { source: words, fromSource, toScreen, limit: LIMITS.paraxialWeightedPhase }));
  }
  let error = inner.error;
  if (!error && s.kind === 'gaussian' && facts.oneD) {
    error = `a Gaussian beam with its waist before a 1-D aperture (slits, a grating of lines) spreads along the slits too, which a 1-D computation does not follow: give the aperture as a 2-D one (a rectangle as long as the slit), or put the waist at the aperture`;
  }
  if (!error && s.kind === 'extended' && s.shape === 'slit' && !facts.oneD) {
    error = `a slit source (long along y) smears a 2-D pattern along y without end: use it with a 1-D aperture (slits, a grating of lines), or give a disc or a rectangle source`;
  }
  // An extended source widens the window by its projection's reach (run/source-blur.ts).
  const [hx, hy] = s.kind === 'extended' || s.kind === 'points' ? projectedHalfWidths(s, c.distance) : [0, 0];
  const widen = (a: AxisPlan, half: number): AxisPlan => {
    const p = sourcePad(half, a.output.step);
    return p === 0 ? a : { ...a, output: { n: a.output.n + 2 * p, start: a.output.start - p * a.output.step, step: a.output.step }, windowHalf: a.windowHalf + p * a.output.step };
  };
  const x = widen(mapAxis(inner.x), hx);
  const y = inner.y ? widen(mapAxis(inner.y), hy) : null;
  // The convolution's cost (run/source-blur.ts): one complex FFT grid over the widened window,
  // forward and back, and the widened map beside the computed one.
  let { memoryBytes, work } = inner;
  if (s.kind === 'extended' || s.kind === 'points') {
    const cells = x.output.n * (y ? y.output.n : 1);
    const grid = nextFastFftSize(x.output.n) * (y ? nextFastFftSize(y.output.n) : 1);
    memoryBytes += 16 * grid + 16 * cells;
    work += 2 * 5 * grid * Math.log2(Math.max(2, grid));
    if (!error && memoryBytes > limits.maxMemoryBytes) error = `the source's spread widens the window to ${x.output.n}${y ? ` × ${y.output.n}` : ''} samples, and the case to about ${bytes(memoryBytes)}, over the ${bytes(limits.maxMemoryBytes)} limit (--max-memory): give a narrower window, or a smaller source`;
    if (!error && work > limits.maxWork) error = `the source's spread widens the window to ${x.output.n}${y ? ` × ${y.output.n}` : ''} samples, and the case to about ${seconds(work)} of computing, over the ${seconds(limits.maxWork)} limit (--accept-large)`;
  }
  return {
    ...inner,
    case: c,
    x,
    y,
    memoryBytes,
    work,
    beams,
    ...(inner.beamRadius !== undefined ? { beamRadius: inner.beamRadius * M } : {}),
    reasons: [...reasons, ...inner.reasons],
    warnings,
    flatLight: { plan: inner, magnification: M, intensityScale: eq.intensityScale },
    ...(error ? { error } : {}),
  };
}

/** An extended source's outline projected onto the screen: half widths along x and y (m), scaled by z/s. */
export function projectedHalfWidths(source: Extract<CaseSource, { kind: 'extended' | 'points' }>, z: number): [number, number] {
  // Points: the largest move along each axis.
  if (source.kind === 'points') {
    const shifts = pointShifts(source, z);
    return [Math.max(...shifts.map((p) => Math.abs(p.shift[0]))), Math.max(...shifts.map((p) => Math.abs(p.shift[1])))];
  }
  const scale = z / source.distance;
  const hx = (source.size[0] / 2) * scale;
  const hy = source.shape === 'slit' ? 0 : (source.shape === 'disc' ? source.size[0] : source.size[1]) / 2 * scale;
  return [hx, hy];
}

/**
 * Cells the window is widened by on each side for a projected half width `half` at pitch `step`:
 * the kernel reaches the cell m·step whose near edge (m − ½)·step is inside it.
 */
export function sourcePad(half: number, step: number): number {
  return half > 0 && step > 0 ? Math.ceil(half / step + 0.5) : 0;
}
