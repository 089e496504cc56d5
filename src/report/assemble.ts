// Gathering a job's results into a JobReport, and writing the job-level answers: the order-overlap
// table, the sweep plots, the contact sheet and the report page.
import { readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { formatLength, trimNumber } from '../job/units.js';
import type { SweepAxis } from '../job/expand.js';
import type { LoadedJob } from '../job/load.js';
import type { Overlap } from '../analysis/overlap.js';
import { writeFileAtomic, safeJoin } from '../output/atomic.js';
import { SPECTRUM_FILES } from '../output/spectrum-files.js';
import { CASE_FILES, type CaseSummary } from '../output/case-output.js';
import type { GratingOrder } from '../analysis/orders.js';
import { gratingUse, ordersWithAnswers } from '../analysis/grating-answers.js';
import { methodWords } from '../plan/planner.js';
import type { Plan } from '../plan/types.js';
import { toCsv } from '../output/csv.js';
import { metricScope, type SummaryRow } from '../output/summary.js';
import { reportedMetrics } from '../metrics/registry.js';
import { TOOL_VERSION } from '../version.js';
import { logDistances, onAxisCurve } from '../analysis/on-axis.js';
import { renderContactSheet, type SheetTile } from './contact-sheet.js';
import { sweptKeyName } from './case-share.js';
import { renderReportHtml } from './html.js';
import { renderPlot, sweepPlots, type PlotInput } from './plots.js';
import type { JobReport, ReportCase, ReportTable, SweepKey } from './types.js';

export const JOB_FILES = {
  report: 'report.html',
  contactSheet: 'contact-sheet.png',
  contactSheetLog: 'contact-sheet-log.png',
  explorer: 'explorer.html',
  overlap: 'order-overlap.csv',
  plots: 'plots',
} as const;

export interface ReportInputs {
  loaded: LoadedJob;
  axes: SweepAxis[];
  rows: SummaryRow[];
  plans: string[];
  overlaps: Overlap[];
}

export function buildJobReport(inp: ReportInputs): JobReport {
  const { loaded, axes, rows } = inp;
  // The answers people read off a sweep, as the metric registry flags them (metrics/registry.ts).
  const reported = reportedMetrics(metricScope(rows));
  const sweeps: SweepKey[] = axes.map((a) => ({
    key: a.key,
    label: sweptKeyName(a.key),
    unit: a.unit,
    spacing: a.spacing === 'single' ? 'list' : a.spacing,
    values: a.values,
  }));
  const cases: ReportCase[] = rows.map((r) => {
    const c = r.record?.plan.case ?? r.plan?.case ?? r.case!;
    const p = r.record?.plan ?? r.plan;
    const metrics: Record<string, number | null> = {};
    for (const { info, quantity } of reported) {
      const v = r.record ? quantity.read(r.record) : null;
      metrics[info.key] = typeof v === 'number' && Number.isFinite(v) ? v : null;
    }
    const verdicts = r.record?.metrics.verdicts ?? [];
    const notes = d4sigmaNotes(r.record?.metrics.d4sigmaWindowChange);
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
      ...(notes.length ? { notes } : {}),
      ...(verdicts.length ? { verdict: verdicts.map((v) => (v.axis === 'radial' ? v.sentence : `${v.axis}: ${v.sentence}`)).join(' ') } : {}),
      ...(r.record ? { picture: `${c.id}/${CASE_FILES.picture}` } : {}),
      ...(r.record?.metrics.mtf ? { mtfPlot: `${c.id}/${CASE_FILES.mtfPlot}` } : {}),
      ...(written(r.record, CASE_FILES.profilePlot) ? { profilePlot: `${c.id}/${CASE_FILES.profilePlot}` } : {}),
      ...(written(r.record, CASE_FILES.zoom) ? { zoom: `${c.id}/${CASE_FILES.zoom}` } : {}),
      ...(written(r.record, CASE_FILES.searchPlot) ? { searchPlot: `${c.id}/${CASE_FILES.searchPlot}` } : {}),
      ...(written(r.record, CASE_FILES.energyPlot) ? { energyPlot: `${c.id}/${CASE_FILES.energyPlot}` } : {}),
      ...(written(r.record, SPECTRUM_FILES.colour) ? { colour: `${c.id}/${SPECTRUM_FILES.colour}` } : {}),
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
    metrics: reported.map((m) => m.info),
    cases,
    tables: reportTables(inp),
    plots: [],
    plans: inp.plans,
    ...onAxisOf(inp, sweeps),
  };
}

/** Above this fall of D4σ with the window cut to 80 %, the report says D4σ describes the window. */
export const D4SIGMA_WINDOW_NOTE = 0.05;

function d4sigmaNotes(change: [number | null, number | null] | undefined): string[] {
  if (!change) return [];
  const axes = (['x', 'y'] as const).filter((_, i) => (change[i] ?? 0) > D4SIGMA_WINDOW_NOTE);
  if (!axes.length) return [];
  const by = axes.map((a) => `${a} by ${Math.round(100 * change[a === 'x' ? 0 : 1]!)} %`).join(', ');
  return [
    `D4σ depends on the window here: it falls ${by} with the window cut to 80 % (the wings of a hard-edged aperture carry a second moment that grows with the window); read the FWHM or the encircled-energy widths for the spot.`,
  ];
}

/** Whether a case's record lists the file (records read from disk list every file of the case). */
function written(rec: SummaryRow['record'], name: string): boolean {
  return !!rec && 'files' in rec && !!(rec as { files?: Record<string, unknown> }).files?.[name];
}

/** Distances of the dense axial curve. */
const ON_AXIS_POINTS = 240;

/**
 * The dense axial curve for a distance sweep of one aperture and light (every case alike but its
 * distance, no planes), where analysis/on-axis.ts has an exact form for them.
 */
function onAxisOf(inp: ReportInputs, sweeps: SweepKey[]): { onAxis?: NonNullable<JobReport['onAxis']> } {
  const d = sweeps.find((s) => s.key === 'distance');
  if (!d || d.values.length < 2 || sweeps.some((s) => s.key !== 'distance' && s.values.length > 1)) return {};
  const c = (inp.rows.find((r) => r.record)?.record?.plan.case ?? null);
  if (!c || c.planes?.length) return {};
  const lo = Math.min(...d.values);
  const hi = Math.max(...d.values);
  if (!(lo > 0 && hi > lo)) return {};
  const z = d.spacing === 'log' || hi > 10 * lo ? logDistances(lo, hi, ON_AXIS_POINTS) : Float64Array.from({ length: ON_AXIS_POINTS }, (_, i) => lo + ((hi - lo) * i) / (ON_AXIS_POINTS - 1));
  const curve = onAxisCurve(c.aperture, c.illumination, c.wavelength, z);
  return curve ? { onAxis: { z: [...curve.z], intensity: [...curve.intensity], how: curve.how } } : {};
}

const fmtLen = (x: number | null | undefined) => (x === null || x === undefined ? null : formatLength(x, 4));
const fmtNum = (x: number | null | undefined, d = 4) => (x === null || x === undefined ? null : trimNumber(x, d));

function reportTables(inp: ReportInputs): ReportTable[] {
  const tables: ReportTable[] = [];
  const done = inp.rows.filter((r) => r.record);
  const swept = inp.axes.filter((a) => a.values.length > 1);
  tables.push({
    title: 'Cases',
    header: ['case', ...swept.map((a) => sweptKeyName(a.key)), 'N_F', 'regime', 'method', 'peak', 'FWHM x', 'radius/half-width 50 %', 'in window', 'warnings'],
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
    note: 'Intensities relative to the incident irradiance; FWHM between the outermost half-maximum crossings of the profile through the peak (the spot\'s envelope); radii of encircled energy about the centroid, as fractions of the power through the aperture.',
  });
  const verdictRows = done.flatMap((r) => (r.record!.metrics.verdicts ?? []).map((v) => [r.record!.plan.case.id, v.axis, v.kind, v.sentence]));
  if (verdictRows.length) tables.push({ title: 'Diffraction-limited?', header: ['case', 'axis', 'verdict', 'in words'], rows: verdictRows, fold: [3] });
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
  const spectra = done.filter((r) => r.record!.metrics.spectrum);
  if (spectra.length) {
    tables.push({
      title: 'Light of several wavelengths',
      header: ['case', 'light', 'wavelengths computed', 'samples the rule asks', 'methods'],
      rows: spectra.map((r) => {
        const s = r.record!.metrics.spectrum!;
        const methods = [...new Set(s.lines.map((l) => (l.form ? `${l.method} (${l.form})` : l.method)))].join(', ');
        return [r.record!.plan.case.id, s.light, s.samples.used, s.samples.needed, methods];
      }),
      note: `Each wavelength is computed on its own onto one output grid and the intensities are added with their powers (mutually incoherent lines); ${done.find((r) => r.record!.metrics.spectrum)!.record!.metrics.spectrum!.normalisation}. colour.png shows the result in sRGB (white point D65) from the CIE 1931 2° colour-matching functions.`,
    });
  }
  const pairRows = done.flatMap((r) =>
    (r.record!.metrics.linePairs ?? []).map((p) => [
      r.record!.plan.case.id,
      p.order,
      fmtWave(p.wavelengths[0]),
      fmtWave(p.wavelengths[1]),
      p.dip === null ? 'too close to read' : `${trimNumber(100 * p.dip, 3)} %`,
      p.resolved ? 'yes' : 'no',
      p.sparrow ? 'yes' : 'no',
      p.resolvingPower === null ? null : fmtNum(p.resolvingPower, 4),
      fmtNum(p.needed, 4),
      p.expected === null ? null : p.expected ? 'yes' : 'no',
    ]),
  );
  if (pairRows.length) {
    tables.push({
      title: 'Close lines: resolved?',
      header: ['case', 'order', 'λ₁', 'λ₂', 'dip (valley / lower peak)', 'resolved on the pattern (Rayleigh)', 'Sparrow', 'R = |m|N', 'λ/Δλ', 'textbook: λ/Δλ ≤ R'],
      rows: pairRows,
      note: "Neighbouring lines closer than three resolution elements, read on the computed pattern in every order where both land: resolved by Rayleigh's criterion when the intensity between them dips to 8/π² ≈ 81 % of the lower peak or below (Born & Wolf §7.6.3), by Sparrow's when there is any dip at all; the textbook answer compares λ/Δλ with the resolving power |m|·N (Born & Wolf §8.6.3). line-pairs.csv has the positions.",
    });
  }
  tables.push(...spectrometerTables(done.map((r) => r.record!)));
  const gratings = done.filter((r) => r.record!.metrics.orders);
  gratings.slice(0, GRATING_TABLES).forEach((r, i) => {
    const t = orderTable(r.record!);
    if (i === GRATING_TABLES - 1 && gratings.length > GRATING_TABLES) {
      t.note = `${t.note} ${gratings.length - GRATING_TABLES} further grating cases are not tabulated here: each case folder's ${CASE_FILES.orders} has its orders.`;
    }
    tables.push(t);
  });
  const changes = methodChanges(inp.rows);
  if (changes.length) {
    tables.push({
      title: 'Where the method changes along the sweep',
      header: ['from case', 'to case', 'method before', 'method after', 'why (the plan of the later case)'],
      rows: changes.map((c) => [c.from, c.to, c.before, c.after, c.why]),
      note: 'Neighbouring cases in sweep order whose method or form differs; the reason is the planner\'s own sentence that chose the later case\'s method (and why the earlier one no longer held, where it says so).',
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

/** A wavelength to 6 significant digits (close lines differ in the fourth or fifth). */
const fmtWave = (x: number) => formatLength(x, 6);

/** The spectrometer's tables: the instrument at the detector's centre, each line on the detector, and close pairs on the pixels. */
function spectrometerTables(records: CaseSummary[]): ReportTable[] {
  const withOne = records.filter((r) => r.metrics.spectrometer);
  if (!withOne.length) return [];
  const nm = (x: number) => `${trimNumber(x * 1e9, 4)} nm`;
  const notListed = withOne.reduce((t, r) => t + r.metrics.spectrometer!.ordersNotListed, 0);
  const deg = (x: number) => `${trimNumber((x * 180) / Math.PI, 5)}°`;
  const out: ReportTable[] = [
    {
      title: 'Spectrometer',
      header: ['case', 'camera at', 'nm per mm', 'per pixel', 'bandpass: slit', 'diffraction', '2 pixels', 'limited by', 'slit image', 'light on the detector'],
      rows: withOne.map((r) => {
        const s = r.metrics.spectrometer!;
        return [r.plan.case.id, deg(s.cameraAngle), fmtNum(s.reciprocalDispersion * 1e6, 4), nm(s.perPixel), nm(s.bandpass.slit), nm(s.bandpass.diffraction), nm(s.bandpass.pixels), s.bandpass.largest, fmtLen(s.slitImage), pctCell(s.powerOnDetector)];
      }),
      note: `At the detector's centre: the reciprocal linear dispersion d·cos θ_c/(|m|·f_camera), per pixel; the bandpass of the slit w·d·cos θ_i/(|m|·f_collimator), of the grating λ/(|m|N) and of two pixels; the slit's geometric image w·(f_camera/f_collimator)·(cos θ_i/cos θ_c). ${withOne[0]!.metrics.spectrometer!.model} detector.csv and detector.png have the signal per pixel.`,
    },
    {
      title: 'Lines on the detector',
      header: ['case', 'λ', 'order', 'position', 'pixel', 'image FWHM', 'in pixels', 'slit image', 'diffraction FWHM', 'share of the line'],
      rows: withOne.flatMap((r) =>
        r.metrics.spectrometer!.lines.map((l) => [
          r.plan.case.id,
          fmtWave(l.wavelength),
          l.order,
          fmtLen(l.position),
          fmtNum(l.pixel, 6),
          l.imageFwhm === null ? 'runs off the detector' : fmtLen(l.imageFwhm),
          l.imageFwhm === null ? null : fmtNum(l.imageFwhm / r.metrics.spectrometer!.setup.pixel, 3),
          fmtLen(l.slitImage),
          fmtLen(l.diffractionWidth),
          pctCell(l.power),
        ]),
      ),
      note: `Every line in every order that lands on the detector (each line's 40 brightest): where the grating equation and the camera (x = f·tan(θ − θ_c)) put it, measured from the detector's centre; the FWHM of its computed image before the pixels, beside the slit's geometric image and the grating's diffraction FWHM 0.886·λf/(W·cos θ); the share of the line's light on the grating that lands on the detector in this order.${notListed ? ` ${notListed} dimmer orders also land on the detector and are not listed (detector.csv has all the light).` : ''}`,
    },
  ];
  const pairs = withOne.flatMap((r) =>
    r.metrics.spectrometer!.pairs.map((p) => [
      r.plan.case.id,
      p.order,
      fmtWave(p.wavelengths[0]),
      fmtWave(p.wavelengths[1]),
      fmtNum(Math.abs(p.pixels[1] - p.pixels[0]), 4),
      nm(p.bandpass),
      p.dip === null ? 'within two pixels' : `${trimNumber(100 * p.dip, 3)} %`,
      p.resolved ? 'yes' : 'no',
      p.sparrow ? 'yes' : 'no',
    ]),
  );
  if (pairs.length) {
    out.push({
      title: 'Close lines on the detector: resolved?',
      header: ['case', 'order', 'λ₁', 'λ₂', 'pixels apart', 'bandpass', 'dip on the pixels', 'Rayleigh', 'Sparrow'],
      rows: pairs,
      note: "Neighbouring lines closer than three bandpasses, read on the pixels' signal: the lowest pixel between the two maxima over the lower maximum; resolved by Rayleigh's criterion at 8/π² ≈ 81 % or below (Born & Wolf §7.6.3), by Sparrow's at any dip; lines within two pixels cannot be told apart on the detector.",
    });
  }
  return out;
}

/** Grating cases given an order table in the report (the rest have their orders.csv). */
export const GRATING_TABLES = 12;
/** Runs of more orders than this wholly outside the window are one row of the report's order table. */
export const OUTSIDE_RUN_ROWS = 6;

const pctCell = (x: number | null | undefined, d = 4) => (x === null || x === undefined ? null : `${trimNumber(100 * x, d)} %`);

/**
 * A grating case's order table: every order that lands (in the window or outside it, with its
 * status) and the evanescent ones the case lists, then the evanescent orders' power together.
 * Every order inside the window has its own row; runs of more than OUTSIDE_RUN_ROWS orders wholly
 * outside the window are one row each (orders.csv has them one by one).
 */
export function orderTable(rec: CaseSummary): ReportTable {
  const m = rec.metrics;
  // The spectroscopy answers (analysis/grating-answers.ts): extra columns for a focal length and a
  // reflection grating, the sign convention, the lit periods and order sorting in the note.
  const use = gratingUse(rec.plan);
  const orders = ordersWithAnswers(rec.plan, m.orders ?? [], use);
  const extra = (o: GratingOrder | null) => [
    o?.smallestResolvable ? fmtLen(o.smallestResolvable) : null,
    ...(use?.focalLength !== undefined ? [o?.focalDispersion === null || o?.focalDispersion === undefined ? null : `${trimNumber(o.focalDispersion * 1e-6, 4)} mm/nm`] : []),
    ...(use?.reflective ? [o?.littrowAngle === null || o?.littrowAngle === undefined ? null : `${trimNumber((o.littrowAngle * 180) / Math.PI, 5)}°`] : []),
  ];
  const rows: (string | number | null)[][] = [];
  const row = (o: GratingOrder) => [
    o.m,
    o.status === 'outside-window' ? `outside the window (${o.outside === 'all' ? 'all' : 'part'} of its interval)` : o.propagates && !o.separated ? 'propagating (overlaps its neighbours here)' : o.status,
    o.angle === null ? `sin θ = ${trimNumber(o.sinAngle, 4)}` : `${trimNumber((o.angle * 180) / Math.PI, 5)}°`,
    fmtLen(o.position),
    pctCell(o.fractionOfTransmitted),
    pctCell(o.predictedFraction),
    pctCell(o.fluxFraction),
    pctCell(o.fractionOfIncident),
    o.resolvingPower,
    o.linearDispersion === null || o.linearDispersion === undefined ? null : `${trimNumber(o.linearDispersion * 1e-6, 4)} mm/nm`,
    o.freeSpectralRange === null || o.freeSpectralRange === undefined ? null : fmtLen(o.freeSpectralRange),
    ...extra(o),
  ];
  const rangeRow = (from: number, to: number, predicted: number) => [
    `${from} … ${to}`,
    'outside the window (all of their intervals)',
    null,
    null,
    null,
    pctCell(predicted),
    null,
    null,
    null,
    null,
    null,
    ...extra(null),
  ];
  const omitted = [...(m.ordersOmitted ?? [])];
  const low = omitted.filter((r) => orders.length === 0 || r.to < orders[0]!.m);
  const high = omitted.filter((r) => !low.includes(r));
  for (const r of low) rows.push(rangeRow(r.from, r.to, r.predictedFraction));
  for (let i = 0; i < orders.length; ) {
    const o = orders[i]!;
    if (o.outside === 'all') {
      let j = i;
      while (j + 1 < orders.length && orders[j + 1]!.outside === 'all') j++;
      if (j - i + 1 > OUTSIDE_RUN_ROWS) {
        rows.push(rangeRow(o.m, orders[j]!.m, orders.slice(i, j + 1).reduce((s2, k) => s2 + k.predictedFraction, 0)));
        i = j + 1;
        continue;
      }
    }
    rows.push(row(o));
    i++;
  }
  for (const r of high) rows.push(rangeRow(r.from, r.to, r.predictedFraction));
  if (m.evanescentFraction !== undefined) {
    rows.push(['all evanescent orders', 'evanescent (together)', null, null, '0 %', pctCell(m.evanescentFraction), '0 %', null, null, null, null, ...extra(null)]);
  }
  return {
    title: `Grating orders, ${rec.plan.case.id}`,
    header: [
      'm', 'status', 'angle', 'position', 'measured, of transmitted', 'thin-grating theory', 'flux, of transmitted', 'of incident', 'resolving power |m|N', 'on the screen, per nm', 'free spectral range λ/m',
      'smallest Δλ resolved, λ/R',
      ...(use?.focalLength !== undefined ? [`at f = ${fmtLen(use.focalLength)}, per nm`] : []),
      ...(use?.reflective ? ['Littrow angle'] : []),
    ],
    rows,
    note:
      'Grating equation d(sin θ_m − sin θ_i) = mλ, angles from the axis; position z·tan θ_m. Measured: ∫|U|² over the interval between the midpoints to the neighbouring orders, over the power through the slits (blank where part of the interval lies outside the window). ' +
      'Thin-grating theory: (w/d)·sinc²(m·w/d) of the same power (Goodman, Introduction to Fourier Optics, §4.4). Flux: the measured value times cos θ_m/cos θ_i, the power crossing the screen plane rather than ∫|U|². ' +
      'Evanescent orders (|sin θ| > 1) carry no power to any screen; the last row is what thin-grating theory sends into all of them together. ' +
      'Per nm: the linear dispersion on this screen, z·m/(d·cos³θ_m), from dθ/dλ = m/(d·cos θ_m) (Born & Wolf §8.6.1); free spectral range λ/|m| (Hecht §10.2.8).' +
      (use
        ? `\n${use.convention}\nResolving power R = |m|·N with N = ${use.periodsWords}.` +
          (use.focalLength !== undefined ? `\nAt f: the linear dispersion f·m/(d·cos θ_m) in the focal plane of a lens of focal length ${fmtLen(use.focalLength)}.` : '') +
          (use.reflective ? '\nReflection grating: computed unfolded about its plane (a groove depth h is an optical path 2h·cos θ_i); Littrow angle θ_L with sin θ_L = mλ/(2d): at incidence θ_i = −θ_L the order returns along the incident beam.' : '') +
          (use.orderSorting !== undefined ? `\nOrder sorting: ${use.orderSorting ? use.orderSorting.words : 'none of the range in orders.use lands in its order at this incidence.'}` : '')
        : ''),
  };
}

export interface MethodChange {
  from: string;
  to: string;
  before: string;
  after: string;
  why: string;
}

const methodLabel = (p: Plan) => (p.form ? `${p.method} (${p.form})` : p.method);

/**
 * Neighbouring cases (in sweep order) whose plans use different methods or forms, with the later
 * plan's sentence that chose its method and, where it has one, its sentence on why the earlier
 * case's method is not valid there.
 */
export function methodChanges(rows: SummaryRow[]): MethodChange[] {
  const out: MethodChange[] = [];
  let prev: { id: string; plan: Plan } | null = null;
  for (const r of rows) {
    const plan = r.record?.plan ?? r.plan;
    if (!plan) continue;
    if (prev && methodLabel(prev.plan) !== methodLabel(plan)) {
      const chose = plan.reasons.find((x) => /\bchosen\b|as requested/.test(x));
      const before = methodWords(prev.plan.method as Parameters<typeof methodWords>[0]);
      const rejected = plan.reasons.find((x) => x.startsWith(before) && /not valid|would need/.test(x));
      const why = [rejected, chose].filter((x): x is string => !!x).join(' ');
      out.push({ from: prev.id, to: plan.case.id, before: methodLabel(prev.plan), after: methodLabel(plan), why: why || 'the later plan gives no reason for its method' });
    }
    prev = { id: plan.case.id, plan };
  }
  return out;
}

export function overlapCsv(overlaps: Overlap[]): string {
  return toCsv(
    ['case_a', 'wavelength_a_m', 'order_a', 'position_a_m', 'case_b', 'wavelength_b_m', 'order_b', 'position_b_m', 'separation_m', 'tolerance_m'],
    overlaps.map((o) => [o.caseA, o.wavelengthA, o.orderA, o.positionA, o.caseB, o.wavelengthB, o.orderB, o.positionB, o.separation, o.tolerance]),
  );
}

/**
 * Renders plots and the contact sheet into the job folder, then the report page; returns the report.
 * drawPlots: draws the plots elsewhere (a run's worker threads, run/helpers.ts) while this thread
 * draws the contact sheet; without it they are drawn here, one after the other. The files are the same.
 */
export async function writeJobReport(
  jobDir: string,
  report: JobReport,
  tiles: SheetTile[],
  overlaps: Overlap[],
  drawPlots?: (inputs: PlotInput[]) => Promise<{ svg: string; png: Uint8Array }[]>,
): Promise<JobReport> {
  if (overlaps.length) await writeFileAtomic(join(jobDir, JOB_FILES.overlap), overlapCsv(overlaps));
  const plots = sweepPlots(report);
  const drawn = drawPlots && plots.length ? drawPlots(plots) : null;
  // (Awaited below; this only keeps a failure there from counting as unhandled while the sheet is drawn.)
  drawn?.catch(() => undefined);
  const sheet = tiles.length > 1 ? renderContactSheet(tiles, { title: `${report.job}: spots along the sweep` }) : null;
  // The same tiles in decades below each one's peak: where the light goes beyond the bright spot.
  const sheetLog = tiles.length > 1 ? renderContactSheet(tiles, { title: `${report.job}: spots along the sweep, log`, scale: 'log', logDecades: 4 }) : null;
  const images = drawn ? await drawn : null;
  const used = new Set<string>();
  for (const [i, p] of plots.entries()) {
    let base = p.title.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '').slice(0, 80) || 'plot';
    for (let k = 2; used.has(base); k++) base = `${base.replace(/-\d+$/, '')}-${k}`;
    used.add(base);
    const { svg, png } = images ? images[i]! : await renderPlot(p);
    const dir = await safeJoin(jobDir, JOB_FILES.plots);
    await writeFileAtomic(join(dir, `${base}.svg`), svg);
    await writeFileAtomic(join(dir, `${base}.png`), png);
    report.plots.push({ title: p.title, svg: `${JOB_FILES.plots}/${base}.svg`, png: `${JOB_FILES.plots}/${base}.png` });
  }
  if (sheet) {
    await writeFileAtomic(join(jobDir, JOB_FILES.contactSheet), sheet);
    report.contactSheet = JOB_FILES.contactSheet;
  }
  if (sheetLog) {
    await writeFileAtomic(join(jobDir, JOB_FILES.contactSheetLog), sheetLog);
    report.contactSheetLog = JOB_FILES.contactSheetLog;
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
