// One case end to end, without I/O: plan → field → metrics → warnings.
import { energyCurve } from '../analysis/encircled.js';
import { spotMetrics } from '../analysis/metrics.js';
import { checkOrders, orderCheckInput } from '../analysis/order-checks.js';
import { gratingOrderTable, type GratingInput } from '../analysis/orders.js';
import { postChecks, type GratingEvanescence } from '../analysis/validity.js';
import { readDetectors } from '../metrics/detectors.js';
import { encircledRadii } from '../metrics/encircled.js';
import { caseVerdicts } from '../metrics/verdicts.js';
import { lensStrehl } from '../metrics/strehl.js';
import { focalPinholes } from '../metrics/spatial-filter.js';
import { lensMtf } from '../metrics/mtf.js';
import { powerAccount } from '../metrics/window.js';
import { planeResults } from '../metrics/planes.js';
import { directionCosines } from '../optics/source.js';
import { gratingOf } from '../elements/registry.js';
import type { CaseMetrics, CaseRecord } from '../output/case-output.js';
import type { Plan, Warning } from '../plan/types.js';
import { warning } from '../warnings/catalogue.js';
import { computeCase, type ComputedCase } from './compute.js';
import { gratingUse, ordersWithAnswers } from '../analysis/grating-answers.js';
import { runSpectrumCase } from './spectrum-case.js';
import { twoPointReading } from '../analysis/two-points.js';
import type { CaseContext } from './context.js';
import { spectrometerPart } from '../metrics/spectrometer.js';

export function runPlannedCase(plan: Plan, ctx: Pick<CaseContext, 'engine' | 'spectra'>): CaseRecord {
  if (plan.spectrum) return runSpectrumCase(plan, ctx);
  const t0 = performance.now();
  const computed = computeCase(plan, ctx);
  const spot = spotMetrics(computed);
  const d = computed.diagnostics;
  const c = plan.case;
  // For an obstacle the computed "aperture" is its complement (Babinet), so d.powerIn is what it
  // blocks; in a plane wave the total power is infinite and fractions of it mean nothing.
  const reference = plan.babinet ? null : d.powerIn;
  const centre: [number, number] = [spot.centroid[0], spot.centroid[1] ?? 0];
  const energy = reference ? energyCurve(computed, centre, reference) : null;
  // Behind an obstacle (in a plane wave or a Gaussian beam) a detector reads a fraction of what it
  // would receive with nothing in the way.
  // (With planes the light on the screen is what left the last plane, whatever the first one is.)
  const detectors = readDetectors(plan, computed, centre, c.aperture.opaque && !c.planes ? null : reference);
  // Key order here is result.json's order.
  const metrics: CaseMetrics = {
    ...spot,
    ...powerAccount(spot.powerInWindow, reference, plan.babinet ? d.powerIn : undefined),
    encircled: encircledRadii(energy, centre),
    detectors: detectors.results,
  };
  const warnings: Warning[] = [...plan.warnings];
  let grating: GratingEvanescence | undefined;
  if (d.planes) {
    metrics.planes = planeResults(c, d.planes);
  } else {
    const g = gratingPart(plan, computed);
    if (g) {
      Object.assign(metrics, g.metrics);
      warnings.push(...g.warnings);
      grating = g.evanescence;
    }
  }
  // The radial verdict reads the case's own curve when it is about the same power (not Babinet).
  const verdicts = caseVerdicts(plan, computed, centre, d.powerIn, reference === d.powerIn ? energy : null);
  if (verdicts.length) metrics.verdicts = verdicts;
  const strehl = lensStrehl(plan, spot.peakIntensity);
  if (strehl) metrics.strehl = strehl;
  const pinholes = focalPinholes(plan, computed, centre, d.powerIn);
  if (pinholes) metrics.spatialFilter = pinholes;
  // The MTF under the same condition, from the PSF in the window and the whole power through the pupil.
  const mtf = strehl ? lensMtf(plan, computed, reference, ctx.engine) : null;
  if (mtf) metrics.mtf = mtf.summary;
  // Two incoherent points: the dip between their patterns (analysis/two-points.ts).
  const two = twoPointReading(plan, computed);
  if (two) metrics.twoPoints = two;
  // The job's spectrometer: its detector, from the grating and the light (metrics/spectrometer.ts).
  const spectrometer = spectrometerPart(plan, [{ wavelength: c.wavelength, weight: 1, aperture: c.aperture }]);
  if (spectrometer) metrics.spectrometer = spectrometer.metrics;
  warnings.push(...postChecks(plan, d, grating), ...detectors.warnings);
  return { plan, computed, metrics, energy, ...(mtf ? { mtf: mtf.curve } : {}), ...(spectrometer ? { detector: spectrometer.signal } : {}), warnings, seconds: (performance.now() - t0) / 1000 };
}

/** A grating's part of the metrics (its order table and checks), or null for other elements. */
export interface GratingPart {
  metrics: Pick<CaseMetrics, 'orders' | 'ordersOmitted' | 'evanescentFraction' | 'orderChecks' | 'strayLight' | 'spectroscopy'>;
  warnings: Warning[];
  evanescence: GratingEvanescence;
}

/** The order table of a grating case and its consistency checks (every grating, every method). */
export function gratingPart(plan: Plan, computed: ComputedCase): GratingPart | null {
  const c = plan.case;
  const d = computed.diagnostics;
  const a = gratingOf(c.aperture);
  if (!a || c.aperture.opaque) return null;
  const footprint = a.count * a.period * (a.length ?? 1);
  const [alpha, beta] = directionCosines(c.illumination);
  const input: GratingInput = {
    period: a.period,
    width: a.width,
    profile: a.profile,
    count: a.count,
    wavelength: c.wavelength,
    distance: c.distance,
    sinIncidence: alpha,
    // A 1-D grating is computed in the x–z plane only (the planner warns that a tilt along y is ignored).
    sinIncidenceY: plan.y ? beta : 0,
    powerTransmitted: d.powerIn,
    powerIncident: c.illumination.kind === 'plane' ? footprint : null,
  };
  const warnings: Warning[] = [];
  const metrics: GratingPart['metrics'] = {};
  const table = gratingOrderTable(computed, input);
  // The answers that need the plan (resolving power with the illuminated periods, the focal
  // plane's dispersion, Littrow angles, order sorting): in the record as in the files.
  const use = gratingUse(plan);
  metrics.orders = ordersWithAnswers(plan, table.orders, use);
  if (use) metrics.spectroscopy = use;
  if (table.omitted.length) metrics.ordersOmitted = table.omitted;
  metrics.evanescentFraction = table.evanescentFraction;
  const evanescent = table.orders.filter((o) => o.status === 'evanescent');
  const below = evanescent.filter((o) => o.sinAngle < 0).map((o) => o.m);
  const above = evanescent.filter((o) => o.sinAngle > 0).map((o) => o.m);
  const evanescence: GratingEvanescence = {
    evanescentFraction: table.evanescentFraction,
    ...(below.length && above.length ? { cutoff: [Math.max(...below), Math.min(...above)] as [number, number] } : {}),
  };
  const checks = checkOrders(computed, orderCheckInput(plan, input, table, d.powerInWindow));
  metrics.orderChecks = checks.checked;
  if (checks.stray.length) metrics.strayLight = checks.stray;
  warnings.push(...checks.warnings);
  if (table.unresolved) {
    const u = table.unresolved;
    warnings.push(warning('orders-unresolved', { distance: c.distance, orders: u.orders, gratingWidth: input.count * input.period, separateBeyond: u.separateBeyond }));
  }
  return { metrics, warnings, evanescence };
}
