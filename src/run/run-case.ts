// One case end to end, without I/O: plan → field → metrics → warnings.
import { detectorAreaInWindow, detectorPower, energyCurve, radiusHolding, type DetectorSpec } from '../analysis/encircled.js';
import { spotMetrics, type IntensityMap } from '../analysis/metrics.js';
import { checkOrders, orderCheckInput } from '../analysis/order-checks.js';
import { gratingOrderTable, type GratingInput } from '../analysis/orders.js';
import { postChecks, type GratingEvanescence } from '../analysis/validity.js';
import { makeVerdict, spotSize, verdictWidth, type Verdict } from '../analysis/verdict.js';
import { formatLength, trimNumber } from '../job/units.js';
import type { Axis } from '../optics/field.js';
import { intensityOf } from '../optics/field.js';
import { freeField } from '../optics/free.js';
import { directionCosines } from '../optics/source.js';
import { gratingOf } from '../elements/registry.js';
import type { CaseMetrics, CaseRecord, DetectorResult } from '../output/case-output.js';
import { verdictAxesOf } from '../plan/answers.js';
import type { Plan, Warning } from '../plan/types.js';
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
  // Behind an obstacle (in a plane wave or a Gaussian beam) a detector reads a fraction of what it
  // would receive with nothing in the way.
  const detectors = readDetectors(plan, computed, centre, c.aperture.opaque ? null : reference);
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
    detectors: detectors.results,
  };
  const warnings: Warning[] = [...plan.warnings];
  let grating: GratingEvanescence | undefined;
  const a = gratingOf(c.aperture);
  if (a && !c.aperture.opaque) {
    const footprint = a.count * a.period * (a.length ?? 1);
    const [alpha, beta] = directionCosines(c.illumination);
    const input: GratingInput = {
      period: a.period,
      width: a.width,
      count: a.count,
      wavelength: c.wavelength,
      distance: c.distance,
      sinIncidence: alpha,
      // A 1-D grating is computed in the x–z plane only (the planner warns that a tilt along y is ignored).
      sinIncidenceY: plan.y ? beta : 0,
      powerTransmitted: d.powerIn,
      powerIncident: c.illumination.kind === 'plane' ? footprint : null,
    };
    const table = gratingOrderTable(computed, input);
    metrics.orders = table.orders;
    if (table.omitted.length) metrics.ordersOmitted = table.omitted;
    metrics.evanescentFraction = table.evanescentFraction;
    const evanescent = table.orders.filter((o) => o.status === 'evanescent');
    const below = evanescent.filter((o) => o.sinAngle < 0).map((o) => o.m);
    const above = evanescent.filter((o) => o.sinAngle > 0).map((o) => o.m);
    grating = {
      evanescentFraction: table.evanescentFraction,
      ...(below.length && above.length ? { cutoff: [Math.max(...below), Math.min(...above)] as [number, number] } : {}),
    };
    // The consistency checks run on every grating case, whatever method computed it.
    const checks = checkOrders(computed, orderCheckInput(plan, input, table, d.powerInWindow));
    metrics.orderChecks = checks.checked;
    if (checks.stray.length) metrics.strayLight = checks.stray;
    warnings.push(...checks.warnings);
    if (table.unresolved) {
      const u = table.unresolved;
      warnings.push({
        code: 'orders-unresolved',
        message:
          `at ${formatLength(c.distance, 4)} the orders ${u.orders.length > 6 ? `${u.orders[0]}…${u.orders[u.orders.length - 1]}` : u.orders.join(', ')} overlap on the screen (each is a beam as wide as the grating's ${formatLength(input.count * input.period, 3)}, widened by its diffraction): the light between two orders is theirs together, so their powers are left empty in the order table` +
          (u.separateBeyond !== null ? `; they separate beyond about ${formatLength(u.separateBeyond, 3)}` : '; with so few lines they never separate fully'),
      });
    }
  }
  const verdicts = caseVerdicts(plan, computed, centre);
  if (verdicts.length) metrics.verdicts = verdicts;
  warnings.push(...postChecks(plan, d, grating), ...detectors.warnings);
  return { plan, computed, metrics, energy, warnings, seconds: (performance.now() - t0) / 1000 };
}

/**
 * The job's detectors. With an aperture, each reads a fraction of the power through it; behind an
 * opaque obstacle (Babinet), a fraction of what it would receive with nothing in the way. A
 * detector partly outside the window reads the part inside (a lower bound, with a warning); one
 * wholly outside reads null (never a silent 0).
 */
function readDetectors(plan: Plan, map: ComputedCase, centre: [number, number], reference: number | null): { results: DetectorResult[]; warnings: Warning[] } {
  const results: DetectorResult[] = [];
  const outside: string[] = [];
  plan.case.analysis.detectors.forEach((det, i) => {
    const at = det.at ?? centre;
    const spec: DetectorSpec = { kind: det.kind, size: det.size, at };
    const areaInWindow = detectorAreaInWindow(map, spec, at);
    const ref = reference ?? unobstructedDetectorPower(plan, map, spec, at);
    const power = areaInWindow > 0 ? detectorPower(map, spec, at) : null;
    results.push({
      kind: det.kind,
      size: det.size,
      at,
      fraction: power === null || !(ref > 0) ? null : power / ref,
      reference: reference !== null ? 'power-through-aperture' : 'unobstructed-beam',
      referencePower: ref,
      areaInWindow,
    });
    if (areaInWindow < 1 - 1e-9) {
      const where = `${det.kind} ${i + 1} (${formatLength(det.size, 3)} at ${formatLength(at[0], 4)}${plan.y ? `, ${formatLength(at[1], 4)}` : ''})`;
      outside.push(
        areaInWindow === 0
          ? `${where} lies wholly outside the window: it has no value (null)`
          : `${where} has ${trimNumber(100 * (1 - areaInWindow), 3)} % of its ${plan.y ? 'area' : 'width'} outside the window: its value counts only the part inside and is a lower bound`,
      );
    }
  });
  const warnings: Warning[] = [];
  if (outside.length) {
    const win = `${formatLength(2 * plan.x.windowHalf, 3)}${plan.y ? ` × ${formatLength(2 * plan.y.windowHalf, 3)}` : ''} window centred at ${formatLength(plan.x.windowCentre, 4)}${plan.y ? `, ${formatLength(plan.y.windowCentre, 4)}` : ''}`;
    warnings.push({
      code: 'detector-outside',
      message: `${outside.join('; ')} (the ${win}); ${plan.case.window ? 'widen the window the job gives' : 'give a window in the job that covers it'} or move the detector`,
    });
  }
  return { results, warnings };
}

/**
 * The power a detector would receive with nothing in the way: the unobstructed beam (plane wave
 * or Gaussian, in closed form, optics/free.ts) sampled on the map's lattice around the detector,
 * including any part outside the window, and integrated with the same sub-cell coverage as the
 * reading (so that for a plane wave it is the detector's area × 1 as that coverage counts it).
 */
export function unobstructedDetectorPower(plan: Plan, map: IntensityMap, d: DetectorSpec, at: [number, number]): number {
  const c = plan.case;
  const half = d.size / 2;
  const lattice = (origin: number, step: number, centre: number): Axis => {
    const first = Math.floor((centre - half - origin) / step) - 1;
    const last = Math.ceil((centre + half - origin) / step) + 1;
    return { n: last - first + 1, start: origin + first * step, step };
  };
  const xs = lattice(map.origin[0], map.pitch[0], at[0]);
  const ys = map.pitch[1] === null ? null : lattice(map.origin[1], map.pitch[1], at[1]);
  const free = freeField(c.illumination, c.distance, xs, ys, c.wavelength);
  const local: IntensityMap = {
    intensity: intensityOf(free),
    rows: ys ? ys.n : 1,
    cols: xs.n,
    pitch: [xs.step, ys ? ys.step : null],
    origin: [xs.start, ys ? ys.start : 0],
  };
  return detectorPower(local, d, at);
}

/** The axes a verdict is given for: radial for circles, x for long slits, x and y for rectangles. */
export function verdictAxes(plan: Plan): ('radial' | 'x' | 'y')[] {
  // One rule with the planner, which costs the verdicts' searches (plan/answers.ts).
  return verdictAxesOf(plan.case);
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
