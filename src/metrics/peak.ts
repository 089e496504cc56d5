// Peak and on-axis intensity, the peak's position and the centroid: read off the map by
// spotMetrics (analysis/metrics.ts) in the same pass as the widths.
import { metric, type MetricFamily } from './types.js';

export const peakMetrics: MetricFamily = {
  key: 'peak',
  quantities: () => [
    metric('peak_intensity', 'peak intensity (relative)', '1', (s) => s.metrics.peakIntensity, { log: true, plot: true }),
    metric('on_axis_intensity', 'on-axis intensity (relative)', '1', (s) => s.metrics.onAxisIntensity, { log: true, plot: true }),
    // Positions stay in summary.csv: they say where the light went, not how good the spot is.
    metric('peak_x_m', 'peak position x', 'm', (s) => s.metrics.peakPosition[0]),
    metric('peak_y_m', 'peak position y', 'm', (s) => s.metrics.peakPosition[1]),
    metric('centroid_x_m', 'centroid x', 'm', (s) => s.metrics.centroid[0]),
    metric('centroid_y_m', 'centroid y', 'm', (s) => s.metrics.centroid[1]),
  ],
};
