// Validity checks that need the computed field: power bookkeeping, wrap-around, band limit.
import { formatLength, trimNumber } from '../job/units.js';
import { LIMITS } from '../plan/limits.js';
import type { Plan, Warning } from '../plan/types.js';
import type { Diagnostics } from '../run/compute.js';

const pct = (x: number) => `${trimNumber(100 * x, 3)} %`;

export function postChecks(plan: Plan, d: Diagnostics): Warning[] {
  const w: Warning[] = [];
  const opaquePlane = plan.babinet && plan.case.illumination.kind === 'plane';
  const ratio = d.powerIn > 0 ? d.powerInWindow / d.powerIn : 0;
  const subject = plan.babinet ? 'of the light the obstacle removes (its complementary hole, by Babinet)' : 'of the power through the aperture';
  if (1 - ratio > LIMITS.windowLossWarn) {
    w.push({
      code: 'window-loss',
      message: `${pct(1 - ratio)} ${subject} falls outside the ${formatLength(2 * plan.x.windowHalf, 3)} window (limit ${pct(LIMITS.windowLossWarn)})${
        opaquePlane ? '' : ': totals and encircled energies are low; widen the window or leave it to the planner'
      }`,
    });
  }
  if (ratio - 1 > LIMITS.powerExcessWarn) {
    w.push({
      code: 'power-excess',
      message: `the window holds ${pct(ratio - 1)} more power than went through the aperture: the result is aliased or under-sampled (check grid.pitch and the window); do not trust it`,
    });
  }
  if (d.edgeEnergy !== undefined && d.edgeEnergy > LIMITS.edgeEnergyWarn) {
    w.push({
      code: 'edge-energy',
      message: `${pct(d.edgeEnergy)} of the power reaches the outer ${trimNumber(100 * LIMITS.edgeFrame, 2)} % of the padded grid: light wraps around the periodic FFT grid into the window; use a larger grid.size or leave the grid to the planner`,
    });
  }
  if (d.bandLimitLoss !== undefined && d.bandLimitLoss > LIMITS.bandLimitWarn) {
    w.push({
      code: 'band-limit',
      message: `the angular-spectrum band limit removed ${pct(d.bandLimitLoss)} of the spectral power (light at angles the grid cannot carry to this distance without aliasing); the window misses that light; enlarge the grid`,
    });
  }
  if (d.evanescentLoss !== undefined && d.evanescentLoss > LIMITS.evanescentWarn) {
    w.push({
      code: 'evanescent',
      message: `${pct(d.evanescentLoss)} of the field's spectrum is evanescent (spatial frequencies above 1/λ): features near or below the wavelength; scalar theory is not reliable here`,
    });
  }
  return w;
}
