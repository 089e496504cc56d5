// summary.csv: one row per case, the swept parameters first, then the key numbers.
import type { SweepAxis } from '../job/expand.js';
import type { CaseRecord } from './case-output.js';
import type { Case, Plan } from '../plan/types.js';
import { toCsv, type Cell } from './csv.js';

export interface SummaryRow {
  plan?: Plan | undefined;
  record?: CaseRecord;
  case?: Case;
  error?: string;
}

const FIXED = [
  'status',
  'wavelength_m',
  'distance_m',
  'fresnel_number',
  'regime',
  'method',
  'peak_intensity',
  'on_axis_intensity',
  'peak_x_m',
  'peak_y_m',
  'fwhm_x_m',
  'fwhm_y_m',
  'first_min_x_m',
  'first_min_y_m',
  'power_through_aperture',
  'power_in_window',
  'window_fraction',
  'seconds',
  'warnings',
  'error',
];

export function summaryCsv(allAxes: SweepAxis[], rows: SummaryRow[]): string {
  // Wavelength and distance have columns of their own.
  const axes = allAxes.filter((a) => a.key !== 'wavelength' && a.key !== 'distance');
  const header = ['case', ...axes.map((a) => (a.unit === 'm' ? `${a.key}_m` : a.key)), ...FIXED];
  const body: Cell[][] = rows.map((r) => {
    const c = r.record?.plan.case ?? r.plan?.case ?? r.case!;
    const swept = axes.map((a) => c.swept[a.key] ?? null);
    const p = r.record?.plan ?? r.plan;
    const m = r.record?.metrics;
    return [
      c.id,
      ...swept,
      r.error ? 'failed' : 'done',
      c.wavelength,
      c.distance,
      p ? Math.max(p.checks.fresnelNumbers[0], p.checks.fresnelNumbers[1] ?? 0) : null,
      p?.regime,
      p ? (p.form ? `${p.method}/${p.form}` : p.method) : null,
      m?.peakIntensity,
      m?.onAxisIntensity,
      m?.peakPosition[0],
      m?.peakPosition[1],
      m?.fwhm[0],
      m?.fwhm[1],
      m?.firstMinimum[0],
      m?.firstMinimum[1],
      m?.powerThroughAperture,
      m?.powerInWindow,
      m?.windowFraction,
      r.record?.seconds,
      r.record ? r.record.warnings.map((w) => w.code).join(';') : null,
      r.error ?? null,
    ];
  });
  return toCsv(header, body);
}
