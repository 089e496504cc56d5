// Carries out a plan: the chosen method's descriptor (src/methods/) builds the source and
// propagates it; here the window's power is measured, an obstacle in a plane wave is taken off the
// free wave (Babinet), and the numerical diagnostics the validity checks need are gathered.
import type { IntensityMap } from '../model/intensity-map.js';
import { intensityOf, powerOf } from '../optics/field.js';
import { complementInPlace, freeField } from '../optics/free.js';
import { carrierFrequencies } from '../optics/source.js';
import { descriptorOf } from '../methods/registry.js';
import type { Plan } from '../plan/types.js';
import type { CaseContext } from './context.js';
import type { PlanePower } from '../methods/types.js';
import { curvedLightResult } from './curved-light-result.js';
export { complementWithin, profileIntervals } from '../methods/exact-intervals.js';

export interface Diagnostics {
  /** Power through the aperture (W per unit incident irradiance; per metre of slit length in 1-D). */
  powerIn: number;
  /** Power of the diffracted (open-part) field inside the window. */
  powerInWindow: number;
  bandLimitLoss?: number;
  evanescentLoss?: number;
  /** Fraction of the power in the outer frame of the padded FFT grid (wrap-around risk). */
  edgeEnergy?: number;
  /** For a shared source (plan.sharedSpectrum): whether its spectrum was computed here or reused. */
  sourceSpectrum?: 'computed' | 'reused';
  /** Planes in sequence: each plane's powers (powerIn is then what leaves the last). */
  planes?: PlanePower[];
}

/** The window's intensity map (the field's grid and |U|²) and what the case adds to it. */
export interface ComputedCase extends IntensityMap {
  /** [col, row] of the optical axis (x = y = 0), fractional in general. */
  center: [number, number];
  diagnostics: Diagnostics;
}

/** The case's field and diagnostics, propagated on ctx's engine (and its kept spectrum, if shared). */
export function computeCase(plan: Plan, ctx: Pick<CaseContext, 'engine' | 'spectra'>): ComputedCase {
  if (plan.error) throw new Error(plan.error);
  // Curved light: the flat-light case computed in its place, mapped back to the real screen.
  if (plan.flatLight) return curvedLightResult(plan, computeCase({ ...plan.flatLight.plan, ...(plan.sharedSpectrum ? { sharedSpectrum: plan.sharedSpectrum } : {}) }, ctx), ctx.engine);
  const c = plan.case;
  const lam = c.wavelength;
  const z = c.distance;
  const ill = c.illumination;
  const carrier = carrierFrequencies(ill, lam);
  const outX = plan.x.output;
  const outY = plan.y ? plan.y.output : null;
  // An obstacle in a Gaussian beam (not Babinet: see the planner) is the beam where it is not.
  const obstructed = c.aperture.opaque && !plan.babinet;
  const result = descriptorOf(plan).propagate(plan, { carrier, obstructed, engine: ctx.engine, spectra: ctx.spectra });

  const field = result.field;
  const powerInWindow = powerOf(field);
  if (plan.babinet) complementInPlace(field, freeField(ill, z, outX, outY, lam));
  const intensity = intensityOf(field);
  const diagnostics: Diagnostics = { powerIn: result.powerIn, powerInWindow };
  if (result.report) {
    diagnostics.bandLimitLoss = result.report.bandLimitLoss;
    diagnostics.evanescentLoss = result.report.evanescentLoss;
  }
  if (result.edge !== undefined) diagnostics.edgeEnergy = result.edge;
  if (result.sourceSpectrum) diagnostics.sourceSpectrum = result.sourceSpectrum;
  if (result.planes) diagnostics.planes = result.planes;
  // A 1-D window (no y axis) is the grid's 1-D form, ny = 1 and dy = 0, whatever a propagator left in dy.
  if (!outY && field.ny !== 1) throw new Error(`a 1-D case came back with a field of ${field.ny} rows`);
  return {
    nx: field.nx,
    ny: field.ny,
    dx: field.dx,
    dy: outY ? field.dy : 0,
    x0: field.x0,
    y0: field.y0,
    intensity,
    center: [-field.x0 / field.dx, outY ? -field.y0 / field.dy : 0],
    diagnostics,
  };
}
