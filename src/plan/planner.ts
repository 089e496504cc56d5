// The planner: for one case, the Fresnel number and regime, the method, the sampling of the
// aperture plane and of the observation window, the validity checks that can be made before
// computing, a memory estimate, and the reasons for each choice in words.
import { apertureFacts, type ApertureFacts } from '../optics/aperture.js';
import { centredAxis, fftAxis, type Axis } from '../optics/field.js';
import { nextPowerOfTwo } from '../optics/fft.js';
import { directionCosines } from '../optics/source.js';
import { bandLimitFrequency } from '../optics/spectral.js';
import { formatLength, trimNumber } from '../job/units.js';
import type { AxisPlan, Case, Checks, FresnelForm, Layout, MethodName, Plan, Regime, Warning } from './types.js';
import { LIMITS } from './limits.js';

export interface PlannerOptions {
  /** A case whose estimated peak memory exceeds this is not computed (bytes). */
  maxMemoryBytes?: number;
  /**
   * Fewest output samples per axis of direct methods (default: enough for a picture). Searches
   * that only read a size off the result ask for fewer.
   */
  minOutputSamples?: number;
}

export const DEFAULT_MAX_MEMORY = 4 * 1024 ** 3;

interface Geometry {
  lam: number;
  z: number;
  k: number;
  facts: ApertureFacts;
  oneD: boolean;
  /** Half extent of the illuminated part of the aperture per axis. */
  aEff: [number, number];
  centre: [number, number];
  windowHalf: [number, number];
  waist: number; // Infinity for plane waves
  carrier: [number, number];
  minOutput: number;
}

const fmt = (x: number, d = 3) => trimNumber(x, d);
const len = (x: number) => formatLength(x, 3);

export function planCase(c: Case, opts: PlannerOptions = {}): Plan {
  const maxMemory = opts.maxMemoryBytes ?? DEFAULT_MAX_MEMORY;
  const lam = c.wavelength;
  const z = c.distance;
  const k = (2 * Math.PI) / lam;
  const facts = apertureFacts(c.aperture);
  const oneD = facts.oneD;
  const ill = c.illumination;
  const warnings: Warning[] = [];
  const reasons: string[] = [];
  const [alpha, beta, gamma] = directionCosines(ill);
  if (oneD && ill.tilt[1] !== 0) {
    warnings.push({
      code: 'tilt-y-ignored',
      message: 'illumination.tilt[1] (along the slits) is ignored: a 1-D aperture is computed in the x–z plane only',
    });
  }
  const waist = ill.kind === 'gaussian' ? ill.waist : Infinity;
  const aEff: [number, number] = [
    Math.min(facts.halfExtent[0], LIMITS.gaussianReach * waist),
    oneD ? 0 : Math.min(facts.halfExtent[1], LIMITS.gaussianReach * waist),
  ];

  // Fresnel numbers and regime.
  const nfx = facts.characteristic[0] ** 2 / (lam * z);
  const nfy = oneD ? null : facts.characteristic[1] ** 2 / (lam * z);
  const beamA = (a: number) => Math.min(a, waist);
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

  // Observation window.
  const centre: [number, number] = [(z * alpha) / gamma, oneD ? 0 : (z * beta) / gamma];
  const beamRadius = ill.kind === 'gaussian' ? beamRadiusAt(waist, lam, z) : undefined;
  const margin = tailMargin(facts, waist, lam, z, oneD);
  const fresnelScale = Math.sqrt((lam * z) / 2);
  const windowHalf: [number, number] = [0, 0];
  for (const i of oneD ? [0] : [0, 1]) {
    if (c.window) {
      windowHalf[i] = c.window[i]! / 2;
      continue;
    }
    const body = Math.max(aEff[i]!, beamRadius !== undefined ? LIMITS.beamWindow * beamRadius : 0);
    const edge = regime === 'near-field' ? Math.max(margin, 2 * fresnelScale) : margin;
    windowHalf[i] = Math.max(body + edge, LIMITS.minWindowOverAperture * aEff[i]!);
  }
  if (!c.window && !oneD && !facts.separable) {
    // Round spots get a square window.
    const w = Math.max(windowHalf[0], windowHalf[1]);
    windowHalf[0] = w;
    windowHalf[1] = w;
  }
  const windowLossEstimate = estimateWindowLoss(facts, waist, lam, z, oneD, aEff, windowHalf, beamRadius);
  reasons.push(
    c.window
      ? `window ${len(2 * windowHalf[0])}${oneD ? '' : ` × ${len(2 * windowHalf[1])}`} as given; about ${pct(windowLossEstimate)} of the power is expected to fall outside it.`
      : `window ${len(2 * windowHalf[0])}${oneD ? '' : ` × ${len(2 * windowHalf[1])}`}: the illuminated aperture plus a margin that should hold all but ≈${pct(windowLossEstimate)} of the power (target ${pct(LIMITS.windowLossTarget)}).`,
  );
  if (centre[0] !== 0 || centre[1] !== 0) {
    reasons.push(`window centred on the tilted beam at (${len(centre[0])}, ${len(centre[1])}) = z·tan θ.`);
  }

  const geo: Geometry = {
    lam,
    z,
    k,
    facts,
    oneD,
    aEff,
    centre,
    windowHalf,
    waist,
    carrier: [alpha / lam, beta / lam],
    minOutput: opts.minOutputSamples ?? (oneD ? LIMITS.minOutput1D : LIMITS.minOutput2D),
  };
  const paraxialPhaseError = paraxialError(geo);
  const goodmanRatio = goodman(geo);
  const farFieldPhaseError = Math.PI * nfEff;
  const beamLimited = ill.kind === 'gaussian' && waist < Math.min(facts.characteristic[0], oneD ? Infinity : facts.characteristic[1]);
  let farFieldPeakError = beamLimited ? farFieldPhaseError ** 2 : farFieldPhaseError ** 2 / 12;
  if (c.aperture.opaque) {
    // Behind an obstacle the hole's field interferes with the free beam, so its phase error (about
    // πN_F/3 on the axis) enters linearly, scaled by the hole's amplitude relative to the beam
    // (area/λz in 2-D, width/√(λz) in 1-D, at most about 2).
    const holeAmplitude = Math.min(2, oneD ? facts.openMeasure / Math.sqrt(lam * z) : facts.openMeasure / (lam * z));
    farFieldPeakError = Math.max(farFieldPeakError, (2 * farFieldPhaseError * holeAmplitude) / 3);
  }

  // Method.
  const minFeature = facts.minFeature;
  const candidates = chooseMethods(c.method, geo, paraxialPhaseError, farFieldPhaseError, farFieldPeakError, reasons);
  type Chosen = Sampling & { method: MethodName };
  let chosen: Chosen | undefined;
  let firstTooBig: Chosen | undefined;
  for (const method of candidates) {
    const s: Chosen = { method, ...sample(method, geo, c) };
    if (s.memory <= maxMemory) {
      chosen = s;
      break;
    }
    firstTooBig ??= s;
    if (c.method === 'auto') {
      reasons.push(`${methodWords(method)} would need ${bytes(s.memory)} (over the ${bytes(maxMemory)} limit); trying the next method.`);
    }
  }
  let error: string | undefined;
  if (!chosen) {
    // Nothing fits: the plan of the preferred method is kept, so that `plan` can show it, and the
    // case is refused with the estimate and how to lower it.
    chosen = firstTooBig!;
    error =
      `needs about ${bytes(chosen.memory)} (limit ${bytes(maxMemory)}): ${methodWords(chosen.method)} on ` +
      `${chosen.axes.map((a) => a.paddedSamples).join(' × ')} samples at ${len(chosen.axes[0]!.inputPitch)}. ` +
      `Lower it with a smaller window, a coarser grid.pitch, ${c.method === 'auto' ? 'or' : 'method: auto or'} a larger limit (--max-memory).`;
  }
  const method = chosen.method;
  const [xPlan, yPlan] = chosen.axes;

  // Validity checks that can be made before computing.
  const samplesPerFeature = minFeature / Math.max(xPlan!.inputPitch, yPlan?.inputPitch ?? 0);
  const checks: Checks = {
    fresnelNumbers: [nfx, nfy],
    effectiveFresnelNumber: nfEff,
    farFieldDistance,
    paraxialPhaseError,
    goodmanRatio,
    farFieldPhaseError,
    farFieldPeakError,
    windowLossEstimate,
    featureOverWavelength: minFeature / lam,
    samplesPerFeature,
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
  warnings.push(...preChecks(c, method, chosen.form, checks, chosen.axes, geo));

  const plan: Plan = {
    case: c,
    regime,
    method,
    ...(chosen.form ? { form: chosen.form } : {}),
    layout: chosen.layout,
    babinet: c.aperture.opaque,
    x: xPlan!,
    y: yPlan ?? null,
    checks,
    reasons,
    warnings,
    memoryBytes: chosen.memory,
    work: chosen.work,
    ...(beamRadius !== undefined ? { beamRadius } : {}),
    ...(error ? { error } : {}),
  };
  return plan;
}

function regimeWords(r: Regime): string {
  return r === 'near-field'
    ? 'near field (N_F > 1: the pattern still resembles the aperture)'
    : r === 'transition'
      ? 'transition (1/8 < N_F ≤ 1: Fresnel regime, neither shadow nor far-field pattern)'
      : 'far field (N_F ≤ 1/8: the pattern is the Fourier transform of the aperture)';
}

const FORM_WORDS: Record<FresnelForm, string> = {
  'transfer-function': 'transfer-function form',
  'single-fft': 'single-transform form by one FFT',
  direct: 'single-transform form by direct sums onto the window',
};

export function methodWords(m: MethodName, form?: FresnelForm): string {
  return m === 'angular-spectrum'
    ? 'angular spectrum'
    : m === 'fresnel'
      ? `Fresnel${form ? ` (${FORM_WORDS[form]})` : ''}`
      : 'far-field formula';
}

function pct(x: number): string {
  if (x < 1e-4) return '<0.01 %';
  return `${trimNumber(100 * x, 2)} %`;
}

export function bytes(n: number): string {
  if (n >= 1024 ** 3) return `${trimNumber(n / 1024 ** 3, 3)} GiB`;
  if (n >= 1024 ** 2) return `${trimNumber(n / 1024 ** 2, 3)} MiB`;
  return `${trimNumber(n / 1024, 3)} KiB`;
}

export function beamRadiusAt(w0: number, lam: number, z: number): number {
  const zr = (Math.PI * w0 * w0) / lam;
  return w0 * Math.sqrt(1 + (z / zr) ** 2);
}

/**
 * Edge-diffraction tails: far outside the geometric spot an edge of length ℓ (per unit length of
 * edge) scatters power ≈ λz/(2π²u)·I_edge beyond a distance u (Fresnel edge and far-field sinc²/Airy
 * tails share this 1/u law; e.g. Airy: 1 − EE(r) ≈ 2λz/(π²Dr)). Solving for the target loss gives
 * the margin around the aperture's projection.
 */
function tailMargin(f: ApertureFacts, waist: number, lam: number, z: number, oneD: boolean): number {
  const { edgeWeight, power } = illuminatedEdges(f, waist, oneD);
  return (f.edgeMeasure * edgeWeight * lam * z) / (2 * Math.PI ** 2 * power * LIMITS.windowLossTarget);
}

function illuminatedEdges(f: ApertureFacts, waist: number, oneD: boolean) {
  if (!Number.isFinite(waist)) return { edgeWeight: 1, power: f.openMeasure };
  const edgeDist = oneD ? f.halfExtent[0] : Math.min(f.halfExtent[0], f.halfExtent[1]);
  const edgeWeight = Math.exp((-2 * edgeDist * edgeDist) / (waist * waist));
  const beamPower = oneD ? waist * Math.sqrt(Math.PI / 2) : (Math.PI * waist * waist) / 2;
  return { edgeWeight, power: Math.min(f.openMeasure, beamPower) };
}

/** Fraction of the power that edge diffraction sends farther than u beyond the geometric spot. */
function edgeTail(f: ApertureFacts, waist: number, lam: number, z: number, oneD: boolean, u: number): number {
  if (!(u > 0)) return 0.5;
  const { edgeWeight, power } = illuminatedEdges(f, waist, oneD);
  return Math.min(1, (f.edgeMeasure * edgeWeight * lam * z) / (2 * Math.PI ** 2 * power * u));
}

function estimateWindowLoss(
  f: ApertureFacts,
  waist: number,
  lam: number,
  z: number,
  oneD: boolean,
  aEff: [number, number],
  windowHalf: [number, number],
  beamRadius?: number,
): number {
  const axes = oneD ? [0] : [0, 1];
  const u = Math.min(...axes.map((i) => windowHalf[i]! - aEff[i]!));
  let loss = edgeTail(f, waist, lam, z, oneD, u);
  if (beamRadius !== undefined) {
    // A Gaussian profile outside the window half-width (per axis, intensity ∝ exp(−2x²/w²)).
    for (const i of axes) loss += erfcApprox((Math.SQRT2 * windowHalf[i]!) / beamRadius);
  }
  return Math.min(1, loss);
}

function erfcApprox(x: number): number {
  // Abramowitz & Stegun 7.1.26 (|error| < 1.5e-7), enough for an estimate.
  const t = 1 / (1 + 0.3275911 * x);
  const y = t * (0.254829592 + t * (-0.284496736 + t * (1.421413741 + t * (-1.453152027 + t * 1.061405429))));
  return y * Math.exp(-x * x);
}

/**
 * Peak-to-peak quartic phase dropped by the Fresnel approximation, k|x−ξ|⁴/(8z³), across the
 * aperture, for observation points in the spot region (the illuminated aperture plus three
 * far-field lobe widths, within the window). What matters for intensities is its variation over ξ,
 * not its value, so this is far less strict than Goodman's sufficient condition. The variation is
 * evaluated at the spot region's centre, edges and corners against aperture points at the edges,
 * the quarters, the centre and the point nearest the observer (where it is smallest): the x and y
 * extents stay apart, so a long slit's length does not count against its far-field width.
 */
function paraxialError(g: Geometry): number {
  const axes = g.oneD ? [0] : [0, 1];
  const obs: number[][] = [];
  const ap: number[][] = [];
  for (const i of axes) {
    const a = g.aEff[i]!;
    const core = Math.min(g.windowHalf[i]!, a + (3 * g.lam * g.z) / (2 * Math.max(a, 1e-30)));
    const c = g.centre[i]!;
    obs.push([c - core, c, c + core]);
    ap.push([-a, -a / 2, 0, a / 2, a]);
  }
  let worst = 0;
  const quartic = (d2: number) => (g.k * d2 * d2) / (8 * g.z ** 3);
  const clamp = (v: number, a: number) => Math.max(-a, Math.min(a, v));
  for (const x of obs[0]!) {
    for (const y of g.oneD ? [0] : obs[1]!) {
      let lo = Infinity;
      let hi = -Infinity;
      const xs = [...ap[0]!, clamp(x, g.aEff[0]!)];
      const ys = g.oneD ? [0] : [...ap[1]!, clamp(y, g.aEff[1]!)];
      for (const xi of xs) {
        for (const eta of ys) {
          const phi = quartic((x - xi) ** 2 + (y - eta) ** 2);
          lo = Math.min(lo, phi);
          hi = Math.max(hi, phi);
        }
      }
      worst = Math.max(worst, hi - lo);
    }
  }
  return worst;
}

function goodman(g: Geometry): number {
  const axes = g.oneD ? [0] : [0, 1];
  let rho2 = 0;
  for (const i of axes) rho2 += (Math.abs(g.centre[i]!) + g.windowHalf[i]! + g.aEff[i]!) ** 2;
  return (Math.PI * rho2 * rho2) / (4 * g.lam * g.z ** 3);
}

function chooseMethods(
  request: Case['method'],
  g: Geometry,
  paraxialPhase: number,
  farFieldPhase: number,
  farFieldError: number,
  reasons: string[],
): MethodName[] {
  const paraxialOk = paraxialPhase <= LIMITS.paraxialPhase;
  const farFieldOk = farFieldError <= LIMITS.farFieldPeakError;
  const separable = g.facts.separable;
  if (request !== 'auto') {
    reasons.push(`${methodWords(request)} as requested.`);
    return [request];
  }
  const parax = `the paraxial (Fresnel) approximation drops a phase of ${fmt(paraxialPhase, 2)} rad peak-to-peak over the spot region (limit ${LIMITS.paraxialPhase} rad)`;
  // The cheapest method that is valid: the far-field formula, else Fresnel, else the exact angular
  // spectrum. Later entries are fallbacks when memory does not allow the first.
  if (farFieldOk) {
    reasons.push(
      `far-field formula chosen: the aperture's own quadratic phase π·N_F = ${fmt(farFieldPhase, 2)} rad that it neglects ` +
        `changes the peak by about ${pct(farFieldError)} (limit ${pct(LIMITS.farFieldPeakError)}); it is evaluated in direction cosines, so wide angles are not paraxial.`,
    );
    return ['fraunhofer', 'fresnel'];
  }
  if (paraxialOk) {
    reasons.push(
      `Fresnel chosen: ${parax}; the far-field formula would be off by about ${pct(farFieldError)} at the peak (π·N_F = ${fmt(farFieldPhase, 2)} rad)` +
        (separable ? '; the aperture is separable, so it is computed as 1-D problems.' : '.'),
    );
    return ['fresnel', 'angular-spectrum'];
  }
  reasons.push(`angular spectrum chosen (exact for scalar waves): ${parax.replace('drops', 'would drop')}.`);
  return ['angular-spectrum', 'fresnel', 'fraunhofer'];
}

interface Sampling {
  form?: FresnelForm;
  axes: AxisPlan[];
  layout: Layout;
  memory: number;
  work: number;
}

function sample(method: MethodName, g: Geometry, c: Case): Sampling {
  const axes = g.oneD ? [0] : [0, 1];
  const layout: Layout = g.oneD ? 'one-d' : g.facts.separable && method !== 'angular-spectrum' ? 'separable' : 'two-d';
  if (method === 'angular-spectrum') {
    const plans = axes.map((i) => fftAxisPlan(g, i, c, method));
    return { axes: plans, layout, ...costFft(plans, layout) };
  }
  if (method === 'fresnel') {
    // Three forms of the same integral. Voelz's rule: the transfer function is adequately sampled
    // when Δx ≥ λz/L. Where several forms are valid they give the same answer, and the cheapest
    // is taken; a grid.size names an FFT grid, so it asks for the transfer-function form.
    const tf = axes.map((i) => fftAxisPlan(g, i, c, method));
    const tfCost = costFft(tf, layout);
    const tfSampled = tf.every((p) => (p.inputPitch * p.inputPitch * p.paddedSamples) / (g.lam * g.z) >= 1);
    if (c.grid?.size) return { form: 'transfer-function', axes: tf, layout, ...tfCost };
    const direct = axes.map((i) => directAxisPlan(g, i, c, 'fresnel'));
    const options: Sampling[] = [{ form: 'direct', axes: direct, layout, ...costDirect(direct, layout, false) }];
    if (tfSampled) options.push({ form: 'transfer-function', axes: tf, layout, ...tfCost });
    const single = direct.map((d) => singleFftAxisPlan(g, d));
    if (single.every((a) => a.paddedSamples <= LIMITS.maxSingleFft)) {
      options.push({ form: 'single-fft', axes: single, layout, ...costFft(single, layout) });
    }
    return options.reduce((best, o) => (o.work < best.work ? o : best));
  }
  const plans = axes.map((i) => directAxisPlan(g, i, c, 'fraunhofer'));
  return { axes: plans, layout, ...costDirect(plans, layout, true) };
}

function pitchFor(
  g: Geometry,
  c: Case,
  contentRule: { pitch: number; rule: string },
  featureSamples: number,
) {
  const rules: { pitch: number; rule: string }[] = [
    { pitch: g.facts.minFeature / featureSamples, rule: `${featureSamples} samples across the smallest feature (${len(g.facts.minFeature)})` },
    contentRule,
  ];
  if (Number.isFinite(g.waist)) rules.push({ pitch: g.waist / 8, rule: `8 samples per beam radius (${len(g.waist)})` });
  let best = rules[0]!;
  for (const r of rules) if (r.pitch < best.pitch) best = r;
  const required = best.pitch;
  if (c.grid?.pitch) return { pitch: c.grid.pitch, required, rule: `grid.pitch as given (the accuracy rules ask for ${len(required)}: ${best.rule})` };
  return { pitch: required, required, rule: best.rule };
}

/** Separable apertures are computed as 1-D problems unless the angular spectrum needs a 2-D grid. */
function onTwoDGrid(g: Geometry, method: MethodName): boolean {
  return !g.oneD && !(g.facts.separable && method !== 'angular-spectrum');
}

function featureSamples(g: Geometry, method: MethodName): number {
  return onTwoDGrid(g, method) ? LIMITS.featureSamples2D : LIMITS.featureSamples1D;
}

function oversampling(g: Geometry, method: MethodName): number {
  return onTwoDGrid(g, method) ? LIMITS.oversampling2D : LIMITS.oversampling1D;
}

function fftAxisPlan(g: Geometry, i: number, c: Case, method: MethodName): AxisPlan {
  const reach = g.windowHalf[i]! + Math.abs(g.centre[i]!) + g.aEff[i]!;
  const q = oversampling(g, method);
  const content = (g.lam * g.z) / (q * reach);
  const contentRule =
    content < g.lam / 2
      ? { pitch: g.lam / 2, rule: 'λ/2: every propagating spatial frequency' }
      : { pitch: content, rule: `${q}× the highest spatial frequency that reaches the window, λz/(${q}·${len(reach)})` };
  const p = pitchFor(g, c, contentRule, featureSamples(g, method));
  const half = Math.max(g.facts.halfExtent[i]!, Math.abs(g.centre[i]!) + g.windowHalf[i]!);
  const minN = g.oneD ? LIMITS.minSamples1D : LIMITS.minSamples2D;
  const n = c.grid?.size ?? Math.max(minN, nextPowerOfTwo(Math.ceil((2 * half) / p.pitch) + 2));
  const padded = n * paddingFactor(g, method, n * p.pitch);
  // The output is the window cut out of the padded grid, on the same pitch.
  const output = windowOn(fftAxis(padded, p.pitch), g.centre[i]!, g.windowHalf[i]!);
  return axisPlan(g, i, p, n, padded, output);
}

function axisPlan(g: Geometry, i: number, p: { pitch: number; required: number; rule: string }, n: number, padded: number, output: Axis): AxisPlan {
  return {
    inputPitch: p.pitch,
    inputSamples: n,
    paddedSamples: padded,
    output,
    apertureHalf: g.aEff[i]!,
    windowHalf: g.windowHalf[i]!,
    windowCentre: g.centre[i]!,
    requiredPitch: p.required,
    pitchRule: p.rule,
  };
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
    return edgeTail(g.facts, g.waist, g.lam, g.z, g.oneD, (g.z * s) / Math.sqrt(1 - s * s));
  };
  return beyond(LIMITS.padding) > LIMITS.bandLimitTarget ? 2 * LIMITS.padding : LIMITS.padding;
}

function directAxisPlan(g: Geometry, i: number, c: Case, method: 'fresnel' | 'fraunhofer'): AxisPlan {
  const q = oversampling(g, method);
  const reach = g.windowHalf[i]! + Math.abs(g.centre[i]!) + g.aEff[i]!;
  let contentRule: { pitch: number; rule: string };
  if (method === 'fresnel') {
    contentRule = { pitch: (g.lam * g.z) / (q * reach), rule: `${q}× the highest frequency of the Fresnel integrand, λz/(${q}·${len(reach)})` };
  } else {
    const fmax = farFieldMaxFrequency(g, i);
    contentRule = { pitch: 1 / (q * fmax), rule: `${q}× the highest direction-cosine frequency in the window (${fmt(fmax * g.lam, 3)}/λ)` };
  }
  const p = pitchFor(g, c, contentRule, featureSamples(g, method));
  // The Fresnel form corrects the cell response on its own source grid and needs a margin for it.
  const margin = method === 'fresnel' ? LIMITS.compensationMargin : 0;
  const nIn = c.grid?.size ?? 2 * (Math.ceil(g.aEff[i]! / p.pitch + 0.5) + margin) + 1;
  // Output pitch: the intensity is band-limited to D/(λz) (D the illuminated width), so
  // λz/(8D) is 4× its Nyquist rate.
  const d = 2 * g.aEff[i]!;
  const nyquist = (g.lam * g.z) / (2 * d);
  const wanted = nyquist / 4;
  const [minM, maxM] = [g.minOutput, g.oneD ? LIMITS.maxOutput1D : LIMITS.maxOutput2D];
  let m = Math.ceil((2 * g.windowHalf[i]!) / wanted) + 1;
  m = Math.min(maxM, Math.max(minM, m));
  if (m % 2 === 0) m += 1;
  const output = centredAxis(m, (2 * g.windowHalf[i]!) / (m - 1), g.centre[i]!);
  return axisPlan(g, i, p, nIn, nIn, output);
}

/**
 * The single-FFT form samples the aperture like the direct form, zero-pads to n and lands on the
 * lattice λz/(nΔx): n is the power of two that makes that pitch at least as fine as the direct form's.
 */
function singleFftAxisPlan(g: Geometry, d: AxisPlan): AxisPlan {
  const target = Math.min(d.output.step, (2 * d.windowHalf) / (g.minOutput - 1));
  const n = nextPowerOfTwo(Math.max(d.inputSamples + 2, Math.ceil((g.lam * g.z) / (d.inputPitch * target))));
  const output = windowOn(fftAxis(n, (g.lam * g.z) / (n * d.inputPitch)), d.windowCentre, d.windowHalf);
  return { ...d, paddedSamples: n, output };
}

/** The samples of a lattice that fall inside [centre − half, centre + half]. */
function windowOn(full: Axis, centre: number, half: number): Axis {
  const lo = Math.max(0, Math.ceil((centre - half - full.start) / full.step - 1e-9));
  const hi = Math.min(full.n - 1, Math.floor((centre + half - full.start) / full.step + 1e-9));
  return { n: hi - lo + 1, start: full.start + lo * full.step, step: full.step };
}

function farFieldMaxFrequency(g: Geometry, i: number): number {
  // |x/(λr) − α/λ| at the two window edges, with the other coordinate at its window centre.
  let worst = 0;
  for (const s of [-1, 1]) {
    const x = g.centre[i]! + s * g.windowHalf[i]!;
    const other = g.oneD ? 0 : g.centre[1 - i]!;
    const r = Math.sqrt(x * x + other * other + g.z * g.z);
    worst = Math.max(worst, Math.abs(x / (g.lam * r) - g.carrier[i]!));
  }
  return Math.max(worst, 1e-30);
}

const BASELINE_MEMORY = 64 * 1024 ** 2;

function costFft(axes: AxisPlan[], layout: Layout): { memory: number; work: number } {
  const n = axes.reduce((p, a) => p * a.inputSamples, 1);
  const np = axes.reduce((p, a) => p * a.paddedSamples, 1);
  const m = axes.reduce((p, a) => p * a.output.n, 1);
  if (layout === 'separable') {
    // Two 1-D problems, then the 2-D product on the output window.
    const oneD = axes.reduce((s, a) => s + 16 * (a.inputSamples + a.paddedSamples + a.output.n), 0);
    return { memory: BASELINE_MEMORY + oneD + 64 * m, work: axes.reduce((s, a) => s + 10 * a.paddedSamples * Math.log2(a.paddedSamples), 0) + 20 * m };
  }
  // Source, padded grid, the FFT kernel's working copy of it (kept between calls), output arrays.
  return { memory: BASELINE_MEMORY + 16 * n + 32 * np + 64 * m, work: 10 * np * Math.log2(np) + 30 * np };
}

function costDirect(axes: AxisPlan[], layout: Layout, farField: boolean): { memory: number; work: number } {
  const m = axes.reduce((p, a) => p * a.output.n, 1);
  if (layout !== 'two-d') {
    const mem = axes.reduce((s, a) => s + 16 * (2 * a.inputSamples + 2 * a.output.n), 0);
    const work = axes.reduce((s, a) => s + 8 * a.inputSamples * (farField && layout === 'separable' ? m : a.output.n), 0);
    return { memory: BASELINE_MEMORY + mem + 64 * (layout === 'separable' ? m : 0), work: work + 20 * m };
  }
  const [x, y] = axes as [AxisPlan, AxisPlan];
  const nin = x.inputSamples * y.inputSamples;
  const mem = 16 * (2 * nin + x.output.n * x.inputSamples + y.output.n * y.inputSamples + y.inputSamples * x.output.n) + 64 * m;
  const separableWork = 8 * (nin * x.output.n + y.output.n * y.inputSamples * x.output.n);
  // The far field at wide angles is evaluated point by point (the fast separable path is used when
  // the mapping error allows; the estimate takes the slow path).
  const work = farField ? 8 * nin * m : separableWork;
  return { memory: BASELINE_MEMORY + mem, work };
}

function samplingReasons(method: MethodName, form: FresnelForm | undefined, axes: AxisPlan[], oneD: boolean): string[] {
  const names = oneD ? ['x'] : ['x', 'y'];
  const out: string[] = [];
  axes.forEach((a, i) => {
    const axis = names[i];
    const fft = method === 'angular-spectrum' || form === 'transfer-function';
    out.push(
      `${axis}: aperture-plane pitch ${len(a.inputPitch)} (${a.pitchRule}); ` +
        (fft
          ? `${a.inputSamples} samples zero-padded to ${a.paddedSamples}; output ${a.output.n} samples at the same pitch.`
          : form === 'single-fft'
            ? `${a.inputSamples} samples over the illuminated aperture, zero-padded to ${a.paddedSamples} so that the output lattice λz/(NΔx) is ${len(a.output.step)}; ${a.output.n} samples in the window.`
            : `${a.inputSamples} samples over the illuminated aperture; output ${a.output.n} samples at ${len(a.output.step)}.`),
    );
  });
  return out;
}

function preChecks(
  c: Case,
  method: MethodName,
  form: FresnelForm | undefined,
  checks: Checks,
  axes: AxisPlan[],
  g: Geometry,
): Warning[] {
  const w: Warning[] = [];
  if (checks.featureOverWavelength < LIMITS.vectorFeature) {
    w.push({
      code: 'near-wavelength',
      message: `the smallest feature (${len(g.facts.minFeature)}) is only ${fmt(checks.featureOverWavelength, 2)} λ: scalar diffraction loses accuracy there (polarisation, edge and thickness effects); a rigorous vector method is needed for quantitative results`,
    });
  }
  if (checks.samplesPerFeature < LIMITS.minSamplesPerFeature) {
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
  if (method === 'fresnel' && checks.paraxialPhaseError > LIMITS.paraxialPhase) {
    w.push({
      code: 'paraxial',
      message: `the Fresnel (paraxial) approximation drops ${fmt(checks.paraxialPhaseError, 2)} rad of phase over the spot region (limit ${LIMITS.paraxialPhase} rad; Goodman's sufficient condition ratio ${fmt(checks.goodmanRatio, 2)}): positions and intensities may be off; use method: angular-spectrum`,
    });
  }
  if (method === 'fraunhofer' && checks.farFieldPeakError > LIMITS.farFieldPeakErrorWarn) {
    w.push({
      code: 'not-far-field',
      message: `the far-field formula neglects the aperture's quadratic phase π·N_F = ${fmt(checks.farFieldPhaseError, 2)} rad here (N_F = ${fmt(checks.effectiveFresnelNumber, 3)}; far field from ${len(checks.farFieldDistance)}), about ${pct(checks.farFieldPeakError)} at the peak: the pattern is not yet the far-field one; use method: auto or fresnel`,
    });
  }
  if (checks.transferSampling !== undefined && checks.transferSampling < 1) {
    w.push({
      code: 'transfer-undersampled',
      message: `the Fresnel transfer function is under-sampled (Δx = ${fmt(checks.transferSampling, 2)}·λz/L < λz/L, Voelz): expect aliasing; the direct form would be right here`,
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
