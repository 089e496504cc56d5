// The power account: power through the aperture, power in the window and the fraction of the one
// in the other (how much of the light the window holds).
import type { CaseMetrics } from '../output/case-output.js';
import { metric, type MetricFamily } from './types.js';

/**
 * CaseMetrics' power fields. powerThroughAperture is null behind an opaque obstacle (Babinet), whose
 * blocked power is given instead: in a plane wave the total is infinite and fractions of it mean nothing.
 */
export function powerAccount(
  powerInWindow: number,
  powerThroughAperture: number | null,
  powerBlocked?: number,
): Pick<CaseMetrics, 'powerThroughAperture' | 'powerBlocked' | 'windowFraction'> {
  return {
    powerThroughAperture,
    ...(powerBlocked !== undefined ? { powerBlocked } : {}),
    windowFraction: powerThroughAperture ? powerInWindow / powerThroughAperture : null,
  };
}

export const windowMetrics: MetricFamily = {
  key: 'window',
  quantities: () => [
    metric('power_through_aperture', 'power through the aperture', '1', (s) => s.metrics.powerThroughAperture, { log: true }),
    metric('power_in_window', 'power in the window', '1', (s) => s.metrics.powerInWindow, { log: true }),
    // A diagnostic: in the cases table, not plotted.
    metric('window_fraction', 'fraction of the power in the window', '1', (s) => s.metrics.windowFraction),
  ],
};
