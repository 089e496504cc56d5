// One case end to end, without I/O: plan → field → metrics → warnings.
import { spotMetrics } from '../analysis/metrics.js';
import { gratingOrders } from '../analysis/orders.js';
import { postChecks } from '../analysis/validity.js';
import { directionCosines } from '../optics/source.js';
import type { CaseMetrics, CaseRecord } from '../output/case-output.js';
import type { Plan } from '../plan/types.js';
import { computeCase } from './compute.js';

export function runPlannedCase(plan: Plan): CaseRecord {
  const t0 = performance.now();
  const computed = computeCase(plan);
  const spot = spotMetrics(computed);
  const d = computed.diagnostics;
  const c = plan.case;
  // For an obstacle the computed "aperture" is its complement (Babinet), so d.powerIn is what it blocks.
  const metrics: CaseMetrics = plan.babinet
    ? { ...spot, powerThroughAperture: null, powerBlocked: d.powerIn, windowFraction: null }
    : { ...spot, powerThroughAperture: d.powerIn, windowFraction: spot.powerInWindow / d.powerIn };
  if (c.aperture.shape === 'slits' && !c.aperture.opaque) {
    const a = c.aperture;
    const footprint = a.count * a.period * (a.length ?? 1);
    metrics.orders = gratingOrders(computed, {
      period: a.period,
      wavelength: c.wavelength,
      distance: c.distance,
      sinIncidence: directionCosines(c.illumination)[0],
      powerTransmitted: d.powerIn,
      powerIncident: c.illumination.kind === 'plane' ? footprint : null,
    });
  }
  const warnings = [...plan.warnings, ...postChecks(plan, d)];
  return { plan, computed, metrics, warnings, seconds: (performance.now() - t0) / 1000 };
}
