// summary.csv: one row per case, the swept parameters first, then the key numbers. The same
// column list tells the report which metrics there are and how to plot them.
import type { SweepAxis } from '../job/expand.js';
import type { CaseSummary } from './case-output.js';
import type { Case, Plan } from '../plan/types.js';
import type { MetricInfo } from '../report/types.js';
import { toCsv, type Cell } from './csv.js';

export interface SummaryRow {
  plan?: Plan | undefined;
  record?: CaseSummary;
  case?: Case;
  error?: string;
  /** A case not (yet) computed: a shard still running it, or a run that stopped before it. */
  missing?: boolean;
}

export interface Column {
  header: string;
  get(r: SummaryRow): Cell;
  /** Set for numeric metrics that belong in plots. */
  metric?: MetricInfo;
}

const num = (header: string, label: string, unit: 'm' | '1', get: (rec: CaseSummary) => number | null | undefined, log = false): Column => ({
  header,
  get: (r) => (r.record ? (get(r.record) ?? null) : null),
  metric: { key: header, label, unit, ...(log ? { log } : {}) },
});

function caseOf(r: SummaryRow): Case {
  return r.record?.plan.case ?? r.plan?.case ?? r.case!;
}

function planOf(r: SummaryRow): Plan | undefined {
  return r.record?.plan ?? r.plan;
}

/** The columns after the swept parameters; detector and verdict columns follow the job's settings. */
export function summaryColumns(rows: SummaryRow[]): Column[] {
  const first = rows.map(caseOf)[0];
  const detectors = first?.analysis.detectors ?? [];
  const axes = new Set<string>();
  for (const r of rows) for (const v of r.record?.metrics.verdicts ?? []) axes.add(v.axis);
  const cols: Column[] = [
    { header: 'status', get: (r) => (r.error ? 'failed' : r.missing ? 'missing' : 'done') },
    { header: 'wavelength_m', get: (r) => caseOf(r).wavelength },
    { header: 'distance_m', get: (r) => caseOf(r).distance },
    {
      header: 'fresnel_number',
      get: (r) => {
        const p = planOf(r);
        return p ? Math.max(p.checks.fresnelNumbers[0], p.checks.fresnelNumbers[1] ?? 0) : null;
      },
      metric: { key: 'fresnel_number', label: 'Fresnel number', unit: '1', log: true },
    },
    { header: 'regime', get: (r) => planOf(r)?.regime ?? null },
    {
      header: 'method',
      get: (r) => {
        const p = planOf(r);
        return p ? (p.form ? `${p.method}/${p.form}` : p.method) : null;
      },
    },
    num('peak_intensity', 'peak intensity (relative)', '1', (m) => m.metrics.peakIntensity, true),
    num('on_axis_intensity', 'on-axis intensity (relative)', '1', (m) => m.metrics.onAxisIntensity, true),
    num('peak_x_m', 'peak position x', 'm', (m) => m.metrics.peakPosition[0]),
    num('peak_y_m', 'peak position y', 'm', (m) => m.metrics.peakPosition[1]),
    num('centroid_x_m', 'centroid x', 'm', (m) => m.metrics.centroid[0]),
    num('centroid_y_m', 'centroid y', 'm', (m) => m.metrics.centroid[1]),
    num('fwhm_x_m', 'FWHM x', 'm', (m) => m.metrics.fwhm[0]),
    num('fwhm_y_m', 'FWHM y', 'm', (m) => m.metrics.fwhm[1]),
    num('e2_width_x_m', '1/e² full width x', 'm', (m) => m.metrics.e2Width[0]),
    num('e2_width_y_m', '1/e² full width y', 'm', (m) => m.metrics.e2Width[1]),
    num('d4sigma_x_m', 'D4σ width x', 'm', (m) => m.metrics.d4sigma[0]),
    num('d4sigma_y_m', 'D4σ width y', 'm', (m) => m.metrics.d4sigma[1]),
    num('first_min_x_m', 'first minimum x', 'm', (m) => m.metrics.firstMinimum[0]),
    num('first_min_y_m', 'first minimum y', 'm', (m) => m.metrics.firstMinimum[1]),
    num('ee50_radius_m', 'radius holding 50 % (encircled energy)', 'm', (m) => m.metrics.encircled?.radius50),
    num('ee84_radius_m', 'radius holding 84 %', 'm', (m) => m.metrics.encircled?.radius84),
    num('ee90_radius_m', 'radius holding 90 %', 'm', (m) => m.metrics.encircled?.radius90),
    num('power_through_aperture', 'power through the aperture', '1', (m) => m.metrics.powerThroughAperture, true),
    num('power_in_window', 'power in the window', '1', (m) => m.metrics.powerInWindow, true),
    num('window_fraction', 'fraction of the power in the window', '1', (m) => m.metrics.windowFraction),
  ];
  // A detector's fraction is of the power through the aperture, or behind an obstacle of what it
  // would receive unobstructed (metrics.detectors[i].reference); the label says which.
  const behind = rows.some((r) => r.record?.metrics.detectors.some((d) => d.reference === 'unobstructed-beam'));
  const mixed = behind && rows.some((r) => r.record?.metrics.detectors.some((d) => d.reference === 'power-through-aperture'));
  detectors.forEach((d, i) => {
    const of = mixed ? ' (see result.json for its reference)' : behind ? ' (of the unobstructed beam on it)' : '';
    cols.push(num(`detector${i + 1}_fraction`, `fraction on ${d.kind} ${i + 1}${of}`, '1', (m) => m.metrics.detectors[i]?.fraction));
    cols.push({ header: `detector${i + 1}_area_in_window`, get: (r) => r.record?.metrics.detectors[i]?.areaInWindow ?? null });
  });
  if (rows.some((r) => r.record?.metrics.evanescentFraction !== undefined)) {
    cols.push(num('evanescent_fraction', 'evanescent fraction (thin-grating theory)', '1', (m) => m.metrics.evanescentFraction));
  }
  for (const axis of axes) {
    const tag = axis === 'radial' ? '' : `_${axis}`;
    const verdict = (m: CaseSummary) => m.metrics.verdicts?.find((v) => v.axis === axis);
    cols.push({ header: `verdict${tag}`, get: (r) => (r.record ? (verdict(r.record)?.kind ?? null) : null) });
    cols.push(num(`spot_over_far_field${tag}`, `spot / far-field size${tag ? ` (${axis})` : ''}`, '1', (m) => verdict(m)?.spotOverFarField));
    cols.push(num(`spot_over_shadow${tag}`, `spot / geometric shadow${tag ? ` (${axis})` : ''}`, '1', (m) => verdict(m)?.spotOverShadow, true));
    cols.push(num(`far_field_from${tag}_m`, `far field (1 %) from${tag ? ` (${axis})` : ''}`, 'm', (m) => verdict(m)?.farFieldFrom));
  }
  if (rows.some((r) => r.record?.search)) {
    cols.push(num('smallest_spot_size_m', 'aperture size of the smallest spot', 'm', (m) => m.search?.best));
    cols.push(num('smallest_spot_m', 'smallest spot size', 'm', (m) => m.search?.bestMeasure));
    cols.push(num('textbook_size_m', 'textbook size estimate', 'm', (m) => m.search?.textbook));
  }
  cols.push(
    { header: 'seconds', get: (r) => r.record?.seconds ?? null },
    { header: 'warnings', get: (r) => (r.record ? r.record.warnings.map((w) => w.code).join(';') : null) },
    { header: 'error', get: (r) => r.error ?? null },
  );
  return cols;
}

/** Swept keys other than wavelength and distance, which have columns of their own. */
function sweptColumns(allAxes: SweepAxis[]): Column[] {
  return allAxes
    .filter((a) => a.key !== 'wavelength' && a.key !== 'distance')
    .map((a) => ({ header: a.unit === 'm' ? `${a.key}_m` : a.key, get: (r: SummaryRow) => caseOf(r).swept[a.key] ?? null }));
}

export function summaryCsv(allAxes: SweepAxis[], rows: SummaryRow[]): string {
  const cols = [{ header: 'case', get: (r: SummaryRow) => caseOf(r).id }, ...sweptColumns(allAxes), ...summaryColumns(rows)];
  return toCsv(
    cols.map((c) => c.header),
    rows.map((r) => cols.map((c) => c.get(r))),
  );
}
