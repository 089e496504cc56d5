// Planning planes in sequence (a lens, a pinhole at its focus, a screen): where the light is at
// each plane, the region sampled there, each plane's pitch, the screen's window and pitch, what it
// costs, and which checks hold. The light is carried plane to plane by the Fresnel integral
// (optics/sequence.ts), whose curvatures are analytic: only what is left of them over each lit
// region, the field's own detail and the next window's reach must be sampled; or, in a gap where
// wide light barely spreads (the next window's reach is then huge), by the exact angular spectrum
// on an FFT grid holding both ends, whichever costs less (see 'Each leg is summed' below).
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
import { nextFastFftSize } from '../optics/fft.js';
import { legWork, spectrumLegWork } from '../optics/sequence.js';
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
/**
 * The same for a sum from a plane whose element has edges in the light: a hard edge's spectrum has
 * no end, and its copies the sum folds back (at 1/Δ) fall off only as 1/f, so at 2 per period the
 * patterns after an opening seen in the near field of the next were 2–6 % off (random sequences
 * against nested Hankel integrals, test/physics/random-sequences.test.ts); 4 kept them within 0.5 %.
 */
const EDGE_SUM_OVERSAMPLING = 4;
/** Screen pitch: this many samples per period of the intensity's highest frequency 2R/(λz). */
const SCREEN_OVERSAMPLING = 4;
/** Largest number of samples per axis of any plane. */
const MAX_PLANE_SAMPLES = 8192;
/** Largest FFT grid per axis of a leg carried by the angular spectrum. */
const MAX_SPECTRUM_SAMPLES = 8192;

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
  /**
   * The element's edges or features lie in the light: its area-averaged cells are freed of their
   * response (spectral.ts compensateCellResponse), on a region widened by a margin for that.
   */
  edges: boolean;
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
      edges: !smooth,
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
      // An element wider than the light adds no edges to it, only its features (those narrower
      // than the light: the outline's size is not one) and phase.
      ...diffractionOf(a, fromLight && bounded ? [Infinity, Infinity] : half, null, lam, fromLight && bounded ? Math.max(...half) : Infinity),
      fromLight,
      edges: !(fromLight && bounded) || f.minFeature < 2 * Math.max(...half),
      focal: lensOf(a)?.focal ?? null,
    });
  }

  // Each leg is summed (optics/sequence.ts propagateLeg: the Fresnel integral's two matrix products
  // onto the next region's own points) or carried by the angular spectrum (propagateLegSpectrum) on
  // an FFT grid that both ends' samples lie on, whichever costs less. The sum's pitch must hold the
  // next window's reach (the kernel's frequency between the regions), which in a gap where wide
  // light barely spreads is huge; the spectrum's need only hold the light's own detail, but its grid
  // spans both regions and the spread between.
  const P = planes.length;
  let sumPitch = planes.map((_, j) => sumPitchOf(j));
  let spectrumPitch = planes.map((_, j) => spectrumPitchOf(j));
  // The screen's points for a summed last leg: the intensity's highest frequency is 2R/(λz) for
  // light from a region of half width R.
  const last = planes[P - 1]!;
  const zLast = gaps[gaps.length - 1]!;
  const sumNyquist = [0, 1].map((i) => (lam * zLast) / (4 * last.half[i]!));
  const sumScreen = [0, 1].map((i) => {
    const wanted = Math.max(LIMITS.minOutput2D, Math.ceil((2 * screenWindow.half[i]! * SCREEN_OVERSAMPLING) / (2 * sumNyquist[i]!)) + 1);
    const n = Math.min(LIMITS.maxOutput2D, wanted | 1);
    return centredAxis(n, (2 * screenWindow.half[i]!) / (n - 1), screenWindow.centre[i]!);
  }) as [Axis, Axis];
  const regionOf = (j: number, i: number): [number, number] => (j < P ? [planes[j]!.centre[i]! - planes[j]!.half[i]!, planes[j]!.centre[i]! + planes[j]!.half[i]!] : [screenWindow.centre[i]! - screenWindow.half[i]!, screenWindow.centre[i]! + screenWindow.half[i]!]);
  const cells = (j: number, i: number, pitch: number) => Math.max(LIMITS.minSamples2D / 2, 2 * Math.ceil(planes[j]!.half[i]! / pitch) + 1);
  // Which form each leg takes, and the step each plane's samples need, from the last leg back: a
  // spectrum leg puts both its ends on one lattice (the finer need of the two), so choosing it may
  // refine the planes after it, and what that adds to their legs is part of its cost.
  const forms: SequenceLeg['form'][] = new Array(P);
  const need: [number, number][] = new Array(P);
  const legCost = (j: number, form: SequenceLeg['form'], step: [number, number]): number => {
    if (form === 'sum') {
      const nIn = [0, 1].map((i) => cells(j, i, step[i]!));
      const nOut = [0, 1].map((i) => (j + 1 < P ? cells(j + 1, i, need[j + 1]![i]!) : sumScreen[i]!.n));
      return Math.max(...nIn) > MAX_PLANE_SAMPLES ? Infinity : legWork(nIn[0]!, nIn[1]!, nOut[0]!, nOut[1]!);
    }
    const grid = [0, 1].map((i) => spectrumGridSamples(j, i, step[i]!));
    return Math.max(...grid) > MAX_SPECTRUM_SAMPLES ? Infinity : spectrumLegWork(grid[0]!, grid[1]!);
  };
  /** What refining plane j's step to `step` adds to the legs from it on. */
  const refineCost = (j: number, step: [number, number]): number => {
    if (j >= P || step.every((s, i) => s >= need[j]![i]!)) return 0;
    const finer = [0, 1].map((i) => Math.min(step[i]!, need[j]![i]!)) as [number, number];
    const extra = legCost(j, forms[j]!, finer) - legCost(j, forms[j]!, need[j]!);
    return extra + (forms[j] === 'spectrum' ? refineCost(j + 1, finer) : 0);
  };
  const decide = () => {
    for (let j = P - 1; j >= 0; j--) {
      const sumStep = sumPitch[j]!.pitch;
      const spectrumStep = [0, 1].map((i) => Math.min(spectrumPitch[j]!.pitch[i]!, j + 1 < P ? need[j + 1]![i]! : Infinity)) as [number, number];
      const sumWork = legCost(j, 'sum', sumStep);
      const spectrumWork = legCost(j, 'spectrum', spectrumStep) + refineCost(j + 1, spectrumStep);
      forms[j] = spectrumWork < sumWork ? 'spectrum' : 'sum';
      need[j] = forms[j] === 'spectrum' ? spectrumStep : sumStep;
    }
  };
  // A spectrum leg may hand its field on as it computed it (no curvature, its carrier, the light's
  // own detail) instead of in the sums' form (curvature 1/(λz), detail R/(λz) for light from a
  // region of half width R): where the light stays wide that is far smoother (a collimated beam
  // through several planes). Every leg where that is smoother is first taken so, which only a
  // spectrum leg can do; a leg then decided as a sum hands its field on in the sums' form after
  // all, and the forms are decided again with the planes after it as they then are.
  const analytic = planes.map((p) => ({ band: p.band, curvature: p.curvature, carrier: p.carrier }));
  const flat: boolean[] = new Array(P).fill(false);
  const applyFlat = (choose: boolean) => {
    for (let j = 0; j < P; j++) Object.assign(planes[j]!, analytic[j]!);
    for (let j = 0; j + 1 < P; j++) {
      const p = planes[j]!;
      const q = planes[j + 1]!;
      const cT = residualCurvature(p);
      const detail = [0, 1].map((i) => spectrumContent(j, i, cT, false));
      if (choose) flat[j] = detail.every((d, i) => d < q.band[i]! + Math.abs(q.curvature) * q.half[i]!);
      if (!flat[j]) continue;
      q.band = [detail[0]!, detail[1]!];
      q.curvature = 0;
      q.carrier = [p.carrier[0] + cT * p.centre[0], p.carrier[1] + cT * p.centre[1]];
    }
  };
  applyFlat(true);
  for (let round = 0; round <= P; round++) {
    sumPitch = planes.map((_, j) => sumPitchOf(j));
    spectrumPitch = planes.map((_, j) => spectrumPitchOf(j));
    decide();
    const wrong = flat.map((f, j) => f && forms[j] === 'sum');
    if (!wrong.some(Boolean)) break;
    wrong.forEach((w, j) => w && (flat[j] = false));
    applyFlat(false);
  }
  const inputs: [Axis, Axis][] = [];
  const rules: string[] = [];
  for (let j = 0; j < P; j++) {
    const p = planes[j]!;
    const onLattice = forms[j] === 'spectrum' || (j > 0 && forms[j - 1] === 'spectrum');
    // A margin of cells for the cell response's correction to ring out in (limits.ts).
    const margin = p.edges ? LIMITS.compensationMargin : 0;
    const axes = [0, 1].map((i) => {
      if (!onLattice) {
        // Cells that tile the region exactly: n cells of width 2R/n, centred on the region.
        const n = cells(j, i, need[j]![i]!);
        return centredAxis(n + 2 * margin, (2 * p.half[i]!) / n, p.centre[i]!);
      }
      const step = j > 0 && forms[j - 1] === 'spectrum' ? inputs[j - 1]![i]!.step : need[j]![i]!;
      const [lo, hi] = regionOf(j, i);
      return latticeAxis(lo - margin * step, hi + margin * step, step, 1);
    });
    inputs.push([axes[0]!, axes[1]!]);
    const rule = (forms[j] === 'spectrum' ? spectrumPitch : sumPitch)[j]!.rule[0]!;
    rules.push(`plane ${j + 1}: ${axes[0]!.n} × ${axes[1]!.n} cells of ${len(axes[0]!.step)} over ${len(2 * p.half[0])} × ${len(2 * p.half[1])} (${rule}${onLattice && need[j]![0]! < (forms[j] === 'spectrum' ? spectrumPitch : sumPitch)[j]!.pitch[0]! ? '; finer, shared with a plane joined by the angular spectrum' : ''})`);
  }
  // The screen: a summed leg's own points; a spectrum leg's lattice, strided to at most the
  // largest map (the intensity is then checked against its highest frequency, 2× the light's).
  const spectrumLast = forms[P - 1] === 'spectrum';
  const screenAxes = spectrumLast
    ? ([0, 1].map((i) => latticeAxis(...regionOf(P, i), inputs[P - 1]![i]!.step, LIMITS.maxOutput2D)) as [Axis, Axis])
    : sumScreen;
  const nyquist = spectrumLast ? spectrumPitch[P - 1]!.nyquist : sumNyquist;
  const coarse = [0, 1].find((i) => screenAxes[i]!.step > nyquist[i]! * 1.0000001);
  if (coarse !== undefined) warnings.push(warning('output-undersampled', { pitch: screenAxes[coarse]!.step, nyquist: nyquist[coarse]!, window: 2 * screenWindow.half[coarse]! }));

  // Legs, their cost and their paraxial error.
  const legs: SequenceLeg[] = [];
  let work = 0;
  let memory = 0;
  for (let j = 0; j < P; j++) {
    const p = planes[j]!;
    const z = gaps[j]!;
    const input = inputs[j]!;
    const output = j + 1 < P ? inputs[j + 1]! : screenAxes;
    const name = j + 1 < P ? `plane ${j + 1} to plane ${j + 2}` : `plane ${j + 1} to the screen`;
    const lensWords = p.focal !== null ? `; the lens (f = ${len(p.focal)}) ${forms[j] === 'spectrum' ? 'sampled as what is left of its curvature' : 'folded into the integral\'s curvature, not sampled'}.` : '.';
    if (forms[j] === 'spectrum') {
      const grid = [0, 1].map((i) => {
        const lo = Math.min(input[i]!.start, output[i]!.start) - spectrumPad(j, i);
        const hi = Math.max(input[i]!.start + (input[i]!.n - 1) * input[i]!.step, output[i]!.start + (output[i]!.n - 1) * output[i]!.step) + spectrumPad(j, i);
        const step = input[i]!.step;
        const m0 = Math.floor(lo / step + 1e-9);
        return { n: nextFastFftSize(Math.ceil(hi / step - 1e-9) - m0 + 1), start: m0 * step, step };
      }) as [Axis, Axis];
      const w = spectrumLegWork(grid[0].n, grid[1].n);
      work += w;
      memory = Math.max(memory, 16 * (2 * grid[0].n * grid[1].n + input[0].n * input[1].n + output[0].n * output[1].n));
      legs.push({ z, input, output, focal: p.focal, paraxialPhase: 0, windowFromLight: j + 1 < P ? planes[j + 1]!.fromLight : !c.window, form: 'spectrum', grid, flat: flat[j]!, cellResponse: p.edges });
      reasons.push(`${name}, ${len(z)}: the angular spectrum (exact, no paraxial approximation) on a ${grid[0].n} × ${grid[1].n} grid of ${len(grid[0].step)} holding both ends and the light's spread between (${seconds(w)}): cheaper here than the Fresnel sums, whose pitch must follow the window's reach` + lensWords);
      continue;
    }
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
    // Into a lens likewise: the Fresnel chain from any plane through a thin lens onto its focal or
    // image plane is the ideal lens's transform (Goodman §5.2: a point at the front focal plane
    // leaves as an exact plane wave), so what the kernel drops on the way in is the ideal lens's
    // business, not an error of this leg; what leaves the lens is counted as above.
    let paraxialPhase: number;
    if (j + 1 < P && planes[j + 1]!.focal !== null) paraxialPhase = 0;
    else if (p.focal === null) paraxialPhase = along((x, y) => paraxialVariation(k, z, p.coreHalf[0], p.coreHalf[1], x, y));
    else if (p.focal > 0 && z > p.focal) {
      const spot = (i: number) => (lam * p.focal!) / (2 * Math.max(p.half[i]!, 1e-300));
      paraxialPhase = along((x, y) => paraxialVariation(k, z - p.focal!, spot(0), spot(1), x, y));
    } else paraxialPhase = 0;
    legs.push({ z, input, output, focal: p.focal, paraxialPhase, windowFromLight: j + 1 < P ? planes[j + 1]!.fromLight : !c.window, form: 'sum', cellResponse: p.edges });
    if (paraxialPhase > LIMITS.paraxialPhase) warnings.push(warning('planes-paraxial', { leg: name, phase: paraxialPhase, limit: LIMITS.paraxialPhase }));
    reasons.push(`${name}, ${len(z)}: ${input[0].n} × ${input[1].n} samples summed onto ${output[0].n} × ${output[1].n} points (${seconds(w)})` + lensWords);
  }

  /** The Fresnel sums' pitch at plane j (the sum is alias-free while the sampled integrand's band plus the window's reach stays below 1/Δ). */
  function sumPitchOf(j: number): { pitch: [number, number]; rule: [string, string] } {
    const p = planes[j]!;
    const z = gaps[j]!;
    const out = j + 1 < P ? planes[j + 1]! : screenWindow;
    const c0 = p.curvature + (1 / z - (p.focal === null ? 0 : 1 / p.focal)) / lam;
    const res = [0, 1].map((i) => {
      const h = p.carrier[i]! + c0 * p.centre[i]!;
      const reachOut = (Math.abs(out.centre[i]! - lam * z * h) + out.half[i]!) / (lam * z);
      const content = p.band[i]! + phaseOf(j) + Math.abs(c0) * p.half[i]!;
      const per = p.edges ? EDGE_SUM_OVERSAMPLING : LEG_OVERSAMPLING;
      return featureRule(j, 1 / (per * (content + reachOut)), `${per}× the highest frequency the sum must hold (${fmt((content + reachOut) / 1e3, 3)} /mm: the light's detail, the residual curvature and the next window's reach)`);
    });
    return { pitch: [res[0]!.pitch, res[1]!.pitch], rule: [res[0]!.rule, res[1]!.rule] };
  }

  /**
   * The angular spectrum's pitch at plane j: the light's own detail, what is left of the curvature
   * (κ less the lens's: no propagation chirp), and what the plane's edges send out (the spread the
   * regions were drawn with); on a leg to the screen, fine enough for the map as well (the
   * intensity holds twice the light's highest frequency: SCREEN_OVERSAMPLING samples per period).
   */
  function spectrumPitchOf(j: number): { pitch: [number, number]; rule: [string, string]; nyquist: [number, number] } {
    const p = planes[j]!;
    const toScreen = j === P - 1;
    const cT = residualCurvature(p);
    const res = [0, 1].map((i) => {
      const content = spectrumContent(j, i, cT);
      // The screen: SCREEN_OVERSAMPLING samples per period of the intensity's frequencies (twice the
      // light's) for the light's spread, and at least the intensity's Nyquist rate for the edges'
      // waves meeting behind the element (a narrow bright spot needs no finer picture than that).
      const spread = toScreen ? spectrumContent(j, i, cT, true, false) : content;
      const per = toScreen ? 2 * SCREEN_OVERSAMPLING : LEG_OVERSAMPLING;
      let pitch = toScreen ? Math.min(1 / (per * spread), 1 / (4 * content)) : 1 / (per * content);
      let rule = `${per}× the highest frequency of the light (${fmt(content / 1e3, 3)} /mm: its detail, the residual curvature and the edges' spread${toScreen && spread < content ? '; 4× the edges\' waves behind the element' : ''})`;
      if (toScreen) {
        const display = (2 * screenWindow.half[i]!) / (LIMITS.minOutput2D - 1);
        if (display < pitch) {
          pitch = display;
          rule = `${LIMITS.minOutput2D} points across the screen's window`;
        }
      }
      return { ...featureRule(j, pitch, rule), nyquist: 1 / (4 * content) };
    });
    return { pitch: [res[0]!.pitch, res[1]!.pitch], rule: [res[0]!.rule, res[1]!.rule], nyquist: [res[0]!.nyquist, res[1]!.nyquist] };
  }

  /** κ less the plane's lens's 1/(λf): the curvature the angular spectrum samples there (no propagation chirp). */
  function residualCurvature(p: PlaneState): number {
    return p.curvature - (p.focal === null ? 0 : 1 / (lam * p.focal));
  }

  function spectrumContent(j: number, i: number, cT: number, toScreen = j === P - 1, behind = true): number {
    const p = planes[j]!;
    const multiple = toScreen ? HARD_EDGE_SPREAD.screen : HARD_EDGE_SPREAD.plane;
    // Edges: the spread that holds all but the loss target of their light, and, close behind, the
    // frequency at which an edge's wave reaches the far side of the element's own shadow, 2E/(λz)
    // (in the near field the whole rim's waves meet on the axis in phase: the Fresnel zones'
    // swings and the bright spot behind a disc are carried by them, however little power that is).
    const reachBack = p.edges && behind ? (2 * Math.min(p.half[i]!, apertureFacts(p.aperture).halfExtent[i]!)) / (lam * gaps[j]!) : 0;
    return p.band[i]! + phaseOf(j) + Math.abs(cT) * p.half[i]! + (p.diffractionEdge ? Math.max((multiple * p.diffraction[i]!) / lam, reachBack) : 0);
  }

  /** How far the light's highest frequency carries it across gap j (the spectrum grid's margin against wrap-around). */
  function spectrumPad(j: number, i: number): number {
    const p = planes[j]!;
    const cT = residualCurvature(p);
    const s = Math.min(lam * spectrumContent(j, i, cT), 0.95);
    return (gaps[j]! * s) / Math.sqrt(1 - s * s);
  }

  /** FFT samples per axis a spectrum leg from plane j would take at this pitch. */
  function spectrumGridSamples(j: number, i: number, pitch: number): number {
    const a = regionOf(j, i);
    const b = regionOf(j + 1, i);
    return nextFastFftSize(Math.ceil((Math.max(a[1], b[1]) - Math.min(a[0], b[0]) + 2 * spectrumPad(j, i)) / pitch) + 3);
  }

  function phaseOf(j: number): number {
    const p = planes[j]!;
    const lens = lensOf(p.aperture);
    return lens ? lens.pupilFrequency(lam) : phaseFrequencyOf(p.aperture, lam, Math.max(...p.half));
  }

  /** Every feature the light meets: the element's smallest, where it is no wider than the lit region. */
  function featureRule(j: number, pitch: number, rule: string): { pitch: number; rule: string } {
    const p = planes[j]!;
    const f = apertureFacts(p.aperture);
    const feature = f.minFeature / LIMITS.featureSamples2D;
    if (feature < pitch && f.minFeature < 2 * Math.max(...p.half) * 1.0001) return { pitch: feature, rule: `${LIMITS.featureSamples2D} cells across the smallest feature (${len(f.minFeature)})` };
    return { pitch, rule };
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
  const biggestGrid = Math.max(0, ...legs.flatMap((l) => (l.grid ? [l.grid[0].n, l.grid[1].n] : [])));
  if (biggest > MAX_PLANE_SAMPLES || biggestGrid > MAX_SPECTRUM_SAMPLES) {
    error = `a plane needs ${Math.max(biggest, biggestGrid)} samples per axis (at most ${MAX_PLANE_SAMPLES}): the light there is both wide and finely detailed (a collimated beam through a small feature, or a lens whose curvature is sampled over a wide region) for the Fresnel sums and for the angular spectrum alike; put the screen where the light comes to a focus (an image plane), or compute that part as a job of its own`;
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
function diffractionOf(a: Aperture, half: [number, number], gaussian: number | null, lam: number, litHalf = Infinity): { diffraction: [number, number]; diffractionEdge: boolean } {
  const f = apertureFacts(a);
  const lens = lensOf(a);
  const phase = lens ? lens.pupilFrequency(lam) : phaseFrequencyOf(a, lam, Math.max(...half.filter(Number.isFinite), 0));
  // A phase (a grating's, a wavefront error's) sends light out to λ times its local frequency: that
  // is added to the edges' spread as an angle (divided by the edge multiple it will be scaled by).
  const diffraction = [0, 1].map((i) => {
    if (gaussian !== null) return (LIMITS.gaussianReach * lam) / (Math.PI * gaussian) + lam * phase;
    const feature = lens || f.minFeature >= 2 * litHalf ? Infinity : f.minFeature;
    const edge = lam / Math.min(2 * half[i]!, feature, Number.isFinite(litHalf) ? Infinity : 2 * (f.halfExtent[i] ?? Infinity));
    return (Number.isFinite(edge) ? edge : 0) + (lam * phase) / HARD_EDGE_SPREAD.screen;
  }) as [number, number];
  return { diffraction, diffractionEdge: gaussian === null };
}

/**
 * Points on the lattice of `step` through the origin covering [lo, hi], every `stride`-th so that
 * at most `most` remain (planes joined by the angular spectrum share the lattice; the screen takes
 * a strided part of it).
 */
function latticeAxis(lo: number, hi: number, step: number, most: number): Axis {
  const span = Math.ceil(hi / step - 1e-9) - Math.floor(lo / step + 1e-9);
  // Strided points stay on multiples of the stride, so the axis itself is among them.
  const stride = most <= 1 ? 1 : Math.max(1, Math.ceil(span / (most - 2)));
  const s = stride * step;
  const m0 = Math.floor(lo / s + 1e-9);
  const m1 = Math.ceil(hi / s - 1e-9);
  return { n: m1 - m0 + 1, start: m0 * s, step: s };
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
