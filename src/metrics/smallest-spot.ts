// The answer to "which aperture size gives the smallest spot here?", found by run/searches.ts
// (a scan and a golden-section search, each size planned and propagated) when the job asks.
import { metric, type MetricFamily } from './types.js';

export const smallestSpotMetrics: MetricFamily = {
  key: 'smallest-spot',
  quantities: ({ records }) =>
    records.some((r) => r.search)
      ? [
          metric('smallest_spot_size_m', 'aperture size of the smallest spot', 'm', (s) => s.search?.best, { plot: true }),
          metric('smallest_spot_m', 'smallest spot size', 'm', (s) => s.search?.bestMeasure, { plot: true }),
          metric('textbook_size_m', 'textbook size estimate', 'm', (s) => s.search?.textbook),
        ]
      : [],
};
