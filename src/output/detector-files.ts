// The spectrometer's detector as files: detector.csv (one row per pixel: its centre, the wavelength
// the camera's order puts there, the signal) and detector.png (the signal against that wavelength,
// pixel by pixel as steps, linear over its peak and in decades below it, so faint orders and wings
// show beside the lines).
import type { DetectorSignal, SpectrometerMetrics } from '../metrics/spectrometer.js';
import { srgb8 } from '../analysis/colour.js';
import { toCsv } from './csv.js';
import { CELL_H, drawText, textWidth, type Colour, type RgbImage } from './font.js';
import { clip, niceTicks, renderLinePlots, type LinePlotInput } from './line-plot.js';
import { encodePng, fillRect, frame } from './raster.js';

export const DETECTOR_FILES = {
  detectorTable: 'detector.csv',
  detectorPlot: 'detector.png',
  detectorColour: 'detector-colour.png',
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
  return Object.entries(DETECTOR_FILES).filter(([k]) => k === 'detectorTable' || hasDetectorPlot(d));
}

/** The detector's files: [name, content]. */
export function detectorFiles(d: DetectorSignal, m: SpectrometerMetrics, title: string): [string, string | Uint8Array][] {
  const out: [string, string | Uint8Array][] = [[DETECTOR_FILES.detectorTable, detectorCsv(d)]];
  if (hasDetectorPlot(d)) {
    out.push([DETECTOR_FILES.detectorPlot, renderDetectorPng(d, m, title)]);
    out.push([DETECTOR_FILES.detectorColour, renderDetectorColourPng(d, m, title)]);
  }
  return out;
}

const STRIP_WIDTH = 1200;
const STRIP_HEIGHT = 90;
const STRIP_MARGIN = 16;
const STRIP_DECADES = 4;
const STRIP_BACKGROUND: Colour = [30, 30, 34];
const STRIP_TEXT: Colour = [225, 225, 225];
const STRIP_FRAME: Colour = [96, 96, 108];

/**
 * The detector as a colour camera would show it (detector-colour.png): each pixel's tristimulus
 * values in sRGB (IEC 61966-2-1, white point D65; CIE 1931 2° observer), linear and over four
 * decades below the brightest pixel, the centre order's wavelength marked beneath. Detectors of
 * more than 1200 pixels are shown in columns of several pixels added together; narrower ones with
 * each pixel several columns wide.
 */
export function renderDetectorColourPng(d: DetectorSignal, m: SpectrometerMetrics, title: string): Buffer {
  const n = d.signal.length;
  const bin = Math.max(1, Math.ceil(n / STRIP_WIDTH));
  const cols = Math.ceil(n / bin);
  const widen = Math.max(1, Math.floor(STRIP_WIDTH / cols));
  const w = cols * widen;
  const X = new Float64Array(cols);
  const Y = new Float64Array(cols);
  const Z = new Float64Array(cols);
  for (let j = 0; j < n; j++) {
    const c = Math.floor(j / bin);
    X[c] = X[c]! + d.xyz.X[j]!;
    Y[c] = Y[c]! + d.xyz.Y[j]!;
    Z[c] = Z[c]! + d.xyz.Z[j]!;
  }
  let yMax = 0;
  for (const v of Y) yMax = Math.max(yMax, v);
  const axisH = CELL_H + 10;
  const captionH = 2 * (CELL_H + 4);
  const width = w + 2 * STRIP_MARGIN;
  const height = STRIP_MARGIN + CELL_H + 10 + 2 * (CELL_H + 6 + STRIP_HEIGHT + axisH) + captionH + STRIP_MARGIN;
  const img: RgbImage = { width, height, data: new Uint8Array(width * height * 3) };
  fillRect(img, { x: 0, y: 0, w: width, h: height }, STRIP_BACKGROUND);
  drawText(img, STRIP_MARGIN, STRIP_MARGIN, clip(`${title}: the detector in colour`, width - 2 * STRIP_MARGIN), STRIP_TEXT);
  const views: { label: string; brightness: (y: number) => number }[] = [
    { label: 'linear: the brightest pixel at full scale', brightness: (y) => y / yMax },
    { label: `brightness over ${STRIP_DECADES} decades below the brightest pixel`, brightness: (y) => (y > 0 ? Math.max(0, 1 + Math.log10(y / yMax) / STRIP_DECADES) : 0) },
  ];
  // The centre order's wavelength at a column's centre (nm), for the ticks.
  const waveAt = (col: number) => {
    const j = Math.min(n - 1, Math.max(0, Math.round((col + 0.5) * bin - 0.5)));
    return d.wavelengths[j]! * 1e9;
  };
  let top = STRIP_MARGIN + CELL_H + 10;
  for (const v of views) {
    drawText(img, STRIP_MARGIN, top, v.label, STRIP_TEXT);
    top += CELL_H + 6;
    const x0 = STRIP_MARGIN;
    for (let c = 0; c < cols; c++) {
      const rgb = yMax > 0 && Y[c]! > 0 ? srgb8([X[c]!, Y[c]!, Z[c]!], v.brightness(Y[c]!)) : ([0, 0, 0] as [number, number, number]);
      fillRect(img, { x: x0 + c * widen, y: top, w: widen, h: STRIP_HEIGHT }, rgb);
    }
    frame(img, { x: x0 - 1, y: top - 1, w: w + 2, h: STRIP_HEIGHT + 2 }, STRIP_FRAME);
    top += STRIP_HEIGHT + 2;
    // Wavelength ticks: where the centre order puts each round wavelength (the mapping is monotonic).
    const a = waveAt(0);
    const b = waveAt(cols - 1);
    if (Number.isFinite(a) && Number.isFinite(b) && a !== b) {
      for (const t of niceTicks(Math.min(a, b), Math.max(a, b), 10)) {
        const col = ((t - a) / (b - a)) * (cols - 1);
        const x = Math.round(x0 + (col + 0.5) * widen);
        fillRect(img, { x, y: top, w: 1, h: 4 }, STRIP_TEXT);
        const s = `${Number(t.toPrecision(6))}`;
        const tx = Math.min(width - STRIP_MARGIN - textWidth(s), Math.max(STRIP_MARGIN, x - Math.floor(textWidth(s) / 2)));
        drawText(img, tx, top + 5, s, STRIP_TEXT);
      }
    }
    top += axisH;
  }
  drawText(img, STRIP_MARGIN, top, clip(`wavelength in order ${m.setup.centre.order} (nm); ${n} pixels${bin > 1 ? `, ${bin} to a column` : ''}; each column holds the whole slit height`, width - 2 * STRIP_MARGIN), STRIP_TEXT);
  drawText(img, STRIP_MARGIN, top + CELL_H + 4, 'sRGB (IEC 61966-2-1), white point D65; CIE 1931 2-degree observer', STRIP_TEXT);
  return encodePng(img);
}
