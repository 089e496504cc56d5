// A profile as a line plot, linear above and in decades below: a 1-D result (a slit, a grating of
// long lines) reads as a curve, not as stripes, with the positions in µm or mm on the axis, the
// geometric shadow's edges marked, and the textbook far-field curve drawn beside it where there is
// one (analysis/textbook.ts). Drawn by line-plot.ts on the case pictures' background.
import type { Colour } from './font.js';
import { renderLinePlots, type LinePlotInput, type LineSeries } from './line-plot.js';

export interface ProfilePlotInput {
  title: string;
  /** Positions (m) and intensities (relative to the incident irradiance). */
  x: ArrayLike<number>;
  intensity: ArrayLike<number>;
  /** Which axis the profile runs along, for the axis title. */
  axis: 'x' | 'y';
  /** The geometric shadow's edges (m): where the aperture's edges project on the screen. */
  edges?: number[];
  /** A reference curve at the same positions. */
  reference?: { label: string; intensity: ArrayLike<number> };
  /** Decades below the peak the log view shows (default 5). */
  decades?: number;
}

const COMPUTED: Colour = [240, 160, 80];
const REFERENCE: Colour = [110, 190, 240];
const EDGE: Colour = [150, 150, 160];

/** A unit for positions: the one in which the widest reads between 1 and 1000. */
function unitFor(span: number): { name: string; metres: number } {
  if (span >= 1e-3) return { name: 'mm', metres: 1e-3 };
  if (span >= 1e-6) return { name: 'µm', metres: 1e-6 };
  return { name: 'nm', metres: 1e-9 };
}

export function renderProfilePng(p: ProfilePlotInput): Buffer {
  const n = Math.min(p.x.length, p.intensity.length);
  if (n < 2) throw new RangeError('profile plot: fewer than two points');
  const lo = p.x[0]!;
  const hi = p.x[n - 1]!;
  const u = unitFor(Math.max(Math.abs(lo), Math.abs(hi)));
  const xs = Array.from({ length: n }, (_, i) => p.x[i]! / u.metres);
  let peak = 0;
  for (let i = 0; i < n; i++) peak = Math.max(peak, p.intensity[i]!);
  let refPeak = 0;
  if (p.reference) for (let i = 0; i < n; i++) refPeak = Math.max(refPeak, p.reference.intensity[i]!);
  const top = Math.max(peak, refPeak) * 1.05 || 1;
  const decades = p.decades ?? 5;
  const logOf = (v: number) => (peak > 0 && v > 0 ? Math.max(-decades, Math.log10(v / peak)) : -decades);
  const edges = (yRange: [number, number]): LineSeries[] =>
    (p.edges ?? [])
      .filter((e) => e >= lo && e <= hi)
      .map((e, k) => ({ label: k === 0 ? 'geometric shadow edges' : '', x: [e / u.metres, e / u.metres], y: yRange, colour: EDGE, dashed: true, width: 1 }));
  const series = (f: (v: number) => number, yRange: [number, number]): LineSeries[] => [
    ...edges(yRange),
    ...(p.reference ? [{ label: p.reference.label, x: xs, y: Array.from({ length: n }, (_, i) => f(p.reference!.intensity[i]!)), colour: REFERENCE, dashed: true, width: 4 }] : []),
    { label: 'computed', x: xs, y: Array.from({ length: n }, (_, i) => f(p.intensity[i]!)), colour: COMPUTED, width: 2 },
  ];
  const xLabel = `${p.axis} (${u.name})`;
  const linear: LinePlotInput = {
    title: p.title,
    xLabel,
    yLabel: 'intensity (relative to the incident irradiance)',
    xRange: [xs[0]!, xs[n - 1]!],
    yRange: [0, top],
    series: series((v) => v, [0, top]),
  };
  const log: LinePlotInput = {
    xLabel,
    yLabel: `log10(intensity / computed peak), ${decades} decades`,
    xRange: [xs[0]!, xs[n - 1]!],
    yRange: [-decades, 0.3],
    series: series(logOf, [-decades, 0.3]),
  };
  return renderLinePlots([linear, log]);
}
