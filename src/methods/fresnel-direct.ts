// Fresnel's single-transform form by direct sums from the (cell-corrected) aperture samples onto
// the window (src/optics/direct.ts): any output pitch, no FFT grid.
import { fresnelDirectAxisPlan } from '../plan/axis-plans.js';
import { costDirect } from '../plan/costs.js';
import { factorisedLayout } from '../plan/geometry.js';
import type { MethodDescriptor } from './types.js';
import { paraxialUseWarning } from './use-warnings.js';
import { paraxialValidity } from './validity.js';
import { propagateFresnelDirect } from '../optics/direct.js';
import { compensateCellResponse } from '../optics/spectral.js';
import { propagateSampled, sampledSource2D, type SampledSteps } from './sampled-source.js';

export const fresnelDirect: MethodDescriptor = {
  id: 'fresnel-direct',
  method: 'fresnel',
  form: 'direct',
  grid: 'direct',
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
    return { axes: direct, layout, ...costDirect(direct, layout, false) };
  },
  words: { method: 'Fresnel', form: 'single-transform form by direct sums onto the window' },
  useWarning: paraxialUseWarning,
  propagate: (plan, run) => propagateSampled(plan, run, steps),
};

const steps: SampledSteps = {
  fftLattice: false,
  line(src, plan, axis, carrier, run) {
    compensateCellResponse(run.engine, src);
    return { field: propagateFresnelDirect(src, plan.case.distance, axis.output, null, [carrier, 0]) };
  },
  plane(plan, run) {
    const { field: src, power } = sampledSource2D(plan, run);
    compensateCellResponse(run.engine, src);
    return { field: propagateFresnelDirect(src, plan.case.distance, plan.x.output, plan.y ? plan.y.output : null, run.carrier), powerIn: power };
  },
};
