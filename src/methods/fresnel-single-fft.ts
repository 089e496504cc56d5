// Fresnel's single-transform form by one FFT (src/optics/single-fft.ts): the aperture sampled as
// for the direct form, zero-padded so that the output lattice λz/(NΔx) is as fine as the direct
// form's, the window cut out of it.
import { fresnelDirectAxisPlan, singleFftAxisPlan } from '../plan/axis-plans.js';
import { costSingleFft } from '../plan/costs.js';
import { factorisedLayout } from '../plan/geometry.js';
import { LIMITS } from '../plan/limits.js';
import type { MethodDescriptor, FieldStep } from './types.js';
import { paraxialUseWarning } from './use-warnings.js';
import { paraxialValidity } from './validity.js';
import type { Engine } from '../optics/engine.js';
import type { Axis, Field } from '../optics/field.js';
import { propagateFresnelSingleFFT } from '../optics/single-fft.js';
import { compensateCellResponse, padField } from '../optics/spectral.js';
import type { Plan } from '../plan/types.js';
import { cropTo, multiplyCarrier } from './grid-steps.js';
import { propagateSampled, sampledSource2D, type SampledSteps } from './sampled-source.js';

export const fresnelSingleFft: MethodDescriptor = {
  id: 'fresnel-single-fft',
  method: 'fresnel',
  form: 'single-fft',
  grid: 'single-fft',
  sharesSourceSpectrum: false,
  apertureCells: false,
  binaryOnly: false,
  closedForm: true,
  validity: paraxialValidity,
  sample(g, c) {
    // A grid.size names an FFT grid: it asks for the transfer-function form.
    if (c.grid?.size) return null;
    const layout = factorisedLayout(g);
    const direct = (g.oneD ? [0] : [0, 1]).map((i) => fresnelDirectAxisPlan(g, i, c));
    const single = direct.map((d) => singleFftAxisPlan(g, d));
    if (!single.every((a) => a.paddedSamples <= LIMITS.maxSingleFft)) return null;
    return { axes: single, layout, ...costSingleFft(single, layout) };
  },
  words: { method: 'Fresnel', form: 'single-transform form by one FFT' },
  useWarning: paraxialUseWarning,
  propagate: (plan, run) => propagateSampled(plan, run, steps),
};

/**
 * The (cell-corrected) aperture samples zero-padded onto the FFT grid, the tilt carrier multiplied
 * in, and the window cut out of the output lattice.
 */
function propagateSingleFft(engine: Engine, src: Field, plan: Plan, padded: [number, number], outX: Axis, outY: Axis | null, carrier: [number, number]): FieldStep {
  compensateCellResponse(engine, src);
  const grid = padField(src, padded[0], padded[1], engine);
  multiplyCarrier(grid, carrier);
  const out = propagateFresnelSingleFFT(engine, grid, plan.case.distance);
  return { field: cropTo(out, outX, outY) };
}

const steps: SampledSteps = {
  fftLattice: false,
  line: (src, plan, axis, carrier, run) => propagateSingleFft(run.engine, src, plan, [axis.paddedSamples, 1], axis.output, null, [carrier, 0]),
  plane(plan, run) {
    const { field: src, power } = sampledSource2D(plan, run);
    const padded: [number, number] = [plan.x.paddedSamples, plan.y!.paddedSamples];
    return { ...propagateSingleFft(run.engine, src, plan, padded, plan.x.output, plan.y ? plan.y.output : null, run.carrier), powerIn: power };
  },
};
