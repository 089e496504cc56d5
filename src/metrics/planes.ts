// Planes in sequence: how much of the light each plane passes. A plane's transmission is the power
// its element passes over the power that left the plane before it (all of which arrives, the
// Fresnel integral conserving power); the first plane's is over what falls on the region sampled
// there. For a spatial filter, plane 2's transmission is the fraction of the focused beam through
// the pinhole.
import type { PlanePower } from '../methods/types.js';
import { describe } from '../optics/aperture.js';
import type { Case } from '../plan/types.js';
import { metric, type MetricFamily } from './types.js';

export interface PlaneResult {
  plane: number;
  element: string;
  /** Distance from the plane before (m); null for the first. */
  after: number | null;
  /** Power passed (W per unit incident irradiance). */
  passed: number;
  /** passed / the power that left the plane before (the first: / the power falling on its sampled region). */
  transmission: number;
  /** passed / the power the first plane passed. */
  ofFirst: number;
}

export function planeResults(c: Case, powers: readonly PlanePower[]): PlaneResult[] {
  const elements = [c.aperture, ...(c.planes ?? []).map((p) => p.aperture)];
  return powers.map((p, i) => {
    const before = i === 0 ? p.arriving : powers[i - 1]!.passed;
    return {
      plane: p.plane,
      element: describe(elements[i]!),
      after: i === 0 ? null : c.planes![i - 1]!.after,
      passed: p.passed,
      transmission: before > 0 ? p.passed / before : 0,
      ofFirst: powers[0]!.passed > 0 ? p.passed / powers[0]!.passed : 0,
    };
  });
}

export const planeMetrics: MetricFamily = {
  key: 'planes',
  quantities: ({ cases }) => {
    const most = Math.max(0, ...cases.map((c) => c.planes?.length ?? 0));
    return Array.from({ length: most }, (_, i) => i + 2).flatMap((n) => [
      metric(`plane${n}_transmission`, `plane ${n}: fraction of the light from the plane before that it passes`, '1', (s) => s.metrics.planes?.[n - 1]?.transmission, { plot: true }),
      metric(`plane${n}_of_first`, `plane ${n}: power passed over the first plane's`, '1', (s) => s.metrics.planes?.[n - 1]?.ofFirst),
    ]);
  },
  definitions: {
    planes:
      "planes in sequence: per plane, the power its element passes (W per unit incident irradiance), its transmission (over the power that left the plane before, all of which arrives: the Fresnel integral conserves power; the first plane's over the light falling on the region sampled there), and the fraction of the first plane's power; with planes, powerThroughAperture is the power leaving the last plane",
  },
};
