// The planner: for one case, the Fresnel number and regime, where the light goes (every beam and
// grating order), the window that holds it, which methods are valid there, the cheapest valid one
// that fits in memory and time, its sampling, the validity checks that can be made before
// computing, a memory estimate, and the reasons for each choice in words. It never falls back to a
// method whose own check fails: with nothing valid that fits, the case is refused with the reasons.
import { withSpectrometer } from './spectrometer.js';
import { isBinary } from '../elements/registry.js';
import { warning } from '../warnings/catalogue.js';
import { apertureFacts } from '../optics/aperture.js';
import { directionCosines } from '../optics/source.js';
import { trimNumber } from '../job/units.js';
import type { AxisPlan, Case, Checks, MethodForm, MethodName, MethodOption, Plan, Regime, Warning } from './types.js';
import { DEFAULT_MAX_MEMORY, LIMITS } from './limits.js';
import { lensBeamRadius, lightModel, type LightModel } from './light.js';
import { lensOf, phaseFrequencyOf } from '../elements/registry.js';
import { lensParaxial, paraxialEstimate } from './paraxial.js';
import { lightFrom, OffGridError, type Geometry, type OutputGrid } from './geometry.js';
import { planSpectrum } from './spectrum.js';
import type { Axis } from '../optics/field.js';
import type { SharedGrid } from './types.js';
import { BASELINE_MEMORY } from './costs.js';
import { bytes, fmt, len, pct, seconds } from './words.js';
import { planWindow, windowLoss } from './window.js';
import { planSequence } from './sequence.js';
import { planCurvedLight } from './curved-light.js';
import { answerVariants, searchLimits } from './answers.js';
import { METHOD_NAMES, METHOD_REGISTRY, methodWords } from '../methods/registry.js';
import type { MethodDescriptor, Sampling, Validity, ValidityInputs } from '../methods/types.js';

export { bytes, methodWords };

export interface PlannerOptions {
  /** A case whose estimated peak memory exceeds this is not computed (bytes). */
  maxMemoryBytes?: number;
  /** A case whose estimated work exceeds this (floating-point operations) is not computed. */
  maxWork?: number;
  /**
   * Fewest output samples per axis of direct methods (default: enough for a picture). Searches
   * that only read a size off the result ask for fewer.
   */
  minOutputSamples?: number;
  /**
   * Whether the estimate counts the answers' extra propagations (plan/answers.ts; default true).
   * The searches plan their own variants without it: a variant's answers are never asked.
   */
  countAnswers?: boolean;
  /**
   * One FFT grid a sweep's cases share (plan/shared-grids.ts): the angular spectrum is planned on
   * it where it meets the case's own accuracy rules.
   */
  sharedGrid?: SharedGrid;
  /**
   * The output grid a spectrum's lines are all delivered onto (plan/spectrum.ts): the window is its
   * extent, and only methods whose output can be put on its points are offered.
   */
  outputGrid?: OutputGrid;
}

export { DEFAULT_MAX_MEMORY };
/** About an hour of one core (LIMITS.workPerSecond). */
export const DEFAULT_MAX_WORK = 3600 * LIMITS.workPerSecond;

export function planCase(c: Case, opts: PlannerOptions = {}): Plan {
  return withSpectrometer(planOwnCase(c, opts), opts.maxWork ?? DEFAULT_MAX_WORK);
}

function planOwnCase(c: Case, opts: PlannerOptions): Plan {
  const maxMemory = opts.maxMemoryBytes ?? DEFAULT_MAX_MEMORY;
  const maxWork = opts.maxWork ?? DEFAULT_MAX_WORK;
  // Planes in sequence have a planner of their own (one method: the Fresnel integral plane to plane).
  if (c.planes?.length) return planSequence(c, { maxMemoryBytes: maxMemory, maxWork });
  // Several wavelengths at once: each planned as its own case onto one output grid (plan/spectrum.ts).
  if (c.spectrum) return planSpectrum(c, { plan: planCase, opts });
  // Curved light (a source at a distance): planned as the equivalent flat-light case (plan/curved-light.ts).
  if (c.source) return planCurvedLight(c as Case & { source: NonNullable<Case['source']> }, (flat) => planCase(flat, { ...opts, countAnswers: false }), { maxMemoryBytes: maxMemory, maxWork });
  const lam = c.wavelength;
  const z = c.distance;
  const k = (2 * Math.PI) / lam;
  const facts = apertureFacts(c.aperture);
  const oneD = facts.oneD;
  const ill = c.illumination;
  const warnings: Warning[] = [];
  const reasons: string[] = [];
  const [alpha, beta] = directionCosines(ill);
  if (oneD && ill.tilt[1] !== 0) {
    warnings.push(warning('tilt-y-ignored'));
  }
  const waist = ill.kind === 'gaussian' ? ill.waist : Infinity;
  // An obstacle in a beam of finite extent (a Gaussian) is propagated as it is: the beam where the
  // obstacle is not. (Babinet's free beam minus the obstacle's complement is kept for plane waves,
  // whose free beam is exact; a Gaussian's closed form is paraxial, and where the obstacle blocks
  // most of the beam the two did not cancel to the small field that is left.) The source then
  // reaches past the obstacle's edge until the beam is down to e⁻⁹ of its amplitude there.
  const obstructed = c.aperture.opaque && ill.kind === 'gaussian';
  // Likewise a beam whose axis is closed (an annulus, an even number of slits) is followed past the
  // nearest open point, not cut at three beam radii from the axis.
  const reach = (h: number) => Math.sqrt(h * h + LIMITS.gaussianReach ** 2 * waist * waist);
  const aEff: [number, number] = obstructed
    ? [reach(facts.halfExtent[0]), oneD ? 0 : reach(facts.halfExtent[1])]
    : [Math.min(facts.halfExtent[0], reach(facts.nearestOpen)), oneD ? 0 : Math.min(facts.halfExtent[1], reach(facts.nearestOpen))];

  // Fresnel numbers and regime.
  const nfx = facts.characteristic[0] ** 2 / (lam * z);
  const nfy = oneD ? null : facts.characteristic[1] ** 2 / (lam * z);
  // The beam's own scale where it is narrower than the aperture; an obstructed beam reaches past the
  // obstacle's edge (the larger of the two).
  const beamA = (a: number) => (obstructed ? Math.max(Math.min(a, LIMITS.gaussianReach * waist), waist) : Math.min(a, waist));
  const nfEff = Math.max(beamA(facts.characteristic[0]), oneD ? 0 : beamA(facts.characteristic[1])) ** 2 / (lam * z);
  const dMax = 2 * Math.max(facts.halfExtent[0], facts.halfExtent[1]);
  const farFieldDistance = (2 * dMax * dMax) / lam;
  // Behind a lens the light converges: its regime is the equivalent propagation's, whose Fresnel
  // number is N_F·|1 − z/f| (the residual chirp a²|1/z − 1/f|/λ): the far field at the focus.
  const lens = lensOf(c.aperture);
  const nfRegime = lens ? nfEff * Math.abs(1 - z / lens.focal) : nfEff;
  const regime: Regime = nfRegime > 1 ? 'near-field' : nfRegime > 1 / 8 ? 'transition' : 'far-field';
  const nf = Math.max(nfx, nfy ?? 0);
  reasons.push(
    `Fresnel number N_F = a²/(λz) = ${fmt(nf)}${nfy !== null && Math.abs(nfx - nfy) > 1e-12 * nf ? ` (x ${fmt(nfx)}, y ${fmt(nfy)})` : ''}` +
      (ill.kind === 'gaussian' && nfEff < nf ? `; with the ${len(waist)} beam radius the effective N_F is ${fmt(nfEff)}` : '') +
      `: ${lens ? 'behind a lens the regime is the equivalent propagation\'s (below)' : regimeWords(regime)} (the far-field distance 2D²/λ is ${len(farFieldDistance)}, common practice).`,
  );

  // Where the light goes, and the window that holds it.
  const model = lightModel(c.aperture, facts, ill, lam, z, aEff, obstructed);
  // Behind a lens a Gaussian beam converges to (or spreads from) its focus: its radius by the ABCD law.
  // An aperture narrower than the beam leaves light no wider than itself: the beam's spread is then
  // that of a beam of the aperture's size (its edges' diffraction has the window's margins), not
  // three radii of the wide beam it was cut from.
  const spreadWaist = Math.min(waist, Math.max(aEff[0], aEff[1]));
  const beamRadius = ill.kind === 'gaussian' ? (lens ? lensBeamRadius(waist, lens.focal, lam, z) : beamRadiusAt(spreadWaist, lam, z)) : undefined;
  const winInputs = {
    lam,
    z,
    model,
    nearField: regime === 'near-field',
    // (An unbounded lens has no edge to ring: its beam's radius alone sets the window.)
    ...(lens ? { zoneScale: lens.stopRadius === null ? 0 : Math.abs(1 - z / lens.focal) } : {}),
    ...(beamRadius !== undefined ? { beamRadius } : {}),
    ...(c.window ? { given: c.window } : {}),
  };
  const win = planWindow(winInputs);
  const centre = win.centre;
  const windowHalf = win.half;
  const forced = opts.outputGrid;
  if (forced) {
    // A spectrum's common grid: the window is the grid's extent.
    forced.forEach((a, i) => {
      if (!a) return;
      centre[i] = a.start + ((a.n - 1) / 2) * a.step;
      windowHalf[i] = ((a.n - 1) / 2) * a.step;
    });
  } else if (!c.window && !oneD && !facts.separable) {
    // Round spots get a square window.
    const w = Math.max(windowHalf[0], windowHalf[1]);
    windowHalf[0] = w;
    windowHalf[1] = w;
  }
  const windowLossEstimate = windowLoss(winInputs, centre, windowHalf);
  if (win.omitted.length > 0) {
    const ms = win.omitted.map((b) => b.order!).sort((a, b) => a - b);
    const power = win.omitted.reduce((t, b) => t + b.power, 0) / Math.max(1e-300, model.propagating.reduce((t, b) => t + b.power, 0));
    warnings.push(warning('orders-outside', { orders: ms, fraction: power, windowGiven: !!c.window, maxOutput: oneD ? LIMITS.maxOutput1D : LIMITS.maxOutput2D }));
  }
  reasons.push(...lightReasons(model, c, z));
  reasons.push(
    c.window
      ? `window ${len(2 * windowHalf[0])}${oneD ? '' : ` × ${len(2 * windowHalf[1])}`} as given; about ${pct(windowLossEstimate)} of the power that reaches the screen is expected to fall outside it.`
      : `window ${len(2 * windowHalf[0])}${oneD ? '' : ` × ${len(2 * windowHalf[1])}`}: every propagating beam's footprint plus a margin for its diffraction tails, which should hold all but ≈${pct(windowLossEstimate)} of the power that reaches the screen (target ${pct(LIMITS.windowLossTarget)}).`,
  );
  if (Math.abs(centre[0]) > 1e-12 * windowHalf[0] || (!oneD && Math.abs(centre[1]) > 1e-12 * windowHalf[1])) {
    reasons.push(`window centred at (${len(centre[0])}, ${len(centre[1])}), where the light lands.`);
  }

  const geo: Geometry = {
    lam,
    z,
    k,
    facts,
    oneD,
    obstructed,
    babinet: c.aperture.opaque && !obstructed,
    aEff,
    centre,
    windowHalf,
    waist,
    carrier: [alpha / lam, beta / lam],
    minOutput: opts.minOutputSamples ?? (oneD ? LIMITS.minOutput1D : LIMITS.minOutput2D),
    model,
  };
  if (opts.sharedGrid) geo.sharedGrid = opts.sharedGrid;
  if (forced) geo.outputGrid = forced;
  // A phase element's finest local period, which every method that samples it must resolve.
  const phaseFrequency = phaseFrequencyOf(c.aperture, lam, Math.max(aEff[0], aEff[1]));
  if (phaseFrequency > 0) geo.phaseFrequency = phaseFrequency;
  // A lens: the paraxial check is on the cone behind it (plan/paraxial.ts lensParaxial).
  const lensCheck = lens
    ? lensParaxial(lam, lens.focal, Math.min(Math.max(aEff[0], aEff[1]), 2 * waist), Math.hypot(alpha, beta), model.propagating[0]?.landing ?? [0, 0])
    : null;
  if (lens) reasons.push(...lensReasons(lens.focal, lens.stopRadius, lam, z, nfRegime));
  const paraxial = lensCheck ? lensCheck.estimate : paraxialEstimate({
    lam,
    z,
    model,
    aperture: aEff,
    centre,
    half: windowHalf,
    interferesWithFreeBeam: c.aperture.opaque && !obstructed,
  });
  const goodmanRatio = goodman(geo);
  const farFieldPhaseError = Math.PI * nfEff;
  const beamLimited = obstructed || (ill.kind === 'gaussian' && waist < Math.min(facts.characteristic[0], oneD ? Infinity : facts.characteristic[1]));
  let farFieldPeakError = beamLimited ? farFieldPhaseError ** 2 : farFieldPhaseError ** 2 / 12;
  if (c.aperture.opaque && !obstructed) {
    // Behind an obstacle the hole's field interferes with the free beam, so its phase error (about
    // πN_F/3 on the axis) enters linearly, scaled by the hole's amplitude relative to the beam
    // (area/λz in 2-D, width/√(λz) in 1-D, at most about 2).
    const holeAmplitude = Math.min(2, oneD ? facts.openMeasure / Math.sqrt(lam * z) : facts.openMeasure / (lam * z));
    farFieldPeakError = Math.max(farFieldPeakError, (2 * farFieldPhaseError * holeAmplitude) / 3);
  }

  // Methods: every one is costed; the valid ones compete on cost.
  const validity = validities({ g: geo, paraxialError: paraxial.error, paraxial, farFieldPhase: farFieldPhaseError, farFieldError: farFieldPeakError, ...(lensCheck ? { lens: lensCheck.lens } : {}) });
  const options: MethodOption[] = [];
  const samplings: Chosen[] = [];
  const answers = opts.countAnswers === false ? 0 : answersPeak(c, opts.maxMemoryBytes);
  const binary = isBinary(c.aperture);
  for (const d of METHOD_REGISTRY) {
    if (d.binaryOnly && !binary) continue;
    const sampled = d.sample(geo, c);
    if (!sampled) continue;
    // On a spectrum's common grid only the forms whose output is exactly its points take part.
    if (forced && !sampled.axes.every((a, i) => sameAxis(a.output, forced[i]))) continue;
    const s: Chosen = { ...sampled, ...(d.form ? { form: d.form } : {}), method: d.method, d };
    const v = validity[d.method];
    wholeCase(s, c, answers);
    const fits = !s.impossible && s.memory <= maxMemory && s.work <= maxWork;
    options.push({ method: d.method, ...(s.form ? { form: s.form } : {}), valid: v.valid, ...(v.why ? { why: v.why } : {}), memoryBytes: s.memory, work: s.work, fits });
    samplings.push(s);
  }
  // (The spectrum's planner catches this and says which line could not be put on the grid.)
  if (forced && samplings.length === 0) throw new OffGridError('no method takes this case onto the common output grid');
  let chosen: Chosen | undefined;
  let error: string | undefined;
  const fitsLimits = (s: Sampling) => !s.impossible && s.memory <= maxMemory && s.work <= maxWork;
  if (c.method !== 'auto') {
    const forced = samplings.filter((s) => s.method === c.method);
    chosen = forced.filter(fitsLimits).reduce<Chosen | undefined>((b, s) => (!b || s.work < b.work ? s : b), undefined);
    reasons.push(`${methodWords(c.method)} as requested.`);
    if (forced.length === 0) {
      // No form of the method takes this element (the exact sums take openings, not complex
      // transmittances): refused, with the cheapest other plan kept so that `plan` can show one.
      chosen = samplings.reduce((b, s) => (s.work < b.work ? s : b));
      error = `${methodWords(c.method)} does not take this element (${facts.description}): ${
        isBinary(c.aperture) ? 'none of its forms applies here' : 'its sums take openings, open or closed everywhere, not a complex transmittance'
      }; use method: auto`;
    } else if (!chosen) {
      chosen = forced.reduce((b, s) => (s.work < b.work ? s : b));
      error = tooBig(chosen, c, maxMemory, maxWork, options);
    }
  } else {
    const valid = samplings.filter((s) => validity[s.method].valid);
    // On a spectrum's grid only some forms take part: none of them valid is a refusal of the grid.
    if (forced && valid.length === 0) throw new OffGridError('no method valid here takes this case onto the common output grid');
    // A sweep's shared grid: the angular spectrum on it, where it is valid, fits and took the grid.
    const sg = opts.sharedGrid;
    const onShared = sg ? valid.find((s) => s.d.id === 'angular-spectrum' && s.layout === 'two-d' && fitsLimits(s) && onSharedGrid(s.axes, sg)) : undefined;
    chosen = onShared ?? preferred(valid.filter(fitsLimits));
    for (const m of METHOD_NAMES) if (!validity[m].valid) reasons.push(`${methodWords(m)} not valid here: ${validity[m].why}.`);
    for (const s of valid) {
      if (!fitsLimits(s)) reasons.push(`${methodWords(s.method, s.form)} would need ${limitWords(s, maxMemory, maxWork)}.`);
    }
    if (onShared && sg) {
      chosen = onShared;
      reasons.push(
        `angular spectrum chosen on a grid shared by ${sg.cases} cases of the sweep (same aperture and light): ${validity[onShared.method].because}; the source's spectrum is computed once, ` +
          `about ${seconds(sg.sharedWork)} for them all against ${seconds(sg.soloWork)} with a grid each; the grid is at least as fine and as wide as this case's own.`,
      );
    } else if (chosen) {
      reasons.push(`${methodWords(chosen.method, chosen.form)} chosen: ${validity[chosen.method].because}; of the valid methods that fit, the simplest for its work (about ${seconds(chosen.work)}).`);
    } else {
      // Nothing valid fits: the cheapest valid plan is kept, so that `plan` can show it, and the
      // case is refused with why each method is out and how to bring one within the limits.
      chosen = valid.reduce((b, s) => (s.work < b.work ? s : b));
      error = refusal(chosen, maxMemory, maxWork, validity);
    }
  }
  const method = chosen.method;
  const [xPlan, yPlan] = chosen.axes;

  // Validity checks that can be made before computing.
  const minFeature = facts.minFeature;
  const samplesPerFeature = minFeature / Math.max(xPlan!.inputPitch, yPlan?.inputPitch ?? 0);
  const checks: Checks = {
    fresnelNumbers: [nfx, nfy],
    effectiveFresnelNumber: nfEff,
    farFieldDistance,
    paraxialPhaseError: paraxial.error,
    paraxialWorst: { at: paraxial.at, phase: paraxial.phase, weight: paraxial.weight },
    goodmanRatio,
    farFieldPhaseError,
    farFieldPeakError,
    windowLossEstimate,
    featureOverWavelength: minFeature / lam,
    samplesPerFeature,
    evanescentFraction: model.evanescentFraction,
  };
  // The chosen form's checks of its own sampling (the angular spectrum's band limit, Voelz's rule).
  if (chosen.d.checks) Object.assign(checks, chosen.d.checks(chosen.axes, geo));
  reasons.push(...samplingReasons(chosen.d, chosen.axes, oneD));
  warnings.push(...preChecks(c, chosen.d, checks, chosen.axes, geo, options, maxMemory));
  if (lensCheck && method !== 'fresnel' && lensCheck.lens.phase > LIMITS.lensSphericalPhase) {
    // A non-paraxial method takes the thin lens's quadratic phase at its word.
    warnings.push(warning('lens-spherical', { method: methodWords(method, chosen.form), phase: lensCheck.lens.phase, fresnelValid: validity.fresnel.valid }));
  }

  const plan: Plan = {
    case: c,
    regime,
    method,
    ...(chosen.form ? { form: chosen.form } : {}),
    layout: chosen.layout,
    babinet: c.aperture.opaque && !obstructed,
    x: xPlan!,
    y: yPlan ?? null,
    checks,
    beams: model.beams.map((b) => ({ order: b.order, dir: b.dir, power: b.power, propagates: b.propagates, landing: b.landing })),
    options,
    reasons,
    warnings,
    memoryBytes: chosen.memory,
    work: chosen.work,
    ...(beamRadius !== undefined ? { beamRadius } : {}),
    ...(chosen.shifted ? { shifted: chosen.shifted } : {}),
    ...(chosen.exact2D ? { exact2D: chosen.exact2D } : {}),
    ...(error ? { error } : {}),
  };
  return plan;
}

/** Whether two axes are the same points (to rounding). */
function sameAxis(a: Axis, b: Axis | null | undefined): boolean {
  if (!b) return false;
  const tol = 1e-9 * Math.max(Math.abs(a.step), Math.abs(b.step));
  return a.n === b.n && Math.abs(a.start - b.start) <= tol * Math.max(1, a.n) && Math.abs(a.step - b.step) <= tol;
}

/** Whether a sampling's axes are the shared grid (fftAxisPlan takes it only where it meets the case's rules). */
function onSharedGrid(axes: AxisPlan[], sg: SharedGrid): boolean {
  return axes.every((a, i) => a.inputPitch === sg.pitch[i] && a.inputSamples === sg.samples[i] && a.paddedSamples === sg.padded[i]);
}

/** A sampling of a form, with its method and the descriptor that made it. */
type Chosen = Sampling & { method: MethodName; form?: MethodForm; d: MethodDescriptor };

/**
 * Among valid methods that fit, the far-field formula, else Fresnel, else the cheaper exact method,
 * unless a simpler one costs more than PREFERENCE_SPAN times the cheapest: the closed forms are
 * what a practitioner checks by hand, and their results move smoothly across a sweep.
 */
const PREFERENCE_SPAN = 20;

function preferred(list: Chosen[]): Chosen | undefined {
  if (list.length === 0) return undefined;
  const cheapest = list.reduce((b, s) => (s.work < b.work ? s : b));
  for (const m of METHOD_NAMES) {
    const forms = list.filter((s) => s.method === m && s.d.closedForm);
    if (forms.length === 0) continue;
    const best = forms.reduce((b, s) => (s.work < b.work ? s : b));
    if (best.work <= PREFERENCE_SPAN * cheapest.work) return best;
  }
  return cheapest;
}

/** Each method's validity, from the first of its forms in the registry (every form shares it). */
function validities(v: ValidityInputs): Record<MethodName, Validity> {
  const out = {} as Record<MethodName, Validity>;
  for (const d of METHOD_REGISTRY) if (!(d.method in out)) out[d.method] = d.validity(v);
  return out;
}

function lightReasons(m: LightModel, c: Case, z: number): string[] {
  const orders = m.propagating.filter((b) => b.order !== null);
  if (orders.length === 0) {
    return m.evanescentFraction > LIMITS.evanescentWarn ? [`about ${pct(m.evanescentFraction)} of the light is evanescent (spatial frequencies above 1/λ) and never reaches the screen.`] : [];
  }
  const ms = orders.map((b) => b.order!).sort((a, b) => a - b);
  const outer = orders.reduce((b, o) => (Math.abs(o.landing![0]) > Math.abs(b.landing![0]) ? o : b));
  return [
    `grating orders m = ${ms[0]}…${ms[ms.length - 1]} propagate (d(sin θ_m − sin θ_i) = mλ); the outermost lands at ${len(outer.landing![0])} = z·tan θ (θ = ${fmt((Math.asin(outer.dir[0]) * 180) / Math.PI, 3)}°)` +
      (m.evanescentFraction > 1e-4 ? `; about ${pct(m.evanescentFraction)} of the transmitted power goes into evanescent orders and never reaches the screen.` : '.'),
  ].concat(c.window ? [] : [`the window holds every propagating order at z = ${len(z)}.`]);
}

/** Where the screen is for a lens: in its focal plane, near it, or in the cone. */
function lensReasons(focal: number, stopRadius: number | null, lam: number, z: number, nf: number): string[] {
  const out: string[] = [`behind the lens the equivalent Fresnel number N_F·|1 − z/f| = ${fmt(nf)} sets the regime (${nf > 1 ? 'near field' : nf > 1 / 8 ? 'transition' : 'far field'}).`];
  const off = Math.abs(z / focal - 1);
  if (focal > 0 && off <= 1e-9) out.push(`the screen is in the lens's focal plane (z = f): the field there is the Fourier transform of the pupil, x = λf·f_x (Goodman §5.2).`);
  else if (focal > 0) {
    const depth = stopRadius !== null ? 2 * lam * (focal / (2 * stopRadius)) ** 2 : null;
    out.push(`the screen is ${len(Math.abs(z - focal))} ${z < focal ? 'before' : 'beyond'} the lens's focus (f = ${len(focal)})${depth !== null ? `; the focal depth ±2λ(f/D)² is ±${len(depth)}` : ''}.`);
  } else out.push(`a diverging lens (f = −${len(-focal)}): the light spreads from its virtual focus ${len(-focal)} before the lens.`);
  return out;
}


function regimeWords(r: Regime): string {
  return r === 'near-field'
    ? 'near field (N_F > 1: the pattern still resembles the aperture)'
    : r === 'transition'
      ? 'transition (1/8 < N_F ≤ 1: Fresnel regime, neither shadow nor far-field pattern)'
      : 'far field (N_F ≤ 1/8: the pattern is the Fourier transform of the aperture)';
}

function limitWords(s: Sampling, maxMemory: number, maxWork: number): string {
  const parts: string[] = [];
  if (s.impossible) parts.push(`${Number.isFinite(s.memory) ? `about ${bytes(s.memory)}, ` : ''}an impossible size (${s.impossible})`);
  else if (s.memory > maxMemory) parts.push(`about ${bytes(s.memory)} (over the ${bytes(maxMemory)} limit)`);
  if (s.work > maxWork) parts.push(`about ${seconds(s.work)} of computing (over the ${seconds(maxWork)} limit)`);
  return parts.join(' and ');
}

function tooBig(s: Chosen, c: Case, maxMemory: number, maxWork: number, options: MethodOption[]): string {
  const alt = options.filter((o) => o.valid && o.fits && o.method !== s.method);
  return (
    `${methodWords(s.method, s.form)} needs ${limitWords(s, maxMemory, maxWork)}: ` +
    `${s.axes.map((a) => a.paddedSamples).join(' × ')} samples at ${len(s.axes[0]!.inputPitch)}. ` +
    (alt.length ? `method: ${alt[0]!.method} is valid here and fits; ` : '') +
    `otherwise a smaller window${c.grid?.pitch ? ' or a coarser grid.pitch' : ''} or ${raiseWords(s, maxMemory, maxWork)}.`
  );
}

function refusal(s: Chosen, maxMemory: number, maxWork: number, validity: Record<MethodName, Validity>): string {
  const out = METHOD_NAMES.filter((m) => !validity[m].valid).map((m) => `${methodWords(m)}: ${validity[m].why}`);
  return (
    `no valid method fits: the cheapest, ${methodWords(s.method, s.form)}, needs ${limitWords(s, maxMemory, maxWork)}` +
    ` (${s.axes.map((a) => a.paddedSamples).join(' × ')} ${s.d.apertureCells ? 'cells' : 'samples'} at ${len(s.axes[0]!.inputPitch)})` +
    (out.length ? `; ${out.join('; ')}` : '') +
    `. Lower it with a smaller window, or ${raiseWords(s, maxMemory, maxWork)}.`
  );
}

/** Which limit to raise: --max-memory for memory, --accept-large for time. */
function raiseWords(s: Sampling, maxMemory: number, maxWork: number): string {
  if (s.impossible) return 'smaller sizes in the job (no limit allows this one)';
  const parts: string[] = [];
  if (s.memory > maxMemory) parts.push('a larger memory limit (--max-memory)');
  if (s.work > maxWork) parts.push('--accept-large to allow cases of more than an hour');
  return parts.join(' and ') || 'a larger limit';
}

export function beamRadiusAt(w0: number, lam: number, z: number): number {
  const zr = (Math.PI * w0 * w0) / lam;
  return w0 * Math.sqrt(1 + (z / zr) ** 2);
}

function goodman(g: Geometry): number {
  const axes = g.oneD ? [0] : [0, 1];
  let rho2 = 0;
  for (const i of axes) rho2 += (Math.abs(g.centre[i]!) + g.windowHalf[i]! + g.aEff[i]!) ** 2;
  return (Math.PI * rho2 * rho2) / (4 * g.lam * g.z ** 3);
}

/**
 * The most complex samples one array may hold: V8's typed arrays end at 2³² elements, and a
 * complex array takes two per sample. A plan that needs more is impossible whatever the memory.
 */
export const MAX_ARRAY_SAMPLES = 2 ** 31;

/** Bytes a row of a profile CSV takes while it is built (the row's array, its numbers as text, the joined line; measured 320). */
const CSV_ROW_BYTES = 400;

/**
 * The whole case's peak, not only its propagation's: s.memory (the propagation, baseline
 * included) against what is held after it (the intensity, 8 bytes a sample) plus the larger of the
 * answers' peak (the largest search variant, its own baseline included) and the files written
 * (the .npy's bytes, the profile CSVs, the pictures' resampled panels: src/output/). Sizes that no
 * array can hold, or that are not finite, make the plan impossible: it never fits, whatever the
 * limits, and `impossible` says which size (an estimate that is not a number is Infinity).
 */
/** What encoding a case's pictures holds besides the map (output/raster.ts encodePng: zlib's deflate state, the filtered rows). */
const PICTURE_ENCODING_BYTES = 4 * 1024 ** 2;

function wholeCase(s: Sampling, c: Case, answers: number): void {
  const problem = s.impossible ?? impossibleSize(s);
  if (problem) s.impossible = problem;
  if (!(s.memory >= 0)) s.memory = Infinity;
  if (!(s.work >= 0)) s.work = Infinity;
  if (problem) return;
  const cols = s.axes[0]!.output.n;
  const rows = s.layout === 'one-d' ? 1 : s.axes[1]!.output.n;
  const m = rows * cols;
  const held = 8 * m;
  // The profile CSVs are built on the JavaScript heap, which keeps what the propagation left for
  // the collector: they count on top of its peak (they matter for 1-D results of 1e5 samples).
  const csv = CSV_ROW_BYTES * Math.max(rows, cols);
  // The energy curve keeps a copy of the map it came from for the verdicts to reuse (analysis/encircled.ts, maps up to 2^20 samples).
  const memo = m <= 2 ** 20 ? 8 * m : 0;
  const files = (c.output.npy === 'float32' ? 4 : 8) * m + csv + 8 * rows * 400 + 4 * 1024 ** 2 + memo;
  // The answers' searches run with the case's map held and what its pictures' encoding left
  // outside the heap (node's zlib: deflate state, rows): a few MB on top of theirs.
  s.memory = Math.max(s.memory + csv, BASELINE_MEMORY + held + files, answers > 0 ? held + answers + PICTURE_ENCODING_BYTES : 0);
}

/** Why a sampling cannot be carried out whatever the limits (a size not finite or beyond any array), or null. */
function impossibleSize(s: Sampling): string | null {
  const count = (n: number) => Number.isFinite(n) && Number.isInteger(n) && n >= 1;
  let padded = 1;
  let input = 1;
  let outputs = 1;
  for (const a of s.axes) {
    if (!count(a.inputSamples) || !count(a.paddedSamples) || !count(a.output.n)) {
      return `${s.axes.map((b) => b.paddedSamples).join(' × ')} samples, ${s.axes.map((b) => b.output.n).join(' × ')} outputs: not a count an array can have`;
    }
    if (!(a.inputPitch > 0) || !Number.isFinite(a.inputPitch) || !Number.isFinite(a.output.start) || !Number.isFinite(a.output.step)) {
      return `a pitch or window of ${len(a.inputPitch)} that is not a finite length`;
    }
    padded *= a.paddedSamples;
    input *= a.inputSamples;
    outputs *= a.output.n;
  }
  const most = Math.max(padded, input, outputs);
  if (most > MAX_ARRAY_SAMPLES) return `${trimNumber(most, 3)} samples in one array (at most ${MAX_ARRAY_SAMPLES} fit in one)`;
  if (!(s.memory >= 0) || !(s.work >= 0)) return 'a memory or work estimate that is not a number';
  // (Infinity passes any limit given as Infinity, as --accept-large gives the work's.)
  if (!Number.isFinite(s.memory) || !Number.isFinite(s.work)) return 'a memory or work estimate beyond any number';
  return null;
}

/**
 * The answers' peak (plan/answers.ts): the largest memory estimate among the variants the
 * searches plan, each planned as the search plans it (its limits, a small output); variants that
 * do not fit are skipped by the search and not counted. 0 when the case asks nothing of them.
 */
function answersPeak(c: Case, maxMemoryBytes: number | undefined): number {
  const variants = answerVariants(c);
  if (variants.length === 0) return 0;
  // The cases of a distance sweep have the same far-field search: planned once (a pure function of
  // the variants and the limit, so remembering it changes no result). The key leaves out what
  // names a case and not its light (job, index, folder, swept values): with them every case of a
  // sweep missed, and planned its 17 search distances again (most of the planning of a 100-case
  // far-field sweep).
  const key = JSON.stringify([maxMemoryBytes ?? null, variants.map(physicsOf)]);
  const known = answersPeaks.get(key);
  if (known !== undefined) return known;
  let peak = 0;
  for (const v of variants) {
    const p = planCase(v, searchLimits(maxMemoryBytes));
    if (!p.error) peak = Math.max(peak, p.memoryBytes);
  }
  if (answersPeaks.size >= 256) answersPeaks.clear();
  answersPeaks.set(key, peak);
  return peak;
}

const answersPeaks = new Map<string, number>();

/** A case without what only names it (the planner's memory and work estimates do not read these). */
function physicsOf(c: Case): Omit<Case, 'job' | 'index' | 'id' | 'swept'> {
  const { job: _job, index: _index, id: _id, swept: _swept, ...rest } = c;
  return rest;
}

function samplingReasons(d: MethodDescriptor, axes: AxisPlan[], oneD: boolean): string[] {
  const names = oneD ? ['x'] : ['x', 'y'];
  const out: string[] = [];
  axes.forEach((a, i) => {
    const axis = names[i];
    const fft = d.grid === 'transfer';
    let tail: string;
    if (fft) tail = `${a.inputSamples} samples zero-padded to ${a.paddedSamples}; output ${a.output.n} samples at the same pitch.`;
    else if (d.grid === 'single-fft') tail = `${a.inputSamples} samples over the illuminated aperture, zero-padded to ${a.paddedSamples} so that the output lattice λz/(NΔx) is ${len(a.output.step)}; ${a.output.n} samples in the window.`;
    else if (d.apertureCells) tail = `${a.inputSamples} cells; output ${a.output.n} samples at ${len(a.output.step)}.`;
    else tail = `${a.inputSamples} samples over the illuminated aperture; output ${a.output.n} samples at ${len(a.output.step)}.`;
    out.push(`${axis}: aperture-plane ${d.apertureCells ? 'cells' : 'pitch'} ${len(a.inputPitch)} (${a.pitchRule}); ${tail}`);
  });
  return out;
}

function preChecks(
  c: Case,
  d: MethodDescriptor,
  checks: Checks,
  axes: AxisPlan[],
  g: Geometry,
  options: MethodOption[],
  maxMemory: number,
): Warning[] {
  const w: Warning[] = [];
  void maxMemory;
  if (checks.featureOverWavelength < LIMITS.vectorFeature) {
    w.push(warning('near-wavelength', { cause: 'feature', feature: g.facts.minFeature, ratio: checks.featureOverWavelength }));
  }
  if (Number.isFinite(g.waist)) {
    // A beam that barely reaches the open part: what passes is its far tail, e^{−2r²/w²} of it.
    const r = lightFrom(g);
    const passing = Math.exp((-2 * r * r) / (g.waist * g.waist));
    if (passing < LIMITS.littleLight) {
      w.push(warning('little-light', { waist: g.waist, passing, openFrom: r }));
    }
  }
  if (g.z < LIMITS.vectorDistance * g.lam) {
    // The scalar integral is still evaluated exactly, but a screen within a wavelength or so of a
    // real (thick, conducting) screen sees its near field, which scalar theory does not describe.
    w.push(warning('near-wavelength', { cause: 'screen', ratio: g.z / g.lam }));
  }
  if (checks.samplesPerFeature < LIMITS.minSamplesPerFeature && !d.apertureCells) {
    w.push(warning('undersampled-feature', { samples: checks.samplesPerFeature, feature: g.facts.minFeature, needed: LIMITS.minSamplesPerFeature }));
  }
  for (const a of axes) {
    if (a.inputPitch > a.requiredPitch * 1.0000001) {
      w.push(warning('coarse-sampling', { pitch: a.inputPitch, required: a.requiredPitch, rule: a.pitchRule }));
      break;
    }
  }
  const fft = d.grid === 'transfer';
  if (fft) {
    for (const a of axes) {
      const span = a.inputSamples * a.inputPitch;
      if (span < 2 * a.apertureHalf * 0.9999999 || (c.grid?.size && span < 2 * (Math.abs(a.windowCentre) + a.windowHalf))) {
        w.push(warning('grid-too-small', { covers: 'aperture-and-window', samples: a.inputSamples, pitch: a.inputPitch }));
        break;
      }
    }
  } else if (c.grid?.size) {
    for (const a of axes) {
      if (a.inputSamples * a.inputPitch < 2 * a.apertureHalf * 0.9999999) {
        w.push(warning('grid-too-small', { covers: 'aperture', samples: a.inputSamples, pitch: a.inputPitch, aperture: 2 * a.apertureHalf }));
        break;
      }
    }
  }
  // The form used where it is not valid (a method the job asks for): what is off, and what to use.
  const use = d.useWarning?.({ checks, g, options });
  if (use) w.push(use);
  if (checks.transferSampling !== undefined && checks.transferSampling < 1) {
    w.push(warning('transfer-undersampled', { sampling: checks.transferSampling }));
  }
  if (!fft) {
    for (const a of axes) {
      const d = 2 * a.apertureHalf;
      const nyquist = (g.lam * g.z) / (2 * d);
      if (a.output.step > nyquist * 1.0000001) {
        w.push(warning('output-undersampled', { pitch: a.output.step, nyquist, window: 2 * a.windowHalf }));
        break;
      }
    }
  }
  return w;
}
