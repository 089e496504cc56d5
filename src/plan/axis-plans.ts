// The sampling of one axis: the pitch the accuracy rules ask for, the aperture-plane samples (or
// cells), the padded FFT grid and the output window. The methods (src/methods/) pick the rules
// that apply to them; the arithmetic of grids and windows is here, once.
import { centredAxis, fftAxis, type Axis } from '../optics/field.js';
import { nextEvenFastFftSize, nextFastFftSize } from '../optics/fft.js';
import type { Case, AxisPlan } from './types.js';
import { LIMITS } from './limits.js';
import { featureSamples, lightFrom, oversampling, type Geometry } from './geometry.js';
import { fmt, len } from './words.js';

/** A pitch rule: the pitch and, in words, why. */
export interface PitchRule {
  pitch: number;
  rule: string;
}

export function axisPlan(g: Geometry, i: number, p: { pitch: number; required: number; rule: string }, n: number, padded: number, output: Axis): AxisPlan {
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

/** Samples per period of a phase element's highest local frequency. */
const PHASE_SAMPLES = 4;

export function pitchFor(g: Geometry, c: Case, contentRule: PitchRule, featureSamples: number) {
  const rules: PitchRule[] = [
    { pitch: g.facts.minFeature / featureSamples, rule: `${featureSamples} samples across the smallest feature (${len(g.facts.minFeature)})` },
    contentRule,
  ];
  if (Number.isFinite(g.waist)) {
    // Where the light passes far out in the beam's tail (an obstacle wider than the beam, an
    // opening beside it), the field falls by e over w²/(2r), shorter than the beam radius: that
    // length is what the samples must resolve (a 0.7 µm beam beside a 4.4 µm wire was 6.6 % off
    // at w/8).
    const r = lightFrom(g);
    const tail = r > g.waist / 2 ? (g.waist * g.waist) / (2 * r) : g.waist;
    rules.push(
      tail < g.waist
        ? { pitch: tail / 8, rule: `8 samples per e-fold of the beam's tail where the light passes (${len(tail)}, ${fmt(r / g.waist, 2)} beam radii out)` }
        : { pitch: g.waist / 8, rule: `8 samples per beam radius (${len(g.waist)})` },
    );
  }
  // A phase element's own finest period (a lens's rim), four samples per period (common practice).
  if (g.phaseFrequency && g.phaseFrequency > 0) {
    rules.push({ pitch: 1 / (PHASE_SAMPLES * g.phaseFrequency), rule: `${PHASE_SAMPLES} samples per period of the element's finest phase (local frequency ${fmt(g.phaseFrequency / 1e3, 3)} /mm)` });
  }
  let best = rules[0]!;
  for (const r of rules) if (r.pitch < best.pitch) best = r;
  const required = best.pitch;
  if (c.grid?.pitch) return { pitch: c.grid.pitch, required, rule: `grid.pitch as given (the accuracy rules ask for ${len(required)}: ${best.rule})` };
  return { pitch: required, required, rule: best.rule };
}

/** The samples of a lattice that fall inside [centre − half, centre + half]. */
export function windowOn(full: Axis, centre: number, half: number): Axis {
  const lo = Math.max(0, Math.ceil((centre - half - full.start) / full.step - 1e-9));
  const hi = Math.min(full.n - 1, Math.floor((centre + half - full.start) / full.step + 1e-9));
  return { n: hi - lo + 1, start: full.start + lo * full.step, step: full.step };
}

/**
 * An FFT grid. `content` is the method's rule for the highest spatial frequency that reaches the
 * window; `padding` the zero-padding factor for a grid of the given width. The grid holds the
 * illuminated aperture (a Gaussian beam narrower than the aperture is cut at e⁻⁹ of its amplitude)
 * and the window; the output is the window cut out of the padded grid, on the same pitch.
 */
export function fftAxisPlan(g: Geometry, i: number, c: Case, content: PitchRule, factorises: boolean, padding: (width: number) => number): AxisPlan {
  let contentRule = content;
  // The output of an FFT method is on the input's lattice: a detector needs ten samples across.
  const detector = Math.min(Infinity, ...c.analysis.detectors.map((det) => det.size / 10));
  if (detector < contentRule.pitch) contentRule = { pitch: detector, rule: `ten samples across the smallest detector (${len(10 * detector)})` };
  const p = pitchFor(g, c, contentRule, featureSamples(g, factorises));
  const half = Math.max(g.aEff[i]!, Math.abs(g.centre[i]!) + g.windowHalf[i]!);
  const minN = g.oneD ? LIMITS.minSamples1D : LIMITS.minSamples2D;
  // The aperture and the window, two samples to spare; the padded grid is the cheapest FFT size
  // (5-smooth) that gives at least the padding factor over them: padding·n samples, so the band
  // limit and the wrap-around distance are at least what the factor asks for.
  const n = c.grid?.size ?? Math.max(minN, Math.ceil((2 * half) / p.pitch) + 2);
  const padded = nextFastFftSize(n * padding(n * p.pitch));
  // A sweep's shared grid, where it is as fine, holds as much and is as wide as this case's own
  // (plan/shared-grids.ts): the same source on the same grid for every case that shares it.
  const forced = g.outputGrid?.[i];
  if (forced && !c.grid) {
    // A spectrum's common output grid: the lattice pitch is the grid's pitch over a whole number
    // k, as fine as this case's rules ask, so that every output point is a lattice point (taken
    // every k-th sample: exact values there, nothing interpolated).
    const k = Math.max(1, Math.ceil(forced.step / p.pitch - 1e-9));
    const pitch = forced.step / k;
    const reach = Math.max(g.aEff[i]!, Math.abs(forced.start), Math.abs(forced.start + (forced.n - 1) * forced.step));
    const nf = Math.max(minN, Math.ceil((2 * reach) / pitch) + 2);
    const paddedF = nextFastFftSize(nf * padding(nf * pitch));
    const onLattice = Math.abs(forced.start / pitch - Math.round(forced.start / pitch)) < 1e-6;
    if (onLattice) {
      const rule = { ...p, pitch, rule: `${p.rule}; ${k > 1 ? `1/${k} of` : 'on'} the spectrum's common output grid (${len(forced.step)})` };
      return axisPlan(g, i, rule, nf, paddedF, forced);
    }
  }
  const sg = g.sharedGrid;
  if (sg && !c.grid && sg.pitch[i]! <= p.pitch && sg.samples[i]! * sg.pitch[i]! >= n * p.pitch && sg.padded[i]! * sg.pitch[i]! >= padded * p.pitch && sg.padded[i]! >= sg.samples[i]!) {
    const shared = { ...p, pitch: sg.pitch[i]!, rule: `${p.rule}; ${sg.pitch[i]! < p.pitch ? 'finer, ' : ''}on the grid the sweep's cases share` };
    return axisPlan(g, i, shared, sg.samples[i]!, sg.padded[i]!, windowOn(fftAxis(sg.padded[i]!, sg.pitch[i]!), g.centre[i]!, g.windowHalf[i]!));
  }
  const output = windowOn(fftAxis(padded, p.pitch), g.centre[i]!, g.windowHalf[i]!);
  return axisPlan(g, i, p, n, padded, output);
}

/**
 * A direct sum onto the window: the aperture sampled at the method's content rule (with `margin`
 * extra samples each side), the output at four times the intensity's Nyquist rate (or ten samples
 * across the smallest detector) over the window.
 */
export function directAxisPlan(g: Geometry, i: number, c: Case, content: PitchRule, factorises: boolean, margin: number): AxisPlan {
  const p = pitchFor(g, c, content, featureSamples(g, factorises));
  const nIn = c.grid?.size ?? 2 * (Math.ceil(g.aEff[i]! / p.pitch + 0.5) + margin) + 1;
  // Output pitch: the intensity is band-limited to D/(λz) (D the illuminated width), so
  // λz/(8D) is 4× its Nyquist rate.
  const d = 2 * g.aEff[i]!;
  const nyquist = (g.lam * g.z) / (2 * d);
  // A detector is read off the map: ten samples across the smallest keep its reading within a
  // fraction of a per cent (its rim cuts cells, which are sub-sampled).
  const detector = Math.min(Infinity, ...c.analysis.detectors.map((det) => det.size / 10));
  const wanted = Math.min(nyquist / 4, detector);
  const [minM, maxM] = [g.minOutput, g.oneD ? LIMITS.maxOutput1D : LIMITS.maxOutput2D];
  let m = Math.ceil((2 * g.windowHalf[i]!) / wanted) + 1;
  m = Math.min(maxM, Math.max(minM, m));
  if (m % 2 === 0) m += 1;
  // A spectrum's common output grid: the sums are evaluated at its points.
  const output = g.outputGrid?.[i] ?? centredAxis(m, (2 * g.windowHalf[i]!) / (m - 1), g.centre[i]!);
  return axisPlan(g, i, p, nIn, nIn, output);
}

/** The span from the far side of the illuminated aperture to the far edge of the window. */
function reachOf(g: Geometry, i: number): number {
  return g.windowHalf[i]! + Math.abs(g.centre[i]!) + g.aEff[i]!;
}

/**
 * The Fresnel integrand's samples (direct and single-FFT forms): q× its highest frequency; the
 * form corrects the cell response on its own source grid and needs a margin for it.
 */
export function fresnelDirectAxisPlan(g: Geometry, i: number, c: Case): AxisPlan {
  const q = oversampling(g, true);
  const reach = reachOf(g, i);
  const content = { pitch: (g.lam * g.z) / (q * reach), rule: `${q}× the highest frequency of the Fresnel integrand, λz/(${q}·${len(reach)})` };
  return directAxisPlan(g, i, c, content, true, LIMITS.compensationMargin);
}

/**
 * Direct sums in direction cosines (the far-field formula, the exact integral's output axes): q×
 * the highest direction-cosine frequency in the window.
 */
export function directionCosineAxisPlan(g: Geometry, i: number, c: Case, factorises: boolean): AxisPlan {
  const q = oversampling(g, factorises);
  const fmax = farFieldMaxFrequency(g, i);
  const content = { pitch: 1 / (q * fmax), rule: `${q}× the highest direction-cosine frequency in the window (${fmt(fmax * g.lam, 3)}/λ)` };
  return directAxisPlan(g, i, c, content, factorises, 0);
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

/**
 * The single-FFT form samples the aperture like the direct form, zero-pads to n and lands on the
 * lattice λz/(nΔx): n is the smallest even FFT size (5-smooth) that makes that pitch at least as fine
 * as the direct form's. Even because the form swaps the halves of each axis to put x = 0 on index 0
 * (single-fft.ts shiftHalf).
 */
export function singleFftAxisPlan(g: Geometry, d: AxisPlan): AxisPlan {
  // Also no coarser than the intensity's Nyquist pitch λz/(2D): the lattice is the form's own, not
  // capped like the direct sums' window (with powers of two it was finer by the rounding).
  const nyquist = (g.lam * g.z) / (4 * Math.max(d.apertureHalf, 1e-300));
  const target = Math.min(d.output.step, (2 * d.windowHalf) / (g.minOutput - 1), nyquist);
  const n = nextEvenFastFftSize(Math.max(d.inputSamples + 2, Math.ceil((g.lam * g.z) / (d.inputPitch * target))));
  const output = windowOn(fftAxis(n, (g.lam * g.z) / (n * d.inputPitch)), d.windowCentre, d.windowHalf);
  return { ...d, paddedSamples: n, output };
}
