// Grating orders: the order table and its checks are computed in run/run-case.ts (analysis/orders.ts,
// analysis/order-checks.ts) and written to orders.csv and the report's order tables; summary.csv
// carries the power thin-grating theory sends into evanescent orders.
import { metric, type MetricFamily } from './types.js';

export const gratingMetrics: MetricFamily = {
  key: 'grating',
  quantities: ({ records }) =>
    records.some((r) => r.metrics.evanescentFraction !== undefined)
      ? [metric('evanescent_fraction', 'evanescent fraction (thin-grating theory)', '1', (s) => s.metrics.evanescentFraction)]
      : [],
  definitions: {
    orders:
      'grating orders, d(sin θ_m − sin θ_i) = mλ; fractionOfTransmitted = ∫|U|²dx over the interval between the midpoints to the neighbouring orders / power through the slits; predictedFraction = (w/d)·sinc²(m·w/d) (thin-grating theory); fluxFraction = fractionOfTransmitted · cos θ_m/cos θ_i, the power crossing the screen plane; evanescent orders carry 0; separated = false where the beam of an order overlaps that of a neighbour on the screen (closer than the orders separate): its fractions are then null',
    evanescentFraction: 'fraction of the power through the slits that thin-grating theory sends into evanescent orders (never reaches a screen)',
  },
};
