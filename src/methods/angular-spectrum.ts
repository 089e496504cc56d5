// The angular spectrum on an axis-centred FFT grid (src/optics/spectral.ts): exact for scalar
// waves, band-limited against aliasing of its transfer function.
import { bandLimitFrequency, angularSpectrumTransfer } from '../optics/spectral.js';
import { fftAxisPlan } from '../plan/axis-plans.js';
import { costFft } from '../plan/costs.js';
import { oversampling, steepestDirection, type Geometry } from '../plan/geometry.js';
import { illuminatedEdgeWeight, type LightModel } from '../plan/light.js';
import { LIMITS } from '../plan/limits.js';
import type { AxisPlan, Case, Checks, Layout } from '../plan/types.js';
import { fmt } from '../plan/words.js';
import type { MethodDescriptor } from './types.js';
import { angularSpectrumValidity } from './validity.js';
import { propagateSampled, type SampledSteps } from './sampled-source.js';
import { propagateOnGrid, transferOnGrid2D, type TransferOf } from './transfer-grid.js';

export const angularSpectrum: MethodDescriptor = {
  id: 'angular-spectrum',
  method: 'angular-spectrum',
  grid: 'transfer',
  sharesSourceSpectrum: true,
  apertureCells: false,
  binaryOnly: false,
  closedForm: false,
  validity: angularSpectrumValidity,
  sample(g, c) {
    const layout: Layout = g.oneD ? 'one-d' : 'two-d';
    const plans = (g.oneD ? [0] : [0, 1]).map((i) => angularSpectrumAxisPlan(g, i, c));
    return { axes: plans, layout, ...costFft(plans, layout) };
  },
  words: { method: 'angular spectrum' },
  checks: bandLimitChecks,
  propagate: (plan, run) => propagateSampled(plan, run, steps),
};

/** The band-limit frequency of the padded grid, per axis (for the angular spectrum's own checks). */
export function bandLimitChecks(axes: AxisPlan[], g: Geometry): Partial<Checks> {
  const [xPlan, yPlan] = axes;
  return {
    bandLimit: [bandLimitFrequency(g.z, g.lam, xPlan!.paddedSamples * xPlan!.inputPitch), yPlan ? bandLimitFrequency(g.z, g.lam, yPlan.paddedSamples * yPlan.inputPitch) : null],
  };
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
function angularSpectrumAxisPlan(g: Geometry, i: number, c: Case): AxisPlan {
  const q = oversampling(g, false);
  const s = steepestDirection(g);
  // Close to the aperture (the window takes in nearly every direction) the folded-back edge
  // spectrum lands in the window: twice the samples there (measured on a 5 µm pinhole at 2λ:
  // 1.4 % of the peak on axis at λ/4, against the exact Rayleigh–Sommerfeld value).
  const qq = s > LIMITS.steepWindow && illuminatedEdgeWeight(g.facts, g.waist, g.oneD) > 1e-4 ? 2 * q : q;
  const contentRule = {
    pitch: g.lam / (qq * s),
    rule: `${qq}× the highest spatial frequency that reaches the window, sin θ/λ = ${fmt(s, 3)}/λ${qq > q ? ' (doubled: the window takes in nearly every direction, where folded-back edge spectrum would land)' : ''}`,
  };
  return fftAxisPlan(g, i, c, contentRule, false, (width) => paddingFactor(g, width));
}

/**
 * The angular spectrum's band limit cuts the spectrum at f ≈ L_pad/(2λz). The cut light would land
 * outside the window, but a sharp spectral cut rings back into it, so the padding is doubled when
 * the edge-tail estimate says more than LIMITS.bandLimitTarget of the power lies beyond the limit.
 */
function paddingFactor(g: Geometry, width: number): number {
  const beyond = (pad: number) => {
    // Light at the band-limit angle (sin θ = λ f) lands z·tan θ away.
    const s = Math.min(0.999, g.lam * bandLimitFrequency(g.z, g.lam, pad * width));
    return edgeTail(g.model, g.lam, g.z, (g.z * s) / Math.sqrt(1 - s * s));
  };
  return beyond(LIMITS.padding) > LIMITS.bandLimitTarget ? 2 * LIMITS.padding : LIMITS.padding;
}

/** Fraction of the power that edge diffraction sends farther than u beyond the geometric spot. */
function edgeTail(m: LightModel, lam: number, z: number, u: number): number {
  if (!(u > 0)) return 0.5;
  return Math.min(1, (m.edgesPerPower * lam * z) / (2 * Math.PI ** 2 * u));
}

const transfer: TransferOf = (grid, z) => angularSpectrumTransfer(grid, z);

const steps: SampledSteps = {
  fftLattice: true,
  line: (src, plan, axis, carrier, run) => propagateOnGrid(run.engine, src, plan, transfer, [axis.paddedSamples, 1], axis.output, null, [carrier, 0]),
  plane: (plan, run) => transferOnGrid2D(plan, run, transfer),
};
