// A lens case's MTF files: mtf.csv (the curve, frequencies in cycles/mm) and mtf.png (the curve
// against the diffraction-limited one). writeCase (case-output.ts) writes both, atomically with the
// rest of the case folder.
import { MTF_WINDOW_FRACTION, type MtfCurve, type MtfSummary } from '../analysis/mtf.js';
import { toCsv, type Cell } from './csv.js';
import type { Colour } from './font.js';
import { renderLinePlot, type LineSeries } from './line-plot.js';

/** mtf.csv's columns, in order. The reference column is empty where there is no uniformly lit circular stop. */
export const MTF_COLUMNS = [
  'frequency_cycles_per_mm',
  'normalised_frequency',
  'mtf_x',
  'mtf_y',
  'mtf_ring_average',
  'diffraction_limited',
] as const;

export function mtfCsv(c: MtfCurve): string {
  const rows: Cell[][] = Array.from(c.frequency, (f, k) => [
    f / 1e3,
    c.normalised[k]!,
    c.x[k]!,
    c.y[k]!,
    c.azimuthal[k]!,
    c.diffractionLimited ? c.diffractionLimited[k]! : null,
  ]);
  return toCsv([...MTF_COLUMNS], rows);
}

// Our own colours, distinguishable on the dark background.
const COLOURS: Record<'x' | 'y' | 'ring' | 'reference', Colour> = {
  x: [240, 160, 80],
  y: [110, 190, 240],
  ring: [235, 235, 235],
  reference: [140, 210, 120],
};

export function renderMtfPng(c: MtfCurve, s: MtfSummary, title: string): Buffer {
  const mm = Array.from(c.frequency, (f) => f / 1e3);
  const series: LineSeries[] = [];
  if (c.diffractionLimited) series.push({ label: 'diffraction-limited', x: mm, y: c.diffractionLimited, colour: COLOURS.reference, dashed: true });
  // Widest first, so that curves that coincide (a round PSF) still all show.
  series.push({ label: 'ring average', x: mm, y: c.azimuthal, colour: COLOURS.ring, width: 5 });
  series.push({ label: 'MTF along x', x: mm, y: c.x, colour: COLOURS.x, width: 3 });
  series.push({ label: 'MTF along y', x: mm, y: c.y, colour: COLOURS.y, width: 2, dashed: true });
  const last = mm[mm.length - 1] ?? 0;
  const topLabel = s.cutoffKind === 'stop' ? 'fraction of the cut-off D/(λz)' : 'fraction of 2w/(λz) (no sharp cut-off)';
  return renderLinePlot({
    title: `MTF · ${title}`,
    xLabel: 'spatial frequency (cycles/mm)',
    yLabel: 'MTF (1 at zero frequency)',
    xRange: [0, last > 0 ? last : 1],
    yRange: [0, 1.05],
    series,
    top: { label: topLabel, factor: 1e3 / s.cutoff },
    ...(s.approximate ? { note: approximateNote(s) } : {}),
  });
}

function approximateNote(s: MtfSummary): string {
  if (s.windowFraction !== null && s.windowFraction < MTF_WINDOW_FRACTION) {
    return `approximate: the window holds ${(100 * s.windowFraction).toFixed(1)} % of the PSF's power`;
  }
  return 'approximate: see approximateWhy in result.json';
}
