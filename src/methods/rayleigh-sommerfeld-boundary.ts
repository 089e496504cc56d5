// The exact integral for a plane wave at normal incidence as an integral along the aperture's
// boundary (src/optics/rs-boundary.ts): exact, and a line integral per output point.
import { boundaryRegionsOf, costRsBoundary, rsBoundary } from '../optics/rs-boundary.js';
import { axisPlan } from '../plan/axis-plans.js';
import { BASELINE_MEMORY } from '../plan/costs.js';
import type { MethodDescriptor } from './types.js';
import { exactOutputAxes, uncostedSlits } from './rayleigh-sommerfeld-shared.js';
import { rayleighSommerfeldValidity } from './validity.js';
import { apertureFacts } from '../optics/aperture.js';

export const rayleighSommerfeldBoundary: MethodDescriptor = {
  id: 'rayleigh-sommerfeld-boundary',
  method: 'rayleigh-sommerfeld',
  form: 'boundary',
  grid: 'direct',
  sharesSourceSpectrum: false,
  apertureCells: true,
  binaryOnly: true,
  closedForm: false,
  validity: rayleighSommerfeldValidity,
  sample(g, c) {
    if (g.oneD || uncostedSlits(g, c)) return null;
    // (Not when the job gives a grid: it asks for a sampled aperture.)
    const regions = !c.grid && c.illumination.kind === 'plane' && c.illumination.tilt[0] === 0 && c.illumination.tilt[1] === 0 ? boundaryRegionsOf(c.aperture) : null;
    if (!regions) return null;
    const out = exactOutputAxes(g, c);
    const cost = costRsBoundary(regions, g.lam, g.z, out[0]!.output, out[1]!.output);
    const whole = (i: number) => ({ pitch: 2 * g.aEff[i]!, required: 2 * g.aEff[i]!, rule: 'none: the integral runs along the aperture\'s edges (boundary form)' });
    const axes = [0, 1].map((i) => axisPlan(g, i, whole(i), 1, 1, out[i]!.output));
    return { axes, layout: 'two-d', memory: BASELINE_MEMORY + cost.memory, work: cost.work };
  },
  words: { method: 'Rayleigh–Sommerfeld integral', form: 'along the aperture\'s boundary' },
  propagate(plan) {
    // For an obstacle, its hole's (Babinet, with the free wave e^{ikz} exact at normal incidence),
    // so that the window's power is the diffracted light's as for every other method.
    const c = plan.case;
    return {
      field: rsBoundary(boundaryRegionsOf({ ...c.aperture, opaque: false })!, c.wavelength, c.distance, plan.x.output, plan.y!.output),
      powerIn: apertureFacts(c.aperture).openMeasure,
    };
  },
};
