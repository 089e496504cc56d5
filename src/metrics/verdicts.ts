// Diffraction-limited or not: per axis, the spot (radius or half-width holding half the power)
// against the far-field pattern's and the geometric shadow's, and from which distance the far-field
// size holds (added by run/searches.ts, which propagates again to find it).
import type { IntensityMap } from '../analysis/metrics.js';
import type { EnergyCurve } from '../analysis/encircled.js';
import { makeVerdict, spotSize, verdictWidth, type Verdict } from '../analysis/verdict.js';
import type { CaseSummary } from '../output/case-output.js';
import { verdictAxesOf } from '../plan/answers.js';
import type { Plan } from '../plan/types.js';
import { column, metric, type MetricFamily } from './types.js';

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
export function caseVerdicts(
  plan: Plan,
  map: IntensityMap,
  centre: [number, number],
  powerThroughAperture: number,
  /** The map's energy curve about centre as fractions of powerThroughAperture, if the caller has it. */
  curve?: EnergyCurve | null,
): Verdict[] {
  const c = plan.case;
  const out: Verdict[] = [];
  for (const axis of verdictAxes(plan)) {
    const width = verdictWidth(c.aperture, axis)!;
    const nf = (width / 2) ** 2 / (c.wavelength * c.distance);
    const size = spotSize(map, axis, width, c.wavelength, c.distance, centre, powerThroughAperture, axis === 'radial' ? curve : null);
    out.push(makeVerdict(axis, size, nf));
  }
  return out;
}

export const verdictMetrics: MetricFamily = {
  key: 'verdicts',
  quantities: ({ records }) => {
    const axes = new Set<Verdict['axis']>();
    for (const r of records) for (const v of r.metrics.verdicts ?? []) axes.add(v.axis);
    return [...axes].flatMap((axis) => {
      const tag = axis === 'radial' ? '' : `_${axis}`;
      const on = tag ? ` (${axis})` : '';
      const verdict = (s: CaseSummary) => s.metrics.verdicts?.find((v) => v.axis === axis);
      // The spot and both references in one chart (log–log: the shadow flat, the far field ∝ z);
      // the ratios are columns.
      const chart = `spot size${on}: radius or half-width holding half the power`;
      return [
        column(`verdict${tag}`, (s) => verdict(s)?.kind),
        metric(`spot${tag}_m`, `computed${on}`, 'm', (s) => verdict(s)?.size.computed, { log: true, plot: true, chart: { name: chart } }),
        metric(`shadow${tag}_m`, `geometric shadow${on}`, 'm', (s) => verdict(s)?.size.geometric, { log: true, plot: true, chart: { name: chart, reference: true } }),
        metric(`far_field_size${tag}_m`, `far field${on}`, 'm', (s) => verdict(s)?.size.farField, { log: true, plot: true, chart: { name: chart, reference: true } }),
        metric(`spot_over_far_field${tag}`, `spot / far-field size${on}`, '1', (s) => verdict(s)?.spotOverFarField),
        metric(`spot_over_shadow${tag}`, `spot / geometric shadow${on}`, '1', (s) => verdict(s)?.spotOverShadow, { log: true }),
        // The same for every distance of one aperture: a column, not a plot.
        metric(`far_field_from${tag}_m`, `far field (1 %) from${on}`, 'm', (s) => verdict(s)?.farFieldFrom),
      ];
    });
  },
};
