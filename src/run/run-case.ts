// One case end to end, without I/O: plan → field → metrics → warnings.
import { detectorFraction, energyCurve, radiusHolding } from '../analysis/encircled.js';
import { spotMetrics } from '../analysis/metrics.js';
import { gratingOrders } from '../analysis/orders.js';
import { postChecks } from '../analysis/validity.js';
import { makeVerdict, spotSize, verdictWidth, type Verdict } from '../analysis/verdict.js';
import { directionCosines } from '../optics/source.js';
import type { CaseMetrics, CaseRecord } from '../output/case-output.js';
import type { Plan } from '../plan/types.js';
import { computeCase, type ComputedCase } from './compute.js';

export function runPlannedCase(plan: Plan): CaseRecord {
  const t0 = performance.now();
  const computed = computeCase(plan);
  const spot = spotMetrics(computed);
  const d = computed.diagnostics;
  const c = plan.case;
  // For an obstacle the computed "aperture" is its complement (Babinet), so d.powerIn is what it
  // blocks; in a plane wave the total power is infinite and fractions of it mean nothing.
  const reference = plan.babinet ? null : d.powerIn;
  const centre: [number, number] = [spot.centroid[0], spot.centroid[1] ?? 0];
  const energy = reference ? energyCurve(computed, centre, reference) : null;
  const metrics: CaseMetrics = {
    ...spot,
    powerThroughAperture: reference,
    ...(plan.babinet ? { powerBlocked: d.powerIn } : {}),
    windowFraction: reference ? spot.powerInWindow / reference : null,
    encircled: energy
      ? {
          centre,
          radius50: radiusHolding(energy, 0.5),
          radius84: radiusHolding(energy, 0.84),
          radius90: radiusHolding(energy, 0.9),
        }
      : null,
    detectors: reference
      ? c.analysis.detectors.map((det) => {
          const at = det.at ?? centre;
          return { kind: det.kind, size: det.size, at, fraction: detectorFraction(computed, { ...det, at }, at, reference) };
        })
      : [],
  };
  if (c.aperture.shape === 'slits' && !c.aperture.opaque) {
    const a = c.aperture;
    const footprint = a.count * a.period * (a.length ?? 1);
    metrics.orders = gratingOrders(computed, {
      period: a.period,
      count: a.count,
      wavelength: c.wavelength,
      distance: c.distance,
      sinIncidence: directionCosines(c.illumination)[0],
      powerTransmitted: d.powerIn,
      powerIncident: c.illumination.kind === 'plane' ? footprint : null,
    });
  }
  const verdicts = caseVerdicts(plan, computed, centre);
  if (verdicts.length) metrics.verdicts = verdicts;
  const warnings = [...plan.warnings, ...postChecks(plan, d)];
  return { plan, computed, metrics, energy, warnings, seconds: (performance.now() - t0) / 1000 };
}

/** The axes a verdict is given for: radial for circles, x for long slits, x and y for rectangles. */
export function verdictAxes(plan: Plan): ('radial' | 'x' | 'y')[] {
  const a = plan.case.aperture;
  if (a.opaque || plan.case.illumination.kind !== 'plane') return [];
  if (a.shape === 'circle') return ['radial'];
  if (a.shape === 'slit') return a.length ? ['x', 'y'] : ['x'];
  if (a.shape === 'rectangle') return ['x', 'y'];
  return [];
}

/**
 * Verdicts for a uniformly lit pinhole, slit or rectangle (with a Gaussian beam the shadow is not
 * a sharp reference, so none is given). The far-field agreement distance is added by the job
 * runner, which can afford (and cache) the extra propagations it needs.
 */
function caseVerdicts(plan: Plan, computed: ComputedCase, centre: [number, number]): Verdict[] {
  const c = plan.case;
  const out: Verdict[] = [];
  for (const axis of verdictAxes(plan)) {
    const width = verdictWidth(c.aperture, axis)!;
    const nf = (width / 2) ** 2 / (c.wavelength * c.distance);
    const size = spotSize(computed, axis, width, c.wavelength, c.distance, centre, computed.diagnostics.powerIn);
    out.push(makeVerdict(axis, size, nf));
  }
  return out;
}
