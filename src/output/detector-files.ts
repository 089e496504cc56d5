// The spectrometer's detector as files: detector.csv (one row per pixel: its centre, the wavelength
// the camera's order puts there, the signal) and detector.png (the signal against that wavelength,
// pixel by pixel as steps, linear over its peak and in decades below it, so faint orders and wings
// show beside the lines).
import type { DetectorSignal, SpectrometerMetrics } from '../metrics/spectrometer.js';
import { toCsv } from './csv.js';
import { renderLinePlots, type LinePlotInput } from './line-plot.js';

export const DETECTOR_FILES = {
  detectorTable: 'detector.csv',
  detectorPlot: 'detector.png',
} as const;

/** Decades below the peak the log panel shows. */
const LOG_DECADES = 6;

export function detectorCsv(d: DetectorSignal): string {
  return toCsv(
    ['pixel', 'x_m', 'wavelength_m', 'fraction_of_light_on_grating'],
    Array.from(d.signal, (v, j) => [j, d.positions[j]!, Number.isNaN(d.wavelengths[j]!) ? null : d.wavelengths[j]!, v]),
  );
}

/** The signal as steps over each pixel's wavelength span, ascending in wavelength. */
function steps(d: DetectorSignal, value: (v: number) => number): { x: number[]; y: number[] } {
  const n = d.signal.length;
  const x: number[] = [];
  const y: number[] = [];
  const idx = Array.from({ length: n }, (_, j) => j).filter((j) => Number.isFinite(d.wavelengths[j]!));
  if (idx.length > 1 && d.wavelengths[idx[0]!]! > d.wavelengths[idx[idx.length - 1]!]!) idx.reverse();
  for (let k = 0; k < idx.length; k++) {
    const j = idx[k]!;
    const w = d.wavelengths[j]! * 1e9;
    const prev = k > 0 ? d.wavelengths[idx[k - 1]!]! * 1e9 : NaN;
    const next = k + 1 < idx.length ? d.wavelengths[idx[k + 1]!]! * 1e9 : NaN;
    const lo = Number.isNaN(prev) ? w - (next - w) / 2 : (prev + w) / 2;
    const hi = Number.isNaN(next) ? w + (w - prev) / 2 : (w + next) / 2;
    const v = value(d.signal[j]!);
    x.push(lo, hi);
    y.push(v, v);
  }
  return { x, y };
}

/**
 * A close view: about the closest pair of lines (six separations wide, at least 40 pixels), or the
 * brightest pixel (40 pixels), in the centre order's wavelength; null where the detector is hardly
 * wider than that.
 */
function zoomRange(d: DetectorSignal, m: SpectrometerMetrics): { range: [number, number]; what: string } | null {
  const n = d.signal.length;
  let centre: number;
  let half = 20;
  let what = 'about the brightest pixel';
  const pair = m.pairs.filter((p) => p.order === m.setup.centre.order).sort((a, b) => a.wavelengths[1] - a.wavelengths[0] - (b.wavelengths[1] - b.wavelengths[0]))[0];
  if (pair) {
    centre = (pair.pixels[0] + pair.pixels[1]) / 2;
    half = Math.max(half, 3 * Math.abs(pair.pixels[1] - pair.pixels[0]));
    what = 'about the closest pair';
  } else {
    centre = 0;
    for (let j = 1; j < n; j++) if (d.signal[j]! > d.signal[centre]!) centre = j;
  }
  if (2 * half >= 0.8 * n) return null;
  const at = (j: number) => d.wavelengths[Math.min(n - 1, Math.max(0, Math.round(j)))]! * 1e9;
  const a = at(centre - half);
  const b = at(centre + half);
  if (!(Number.isFinite(a) && Number.isFinite(b)) || a === b) return null;
  return { range: [Math.min(a, b), Math.max(a, b)], what };
}

export function renderDetectorPng(d: DetectorSignal, m: SpectrometerMetrics, title: string): Buffer {
  let peak = 0;
  for (const v of d.signal) peak = Math.max(peak, v);
  const lin = steps(d, (v) => (peak > 0 ? v / peak : 0));
  const xRange: [number, number] = [Math.min(lin.x[0]!, lin.x[lin.x.length - 1]!), Math.max(lin.x[0]!, lin.x[lin.x.length - 1]!)];
  const floor = -LOG_DECADES;
  const log = steps(d, (v) => (peak > 0 && v > 0 ? Math.max(floor, Math.log10(v / peak)) : floor));
  const xLabel = `wavelength in order ${m.setup.centre.order} at the pixel (nm)`;
  const note = `${m.setup.pixels} pixels of ${(m.setup.pixel * 1e6).toPrecision(3)} µm, ${(m.perPixel * 1e9).toPrecision(3)} nm each`;
  const zoom = zoomRange(d, m);
  const plots: LinePlotInput[] = [
    ...(zoom ? [{ title: `${title}: detector`, xLabel, yLabel: `signal / its peak, ${zoom.what}`, note, xRange: zoom.range, yRange: [0, 1.05] as [number, number], series: [{ label: 'pixel signal', x: lin.x, y: lin.y, colour: [120, 200, 255] as [number, number, number], width: 2 }] }] : []),
    { ...(zoom ? {} : { title: `${title}: detector`, note }), xLabel, yLabel: 'signal / its peak, whole detector', xRange, yRange: [0, 1.05], series: [{ label: 'pixel signal', x: lin.x, y: lin.y, colour: [120, 200, 255], width: 1 }] },
    { xLabel, yLabel: 'log10(signal / its peak)', xRange, yRange: [floor, 0.2], series: [{ label: 'pixel signal (decades)', x: log.x, y: log.y, colour: [255, 190, 90], width: 1 }] },
  ];
  return renderLinePlots(plots);
}

/** Whether detector.png is drawn: two pixels at least see a direction that leaves the grating. */
export function hasDetectorPlot(d: DetectorSignal): boolean {
  let finite = 0;
  for (const w of d.wavelengths) if (Number.isFinite(w)) finite++;
  return finite >= 2;
}

/** Which of DETECTOR_FILES a case writes, as [key, file name] (for result.json's file list). */
export function detectorFileEntries(d: DetectorSignal | undefined): [string, string][] {
  if (!d) return [];
  return Object.entries(DETECTOR_FILES).filter(([k]) => k !== 'detectorPlot' || hasDetectorPlot(d));
}

/** The detector's files: [name, content]. */
export function detectorFiles(d: DetectorSignal, m: SpectrometerMetrics, title: string): [string, string | Uint8Array][] {
  const out: [string, string | Uint8Array][] = [[DETECTOR_FILES.detectorTable, detectorCsv(d)]];
  if (hasDetectorPlot(d)) out.push([DETECTOR_FILES.detectorPlot, renderDetectorPng(d, m, title)]);
  return out;
}
