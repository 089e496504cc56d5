// Every metric the tool reports, in the order of summary.csv's columns. summary.csv
// (output/summary.ts), the report's plots and per-case lists (report/assemble.ts) and the words in
// result.json's `definitions` (output/case-output.ts) are built from this list; adding a metric is
// one file here and one line below.
import type { MetricInfo } from '../report/types.js';
import { detectorMetrics } from './detectors.js';
import { encircledMetrics } from './encircled.js';
import { gratingMetrics } from './grating.js';
import { peakMetrics } from './peak.js';
import { planeMetrics } from './planes.js';
import { smallestSpotMetrics } from './smallest-spot.js';
import { spatialFilterMetrics } from './spatial-filter.js';
import { strehlMetrics } from './strehl.js';
import { mtfMetrics } from './mtf.js';
import { spectrometerMetrics } from './spectrometer.js';
import { twoPointMetrics } from './two-points.js';
import type { MetricFamily, MetricScope, Quantity } from './types.js';
import { verdictMetrics } from './verdicts.js';
import { widthMetrics } from './widths.js';
import { windowMetrics } from './window.js';

export const METRICS: readonly MetricFamily[] = [
  peakMetrics,
  widthMetrics,
  encircledMetrics,
  windowMetrics,
  detectorMetrics,
  gratingMetrics,
  verdictMetrics,
  strehlMetrics,
  planeMetrics,
  spatialFilterMetrics,
  mtfMetrics,
  spectrometerMetrics,
  twoPointMetrics,
  smallestSpotMetrics,
];

/** The quantities a job reports, family by family: summary.csv's metric columns in order. */
export function metricQuantities(scope: MetricScope, families: readonly MetricFamily[] = METRICS): Quantity[] {
  return families.flatMap((f) => f.quantities(scope));
}

/** A quantity the report plots and lists per case, with its MetricInfo (key = its summary.csv header). */
export interface ReportedMetric {
  info: MetricInfo;
  quantity: Quantity;
}

/** The quantities the report plots, in summary.csv's order. */
export function reportedMetrics(scope: MetricScope, families: readonly MetricFamily[] = METRICS): ReportedMetric[] {
  return metricQuantities(scope, families)
    .filter((q) => q.display?.plot)
    .map((q) => {
      const d = q.display!;
      return { info: { key: q.header, label: d.label, unit: d.unit, ...(d.log ? { log: true } : {}), ...(d.chart ? { chart: d.chart } : {}) }, quantity: q };
    });
}

/** result.json's `definitions`: every family's words, in registry order. */
export function metricDefinitions(families: readonly MetricFamily[] = METRICS): Record<string, string> {
  const out: Record<string, string> = {};
  for (const f of families) {
    for (const [k, v] of Object.entries(f.definitions ?? {})) {
      if (k in out) throw new Error(`metric definition ${k} given twice (${f.key})`);
      out[k] = v;
    }
  }
  return out;
}
