// Planning planes in sequence (a lens, a pinhole at its focus, a screen): where the light is at
// each plane, the region sampled there, each plane's pitch, the screen's window and pitch, what it
// costs, and which checks hold. The light is carried plane to plane by the Fresnel integral
// (optics/sequence.ts), whose curvatures are analytic: only what is left of them over each lit
// region, the field's own detail and the next window's reach must be sampled.
//
// Where the light goes is tracked per axis as a ray bundle with diffraction: from a lit region of
// half width R about c, with directions within ±s of the chief direction θ, a lens of focal length f
// bending by −ξ/f, the light at distance z lies within c(1 − z/f) + zθ ± (R|1 − z/f| + z(s + δ)),
// δ the diffraction half-angle: 10λ/D for a hard-edged region or feature of size D (an Airy
// pattern's encircled energy leaves 2λ/(π²Dθ) outside θ, Born & Wolf §8.5.2: 2 % at 10λ/D, the
// window target), 3λ/(πw) for a Gaussian beam of radius w (e⁻⁹ of its amplitude beyond). A plane
// whose element is narrower than that is sampled over the element only: what falls outside is
// blocked there. Elsewhere the region comes from the estimate and the light it misses is measured.
import { apertureFacts, lensOf, phaseFrequencyOf } from '../elements/registry.js';
import { SIZE } from '../job/quantities.js';
import { centredAxis, type Axis } from '../optics/field.js';
import { legWork } from '../optics/sequence.js';
import { directionCosines } from '../optics/source.js';
import { warning } from '../warnings/catalogue.js';
import { BASELINE_MEMORY } from './costs.js';
import { LIMITS } from './limits.js';
import { paraxialVariation } from './paraxial.js';
import { clipRegion, extentOf, lensRegion, propagateRegion, rectangleRegion, spreadRegion } from './phase-space.js';
import type { AxisPlan, Case, Checks, Plan, Regime, SequenceLeg, Warning } from './types.js';
import { bytes, fmt, len, seconds } from './words.js';
import type { Aperture } from '../optics/aperture.js';

/**
 * Diffraction half-angle of a hard-edged region or feature of size D, in λ/D: 10 for the screen
 * (2 % outside; see above), 50 for a plane between (0.4 %): what a plane between misses is missing
 * from everything after it, and its tails still reach the axis downstream (measured: a 1 mm opening
 * split into gaps of 20 and 30 mm was 2.4 % of the peak off on the axis with 10λ/D, within 0.3 %
 * with 50λ/D).
 */
const HARD_EDGE_SPREAD = { screen: 10, plane: 50 };
/** A plane between whose sampled region missed more than this fraction of the light arriving is warned. */
export const PLANE_LOSS_WARN = 0.01;
/** Samples per period of the highest frequency a leg's sum must hold (the alias-free limit is 1). */
const LEG_OVERSAMPLING = 2;
/** Screen pitch: this many samples per period of the intensity's highest frequency 2R/(λz). */
const SCREEN_OVERSAMPLING = 4;
/** Largest number of samples per axis of any plane. */
const MAX_PLANE_SAMPLES = 8192;

export interface SequenceOptions {
  maxMemoryBytes: number;
  maxWork: number;
}

interface PlaneState {
  aperture: Aperture;
  /** Lit region at this plane (sampled here): centre and half width per axis. */
  centre: [number, number];
  half: [number, number];
  /**
   * Where most of the light is, for the paraxial check (which weighs where light lands in earnest,
   * not its tails): the core's half width here (two beam radii of a Gaussian; its rays spread by
   * the main diffraction lobe's half-power angle 0.51λ/D), and where the core lands at the next
   * plane or the screen, per axis [lo, hi].
   */
  coreHalf: [number, number];
  landing?: [[number, number], [number, number]];
  /** Diffraction half-angle this plane adds (its edges, features, phase): λ/D for edges (diffractionEdge), else the angle itself. */
  diffraction: [number, number];
  diffractionEdge: boolean;
  /** V's frequency band about zero (1/m): the light's own detail. */
  band: [number, number];
  /** κ and β of the arriving light (optics/sequence.ts). */
  curvature: number;
  carrier: [number, number];
  /** The region came from the light's estimate (narrower than the element): its loss is measured. */
  fromLight: boolean;
  focal: number | null;
}

/** A plan for a case with planes in sequence, or a plan that carries why it cannot be computed. */
type PlanBase = Pick<Plan, 'case' | 'babinet' | 'beams' | 'options'>;

export function planSequence(c: Case, opts: SequenceOptions): Plan {
  const lam = c.wavelength;
  const k = (2 * Math.PI) / lam;
  const warnings: Warning[] = [];
  const reasons: string[] = [];
  const base: PlanBase = { case: c, babinet: false, beams: [], options: [] };
  const elements = [c.aperture, ...(c.planes ?? []).map((p) => p.aperture)];
  const gaps = [...(c.planes ?? []).map((p) => p.after), c.distance];
  const refuse = (why: string): Plan => refused(base, why, reasons, warnings);
  for (const [i, a] of elements.entries()) {
    const f = apertureFacts(a);
    if (f.oneD) return refuse(`plane ${i + 1} (${f.description}) is infinitely long: planes in sequence take elements of finite size in both directions (give the slit or grating a length)`);
    if (f.minFeature / lam < LIMITS.vectorFeature) warnings.push(warning('near-wavelength', { cause: 'feature', feature: f.minFeature, ratio: f.minFeature / lam }));
  }
  for (const z of gaps) if (z < LIMITS.vectorDistance * lam) warnings.push(warning('near-wavelength', { cause: 'screen', ratio: z / lam }));

  // Plane 1: the job's aperture under its illumination.
  const ill = c.illumination;
  const waist = ill.kind === 'gaussian' ? ill.waist : Infinity;
  const first = elements[0]!;
  const f0 = apertureFacts(first);
  const reach = (h: number) => Math.sqrt(h * h + LIMITS.gaussianReach ** 2 * waist * waist);
  const unbounded = (h: number) => !(h < SIZE.max / 2);
  if (!Number.isFinite(waist) && (first.opaque || unbounded(Math.max(...f0.halfExtent)))) {
    return refuse(`plane 1 (${f0.description}) is unbounded in a plane wave: planes in sequence need light of finite extent (a Gaussian beam, or an element of finite size first)`);
  }
  const litHalf = (h: number) => (first.opaque ? reach(h) : Math.min(h, reach(f0.nearestOpen)));
  const half0: [number, number] = [litHalf(f0.halfExtent[0]), litHalf(f0.halfExtent[1])];
  const [alpha, beta] = directionCosines(ill);
  const smooth = Number.isFinite(waist) && !first.opaque && half0.every((h, i) => h < f0.halfExtent[i]!);
  const planes: PlaneState[] = [
    {
      aperture: first,
      centre: [0, 0],
      half: half0,
      coreHalf: Number.isFinite(waist) ? [Math.min(half0[0], 2 * waist), Math.min(half0[1], 2 * waist)] : half0,
      ...diffractionOf(first, half0, smooth ? waist : null, lam),
      band: Number.isFinite(waist) ? [3 / (Math.PI * waist), 3 / (Math.PI * waist)] : [0, 0],
      curvature: 0,
      carrier: [alpha / lam, beta / lam],
      fromLight: false,
      focal: lensOf(first)?.focal ?? null,
    },
  ];
  // Each later plane and the screen: where the light lands (its rays in phase space, per axis:
  // plan/phase-space.ts), and the region sampled there.
  const screenWindow: { centre: [number, number]; half: [number, number] } = { centre: [0, 0], half: [0, 0] };
  const dirs = [alpha, beta];
  let full = [0, 1].map((i) => rectangleRegion(-half0[i]!, half0[i]!, dirs[i]!, dirs[i]!));
  let core = [0, 1].map((i) => rectangleRegion(-planes[0]!.coreHalf[i]!, planes[0]!.coreHalf[i]!, dirs[i]!, dirs[i]!));
  for (let j = 0; j < gaps.length; j++) {
    const p = planes[j]!;
    const z = gaps[j]!;
    const toScreen = j === gaps.length - 1;
    const multiple = p.diffractionEdge ? (toScreen ? HARD_EDGE_SPREAD.screen : HARD_EDGE_SPREAD.plane) : 1;
    // Behind the plane: its lens bends the rays, its edges and phase spread them; then the gap.
    full = full.map((r, i) => propagateRegion(spreadRegion(p.focal === null ? r : lensRegion(r, p.focal), p.diffraction[i]! * multiple), z));
    core = core.map((r, i) => propagateRegion(spreadRegion(p.focal === null ? r : lensRegion(r, p.focal), lobe(p.coreHalf[i]!, lam)), z));
    const lit = full.map(extentOf);
    const coreLit = core.map(extentOf);
    p.landing = [0, 1].map((i) => coreLit[i] ?? lit[i] ?? [0, 0]) as [[number, number], [number, number]];
    const next = {
      band: [p.half[0] / (lam * z), p.half[1] / (lam * z)] as [number, number],
      curvature: 1 / (lam * z),
      carrier: [-p.centre[0] / (lam * z), -p.centre[1] / (lam * z)] as [number, number],
    };
    if (toScreen) {
      const lo = lit.map((e) => e![0]);
      const hi = lit.map((e) => e![1]);
      screenWindow.centre = [(lo[0]! + hi[0]!) / 2, (lo[1]! + hi[1]!) / 2];
      const light: [number, number] = [(hi[0]! - lo[0]!) / 2, (hi[1]! - lo[1]!) / 2];
      // A round spot gets a square window, as a single element's does.
      const w = Math.max(light[0], light[1]);
      screenWindow.half = c.window ? [c.window[0] / 2, c.window[1] / 2] : [w, w];
      break;
    }
    const a = elements[j + 1]!;
    const f = apertureFacts(a);
    // The element's own extent (about the axis) bounds the region, unless it is an obstacle or unbounded.
    const bounded = !a.opaque && !unbounded(Math.max(...f.halfExtent));
    const lo = [0, 1].map((i) => (bounded ? Math.max(lit[i]![0], -f.halfExtent[i]!) : lit[i]![0]));
    const hi = [0, 1].map((i) => (bounded ? Math.min(lit[i]![1], f.halfExtent[i]!) : lit[i]![1]));
    if (!(hi[0]! > lo[0]!) || !(hi[1]! > lo[1]!)) {
      warnings.push(warning('planes-no-light', { plane: j + 2 }));
      // Sample the element anyway: what passes is the far tail of the light.
      for (const i of [0, 1]) {
        lo[i] = -f.halfExtent[i]!;
        hi[i] = f.halfExtent[i]!;
      }
      full = [0, 1].map((i) => rectangleRegion(lo[i]!, hi[i]!, -1, 1));
      core = full;
    } else {
      full = full.map((r, i) => clipRegion(r, lo[i]!, hi[i]!));
      // (A core the element misses leaves the paraxial check the whole light instead.)
      core = core.map((r, i) => {
        const kept = clipRegion(r, lo[i]!, hi[i]!);
        return kept.length ? kept : full[i]!;
      });
    }
    const half: [number, number] = [(hi[0]! - lo[0]!) / 2, (hi[1]! - lo[1]!) / 2];
    const fromLight = !bounded || half.some((h, i) => h < f.halfExtent[i]! * (1 - 1e-9));
    const coreAt = core.map(extentOf);
    planes.push({
      aperture: a,
      centre: [(hi[0]! + lo[0]!) / 2, (hi[1]! + lo[1]!) / 2],
      half,
      ...next,
      coreHalf: [0, 1].map((i) => Math.max((coreAt[i]![1] - coreAt[i]![0]) / 2, 1e-3 * half[i]!)) as [number, number],
      // An element wider than the light adds no edges to it, only its features and phase.
      ...diffractionOf(a, fromLight && bounded ? [Infinity, Infinity] : half, null, lam),
      fromLight,
      focal: lensOf(a)?.focal ?? null,
    });
  }

  // Pitches: each plane's from the leg that leaves it (optics/sequence.ts: the sum is alias-free
  // while the sampled integrand's band plus the window's reach stays below 1/Δ).
  const inputs: [Axis, Axis][] = [];
  const rules: string[] = [];
  for (let j = 0; j < planes.length; j++) {
    const p = planes[j]!;
    const z = gaps[j]!;
    const out = j + 1 < planes.length ? planes[j + 1]! : { centre: screenWindow.centre, half: screenWindow.half };
    const lens = lensOf(p.aperture);
    const c0 = p.curvature + (1 / z - (p.focal === null ? 0 : 1 / p.focal)) / lam;
    const phase = lens ? lens.pupilFrequency(lam) : phaseFrequencyOf(p.aperture, lam, Math.max(...p.half));
    const f = apertureFacts(p.aperture);
    const axes = [0, 1].map((i) => {
      const h = p.carrier[i]! + c0 * p.centre[i]!;
      const reachOut = (Math.abs(out.centre[i]! - lam * z * h) + out.half[i]!) / (lam * z);
      const content = p.band[i]! + phase + Math.abs(c0) * p.half[i]!;
      let pitch = 1 / (LEG_OVERSAMPLING * (content + reachOut));
      let rule = `${LEG_OVERSAMPLING}× the highest frequency the sum must hold (${fmt((content + reachOut) / 1e3, 3)} /mm: the light's detail, the residual curvature and the next window's reach)`;
      // Every feature the light meets: the element's smallest, where it is no wider than the lit region.
      const feature = f.minFeature / LIMITS.featureSamples2D;
      if (feature < pitch && f.minFeature < 2 * Math.max(...p.half) * 1.0001) {
        pitch = feature;
        rule = `${LIMITS.featureSamples2D} cells across the smallest feature (${len(f.minFeature)})`;
      }
      const n = Math.max(LIMITS.minSamples2D / 2, 2 * Math.ceil(p.half[i]! / pitch) + 1);
      return { axis: centredAxis(n, (2 * p.half[i]!) / n, p.centre[i]!), rule };
    });
    // Cells that tile the region exactly: n cells of width 2R/n, centred on the region.
    inputs.push([axes[0]!.axis, axes[1]!.axis]);
    rules.push(`plane ${j + 1}: ${axes[0]!.axis.n} × ${axes[1]!.axis.n} cells of ${len(axes[0]!.axis.step)} over ${len(2 * p.half[0])} × ${len(2 * p.half[1])} (${axes[0]!.rule})`);
  }
  // The screen: the intensity's highest frequency is 2R/(λz) for light from a region of half width R.
  const last = planes[planes.length - 1]!;
  const zLast = gaps[gaps.length - 1]!;
  const nyquist = [0, 1].map((i) => (lam * zLast) / (4 * last.half[i]!));
  const screenAxes = [0, 1].map((i) => {
    const wanted = Math.max(LIMITS.minOutput2D, Math.ceil((2 * screenWindow.half[i]! * SCREEN_OVERSAMPLING) / (2 * nyquist[i]!)) + 1);
    const n = Math.min(LIMITS.maxOutput2D, wanted | 1);
    return centredAxis(n, (2 * screenWindow.half[i]!) / (n - 1), screenWindow.centre[i]!);
  }) as [Axis, Axis];
  const coarse = [0, 1].find((i) => screenAxes[i]!.step > nyquist[i]! * 1.0000001);
  if (coarse !== undefined) warnings.push(warning('output-undersampled', { pitch: screenAxes[coarse]!.step, nyquist: nyquist[coarse]!, window: 2 * screenWindow.half[coarse]! }));

  // Legs, their cost and their paraxial error.
  const legs: SequenceLeg[] = [];
  let work = 0;
  let memory = 0;
  for (let j = 0; j < planes.length; j++) {
    const p = planes[j]!;
    const z = gaps[j]!;
    const input = inputs[j]!;
    const output = j + 1 < planes.length ? inputs[j + 1]! : screenAxes;
    const w = legWork(input[0].n, input[1].n, output[0].n, output[1].n);
    work += w;
    memory = Math.max(memory, 16 * (2 * input[0].n * input[1].n + output[0].n * input[0].n + output[1].n * input[1].n + input[1].n * output[0].n + output[0].n * output[1].n));
    // Where the light lands in earnest (its core), seen from the lit region: the variation there of
    // the phase the Fresnel kernel drops.
    const land = p.landing!;
    const x = Math.max(Math.abs(land[0][0] - p.centre[0]), Math.abs(land[0][1] - p.centre[0]));
    const y = Math.max(Math.abs(land[1][0] - p.centre[1]), Math.abs(land[1][1] - p.centre[1]));
    // Along each axis in turn (a round bundle's edge, not the corner of its box).
    const cx = Math.abs((land[0][0] + land[0][1]) / 2 - p.centre[0]);
    const cy = Math.abs((land[1][0] + land[1][1]) / 2 - p.centre[1]);
    const along = (f: (x: number, y: number) => number) => Math.max(f(x, cy), f(cx, y));
    // Behind a lens the paraxial thin lens and the Fresnel kernel drop the same order (an ideal
    // lens's field, as the single-plane lens form says): up to its focus nothing is counted; beyond
    // it the light spreads from the focal spot (half width about λ/(2·NA)), and the kernel's error is
    // counted from there.
    let paraxialPhase: number;
    if (p.focal === null) paraxialPhase = along((x, y) => paraxialVariation(k, z, p.coreHalf[0], p.coreHalf[1], x, y));
    else if (p.focal > 0 && z > p.focal) {
      const spot = (i: number) => (lam * p.focal!) / (2 * Math.max(p.half[i]!, 1e-300));
      paraxialPhase = along((x, y) => paraxialVariation(k, z - p.focal!, spot(0), spot(1), x, y));
    } else paraxialPhase = 0;
    legs.push({ z, input, output, focal: p.focal, paraxialPhase, windowFromLight: j + 1 < planes.length ? planes[j + 1]!.fromLight : !c.window });
    const name = j + 1 < planes.length ? `plane ${j + 1} to plane ${j + 2}` : `plane ${j + 1} to the screen`;
    if (paraxialPhase > LIMITS.paraxialPhase) warnings.push(warning('planes-paraxial', { leg: name, phase: paraxialPhase, limit: LIMITS.paraxialPhase }));
    reasons.push(`${name}, ${len(z)}: ${input[0].n} × ${input[1].n} samples summed onto ${output[0].n} × ${output[1].n} points (${seconds(w)})` + (p.focal !== null ? `; the lens (f = ${len(p.focal)}) folded into the integral's curvature, not sampled.` : '.'));
  }
  reasons.push(...rules);
  const lens0 = planes[0]!.focal;
  if (lens0 !== null) {
    // The thin lens is paraxial, as in the single-plane lens form.
    const r = Math.max(...planes[0]!.coreHalf);
    const phase = (k * r ** 4) / (8 * Math.abs(lens0) ** 3);
    if (phase > LIMITS.paraxialPhase) warnings.push(warning('paraxial-lens', { phase, limit: LIMITS.paraxialPhase }));
  }
  const memoryBytes = BASELINE_MEMORY + memory + 8 * screenAxes[0].n * screenAxes[1].n * 3;
  let error: string | undefined;
  const biggest = Math.max(...inputs.flatMap((a) => [a[0].n, a[1].n]));
  if (biggest > MAX_PLANE_SAMPLES) {
    error = `a plane needs ${biggest} samples per axis (at most ${MAX_PLANE_SAMPLES}): a gap where wide light barely spreads (a collimated beam, a screen in the near field of the plane before) takes a direct sum this form cannot afford; put the screen where the light comes to a focus (an image plane), or compute that part as a job of its own`;
  }
  else if (memoryBytes > opts.maxMemoryBytes) error = `the planes need about ${bytes(memoryBytes)}, over the ${bytes(opts.maxMemoryBytes)} limit (--max-memory)`;
  else if (work > opts.maxWork) error = `the planes need about ${seconds(work)} of computing, over the ${seconds(opts.maxWork)} limit (--accept-large)`;

  const nf = (last.half[0] ** 2 / (lam * zLast)) * (last.focal === null ? 1 : Math.abs(1 - zLast / last.focal));
  const regime: Regime = nf > 1 ? 'near-field' : nf > 1 / 8 ? 'transition' : 'far-field';
  reasons.unshift(
    `${elements.length} planes in sequence, carried plane to plane by the Fresnel integral (paraxial) with each plane's curvature in closed form; the screen is ${len(zLast)} behind plane ${elements.length} (Fresnel number there ${fmt(nf)}).`,
  );
  const axisPlan = (i: number): AxisPlan => ({
    inputPitch: inputs[0]![i]!.step,
    inputSamples: inputs[0]![i]!.n,
    paddedSamples: inputs[0]![i]!.n,
    output: screenAxes[i]!,
    apertureHalf: planes[0]!.half[i]!,
    windowHalf: screenWindow.half[i]!,
    windowCentre: screenWindow.centre[i]!,
    requiredPitch: inputs[0]![i]!.step,
    pitchRule: 'planes in sequence (see the reasons)',
  });
  const checks: Checks = {
    fresnelNumbers: [last.half[0] ** 2 / (lam * zLast), last.half[1] ** 2 / (lam * zLast)],
    effectiveFresnelNumber: nf,
    farFieldDistance: (2 * (2 * Math.max(...last.half)) ** 2) / lam,
    paraxialPhaseError: Math.max(...legs.map((l) => l.paraxialPhase)),
    goodmanRatio: 0,
    farFieldPhaseError: Math.PI * nf,
    farFieldPeakError: 0,
    windowLossEstimate: c.window ? 0 : LIMITS.windowLossTarget,
    featureOverWavelength: Math.min(...elements.map((a) => apertureFacts(a).minFeature)) / lam,
    samplesPerFeature: apertureFacts(first).minFeature / Math.max(inputs[0]![0].step, inputs[0]![1].step),
  };
  return {
    ...base,
    regime,
    method: 'fresnel',
    form: 'planes',
    layout: 'two-d',
    babinet: false,
    x: axisPlan(0),
    y: axisPlan(1),
    checks,
    reasons,
    warnings,
    memoryBytes,
    work,
    options: [{ method: 'fresnel', form: 'planes', valid: true, memoryBytes, work, fits: !error }],
    sequence: { legs },
    ...(error ? { error } : {}),
  };
}

/** The half-power angle of the main diffraction lobe of a region of half width h (an Airy pattern's, 0.51λ/D). */
function lobe(h: number, lam: number): number {
  return (0.51 * lam) / (2 * h);
}

/** A plane's diffraction half-angle per axis: its hard edges (or features) and its phase. */
function diffractionOf(a: Aperture, half: [number, number], gaussian: number | null, lam: number): { diffraction: [number, number]; diffractionEdge: boolean } {
  const f = apertureFacts(a);
  const lens = lensOf(a);
  const phase = lens ? lens.pupilFrequency(lam) : phaseFrequencyOf(a, lam, Math.max(...half.filter(Number.isFinite), 0));
  // A phase (a grating's, a wavefront error's) sends light out to λ times its local frequency: that
  // is added to the edges' spread as an angle (divided by the edge multiple it will be scaled by).
  const diffraction = [0, 1].map((i) => {
    if (gaussian !== null) return (LIMITS.gaussianReach * lam) / (Math.PI * gaussian) + lam * phase;
    const edge = lam / Math.min(2 * half[i]!, lens ? Infinity : f.minFeature, 2 * (f.halfExtent[i] ?? Infinity));
    return (Number.isFinite(edge) ? edge : 0) + (lam * phase) / HARD_EDGE_SPREAD.screen;
  }) as [number, number];
  return { diffraction, diffractionEdge: gaussian === null };
}

function refused(base: PlanBase, why: string, reasons: string[], warnings: Warning[]): Plan {
  const axis = centredAxis(1, 1, 0);
  const a: AxisPlan = { inputPitch: 1, inputSamples: 1, paddedSamples: 1, output: axis, apertureHalf: 0, windowHalf: 0, windowCentre: 0, requiredPitch: 1, pitchRule: '' };
  const checks: Checks = {
    fresnelNumbers: [0, 0],
    effectiveFresnelNumber: 0,
    farFieldDistance: 0,
    paraxialPhaseError: 0,
    goodmanRatio: 0,
    farFieldPhaseError: 0,
    farFieldPeakError: 0,
    windowLossEstimate: 0,
    featureOverWavelength: 0,
    samplesPerFeature: 0,
  };
  return { ...base, regime: 'far-field', method: 'fresnel', form: 'planes', layout: 'two-d', babinet: false, x: a, y: a, checks, reasons, warnings, memoryBytes: 0, work: 0, error: why };
}
