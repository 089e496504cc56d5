// Plots of swept metrics: a vega-lite spec built from plain data, compiled by vega to SVG and
// rasterised by resvg. The spec is kept pure so tests can read what will be drawn; only
// renderPlot touches the libraries, and loads them (plotting()).

import type { TopLevelSpec } from 'vega-lite';
import type { JobReport, MetricInfo, ReportCase, SweepKey } from './types.js';
import { formatLength } from '../job/units.js';
import { safeEcho } from '../safe-text.js';

export interface PlotInput {
  title: string;
  x: { label: string; unit: 'm' | '1'; log: boolean };
  y: { label: string; unit: 'm' | '1'; log: boolean };
  /** Points; series groups points of the other swept keys' values (one line per series). */
  points: { x: number; y: number | null; series?: string }[];
  /** x value where N_F = 1, drawn as a labelled vertical rule, when it lies inside the x range. */
  nfBoundary?: number | null;
  /** Series drawn as lines only (references, dense curves): no point marks. */
  lineOnly?: string[];
}

export const PLOT_WIDTH = 640;
export const PLOT_HEIGHT = 400;
// Rasterising text needs a font file; DejaVu is what the project's machines carry. Without it resvg
// still draws the marks, and the SVG beside the PNG keeps the text.
const FONT = 'DejaVu Sans';

// Our own palette: muted, distinguishable on white, darkest first so a single series reads firmly.
const PALETTE = ['#2e4f73', '#b0583a', '#5c7a34', '#7f5283', '#2d8079', '#a8842c', '#5e5e66', '#9a3f55'];
const RULE_COLOUR = '#6a6a72';

interface LengthUnit {
  name: string;
  metres: number;
}
const LENGTH_UNITS: LengthUnit[] = [
  { name: 'm', metres: 1 },
  { name: 'mm', metres: 1e-3 },
  { name: 'µm', metres: 1e-6 },
  { name: 'nm', metres: 1e-9 },
];

/** The unit in which the largest magnitude reads between 1 and 1000 (nm below that). */
export function lengthUnitFor(values: readonly number[]): LengthUnit {
  let m = 0;
  for (const v of values) if (Number.isFinite(v) && Math.abs(v) > m) m = Math.abs(v);
  if (m === 0) return LENGTH_UNITS[0]!;
  return LENGTH_UNITS.find((u) => m >= u.metres * (1 - 1e-9)) ?? LENGTH_UNITS[LENGTH_UNITS.length - 1]!;
}


function axisScale(a: PlotInput['x'], values: number[]): { factor: number; title: string } {
  if (a.unit !== 'm') return { factor: 1, title: a.label };
  const u = lengthUnitFor(values);
  return { factor: u.metres, title: `${a.label} (${u.name})` };
}

/**
 * The vega-lite spec. Lengths are converted to one readable unit per axis. Points that cannot be
 * drawn (null, or not positive on a log axis) are dropped and split their series into separate
 * runs, so a missing value shows as a gap instead of a line bridged across it or a fake zero.
 */
export function plotSpec(p: PlotInput): object {
  const drawable = (v: number | null, log: boolean): v is number => v !== null && Number.isFinite(v) && (!log || v > 0);
  const xs = p.points.map((q) => q.x).filter((v) => drawable(v, p.x.log));
  const ys = p.points.map((q) => q.y).filter((v): v is number => drawable(v, p.y.log));
  const ax = axisScale(p.x, xs);
  const ay = axisScale(p.y, ys);

  const seriesNames: string[] = [];
  for (const q of p.points) {
    const s = q.series ?? '';
    if (!seriesNames.includes(s)) seriesNames.push(s);
  }
  const values: { x: number; y: number; series: string; run: string }[] = [];
  for (const s of seriesNames) {
    const pts = p.points.filter((q) => (q.series ?? '') === s && drawable(q.x, p.x.log)).sort((a, b) => a.x - b.x);
    let run = 0;
    let open = false;
    for (const q of pts) {
      if (!drawable(q.y, p.y.log)) {
        if (open) run++;
        open = false;
        continue;
      }
      values.push({ x: q.x / ax.factor, y: q.y / ay.factor, series: s, run: `${s}#${run}` });
      open = true;
    }
  }

  const several = seriesNames.length > 1;
  const colour = several
    ? {
        color: {
          field: 'series',
          type: 'nominal',
          title: null,
          sort: seriesNames,
          scale: { domain: seriesNames, range: seriesNames.map((_, i) => PALETTE[i % PALETTE.length]) },
          legend: { orient: 'right', labelLimit: 220, symbolType: 'stroke', symbolStrokeWidth: 2 },
        },
      }
    : {};
  const scale = (log: boolean) => (log ? { type: 'log' } : { type: 'linear', zero: false, nice: true });
  // Linear axes keep vega's step-aware labels; on log axes "~g" keeps 1, 2, 5, 10 short instead
  // of padding them to the precision of the smallest decade.
  const axis = (log: boolean) => (log ? { format: '~g' } : {});
  const x = { field: 'x', type: 'quantitative', title: ax.title, scale: scale(p.x.log), axis: { ...axis(p.x.log), labelFlush: true } };
  const y = { field: 'y', type: 'quantitative', title: ay.title, scale: scale(p.y.log), axis: axis(p.y.log) };

  const layers: object[] = [
    {
      mark: { type: 'line', strokeWidth: 1.75, ...(several ? {} : { color: PALETTE[0] }) },
      encoding: { x, y, detail: { field: 'run', type: 'nominal' }, ...colour },
    },
    {
      ...(p.lineOnly?.length ? { transform: [{ filter: { not: { field: 'series', oneOf: p.lineOnly } } }] } : {}),
      mark: { type: 'point', filled: true, size: 26, opacity: 1, ...(several ? {} : { color: PALETTE[0] }) },
      encoding: { x, y, ...colour },
    },
  ];

  const lo = Math.min(...xs), hi = Math.max(...xs);
  const nf = p.nfBoundary;
  if (nf !== null && nf !== undefined && Number.isFinite(nf) && xs.length > 0 && nf >= lo && nf <= hi && (!p.x.log || nf > 0)) {
    const at = { values: [{ x: nf / ax.factor, label: 'N_F = 1' }] };
    layers.push(
      {
        data: at,
        mark: { type: 'rule', color: RULE_COLOUR, strokeDash: [5, 4], strokeWidth: 1.25 },
        encoding: { x: { field: 'x', type: 'quantitative' } },
      },
      {
        data: at,
        mark: { type: 'text', color: RULE_COLOUR, align: 'left', baseline: 'top', dx: 4, y: 4, fontSize: 11 },
        encoding: { x: { field: 'x', type: 'quantitative' }, text: { field: 'label' } },
      },
    );
  }

  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    title: { text: p.title, anchor: 'start', fontSize: 14, fontWeight: 'normal', color: '#1f1f24', offset: 10 },
    width: PLOT_WIDTH,
    height: PLOT_HEIGHT,
    autosize: { type: 'fit', contains: 'padding' },
    padding: 12,
    background: 'white',
    data: { values },
    layer: layers,
    config: {
      font: FONT,
      view: { stroke: '#d8d8dc' },
      axis: {
        labelFontSize: 11,
        titleFontSize: 12,
        titleFontWeight: 'normal',
        labelColor: '#3a3a40',
        titleColor: '#1f1f24',
        domainColor: '#9a9aa2',
        tickColor: '#9a9aa2',
        gridColor: '#ececef',
      },
      legend: { labelFontSize: 11, labelColor: '#3a3a40' },
    },
  };
}

/**
 * The plotting libraries, loaded by the first plot: vega-lite and vega take about 0.2 s to load,
 * which every process paid at start-up (a worker thread, `spotcast plan`, a run's first case) when
 * they were imported with this module.
 */
function plotting() {
  return (LIBRARIES ??= Promise.all([import('vega-lite'), import('vega'), import('@resvg/resvg-js')]).then(([vl, vega, rs]) => ({
    compile: vl.compile,
    vega,
    Resvg: rs.Resvg,
  })));
}
let LIBRARIES: Promise<{ compile: typeof import('vega-lite').compile; vega: typeof import('vega'); Resvg: typeof import('@resvg/resvg-js').Resvg }> | null = null;

/** Loads the plotting libraries ahead of the first plot (a worker does while others finish their cases). */
export async function loadPlotting(): Promise<void> {
  await plotting();
}

export async function renderPlot(p: PlotInput): Promise<{ svg: string; png: Buffer }> {
  const { compile, vega, Resvg } = await plotting();
  const compiled = compile(plotSpec(p) as TopLevelSpec).spec;
  const view = new vega.View(vega.parse(compiled), { renderer: 'none', logLevel: vega.Error });
  const svg = await view.toSVG();
  view.finalize();
  const resvg = new Resvg(svg, {
    background: 'white',
    font: { loadSystemFonts: true, defaultFontFamily: FONT },
  });
  return { svg, png: Buffer.from(resvg.render().asPng()) };
}

// Short names for keys whose trade symbols are standard; other keys use their label.
const SYMBOLS: Record<string, string> = {
  wavelength: 'λ',
  distance: 'z',
  'aperture.diameter': 'D',
  'aperture.width': 'w',
  'aperture.height': 'h',
};

// Labels drawn in a plot are cut to this many characters, control characters escaped: a control
// character is not allowed in SVG (XML 1.0) and would make the plot unreadable to the rasteriser.
const PLOT_LABEL_CHARS = 80;
const plotLabel = (s: string) => safeEcho(s, PLOT_LABEL_CHARS);

function formatKeyValue(k: SweepKey, v: number): string {
  const name = SYMBOLS[k.key] ?? plotLabel(k.label);
  return `${name} ${k.unit === 'm' ? formatLength(v, 3) : String(v)}`;
}

/**
 * Where N_F crosses 1 between neighbouring cases of one series, by interpolating log N_F in log x
 * (log sweeps, where N_F is a power law of x and the interpolation is exact) or in x.
 */
export function fresnelCrossing(cases: { x: number; fresnelNumber: number | null }[], logX: boolean): number | null {
  const pts = cases
    .filter((c) => c.fresnelNumber !== null && c.fresnelNumber > 0 && Number.isFinite(c.fresnelNumber) && (!logX || c.x > 0))
    .map((c) => ({ u: logX ? Math.log(c.x) : c.x, l: Math.log(c.fresnelNumber!), x: c.x }))
    .sort((a, b) => a.u - b.u);
  for (let i = 0; i < pts.length; i++) {
    const a = pts[i]!;
    if (a.l === 0) return a.x;
    const b = pts[i + 1];
    if (b && Math.sign(a.l) !== Math.sign(b.l) && b.l !== 0) {
      const u = a.u + (a.l / (a.l - b.l)) * (b.u - a.u);
      return logX ? Math.exp(u) : u;
    }
  }
  return null;
}

/** One plot per swept key (with more than one value) and metric that has two values to join. */
export function sweepPlots(report: JobReport): PlotInput[] {
  const done = report.cases.filter((c) => c.status === 'done');
  const swept = report.sweeps.filter((k) => k.values.length > 1);
  const plots: PlotInput[] = [];
  for (const key of swept) {
    const others = swept.filter((k) => k !== key);
    const series = (c: ReportCase): string =>
      others
        .map((k) => (c.swept[k.key] === undefined ? null : formatKeyValue(k, c.swept[k.key]!)))
        .filter((s): s is string => s !== null)
        .join(', ');
    const here = done.filter((c) => Number.isFinite(c.swept[key.key]));
    const log = key.spacing === 'log';

    // The first series (in case order) that crosses N_F = 1 places the rule.
    let nfBoundary: number | null = null;
    const names: string[] = [];
    for (const c of here) if (!names.includes(series(c))) names.push(series(c));
    for (const s of names) {
      const cs = here.filter((c) => series(c) === s).map((c) => ({ x: c.swept[key.key]!, fresnelNumber: c.fresnelNumber }));
      nfBoundary = fresnelCrossing(cs, log);
      if (nfBoundary !== null) break;
    }

    const charted = new Set<string>();
    for (const m of report.metrics) {
      if (m.chart) {
        // The metrics of one chart together, as its series (once, at the chart's first metric).
        if (charted.has(m.chart.name)) continue;
        charted.add(m.chart.name);
        const members = report.metrics.filter((q) => q.chart?.name === m.chart!.name);
        const named = (q: MetricInfo, c: ReportCase) => [plotLabel(q.label), series(c)].filter((t) => t).join(', ');
        const points = members.flatMap((q) => here.map((c) => ({ x: c.swept[key.key]!, y: metricValue(c, q), series: named(q, c) })));
        const computed = members.filter((q) => !q.chart!.reference);
        if (here.filter((c) => computed.some((q) => (metricValue(c, q) ?? 0) > 0)).length < 2) continue;
        const lineOnly = [...new Set(members.filter((q) => q.chart!.reference).flatMap((q) => here.map((c) => named(q, c))))];
        plots.push({
          title: `${plotLabel(m.chart.name)} against ${plotLabel(key.label)}`,
          x: { label: plotLabel(key.label), unit: key.unit, log: true },
          y: { label: 'size', unit: 'm', log: true },
          points,
          nfBoundary,
          lineOnly,
        });
        continue;
      }
      const points = here.map((c) => ({ x: c.swept[key.key]!, y: metricValue(c, m), series: series(c) }));
      if (points.filter((q) => q.y !== null && (!m.log || q.y > 0)).length < 2) continue;
      // The axial intensity against distance: the cases' points with the exact axial curve drawn
      // densely through them (a few cases cannot show its oscillations).
      const dense = m.key === 'on_axis_intensity' && key.key === 'distance' && report.onAxis && others.length === 0 ? report.onAxis : null;
      const curve = dense ? 'exact (dense)' : null;
      // D4σ of hard-edged apertures is a property of the window as much as of the spot (the cases say which).
      const caution = m.key.startsWith('d4sigma') && here.some((c) => c.notes?.some((n) => n.startsWith('D4σ'))) ? ' (depends on the window: see the cases)' : '';
      plots.push({
        title: `${plotLabel(m.label)} against ${plotLabel(key.label)}${caution}`,
        x: { label: plotLabel(key.label), unit: key.unit, log },
        y: { label: plotLabel(m.label), unit: m.unit, log: m.log ?? false },
        points: dense ? [...points.map((q) => ({ ...q, series: 'cases' })), ...denseCurve(dense, m.log ?? false, curve!)] : points,
        nfBoundary,
        ...(curve ? { lineOnly: [curve] } : {}),
      });
    }
  }
  return plots;
}

/** A dense curve's points; on a log axis its zeros (and values 1e-4 of its maximum or less) are gaps, not decades of nothing. */
function denseCurve(d: NonNullable<JobReport['onAxis']>, log: boolean, series: string): PlotInput['points'] {
  const top = Math.max(...d.intensity);
  return d.z.map((z, i) => {
    const v = d.intensity[i]!;
    return { x: z, y: log && !(v > 1e-4 * top) ? null : v, series };
  });
}

function metricValue(c: ReportCase, m: MetricInfo): number | null {
  const v = c.metrics[m.key];
  return v === undefined || v === null || !Number.isFinite(v) ? null : v;
}
