// Fresnel's single-transform form by one FFT (src/optics/single-fft.ts): the aperture sampled as
// for the direct form, zero-padded so that the output lattice λz/(NΔx) is as fine as the direct
// form's, the window cut out of it.
import { fresnelDirectAxisPlan, singleFftAxisPlan } from '../plan/axis-plans.js';
import { costSingleFft } from '../plan/costs.js';
import { factorisedLayout } from '../plan/geometry.js';
import { LIMITS } from '../plan/limits.js';
import type { MethodDescriptor } from './types.js';
import { paraxialUseWarning } from './use-warnings.js';
import { paraxialValidity } from './validity.js';

export const fresnelSingleFft: MethodDescriptor = {
  id: 'fresnel-single-fft',
  method: 'fresnel',
  form: 'single-fft',
  grid: 'single-fft',
  sharesSourceSpectrum: false,
  apertureCells: false,
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
};
