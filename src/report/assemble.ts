// Gathering a job's results into a JobReport, and writing the job-level answers: the order-overlap
// table, the sweep plots, the contact sheet and the report page.
import { readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { formatLength, trimNumber } from '../job/units.js';
import type { SweepAxis } from '../job/expand.js';
import type { LoadedJob } from '../job/load.js';
import type { Overlap } from '../analysis/overlap.js';
import { writeFileAtomic, safeJoin } from '../output/atomic.js';
import { CASE_FILES } from '../output/case-output.js';
import { toCsv } from '../output/csv.js';
import { summaryColumns, type SummaryRow } from '../output/summary.js';
import type { ComputedCase } from '../run/compute.js';
import { TOOL_VERSION } from '../version.js';
import { renderContactSheet, type SheetTile } from './contact-sheet.js';
import { renderReportHtml } from './html.js';
import { renderPlot, sweepPlots } from './plots.js';
import type { JobReport, ReportCase, ReportTable, SweepKey } from './types.js';

export const JOB_FILES = {
  report: 'report.html',
  contactSheet: 'contact-sheet.png',
  overlap: 'order-overlap.csv',
  plots: 'plots',
} as const;

/** How many cases a contact sheet shows at most (chosen evenly along the sweep). */
export const SHEET_MAX_TILES = 36;

/** Indices of the cases that go on the contact sheet. */
export function sheetIndices(count: number): Set<number> {
  if (count < 2) return new Set();
  const n = Math.min(count, SHEET_MAX_TILES);
  return new Set(Array.from({ length: n }, (_, i) => Math.round((i * (count - 1)) / Math.max(1, n - 1))));
}

/** A case's map reduced (box average) to at most `limit` samples per axis, for the contact sheet. */
export function sheetTile(label: string, c: ComputedCase, limit = 400): SheetTile {
  const fx = Math.max(1, Math.ceil(c.cols / limit));
  const fy = c.pitch[1] === null ? 1 : Math.max(1, Math.ceil(c.rows / limit));
  const cols = Math.floor(c.cols / fx);
  const rows = Math.floor(c.rows / fy);
  const out = new Float64Array(rows * cols);
  for (let r = 0; r < rows; r++) {
    for (let q = 0; q < cols; q++) {
      let s = 0;
      for (let i = 0; i < fy; i++) for (let j = 0; j < fx; j++) s += c.intensity[(r * fy + i) * c.cols + q * fx + j]!;
      out[r * cols + q] = s / (fx * fy);
    }
  }
  const dx = c.pitch[0] * fx;
  const dy = c.pitch[1] === null ? null : c.pitch[1] * fy;
  // The reduced sample (r, q) is centred on the mean position of the samples it averages.
  return {
    label,
    intensity: out,
    rows,
    cols,
    pitchX: dx,
    pitchY: dy,
    originX: c.origin[0] + ((fx - 1) / 2) * c.pitch[0],
    originY: c.pitch[1] === null ? 0 : c.origin[1] + ((fy - 1) / 2) * c.pitch[1],
  };
}

const LABELS: Record<string, string> = {
  wavelength: 'wavelength',
  distance: 'distance',
  'aperture.diameter': 'diameter',
  'aperture.width': 'width',
  'aperture.height': 'height',
  'aperture.length': 'length',
  'aperture.outer': 'outer diameter',
  'aperture.inner': 'inner diameter',
  'aperture.count': 'slit count',
  'aperture.period': 'period',
  'illumination.waist': 'beam waist',
};

export function sweptLabel(a: { key: string; unit: 'm' | '1' }, value: number): string {
  const short = LABELS[a.key] ?? a.key;
  return `${short} ${a.unit === 'm' ? formatLength(value, 4) : value}`;
}

export interface ReportInputs {
  loaded: LoadedJob;
  axes: SweepAxis[];
  rows: SummaryRow[];
  plans: string[];
  overlaps: Overlap[];
}

/**
 * The metrics a report plots and lists per case: the answers people read off a sweep. Positions,
 * powers and the far-field distance (the same for every distance of one aperture) stay in
 * summary.csv.
 */
const REPORTED = [
  /^peak_intensity$/,
  /^on_axis_intensity$/,
  /^fwhm_[xy]_m$/,
  /^d4sigma_[xy]_m$/,
  /^ee(50|84)_radius_m$/,
  /^window_fraction$/,
  /^detector\d+_fraction$/,
  /^spot_over_(far_field|shadow)/,
  /^smallest_spot/,
];

export function buildJobReport(inp: ReportInputs): JobReport {
  const { loaded, axes, rows } = inp;
  const columns = summaryColumns(rows);
  const metricColumns = columns.filter((c) => c.metric && REPORTED.some((re) => re.test(c.header)));
  const sweeps: SweepKey[] = axes.map((a) => ({
    key: a.key,
    label: LABELS[a.key] ?? a.key,
    unit: a.unit,
    spacing: a.spacing === 'single' ? 'list' : a.spacing,
    values: a.values,
  }));
  const cases: ReportCase[] = rows.map((r) => {
    const c = r.record?.plan.case ?? r.plan?.case ?? r.case!;
    const p = r.record?.plan ?? r.plan;
    const metrics: Record<string, number | null> = {};
    for (const col of metricColumns) {
      const v = col.get(r);
      metrics[col.metric!.key] = typeof v === 'number' && Number.isFinite(v) ? v : null;
    }
    const verdicts = r.record?.metrics.verdicts ?? [];
    return {
      id: c.id,
      folder: c.id,
      status: r.error ? 'failed' : r.missing ? 'missing' : 'done',
      ...(r.error ? { error: r.error } : {}),
      swept: c.swept,
      wavelength: c.wavelength,
      distance: c.distance,
      fresnelNumber: p ? Math.max(p.checks.fresnelNumbers[0], p.checks.fresnelNumbers[1] ?? 0) : null,
      regime: p?.regime ?? null,
      method: p ? (p.form ? `${p.method} (${p.form})` : p.method) : null,
      metrics,
      warnings: r.record?.warnings ?? p?.warnings ?? [],
      reasons: p?.reasons ?? [],
      ...(verdicts.length ? { verdict: verdicts.map((v) => (v.axis === 'radial' ? v.sentence : `${v.axis}: ${v.sentence}`)).join(' ') } : {}),
      ...(r.record ? { picture: `${c.id}/${CASE_FILES.picture}` } : {}),
    };
  });
  return {
    job: loaded.spec.name,
    file: loaded.file,
    ...(loaded.spec.description ? { description: loaded.spec.description } : {}),
    given: loaded.given,
    toolVersion: TOOL_VERSION,
    createdAt: new Date().toISOString(),
    sweeps: sweeps.filter((s) => s.values.length > 1),
    metrics: metricColumns.map((c) => c.metric!),
    cases,
    tables: reportTables(inp),
    plots: [],
    plans: inp.plans,
  };
}

const fmtLen = (x: number | null | undefined) => (x === null || x === undefined ? null : formatLength(x, 4));
const fmtNum = (x: number | null | undefined, d = 4) => (x === null || x === undefined ? null : trimNumber(x, d));

function reportTables(inp: ReportInputs): ReportTable[] {
  const tables: ReportTable[] = [];
  const done = inp.rows.filter((r) => r.record);
  const swept = inp.axes.filter((a) => a.values.length > 1);
  tables.push({
    title: 'Cases',
    header: ['case', ...swept.map((a) => LABELS[a.key] ?? a.key), 'N_F', 'regime', 'method', 'peak', 'FWHM x', 'radius/half-width 50 %', 'in window', 'warnings'],
    rows: inp.rows.map((r) => {
      const c = r.record?.plan.case ?? r.plan?.case ?? r.case!;
      const p = r.record?.plan ?? r.plan;
      const m = r.record?.metrics;
      return [
        c.id,
        ...swept.map((a) => (a.unit === 'm' ? fmtLen(c.swept[a.key]) : (c.swept[a.key] ?? null))),
        p ? fmtNum(Math.max(p.checks.fresnelNumbers[0], p.checks.fresnelNumbers[1] ?? 0), 3) : null,
        p?.regime ?? null,
        p ? (p.form ? `${p.method} (${p.form})` : p.method) : null,
        r.error ? `failed: ${r.error}` : r.missing ? 'not computed yet' : fmtNum(m?.peakIntensity),
        fmtLen(m?.fwhm[0]),
        fmtLen(m?.encircled?.radius50),
        m?.windowFraction === null || m?.windowFraction === undefined ? null : `${trimNumber(100 * m.windowFraction, 3)} %`,
        r.record ? r.record.warnings.map((w) => w.code).join(', ') : null,
      ];
    }),
    note: 'Intensities relative to the incident irradiance; radii of encircled energy about the centroid, as fractions of the power through the aperture.',
  });
  const verdictRows = done.flatMap((r) => (r.record!.metrics.verdicts ?? []).map((v) => [r.record!.plan.case.id, v.axis, v.kind, v.sentence]));
  if (verdictRows.length) tables.push({ title: 'Diffraction-limited?', header: ['case', 'axis', 'verdict', 'in words'], rows: verdictRows });
  const searchRows = done.filter((r) => r.record!.search).map((r) => {
    const s = r.record!.search!;
    const c = r.record!.plan.case;
    return [c.id, fmtLen(c.wavelength), fmtLen(c.distance), fmtLen(s.best), fmtLen(s.bestMeasure), fmtLen(s.textbook), fmtLen(s.textbookMeasure), s.evaluations];
  });
  if (searchRows.length) {
    tables.push({
      title: 'Smallest spot',
      header: ['case', 'wavelength', 'distance', 'best size', 'its spot', 'textbook size', 'its spot', 'propagations'],
      rows: searchRows,
      note: done.find((r) => r.record!.search)?.record!.search!.method,
    });
  }
  const gratings = done.filter((r) => r.record!.metrics.orders);
  for (const r of gratings.slice(0, 12)) {
    const orders = r.record!.metrics.orders!.filter((o) => o.propagates && o.inWindow);
    tables.push({
      title: `Grating orders, ${r.record!.plan.case.id}`,
      header: ['m', 'angle', 'position', 'of transmitted', 'of incident', 'resolving power mN'],
      rows: orders.map((o) => [
        o.m,
        o.angle === null ? null : `${trimNumber((o.angle * 180) / Math.PI, 5)}°`,
        fmtLen(o.position),
        o.fractionOfTransmitted === null ? null : `${trimNumber(100 * o.fractionOfTransmitted, 4)} %`,
        o.fractionOfIncident === null ? null : `${trimNumber(100 * o.fractionOfIncident, 4)} %`,
        o.resolvingPower,
      ]),
      note: 'Grating equation d(sin θ_m − sin θ_i) = mλ, angles from the axis; position z·tan θ_m; power integrated between the midpoints to the neighbouring orders.',
    });
  }
  if (inp.overlaps.length) {
    tables.push({
      title: 'Orders of different wavelengths that overlap',
      header: ['λ₁', 'm₁', 'λ₂', 'm₂', 'position', 'separation', 'within'],
      rows: inp.overlaps.map((o) => [fmtLen(o.wavelengthA), o.orderA, fmtLen(o.wavelengthB), o.orderB, fmtLen(o.positionA), fmtLen(o.separation), fmtLen(o.tolerance)]),
      note: 'Orders with equal mλ land at the same angle (common practice); "within" is the job\'s orders.overlap or, by default, the larger order\'s half-width to its first zero.',
    });
  }
  return tables;
}

export function overlapCsv(overlaps: Overlap[]): string {
  return toCsv(
    ['case_a', 'wavelength_a_m', 'order_a', 'position_a_m', 'case_b', 'wavelength_b_m', 'order_b', 'position_b_m', 'separation_m', 'tolerance_m'],
    overlaps.map((o) => [o.caseA, o.wavelengthA, o.orderA, o.positionA, o.caseB, o.wavelengthB, o.orderB, o.positionB, o.separation, o.tolerance]),
  );
}

/** Renders plots and the contact sheet into the job folder, then the report page; returns the report. */
export async function writeJobReport(jobDir: string, report: JobReport, tiles: SheetTile[], overlaps: Overlap[]): Promise<JobReport> {
  if (overlaps.length) await writeFileAtomic(join(jobDir, JOB_FILES.overlap), overlapCsv(overlaps));
  const plots = sweepPlots(report);
  const used = new Set<string>();
  for (const p of plots) {
    let base = p.title.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '').slice(0, 80) || 'plot';
    for (let k = 2; used.has(base); k++) base = `${base.replace(/-\d+$/, '')}-${k}`;
    used.add(base);
    const { svg, png } = await renderPlot(p);
    const dir = await safeJoin(jobDir, JOB_FILES.plots);
    await writeFileAtomic(join(dir, `${base}.svg`), svg);
    await writeFileAtomic(join(dir, `${base}.png`), png);
    report.plots.push({ title: p.title, svg: `${JOB_FILES.plots}/${base}.svg`, png: `${JOB_FILES.plots}/${base}.png` });
  }
  if (tiles.length > 1) {
    await writeFileAtomic(join(jobDir, JOB_FILES.contactSheet), renderContactSheet(tiles, { title: `${report.job}: spots along the sweep` }));
    report.contactSheet = JOB_FILES.contactSheet;
  }
  const html = await renderReportHtml(report, {
    readFile: async (rel) => {
      try {
        return await readFile(join(jobDir, rel));
      } catch {
        return null;
      }
    },
  });
  await writeFileAtomic(join(jobDir, JOB_FILES.report), html);
  return report;
}
