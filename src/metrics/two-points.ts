// Two mutually incoherent points (illumination kind points): the dip between their patterns on the
// screen, read in run/run-case.ts by analysis/two-points.ts; summary.csv carries the dip and both
// verdicts, so a sweep of separations shows where the pair becomes resolved.
import { column, metric, type MetricFamily } from './types.js';

export const twoPointMetrics: MetricFamily = {
  key: 'two-points',
  quantities: ({ cases }) =>
    cases.some((c) => c.source?.kind === 'points')
      ? [
          metric('two_point_dip', 'dip between the two points (valley / lower peak)', '1', (s) => s.metrics.twoPoints?.dip, { plot: true }),
          column('two_point_rayleigh', (s) => (s.metrics.twoPoints ? (s.metrics.twoPoints.resolved ? 'resolved' : 'not resolved') : undefined)),
          column('two_point_sparrow', (s) => (s.metrics.twoPoints ? (s.metrics.twoPoints.sparrow ? 'resolved' : 'not resolved') : undefined)),
        ]
      : [],
  definitions: {
    twoPoints:
      'two mutually incoherent points: centres where their patterns land, their separation, the two peaks and the valley found on the profile through them, dip = valley / lower peak (null: one peak), resolved by Rayleigh\'s criterion (dip ≤ 8/π²) and by Sparrow\'s (any dip)',
  },
};
