// A curved-light case's result (plan/curved-light.ts): the flat-light case's map, its grid
// magnified by M and its intensities scaled by 1/M² (1/M in 1-D); for an extended source, then
// convolved with the source's outline projected onto the screen (run/source-blur.ts).
import type { Plan } from '../plan/types.js';
import { isOneD } from '../model/grid.js';
import type { Engine } from '../optics/engine.js';
import type { ComputedCase } from './compute.js';
import { blurBySource } from './source-blur.js';

export function curvedLightResult(plan: Plan, flat: ComputedCase, engine: Engine): ComputedCase {
  const fl = plan.flatLight!;
  const M = fl.magnification;
  const intensity = flat.intensity;
  for (let i = 0; i < intensity.length; i++) intensity[i]! *= fl.intensityScale;
  // Powers: in 2-D unchanged (intensities fall by M² where areas grow by M²). In 1-D the map's
  // power per metre of slit length grows by M across x, and falls by the intensity scale: a line
  // source keeps it, a point's light spreads along the slits by M, so the power per metre of length
  // reaching the screen's line is 1/M of what passed the aperture there. The power through the
  // aperture is counted the same way, so that every fraction of it (window, encircled, orders)
  // stays a fraction of the light that reaches the screen.
  const factor = fl.intensityScale * (isOneD(flat) ? M : M * M);
  const d = flat.diagnostics;
  const mapped: ComputedCase = {
    ...flat,
    diagnostics: { ...d, powerIn: d.powerIn * factor, powerInWindow: d.powerInWindow * factor },
    dx: flat.dx * M,
    dy: flat.dy * M,
    x0: flat.x0 * M,
    y0: flat.y0 * M,
    intensity,
  };
  const s = plan.case.source;
  return s?.kind === 'extended' || s?.kind === 'points' ? blurBySource(mapped, s, plan.case.distance, engine) : mapped;
}
