// Encircled energy: the radii (2-D) or half-widths (1-D) about the centroid that hold 50, 84 and
// 90 % of the power through the aperture, read off the curve of analysis/encircled.ts.
import { radiusHolding, type EnergyCurve } from '../analysis/encircled.js';
import type { CaseMetrics } from '../output/case-output.js';
import { metric, type MetricFamily } from './types.js';

/** CaseMetrics.encircled from the case's energy curve (null where there is none: obstacles in a plane wave). */
export function encircledRadii(curve: EnergyCurve | null, centre: [number, number]): CaseMetrics['encircled'] {
  return curve
    ? {
        centre,
        radius50: radiusHolding(curve, 0.5),
        radius84: radiusHolding(curve, 0.84),
        radius90: radiusHolding(curve, 0.9),
      }
    : null;
}

export const encircledMetrics: MetricFamily = {
  key: 'encircled',
  quantities: () => [
    metric('ee50_radius_m', 'radius holding 50 % (encircled energy)', 'm', (s) => s.metrics.encircled?.radius50, { plot: true }),
    metric('ee84_radius_m', 'radius holding 84 %', 'm', (s) => s.metrics.encircled?.radius84, { plot: true }),
    metric('ee90_radius_m', 'radius holding 90 %', 'm', (s) => s.metrics.encircled?.radius90),
  ],
};
