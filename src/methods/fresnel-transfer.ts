// Fresnel's transfer-function form: the source on a padded FFT grid times the paraxial transfer
// function (src/optics/spectral.ts). Voelz's rule: the transfer function is adequately sampled when
// Δx ≥ λz/L; where it is not, the planner offers it only when the job names a grid.size.
import { fftAxisPlan } from '../plan/axis-plans.js';
import { costFft } from '../plan/costs.js';
import { factorisedLayout, oversampling, type Geometry } from '../plan/geometry.js';
import { LIMITS } from '../plan/limits.js';
import type { AxisPlan, Case } from '../plan/types.js';
import { len } from '../plan/words.js';
import type { MethodDescriptor } from './types.js';
import { paraxialUseWarning } from './use-warnings.js';
import { paraxialValidity } from './validity.js';
import { propagateSampled, type SampledSteps } from './sampled-source.js';
import { propagateOnGrid, transferOnGrid2D, type TransferOf } from './transfer-grid.js';

export const fresnelTransfer: MethodDescriptor = {
  id: 'fresnel-transfer',
  method: 'fresnel',
  form: 'transfer-function',
  grid: 'transfer',
  sharesSourceSpectrum: true,
  apertureCells: false,
  binaryOnly: false,
  closedForm: true,
  validity: paraxialValidity,
  sample(g, c) {
    const layout = factorisedLayout(g);
    const tf = (g.oneD ? [0] : [0, 1]).map((i) => fresnelTransferAxisPlan(g, i, c));
    const tfCost = costFft(tf, layout);
    const tfSampled = tf.every((p) => (p.inputPitch * p.inputPitch * p.paddedSamples) / (g.lam * g.z) >= 1);
    // A grid.size names an FFT grid, so it asks for this form whether or not it is sampled well.
    if (!c.grid?.size && !tfSampled) return null;
    return { axes: tf, layout, ...tfCost };
  },
  words: { method: 'Fresnel', form: 'transfer-function form' },
  checks: (axes, g) => ({ transferSampling: Math.min(...axes.map((a) => (a.inputPitch * a.inputPitch * a.paddedSamples) / (g.lam * g.z))) }),
  useWarning: paraxialUseWarning,
  propagate: (plan, run) => propagateSampled(plan, run, steps),
};

/** q× the highest spatial frequency that reaches the window, λz/(q·reach), on an FFT grid padded LIMITS.padding×. */
function fresnelTransferAxisPlan(g: Geometry, i: number, c: Case): AxisPlan {
  const q = oversampling(g, true);
  const reach = g.windowHalf[i]! + Math.abs(g.centre[i]!) + g.aEff[i]!;
  const content = (g.lam * g.z) / (q * reach);
  const contentRule = { pitch: content, rule: `${q}× the highest spatial frequency that reaches the window, λz/(${q}·${len(reach)})` };
  return fftAxisPlan(g, i, c, contentRule, true, () => LIMITS.padding);
}

const transfer: TransferOf = (grid, z) => ({ kind: 'fresnel', z, wavelength: grid.wavelength });

const steps: SampledSteps = {
  fftLattice: true,
  line: (src, plan, axis, carrier, run) => propagateOnGrid(run.engine, src, plan, transfer, [axis.paddedSamples, 1], axis.output, null, [carrier, 0]),
  plane: (plan, run) => transferOnGrid2D(plan, run, transfer),
};
