// A curved-light case's result (plan/curved-light.ts): the flat-light case's map, its grid
// magnified by M and its intensities scaled by 1/M² (1/M in 1-D); for an extended source, then
// convolved with the source's outline projected onto the screen (run/source-blur.ts).
import type { Plan } from '../plan/types.js';
import type { Engine } from '../optics/engine.js';
import type { ComputedCase } from './compute.js';
import { blurBySource } from './source-blur.js';

export function curvedLightResult(plan: Plan, flat: ComputedCase, engine: Engine): ComputedCase {
  const fl = plan.flatLight!;
  const M = fl.magnification;
  const intensity = flat.intensity;
  for (let i = 0; i < intensity.length; i++) intensity[i]! *= fl.intensityScale;
  // (Power in the window is unchanged: intensities fall by M² where areas grow by M², and the
  // power through the aperture is the flat case's, the aperture being the same.)
  const mapped: ComputedCase = {
    ...flat,
    dx: flat.dx * M,
    dy: flat.dy * M,
    x0: flat.x0 * M,
    y0: flat.y0 * M,
    intensity,
  };
  const s = plan.case.source;
  return s?.kind === 'extended' || s?.kind === 'points' ? blurBySource(mapped, s, plan.case.distance, engine) : mapped;
}
