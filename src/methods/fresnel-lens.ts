// Fresnel's single-transform form behind a thin lens, with the lens's quadratic phase folded into
// the transform's chirp analytically instead of sampled: U₀(ξ)e^{−iπξ²/(λf)}·e^{iπξ²/(λz)} =
// U₀(ξ)e^{iπξ²(1/z − 1/f)/λ} (Goodman, Introduction to Fourier Optics, §5.1–5.2). Only the pupil
// (stop × wavefront error × illumination) is sampled, and only the residual chirp R·|1/z − 1/f|/λ
// must be resolved: in the focal plane none at all (a pure Fourier transform, x = λf·f_x), so a
// 25 mm lens of f = 100 mm at its focus is a grid of a few hundred samples a side, where sampling
// its phase (R/(λf) = 200 /mm at the rim) would take some 10⁵.
import { warning } from '../warnings/catalogue.js';
import { lensOf } from '../elements/registry.js';
import { compensateCellResponse, padField } from '../optics/spectral.js';
import { propagateFresnelSingleFFT } from '../optics/single-fft.js';
import { transmittanceSource } from '../optics/source.js';
import { directAxisPlan, singleFftAxisPlan, windowOn } from '../plan/axis-plans.js';
import { costSingleFft } from '../plan/costs.js';
import { oversampling, type Geometry } from '../plan/geometry.js';
import { LIMITS } from '../plan/limits.js';
import { fmt } from '../plan/words.js';
import type { Warning } from '../plan/types.js';
import { cropTo, sourceAxis } from './grid-steps.js';
import { fftAxis, type Field } from '../optics/field.js';
import { rotate } from '../optics/phase.js';
import type { MethodDescriptor, UseCheckInputs } from './types.js';
import { paraxialValidity } from './validity.js';
import { lensTiltPhase } from '../plan/paraxial.js';
import { advisable } from '../plan/advice.js';

/**
 * The highest frequency the transform must hold along axis i: the larger of the residual chirp's at
 * the lit rim, R·|1/z − 1/f|/λ (sampled on the source grid), and x/(λz) at the window's far edge
 * (the band ±1/(2Δξ) of the transform is the output lattice's period λz/Δξ). The transform is taken
 * at every frequency of its band at once, so the two are not added as a direct sum's integrand's are.
 */
function contentFrequency(g: Geometry, i: number, focal: number): number {
  const residual = (g.aEff[i]! * Math.abs(1 / g.z - 1 / focal)) / g.lam;
  // Measured from the tilt's shift: the carrier is not sampled (see tiltShift).
  const window = (Math.abs(g.centre[i]! - tiltShift(g, i)) + g.windowHalf[i]!) / (g.lam * g.z);
  return Math.max(residual, window);
}

/**
 * A tilt's carrier e^{i2π(αξ + βη)/λ} is not multiplied into the source: it shifts the transform's
 * argument, x/(λz) − α/λ, so the output lattice is moved by z·α (and z·β) instead and the band
 * needs to hold only the window about that point.
 */
function tiltShift(g: Geometry, i: number): number {
  return g.lam * g.z * g.carrier[i]!;
}

export const fresnelLens: MethodDescriptor = {
  id: 'fresnel-lens',
  method: 'fresnel',
  form: 'lens-chirp',
  grid: 'single-fft',
  sharesSourceSpectrum: false,
  apertureCells: false,
  binaryOnly: false,
  closedForm: true,
  validity: paraxialValidity,
  sample(g, c) {
    const lens = lensOf(c.aperture);
    // A lens on a 2-D grid only (a grid.size names an FFT grid: the transfer-function form).
    if (!lens || g.oneD || c.grid?.size) return null;
    // The pupil's own phase (a wavefront error) is sampled; the lens's is not.
    const pupil = lens.pupilFrequency(g.lam);
    const gp: Geometry = { ...g };
    if (pupil > 0) gp.phaseFrequency = pupil;
    else delete gp.phaseFrequency;
    const q = oversampling(g, false);
    const direct = [0, 1].map((i) => {
      const fmax = contentFrequency(g, i, lens.focal);
      const content = {
        pitch: 1 / (q * fmax),
        rule: `${q}× the highest frequency the transform must hold with the lens folded into its chirp (the residual chirp at the rim or the window's edge, ${fmt(fmax / 1e3, 3)} /mm)`,
      };
      return directAxisPlan(gp, i, c, content, false, LIMITS.compensationMargin);
    });
    const single = direct.map((d, i) => {
      const a = singleFftAxisPlan(gp, d);
      const lattice = fftAxis(a.paddedSamples, (g.lam * g.z) / (a.paddedSamples * a.inputPitch));
      return { ...a, output: windowOn({ ...lattice, start: lattice.start + tiltShift(g, i) }, d.windowCentre, d.windowHalf) };
    });
    if (!single.every((a) => a.paddedSamples <= LIMITS.maxSingleFft)) return null;
    return { axes: single, layout: 'two-d', ...costSingleFft(single, 'two-d') };
  },
  words: { method: 'Fresnel', form: "single-transform form with the lens's phase folded into its chirp" },
  useWarning: lensUseWarning,
  propagate(plan, run) {
    const c = plan.case;
    const lens = lensOf(c.aperture)!;
    const xa = sourceAxis(plan.x, false);
    const ya = sourceAxis(plan.y!, false);
    const { field: src, power } = transmittanceSource(lens.pupil(xa, ya, c.wavelength), c.illumination, xa, ya, c.wavelength, { sampleCarrier: false });
    // Cell averages in, point samples for the transform (as the single-FFT form).
    compensateCellResponse(run.engine, src);
    const grid = padField(src, plan.x.paddedSamples, plan.y!.paddedSamples, run.engine);
    const out = propagateFresnelSingleFFT(run.engine, grid, c.distance, lens.focal);
    shiftByTilt(out, c.distance, [c.wavelength * run.carrier[0], c.wavelength * run.carrier[1]]);
    return { field: cropTo(out, plan.x.output, plan.y!.output), powerIn: power };
  },
};

/**
 * Moves a field computed without the tilt's carrier to where the tilted light lands: the transform's
 * value at x' belongs at x = x' + z·α, and the outer factor e^{iπx²/(λz)}, applied at x', is made
 * e^{iπ(x' + zα)²/(λz)} (so the field's phase is the tilted one, not only its intensity).
 */
function shiftByTilt(f: Field, z: number, dir: [number, number]): void {
  const [sx, sy] = [z * dir[0], z * dir[1]];
  if (sx === 0 && sy === 0) return;
  const k = Math.PI / (f.wavelength * z);
  for (let r = 0; r < f.ny; r++) {
    const y = f.y0 + r * f.dy;
    for (let col = 0; col < f.nx; col++) {
      const x = f.x0 + col * f.dx;
      rotate(f.data, 2 * (r * f.nx + col), k * (2 * x * sx + sx * sx + 2 * y * sy + sy * sy));
    }
  }
  f.x0 += sx;
  f.y0 += sy;
}

/**
 * kR·|tan θ − sin θ| above which a tilted beam's landing point is warned of (rad): the spot moves by
 * this over π of its scale λz/(2R) between the two readings of a thin lens, and the steepest slope of
 * an Airy or Gaussian spot, about 1.7 of the peak per λz/(2R), turns 0.03 rad into about 1.6 % of the
 * peak (a judgement against the 2 % the property tests hold a peak to).
 */
export const LENS_TILT_PHASE = 0.03;

/**
 * The thin lens is paraxial: where its quadratic phase is far from a spherical wave about its focus
 * (kR⁴/(8f³) above the paraxial limit), say what the result is — an ideal lens's field within the
 * paraxial approximation — and what it is not.
 *
 * A tilted beam lands at z·sin θ here (the paraxial kernel's mapping: the ideal, Fourier-transform
 * lens of Goodman §5.2); the exact kernel takes the thin quadratic phase's undeviated chief ray to
 * z·tan θ. The difference is the linear part of the phase the Fresnel kernel drops across the lit
 * pupil seen from the landing point, 2kR·|tan θ − sin θ| from rim to rim. Where it moves the spot
 * enough to change intensities near it beyond the tests' 2 %, that comes first, as the paraxial
 * approximation's own warning: positions and intensities there depend on the approximation.
 */
function lensUseWarning({ checks, g, options }: UseCheckInputs): Warning | null {
  const s = Math.hypot(g.lam * g.carrier[0]!, g.lam * g.carrier[1]!);
  if (s > 0) {
    // The lit pupil as the planner takes it (planner.ts: the stop, or two beam radii).
    const radius = Math.min(Math.max(g.aEff[0]!, g.aEff[1]!), 2 * g.waist);
    const phase = 2 * lensTiltPhase(g.lam, radius, s);
    const limit = 2 * LENS_TILT_PHASE;
    if (phase > limit) {
      return warning('paraxial', {
        at: [g.centre[0]!, g.centre[1]!],
        phase,
        weight: 1,
        weighted: phase,
        limit,
        goodmanRatio: checks.goodmanRatio,
        instead: advisable(options, 'fresnel')?.method ?? null,
      });
    }
  }
  if (!(checks.paraxialPhaseError > LIMITS.paraxialPhase)) return null;
  return warning('paraxial-lens', { phase: checks.paraxialPhaseError, limit: LIMITS.paraxialPhase });
}
