// The planner: for one case, the Fresnel number and regime, where the light goes (every beam and
// grating order), the window that holds it, which methods are valid there, the cheapest valid one
// that fits in memory and time, its sampling, the validity checks that can be made before
// computing, a memory estimate, and the reasons for each choice in words. It never falls back to a
// method whose own check fails: with nothing valid that fits, the case is refused with the reasons.
import { apertureFacts } from '../optics/aperture.js';
import { fftAxis } from '../optics/field.js';
import { nextPowerOfTwo } from '../optics/fft.js';
import { directionCosines } from '../optics/source.js';
import { bandLimitFrequency } from '../optics/spectral.js';
import { mappingError } from '../optics/direct.js';
import { boundaryRegionsOf, costRsBoundary } from '../optics/rs-boundary.js';
import { costFarFieldTable, farFieldBand } from '../optics/spectrum-table.js';
import { edgeSpectrumTail, gaussianSpectrumTail, shiftedGridFor } from '../optics/shifted-spectrum.js';
import { trimNumber } from '../job/units.js';
import type { AxisPlan, Case, Checks, Layout, MethodForm, MethodName, MethodOption, Plan, Regime, Warning } from './types.js';
import { LIMITS } from './limits.js';
import { illuminatedEdgeWeight, lightModel, type LightModel } from './light.js';
import { paraxialEstimate } from './paraxial.js';
import { featureSamples, oversampling, steepestDirection, type Geometry } from './geometry.js';
import { axisPlan, directionCosineAxisPlan, fftAxisPlan as fftAxisPlanOf, fresnelDirectAxisPlan, pitchFor, singleFftAxisPlan, windowOn } from './axis-plans.js';
import { BASELINE_MEMORY, costDirect, costFft, costSingleFft } from './costs.js';
import { bytes, fmt, len, pct, seconds } from './words.js';
import { planWindow, windowLoss } from './window.js';
import { answerVariants, searchLimits } from './answers.js';
import { costRsDirect1D, costRsDirect2D, costRsPerPeriod1D, periodicAxis, rs2DSampling, rsAreaSamplingError, rsMaxCell } from '../optics/rayleigh-sommerfeld.js';

export { bytes };

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
}

export const DEFAULT_MAX_MEMORY = 4 * 1024 ** 3;
/** About an hour of one core (LIMITS.workPerSecond). */
export const DEFAULT_MAX_WORK = 3600 * LIMITS.workPerSecond;

export function planCase(c: Case, opts: PlannerOptions = {}): Plan {
  const maxMemory = opts.maxMemoryBytes ?? DEFAULT_MAX_MEMORY;
  const maxWork = opts.maxWork ?? DEFAULT_MAX_WORK;
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
    warnings.push({
      code: 'tilt-y-ignored',
      message: 'illumination.tilt[1] (along the slits) is ignored: a 1-D aperture is computed in the x–z plane only',
    });
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
  const regime: Regime = nfEff > 1 ? 'near-field' : nfEff > 1 / 8 ? 'transition' : 'far-field';
  const nf = Math.max(nfx, nfy ?? 0);
  reasons.push(
    `Fresnel number N_F = a²/(λz) = ${fmt(nf)}${nfy !== null && Math.abs(nfx - nfy) > 1e-12 * nf ? ` (x ${fmt(nfx)}, y ${fmt(nfy)})` : ''}` +
      (ill.kind === 'gaussian' && nfEff < nf ? `; with the ${len(waist)} beam radius the effective N_F is ${fmt(nfEff)}` : '') +
      `: ${regimeWords(regime)} (the far-field distance 2D²/λ is ${len(farFieldDistance)}, common practice).`,
  );

  // Where the light goes, and the window that holds it.
  const model = lightModel(c.aperture, facts, ill, lam, z, aEff, obstructed);
  const beamRadius = ill.kind === 'gaussian' ? beamRadiusAt(waist, lam, z) : undefined;
  const winInputs = {
    lam,
    z,
    model,
    nearField: regime === 'near-field',
    ...(beamRadius !== undefined ? { beamRadius } : {}),
    ...(c.window ? { given: c.window } : {}),
  };
  const win = planWindow(winInputs);
  const centre = win.centre;
  const windowHalf = win.half;
  if (!c.window && !oneD && !facts.separable) {
    // Round spots get a square window.
    const w = Math.max(windowHalf[0], windowHalf[1]);
    windowHalf[0] = w;
    windowHalf[1] = w;
  }
  const windowLossEstimate = windowLoss(winInputs, centre, windowHalf);
  if (win.omitted.length > 0) {
    const ms = win.omitted.map((b) => b.order!).sort((a, b) => a - b);
    const power = win.omitted.reduce((t, b) => t + b.power, 0) / Math.max(1e-300, model.propagating.reduce((t, b) => t + b.power, 0));
    warnings.push({
      code: 'orders-outside',
      message:
        `propagating orders ${orderList(ms)} (${pct(power)} of the power that reaches the screen) land outside the window` +
        (c.window
          ? ' the job gives; they are listed in the order table as outside; widen the window to see them'
          : `: holding them at a pitch that resolves each order would take more output samples than the ${oneD ? LIMITS.maxOutput1D : LIMITS.maxOutput2D} per axis allowed; they are listed in the order table as outside; give a window around the orders of interest`),
    });
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
  const paraxial = paraxialEstimate({
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
  const validity = methodValidity(geo, paraxial.error, farFieldPhaseError, farFieldPeakError, paraxial);
  const options: MethodOption[] = [];
  const samplings: (Sampling & { method: MethodName })[] = [];
  const answers = opts.countAnswers === false ? 0 : answersPeak(c, opts.maxMemoryBytes);
  for (const method of METHOD_ORDER) {
    const v = validity[method];
    for (const s of sample(method, geo, c)) {
      wholeCase(s, c, answers);
      const fits = !s.impossible && s.memory <= maxMemory && s.work <= maxWork;
      options.push({ method, ...(s.form ? { form: s.form } : {}), valid: v.valid, ...(v.why ? { why: v.why } : {}), memoryBytes: s.memory, work: s.work, fits });
      samplings.push({ method, ...s });
    }
  }
  type Chosen = Sampling & { method: MethodName };
  let chosen: Chosen | undefined;
  let error: string | undefined;
  const fitsLimits = (s: Sampling) => !s.impossible && s.memory <= maxMemory && s.work <= maxWork;
  if (c.method !== 'auto') {
    const forced = samplings.filter((s) => s.method === c.method);
    chosen = forced.filter(fitsLimits).reduce<Chosen | undefined>((b, s) => (!b || s.work < b.work ? s : b), undefined);
    reasons.push(`${methodWords(c.method)} as requested.`);
    if (!chosen) {
      chosen = forced.reduce((b, s) => (s.work < b.work ? s : b));
      error = tooBig(chosen, c, maxMemory, maxWork, options);
    }
  } else {
    const valid = samplings.filter((s) => validity[s.method].valid);
    chosen = preferred(valid.filter(fitsLimits));
    for (const m of METHOD_ORDER) if (!validity[m].valid) reasons.push(`${methodWords(m)} not valid here: ${validity[m].why}.`);
    for (const s of valid) {
      if (!fitsLimits(s)) reasons.push(`${methodWords(s.method, s.form)} would need ${limitWords(s, maxMemory, maxWork)}.`);
    }
    if (chosen) {
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
  if (method === 'angular-spectrum') {
    checks.bandLimit = [
      bandLimitFrequency(z, lam, xPlan!.paddedSamples * xPlan!.inputPitch),
      yPlan ? bandLimitFrequency(z, lam, yPlan.paddedSamples * yPlan.inputPitch) : null,
    ];
  }
  if (method === 'fresnel' && chosen.form === 'transfer-function') {
    checks.transferSampling = Math.min(...chosen.axes.map((a) => (a.inputPitch * a.inputPitch * a.paddedSamples) / (lam * z)));
  }
  reasons.push(...samplingReasons(method, chosen.form, chosen.axes, oneD));
  warnings.push(...preChecks(c, method, chosen.form, checks, chosen.axes, geo, options, maxMemory));

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

/** The order in which methods are listed (and, at equal cost, preferred). */
const METHOD_ORDER: MethodName[] = ['fraunhofer', 'fresnel', 'angular-spectrum', 'rayleigh-sommerfeld'];

/**
 * Among valid methods that fit, the far-field formula, else Fresnel, else the cheaper exact method,
 * unless a simpler one costs more than PREFERENCE_SPAN times the cheapest: the closed forms are
 * what a practitioner checks by hand, and their results move smoothly across a sweep.
 */
const PREFERENCE_SPAN = 20;

function preferred<T extends Sampling & { method: MethodName }>(list: T[]): T | undefined {
  if (list.length === 0) return undefined;
  const cheapest = list.reduce((b, s) => (s.work < b.work ? s : b));
  for (const m of ['fraunhofer', 'fresnel'] as MethodName[]) {
    const forms = list.filter((s) => s.method === m);
    if (forms.length === 0) continue;
    const best = forms.reduce((b, s) => (s.work < b.work ? s : b));
    if (best.work <= PREFERENCE_SPAN * cheapest.work) return best;
  }
  return cheapest;
}

interface Validity {
  valid: boolean;
  /** Why it is not valid. */
  why?: string;
  /** Why it is valid (for the reasons). */
  because: string;
}

function methodValidity(
  g: Geometry,
  paraxialError: number,
  farFieldPhase: number,
  farFieldError: number,
  paraxial: { at: [number, number]; phase: number; weight: number },
): Record<MethodName, Validity> {
  const ffOk = farFieldError <= LIMITS.farFieldPeakError;
  const paraxialLimit = g.babinet ? LIMITS.paraxialPhaseBabinet : LIMITS.paraxialPhase;
  const parOk = paraxialError <= paraxialLimit;
  const where = `at (${len(paraxial.at[0])}${g.oneD ? '' : `, ${len(paraxial.at[1])}`}) it drops ${fmt(paraxial.phase, 2)} rad of phase across the aperture where the light is ${pct(paraxial.weight)} of the peak (weighted ${fmt(paraxialError, 2)} rad, limit ${paraxialLimit} rad${g.babinet ? ': behind an obstacle the diffracted light interferes with the free beam, so its error shows linearly' : ''})`;
  return {
    fraunhofer: {
      valid: ffOk,
      because: `the aperture's own quadratic phase π·N_F = ${fmt(farFieldPhase, 2)} rad that it neglects changes the peak by about ${pct(farFieldError)} (limit ${pct(LIMITS.farFieldPeakError)}); it is evaluated in direction cosines with the exact kernel, so wide angles are not paraxial`,
      ...(ffOk ? {} : { why: `the aperture's quadratic phase π·N_F = ${fmt(farFieldPhase, 2)} rad would change the peak by about ${pct(farFieldError)} (limit ${pct(LIMITS.farFieldPeakError)})` }),
    },
    fresnel: {
      valid: parOk,
      because: `the paraxial approximation holds wherever the light lands (${where})`,
      ...(parOk ? {} : { why: `the paraxial approximation fails where light lands: ${where}` }),
    },
    'angular-spectrum': { valid: true, because: 'it is exact for scalar waves' },
    'rayleigh-sommerfeld': { valid: true, because: 'the Rayleigh–Sommerfeld integral is exact for scalar waves at any distance and angle' },
  };
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

/** Order numbers in words: runs of consecutive orders as a…b. */
function orderList(ms: number[]): string {
  const parts: string[] = [];
  for (let i = 0; i < ms.length; ) {
    let j = i;
    while (j + 1 < ms.length && ms[j + 1] === ms[j]! + 1) j++;
    parts.push(j > i ? `${ms[i]}…${ms[j]}` : `${ms[i]}`);
    i = j + 1;
  }
  return parts.join(', ');
}

function regimeWords(r: Regime): string {
  return r === 'near-field'
    ? 'near field (N_F > 1: the pattern still resembles the aperture)'
    : r === 'transition'
      ? 'transition (1/8 < N_F ≤ 1: Fresnel regime, neither shadow nor far-field pattern)'
      : 'far field (N_F ≤ 1/8: the pattern is the Fourier transform of the aperture)';
}

const FORM_WORDS: Record<string, string> = {
  'transfer-function': 'transfer-function form',
  'single-fft': 'single-transform form by one FFT',
  direct: 'single-transform form by direct sums onto the window',
  shifted: 'in the tilted beam\'s frame, the grid shifted to where it lands',
};

export function methodWords(m: MethodName, form?: MethodForm): string {
  switch (m) {
    case 'angular-spectrum':
      return `angular spectrum${form === 'shifted' ? ` (${FORM_WORDS[form]})` : ''}`;
    case 'fresnel':
      return `Fresnel${form ? ` (${FORM_WORDS[form]})` : ''}`;
    case 'fraunhofer':
      return 'far-field formula';
    case 'rayleigh-sommerfeld':
      return `Rayleigh–Sommerfeld integral${form === 'per-period' ? ' (one period, summed over the periods)' : form === 'direct' ? ' (direct sums over the aperture)' : form === 'boundary' ? ' (along the aperture\'s boundary)' : ''}`;
  }
}

function limitWords(s: Sampling, maxMemory: number, maxWork: number): string {
  const parts: string[] = [];
  if (s.impossible) parts.push(`${Number.isFinite(s.memory) ? `about ${bytes(s.memory)}, ` : ''}an impossible size (${s.impossible})`);
  else if (s.memory > maxMemory) parts.push(`about ${bytes(s.memory)} (over the ${bytes(maxMemory)} limit)`);
  if (s.work > maxWork) parts.push(`about ${seconds(s.work)} of computing (over the ${seconds(maxWork)} limit)`);
  return parts.join(' and ');
}

function tooBig(s: Sampling & { method: MethodName }, c: Case, maxMemory: number, maxWork: number, options: MethodOption[]): string {
  const alt = options.filter((o) => o.valid && o.fits && o.method !== s.method);
  return (
    `${methodWords(s.method, s.form)} needs ${limitWords(s, maxMemory, maxWork)}: ` +
    `${s.axes.map((a) => a.paddedSamples).join(' × ')} samples at ${len(s.axes[0]!.inputPitch)}. ` +
    (alt.length ? `method: ${alt[0]!.method} is valid here and fits; ` : '') +
    `otherwise a smaller window${c.grid?.pitch ? ' or a coarser grid.pitch' : ''} or ${raiseWords(s, maxMemory, maxWork)}.`
  );
}

function refusal(s: Sampling & { method: MethodName }, maxMemory: number, maxWork: number, validity: Record<MethodName, Validity>): string {
  const out = METHOD_ORDER.filter((m) => !validity[m].valid).map((m) => `${methodWords(m)}: ${validity[m].why}`);
  return (
    `no valid method fits: the cheapest, ${methodWords(s.method, s.form)}, needs ${limitWords(s, maxMemory, maxWork)}` +
    ` (${s.axes.map((a) => a.paddedSamples).join(' × ')} ${s.method === 'rayleigh-sommerfeld' ? 'cells' : 'samples'} at ${len(s.axes[0]!.inputPitch)})` +
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

/** Fraction of the power that edge diffraction sends farther than u beyond the geometric spot. */
function edgeTail(m: LightModel, lam: number, z: number, u: number): number {
  if (!(u > 0)) return 0.5;
  return Math.min(1, (m.edgesPerPower * lam * z) / (2 * Math.PI ** 2 * u));
}

function goodman(g: Geometry): number {
  const axes = g.oneD ? [0] : [0, 1];
  let rho2 = 0;
  for (const i of axes) rho2 += (Math.abs(g.centre[i]!) + g.windowHalf[i]! + g.aEff[i]!) ** 2;
  return (Math.PI * rho2 * rho2) / (4 * g.lam * g.z ** 3);
}

interface Sampling {
  /** Set when a size the sampling needs cannot exist (see impossibleSize). */
  impossible?: string;
  form?: MethodForm;
  axes: AxisPlan[];
  layout: Layout;
  memory: number;
  work: number;
  shifted?: Plan['shifted'];
  exact2D?: Plan['exact2D'];
}

/** The plans of a method: one per form that applies (Fresnel has three; the exact integral two). */
function sample(method: MethodName, g: Geometry, c: Case): Sampling[] {
  const axes = g.oneD ? [0] : [0, 1];
  if (method === 'angular-spectrum') {
    const layout: Layout = g.oneD ? 'one-d' : 'two-d';
    const plans = axes.map((i) => fftAxisPlan(g, i, c, method));
    const list: Sampling[] = [{ axes: plans, layout, ...costFft(plans, layout) }];
    const shifted = shiftedSampling(g, c, layout);
    if (shifted) list.push(shifted);
    return list;
  }
  // The beam minus an obstacle is not a product of two profiles, even where the obstacle is.
  const layout: Layout = g.oneD ? 'one-d' : g.facts.separable && !g.obstructed ? 'separable' : 'two-d';
  if (method === 'fresnel') {
    // Three forms of the same integral. Voelz's rule: the transfer function is adequately sampled
    // when Δx ≥ λz/L. They give the same answer; a grid.size names an FFT grid, so it asks for the
    // transfer-function form.
    const tf = axes.map((i) => fftAxisPlan(g, i, c, method));
    const tfCost = costFft(tf, layout);
    const tfSampled = tf.every((p) => (p.inputPitch * p.inputPitch * p.paddedSamples) / (g.lam * g.z) >= 1);
    if (c.grid?.size) return [{ form: 'transfer-function', axes: tf, layout, ...tfCost }];
    const direct = axes.map((i) => directAxisPlan(g, i, c, 'fresnel'));
    const options: Sampling[] = [{ form: 'direct', axes: direct, layout, ...costDirect(direct, layout, false) }];
    if (tfSampled) options.push({ form: 'transfer-function', axes: tf, layout, ...tfCost });
    const single = direct.map((d) => singleFftAxisPlan(g, d));
    if (single.every((a) => a.paddedSamples <= LIMITS.maxSingleFft)) {
      options.push({ form: 'single-fft', axes: single, layout, ...costSingleFft(single, layout) });
    }
    return options;
  }
  if (method === 'fraunhofer') {
    const plans = axes.map((i) => directAxisPlan(g, i, c, 'fraunhofer'));
    return [{ axes: plans, layout, ...costFarField(plans, layout, g, c) }];
  }
  return sampleExact(g, c);
}

/**
 * The exact integral. 1-D: cells no wider than the curvature rule allows (rs-sampling.ts) over the
 * open intervals, summed onto the window; for a grating lit by a plane wave, also one period's
 * field summed over the periods on a lattice commensurate with the period. 2-D: an area-sampled
 * grid, cells no wider than the curvature rule, the smallest feature's 16th and λ/(4·sin θ) of the
 * steepest ray into the window (partial edge cells carry their open area at the cell centre, so
 * their phase error must stay small at the widest angle), summed onto the window point by point.
 */
function sampleExact(g: Geometry, c: Case): Sampling[] {
  const a = c.aperture;
  const waist = Number.isFinite(g.waist) ? { waist: g.waist } : {};
  // A given grid.pitch bounds the cells too (the job asked for at least that resolution).
  const cell = Math.min(rsMaxCell(g.lam, g.z, waist), c.grid?.pitch ?? Infinity);
  if (g.oneD) {
    const out = directAxisPlan(g, 0, c, 'rayleigh-sommerfeld');
    const intervals = a.shape === 'slits' ? a.count : 1;
    const open = g.obstructed ? 2 * g.aEff[0] : Number.isFinite(g.waist) ? Math.min(g.facts.openMeasure, 2 * g.aEff[0]) : g.facts.openMeasure;
    const cells = Math.ceil(open / cell) + intervals + (g.obstructed ? 1 : 0);
    const rule = { pitch: cell, required: cell, rule: `cells of at most ${len(cell)} over the open intervals, edges exact (the kernel's phase curvature across a cell stays within the accuracy target)` };
    const direct: Sampling = {
      form: 'direct',
      axes: [axisPlan(g, 0, rule, cells, cells, out.output)],
      layout: 'one-d',
      memory: BASELINE_MEMORY + 16 * (5 * cells + 2 * out.output.n),
      work: costRsDirect1D(cells, out.output.n),
    };
    const list = [direct];
    if (a.shape === 'slits' && a.count >= 2 && c.illumination.kind === 'plane') {
      const lo = out.output.start;
      const hi = out.output.start + (out.output.n - 1) * out.output.step;
      const pa = periodicAxis(a.period, out.output.step, lo, hi);
      const perPeriod = Math.ceil(a.width / cell);
      const lattice = (a.count - 1) * pa.p + (pa.axis.n - 1) * pa.s + 1;
      const axis = axisPlan(g, 0, { ...rule, rule: `${rule.rule}; one period's field on a lattice of ${len(a.period / pa.p)}, summed over the ${a.count} periods` }, perPeriod, perPeriod, pa.axis);
      axis.periodic = { p: pa.p, s: pa.s };
      list.push({
        form: 'per-period',
        axes: [axis],
        layout: 'one-d',
        // One period's field on the whole lattice, then the output.
        memory: BASELINE_MEMORY + 16 * (lattice + 2 * pa.axis.n + 5 * perPeriod),
        work: costRsPerPeriod1D(perPeriod, a.count, pa.axis.n, pa.p, pa.s),
      });
    }
    return list;
  }
  const list: Sampling[] = [];
  if (a.shape === 'slits' && a.count > MAX_COSTED_SLITS) {
    // Costing the 2-D sums walks every slit (its rectangles, its cells): past this many the walk
    // alone holds the planner for seconds to minutes (a million slits overflowed the stack), so
    // the form is not offered; the other methods are costed from the sizes alone.
    const out = [0, 1].map((i) => directAxisPlan(g, i, c, 'rayleigh-sommerfeld'));
    const rule = { pitch: cell, required: cell, rule: `not costed: more than ${MAX_COSTED_SLITS} slits` };
    const axes = [0, 1].map((i) => axisPlan(g, i, rule, 1, 1, out[i]!.output));
    return [{ form: 'direct', axes, layout: 'two-d', memory: Infinity, work: Infinity, impossible: `${a.count} slits: the exact 2-D sums are costed for at most ${MAX_COSTED_SLITS}` }];
  }
  // (Not when the job gives a grid: it asks for a sampled aperture.)
  const regions = !c.grid && c.illumination.kind === 'plane' && c.illumination.tilt[0] === 0 && c.illumination.tilt[1] === 0 ? boundaryRegionsOf(c.aperture) : null;
  if (regions) {
    // A plane wave at normal incidence: the integral over the aperture becomes one along its
    // boundary (src/optics/rs-boundary.ts), exact and a line integral per output point.
    const out = [0, 1].map((i) => directAxisPlan(g, i, c, 'rayleigh-sommerfeld'));
    const cost = costRsBoundary(regions, g.lam, g.z, out[0]!.output, out[1]!.output);
    const whole = (i: number) => ({ pitch: 2 * g.aEff[i]!, required: 2 * g.aEff[i]!, rule: 'none: the integral runs along the aperture\'s edges (boundary form)' });
    const axes = [0, 1].map((i) => axisPlan(g, i, whole(i), 1, 1, out[i]!.output));
    list.push({ form: 'boundary', axes, layout: 'two-d', memory: BASELINE_MEMORY + cost.memory, work: cost.work });
  }
  if (g.obstructed) {
    // The beam where an obstacle is not: area-sampled cells (the exact edge cells are built for
    // holes). Area-sampled edge cells carry their open fraction over the whole cell: the error grows
    // as (pitch·sin θ/λ)² at the steepest ray into the window (rsAreaSamplingError, measured).
    const sMax = Math.max(steepestDirection(g), 1e-6);
    const ref = g.lam;
    const areaPitch = ref * Math.sqrt(LIMITS.rsAreaError / rsAreaSamplingError(ref, g.lam, sMax));
    const p = pitchFor(g, c, { pitch: Math.min(cell, areaPitch), rule: `the finer of the kernel's curvature rule and the area-sampled edge cells' error at the steepest ray into the window (sin θ = ${fmt(sMax, 3)})` }, LIMITS.featureSamples2D);
    const out = [0, 1].map((i) => directAxisPlan(g, i, c, 'rayleigh-sommerfeld'));
    const n = [0, 1].map((i) => c.grid?.size ?? 2 * Math.ceil(g.aEff[i]! / p.pitch + 0.5) + 1);
    const axes = [0, 1].map((i) => axisPlan(g, i, p, n[i]!, n[i]!, out[i]!.output));
    const cells = n[0]! * n[1]!;
    const outputs = out[0]!.output.n * out[1]!.output.n;
    return [...list, { form: 'direct', axes, layout: 'two-d', memory: BASELINE_MEMORY + 16 * (3 * cells) + 64 * outputs, work: costRsDirect2D(cells, outputs) }];
  }
  // Boxes for every wholly open cell and Gauss–Legendre nodes with exact weights in the cells an
  // edge crosses (src/optics/rs-2d-*.ts): the pitch and node count are the cheapest that keep the
  // error within the target; round and mirror-symmetric sources take the radial or mirror path.
  const out = [0, 1].map((i) => directAxisPlan(g, i, c, 'rayleigh-sommerfeld'));
  const s2 = rs2DSampling(c.aperture, c.illumination, g.lam, g.z, out[0]!.output, out[1]!.output, LIMITS.rsExactTarget);
  const pitch = c.grid?.pitch ? Math.min(c.grid.pitch, s2.pitch) : s2.pitch;
  const rule = { pitch, required: s2.pitch, rule: `boxes of ${len(s2.pitch)} with exact edges (${s2.edgeNodes}² nodes in each edge cell), the cheapest that keeps the error within ${LIMITS.rsExactTarget} of the peak; ${s2.choice.path} path` };
  const n = [0, 1].map((i) => 2 * Math.ceil(g.aEff[i]! / pitch + 0.5) + 1);
  const axes = [0, 1].map((i) => axisPlan(g, i, rule, n[i]!, n[i]!, out[i]!.output));
  return [...list, { form: 'direct', axes, layout: 'two-d', memory: BASELINE_MEMORY + s2.choice.memory, work: s2.choice.work, exact2D: { edgeNodes: s2.edgeNodes, path: s2.choice.path } }];
}

/** Most slits of a 2-D grating (one with a length) whose exact 2-D sums the planner costs. */
const MAX_COSTED_SLITS = 16384;

/**
 * The angular spectrum in the frame of a tilted beam (src/optics/shifted-spectrum.ts): the carrier
 * is taken out of the source and the grid shifted to where the beam lands, so the grid is as large
 * as the beam, not as the span from the aperture to the window, and its pitch resolves the
 * envelope, not the carrier. For one tilted beam (a plain aperture); a grating's orders go in many
 * directions at once.
 */
function shiftedSampling(g: Geometry, c: Case, layout: Layout): Sampling | null {
  const tilted = g.carrier[0] !== 0 || (!g.oneD && g.carrier[1] !== 0);
  if (!tilted || g.model.propagating.length !== 1 || c.grid?.size) return null;
  const lam = g.lam;
  const carrier: [number, number] = [g.carrier[0], g.oneD ? 0 : g.carrier[1]];
  const feature = g.facts.minFeature / featureSamples(g, false);
  const beamPitch = Number.isFinite(g.waist) ? g.waist / 8 : Infinity;
  const maxPitch: [number, number] = [Math.min(feature, beamPitch), Math.min(feature, beamPitch)];
  let grid;
  try {
    grid = shiftedGridFor({
      wavelength: lam,
      z: g.z,
      carrier,
      centre: [g.centre[0], g.oneD ? 0 : g.centre[1]],
      footprint: [g.aEff[0], g.oneD ? 0 : g.aEff[1]],
      window: [g.windowHalf[0], g.oneD ? 0 : g.windowHalf[1]],
      oneD: g.oneD,
      samplesPerPeriod: oversampling(g, false),
      maxPitch,
      ...(c.grid?.pitch ? { pitch: [c.grid.pitch, c.grid.pitch] as [number, number] } : {}),
      tail: Number.isFinite(g.waist) && illuminatedEdgeWeight(g.facts, g.waist, g.oneD) < 1e-4 ? gaussianSpectrumTail(g.waist) : edgeSpectrumTail(g.model.beamEdgesPerPower),
      target: LIMITS.bandLimitTarget,
      maxSamples: g.oneD ? 1 << 24 : 1 << 16,
    });
  } catch {
    return null;
  }
  const axes = (g.oneD ? [0] : [0, 1]).map((i) => {
    const p = grid.pitch[i]!;
    const padded = grid.samples[i]!;
    const n = Math.min(padded, nextPowerOfTwo(Math.ceil((2 * g.aEff[i]!) / p) + 2));
    // The output lattice is the grid's own, shifted by the centre.
    const lattice = fftAxis(padded, p);
    const output = windowOn({ n: lattice.n, start: lattice.start + grid.centre[i]!, step: p }, g.centre[i]!, g.windowHalf[i]!);
    const rule = { pitch: p, required: Math.min(p, maxPitch[i]!), rule: `the tilted beam's envelope, sampled in its own frame (the carrier taken out)` };
    return axisPlan(g, i, rule, n, padded, output);
  });
  return { form: 'shifted', axes, layout, ...costFft(axes, layout), shifted: { centre: grid.centre, taper: grid.taper, bandTaper: grid.bandTaper } };
}

/**
 * FFT grids. The pitch resolves the highest spatial frequency that reaches the window,
 * sin θ/λ of the steepest ray from the aperture into it (q samples per period of it). Where the
 * window takes in steep rays (short distances, wide windows) that rule reaches λ/4 (2-D) or λ/8
 * (1-D): the area-sampled edge is not band-limited, and its spectrum beyond the grid's band folds
 * back into the propagating band — far away the folded light leaves the window, close to the
 * aperture it lands in it. Below λ/2 the grid carries evanescent frequencies, which the angular
 * spectrum damps correctly.
 */
function fftAxisPlan(g: Geometry, i: number, c: Case, method: MethodName): AxisPlan {
  const factorises = method === 'fresnel' || method === 'fraunhofer';
  const q = oversampling(g, factorises);
  let contentRule: { pitch: number; rule: string };
  if (method === 'angular-spectrum') {
    const s = steepestDirection(g);
    // Close to the aperture (the window takes in nearly every direction) the folded-back edge
    // spectrum lands in the window: twice the samples there (measured on a 5 µm pinhole at 2λ:
    // 1.4 % of the peak on axis at λ/4, against the exact Rayleigh–Sommerfeld value).
    const qq = s > LIMITS.steepWindow && illuminatedEdgeWeight(g.facts, g.waist, g.oneD) > 1e-4 ? 2 * q : q;
    contentRule = {
      pitch: g.lam / (qq * s),
      rule: `${qq}× the highest spatial frequency that reaches the window, sin θ/λ = ${fmt(s, 3)}/λ${qq > q ? ' (doubled: the window takes in nearly every direction, where folded-back edge spectrum would land)' : ''}`,
    };
  } else {
    const reach = g.windowHalf[i]! + Math.abs(g.centre[i]!) + g.aEff[i]!;
    const content = (g.lam * g.z) / (q * reach);
    contentRule = { pitch: content, rule: `${q}× the highest spatial frequency that reaches the window, λz/(${q}·${len(reach)})` };
  }
  return fftAxisPlanOf(g, i, c, contentRule, factorises, (width) => paddingFactor(g, method, width));
}

/**
 * The angular spectrum's band limit cuts the spectrum at f ≈ L_pad/(2λz). The cut light would land
 * outside the window, but a sharp spectral cut rings back into it, so the padding is doubled when
 * the edge-tail estimate says more than LIMITS.bandLimitTarget of the power lies beyond the limit.
 */
function paddingFactor(g: Geometry, method: MethodName, width: number): number {
  if (method !== 'angular-spectrum') return LIMITS.padding;
  const beyond = (pad: number) => {
    // Light at the band-limit angle (sin θ = λ f) lands z·tan θ away.
    const s = Math.min(0.999, g.lam * bandLimitFrequency(g.z, g.lam, pad * width));
    return edgeTail(g.model, g.lam, g.z, (g.z * s) / Math.sqrt(1 - s * s));
  };
  return beyond(LIMITS.padding) > LIMITS.bandLimitTarget ? 2 * LIMITS.padding : LIMITS.padding;
}

function directAxisPlan(g: Geometry, i: number, c: Case, method: 'fresnel' | 'fraunhofer' | 'rayleigh-sommerfeld'): AxisPlan {
  return method === 'fresnel' ? fresnelDirectAxisPlan(g, i, c) : directionCosineAxisPlan(g, i, c, method === 'fraunhofer');
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
  const files = (c.output.npy === 'float32' ? 4 : 8) * m + csv + 8 * rows * 400 + 4 * 1024 ** 2;
  s.memory = Math.max(s.memory + csv, BASELINE_MEMORY + held + files, answers > 0 ? held + answers : 0);
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
  // the variants and the limit, so remembering it changes no result).
  const key = JSON.stringify([maxMemoryBytes ?? null, variants]);
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

/**
 * The far-field formula's cost by the path direct.ts takes: a 1-D sum per output sample; for
 * separable apertures each factor's spectrum tabulated (steps of 1/(32·reach)) and interpolated;
 * for round untilted apertures one radial line of the spectrum, interpolated; otherwise, where
 * x/(λr) ≈ x/(λz) holds across the aperture (mappingError), two matrix products, else a sum per
 * output point.
 */
function costFarField(axes: AxisPlan[], layout: Layout, g: Geometry, c: Case): { memory: number; work: number } {
  const m = axes.reduce((p, a) => p * a.output.n, 1);
  const table = (a: AxisPlan) => {
    const reach = a.apertureHalf + a.inputPitch;
    const fSpan = (2 * (Math.abs(a.windowCentre) + a.windowHalf)) / (g.lam * g.z);
    return Math.ceil(32 * reach * fSpan) + 5;
  };
  if (layout === 'one-d') {
    const a = axes[0]!;
    return { memory: BASELINE_MEMORY + 16 * (2 * a.inputSamples + 2 * a.output.n), work: 8 * a.inputSamples * a.output.n + 20 * m };
  }
  if (layout === 'separable') {
    const mem = axes.reduce((s, a) => s + 16 * (2 * a.inputSamples + table(a)), 0);
    return { memory: BASELINE_MEMORY + mem + 64 * m, work: axes.reduce((s, a) => s + 8 * a.inputSamples * table(a), 0) + 60 * m };
  }
  const [x, y] = axes as [AxisPlan, AxisPlan];
  const nin = x.inputSamples * y.inputSamples;
  const mem = BASELINE_MEMORY + 16 * (2 * nin + x.output.n * x.inputSamples + y.output.n * y.inputSamples + y.inputSamples * x.output.n) + 64 * m;
  const untilted = c.illumination.tilt[0] === 0 && c.illumination.tilt[1] === 0;
  if (untilted && (c.aperture.shape === 'circle' || c.aperture.shape === 'annulus')) {
    // The line reaches as far as the source grid does (direct.ts: its whole extent, not the aperture's).
    const reach = Math.max(((x.inputSamples - 1) / 2) * x.inputPitch, ((y.inputSamples - 1) / 2) * y.inputPitch) + x.inputPitch;
    const fMax = (Math.SQRT2 * Math.max(x.windowHalf, y.windowHalf)) / (g.lam * g.z);
    const entries = Math.ceil(32 * reach * fMax) + 5;
    // The radial line is one dft2 onto (entries × 1) frequencies: its kernel (entries × nx), the
    // row pass (ny × entries), the line and its frequencies (direct.ts radialFarFieldSpectrum).
    const line = 16 * entries * (x.inputSamples + y.inputSamples + 2) + 8 * entries;
    return { memory: mem + line, work: 8 * nin * entries + 40 * m };
  }
  const outX = x.output;
  const outY = y.output;
  if (mappingError([x.apertureHalf, y.apertureHalf], g.z, outX, outY, g.lam) <= 1e-4) {
    return { memory: mem, work: 8 * (nin * x.output.n + y.output.n * y.inputSamples * x.output.n) + 40 * m };
  }
  // Wide windows: the spectrum tabulated once and interpolated (spectrum-table.ts).
  const t = costFarFieldTable({ nx: x.inputSamples, ny: y.inputSamples, dx: x.inputPitch, dy: y.inputPitch }, farFieldBand(outX, outY, g.z, g.lam, g.carrier), m);
  return { memory: BASELINE_MEMORY + 32 * nin + t.memory + 64 * m, work: t.work + 40 * m };
}

function samplingReasons(method: MethodName, form: MethodForm | undefined, axes: AxisPlan[], oneD: boolean): string[] {
  const names = oneD ? ['x'] : ['x', 'y'];
  const out: string[] = [];
  axes.forEach((a, i) => {
    const axis = names[i];
    const fft = method === 'angular-spectrum' || form === 'transfer-function';
    let tail: string;
    if (fft) tail = `${a.inputSamples} samples zero-padded to ${a.paddedSamples}; output ${a.output.n} samples at the same pitch.`;
    else if (form === 'single-fft') tail = `${a.inputSamples} samples over the illuminated aperture, zero-padded to ${a.paddedSamples} so that the output lattice λz/(NΔx) is ${len(a.output.step)}; ${a.output.n} samples in the window.`;
    else if (method === 'rayleigh-sommerfeld') tail = `${a.inputSamples} cells; output ${a.output.n} samples at ${len(a.output.step)}.`;
    else tail = `${a.inputSamples} samples over the illuminated aperture; output ${a.output.n} samples at ${len(a.output.step)}.`;
    out.push(`${axis}: aperture-plane ${method === 'rayleigh-sommerfeld' ? 'cells' : 'pitch'} ${len(a.inputPitch)} (${a.pitchRule}); ${tail}`);
  });
  return out;
}

/** A valid method that fits, other than `not`, to advise; null if there is none. */
function advisable(options: MethodOption[], not: MethodName): MethodOption | null {
  const ok = options.filter((o) => o.valid && o.fits && o.method !== not);
  if (ok.length === 0) return null;
  return ok.reduce((b, o) => ((o.work ?? Infinity) < (b.work ?? Infinity) ? o : b));
}

function adviceFor(options: MethodOption[], not: MethodName): string {
  const a = advisable(options, not);
  return a ? `use method: ${a.method} (valid here, and it fits)` : 'no valid method fits this case as given: narrow the window, or raise --max-memory or pass --accept-large';
}

function preChecks(
  c: Case,
  method: MethodName,
  form: MethodForm | undefined,
  checks: Checks,
  axes: AxisPlan[],
  g: Geometry,
  options: MethodOption[],
  maxMemory: number,
): Warning[] {
  const w: Warning[] = [];
  void maxMemory;
  if (checks.featureOverWavelength < LIMITS.vectorFeature) {
    w.push({
      code: 'near-wavelength',
      message: `the smallest feature (${len(g.facts.minFeature)}) is only ${fmt(checks.featureOverWavelength, 2)} λ: scalar diffraction loses accuracy there (polarisation, edge and thickness effects); a rigorous vector method is needed for quantitative results`,
    });
  }
  if (Number.isFinite(g.waist)) {
    // A beam that barely reaches the open part: what passes is its far tail, e^{−2r²/w²} of it.
    const r = g.obstructed ? Math.min(g.facts.halfExtent[0], g.oneD ? Infinity : g.facts.halfExtent[1]) : g.facts.nearestOpen;
    const passing = Math.exp((-2 * r * r) / (g.waist * g.waist));
    if (passing < LIMITS.littleLight) {
      w.push({
        code: 'little-light',
        message: `the ${len(g.waist)} beam passes only about ${passing.toExponential(1)} of its power (the open part begins ${len(r)} from its axis, ${fmt(r / g.waist, 2)} beam radii): the result is the beam's far tail, where the computed values are at the level of rounding and of the beam's truncation, and their relative accuracy is not controlled`,
      });
    }
  }
  if (g.z < LIMITS.vectorDistance * g.lam) {
    // The scalar integral is still evaluated exactly, but a screen within a wavelength or so of a
    // real (thick, conducting) screen sees its near field, which scalar theory does not describe.
    w.push({
      code: 'near-wavelength',
      message: `the screen is only ${fmt(g.z / g.lam, 2)} λ from the aperture: the evanescent near field of the real screen (its thickness, material and polarisation) dominates there, which scalar diffraction does not describe; a rigorous vector method is needed for quantitative results`,
    });
  }
  if (checks.samplesPerFeature < LIMITS.minSamplesPerFeature && method !== 'rayleigh-sommerfeld') {
    w.push({
      code: 'undersampled-feature',
      message: `only ${fmt(checks.samplesPerFeature, 2)} samples across the smallest feature (${len(g.facts.minFeature)}); at least ${LIMITS.minSamplesPerFeature} are needed for its edges to be resolved`,
    });
  }
  for (const a of axes) {
    if (a.inputPitch > a.requiredPitch * 1.0000001) {
      w.push({
        code: 'coarse-sampling',
        message: `pitch ${len(a.inputPitch)} is coarser than the ${len(a.requiredPitch)} the accuracy target needs (${a.pitchRule.replace(/^grid\.pitch as given \(the accuracy rules ask for [^:]*: /, '').replace(/\)$/, '')}); expect aliasing or missing fringes`,
      });
      break;
    }
  }
  const fft = method === 'angular-spectrum' || form === 'transfer-function';
  if (fft) {
    for (const a of axes) {
      const span = a.inputSamples * a.inputPitch;
      if (span < 2 * a.apertureHalf * 0.9999999 || (c.grid?.size && span < 2 * (Math.abs(a.windowCentre) + a.windowHalf))) {
        w.push({
          code: 'grid-too-small',
          message: `the grid (${a.inputSamples} × ${len(a.inputPitch)} = ${len(span)}) does not cover the aperture and the window; the field is cut and wraps around`,
        });
        break;
      }
    }
  } else if (c.grid?.size) {
    for (const a of axes) {
      if (a.inputSamples * a.inputPitch < 2 * a.apertureHalf * 0.9999999) {
        w.push({ code: 'grid-too-small', message: `the grid (${a.inputSamples} × ${len(a.inputPitch)}) does not cover the aperture (${len(2 * a.apertureHalf)}): the aperture is cut` });
        break;
      }
    }
  }
  if (method === 'fresnel' && checks.paraxialPhaseError > (g.babinet ? LIMITS.paraxialPhaseBabinet : LIMITS.paraxialPhase)) {
    const at = checks.paraxialWorst!;
    w.push({
      code: 'paraxial',
      message: `the Fresnel (paraxial) approximation is off where light lands: at (${len(at.at[0])}${g.oneD ? '' : `, ${len(at.at[1])}`}) it drops ${fmt(at.phase, 2)} rad of phase across the aperture where the light is ${pct(at.weight)} of the peak (weighted ${fmt(checks.paraxialPhaseError, 2)} rad, limit ${g.babinet ? LIMITS.paraxialPhaseBabinet : LIMITS.paraxialPhase} rad; Goodman's sufficient condition ratio ${fmt(checks.goodmanRatio, 2)}): positions and intensities there are off; ${adviceFor(options, 'fresnel')}`,
    });
  }
  if (method === 'fraunhofer' && checks.farFieldPeakError > LIMITS.farFieldPeakErrorWarn) {
    w.push({
      code: 'not-far-field',
      message: `the far-field formula neglects the aperture's quadratic phase π·N_F = ${fmt(checks.farFieldPhaseError, 2)} rad here (N_F = ${fmt(checks.effectiveFresnelNumber, 3)}; far field from ${len(checks.farFieldDistance)}), about ${pct(checks.farFieldPeakError)} at the peak: the pattern is not yet the far-field one; ${adviceFor(options, 'fraunhofer')}`,
    });
  }
  if (checks.transferSampling !== undefined && checks.transferSampling < 1) {
    w.push({
      code: 'transfer-undersampled',
      message: `the Fresnel transfer function is under-sampled (Δx = ${fmt(checks.transferSampling, 2)}·λz/L < λz/L, Voelz): expect aliasing; without grid.size the planner picks a Fresnel form that is sampled correctly here`,
    });
  }
  if (!fft) {
    for (const a of axes) {
      const d = 2 * a.apertureHalf;
      const nyquist = (g.lam * g.z) / (2 * d);
      if (a.output.step > nyquist * 1.0000001) {
        w.push({
          code: 'output-undersampled',
          message: `the output pitch ${len(a.output.step)} is coarser than the intensity's Nyquist pitch λz/(2D) = ${len(nyquist)}: fringes are not resolved in the window (${len(2 * a.windowHalf)}); narrow the window`,
        });
        break;
      }
    }
  }
  return w;
}
