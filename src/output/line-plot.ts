// A small line-plot drawer for per-case curves (the MTF): axes with round ticks and labelled units,
// an optional second scale along the top, lines solid or dashed, and a legend, on the case
// pictures' dark background with the project's bitmap font. Plain raster drawing, as picture.ts:
// the worker writes it without a plotting library or a system font.
import { CELL_H, drawText, textWidth, type Colour, type RgbImage } from './font.js';
import { encodePng, fillRect, frame, type Rect } from './raster.js';
import { indexedImage } from './indexed.js';

export interface LineSeries {
  label: string;
  x: ArrayLike<number>;
  y: ArrayLike<number>;
  colour: Colour;
  dashed?: boolean;
  /** Line width in pixels (default 2). */
  width?: number;
}

export interface LinePlotInput {
  title?: string;
  /** Axis titles with their units, e.g. 'spatial frequency (cycles/mm)'. */
  xLabel: string;
  yLabel: string;
  xRange: [number, number];
  yRange: [number, number];
  series: LineSeries[];
  /** A second scale along the top: its value is x × factor (e.g. frequency / cut-off). */
  top?: { label: string; factor: number };
  /** A caution, written in its own colour at the right end of the y axis title's line. */
  note?: string;
}

export interface LinePlotLayout {
  width: number;
  height: number;
  /** The plotting area (inside its frame). */
  plot: Rect;
}

const WIDTH = 640;
const HEIGHT = 440;
const MARGIN = 16;
const BACKGROUND: Colour = [30, 30, 34];
const FRAME: Colour = [150, 150, 160];
const GRID: Colour = [55, 55, 62];
const TEXT: Colour = [225, 225, 225];
const NOTE: Colour = [250, 200, 90];
const TICK = 4;

/** Where the plot area lands, for callers and tests. */
export function layoutLinePlot(p: LinePlotInput): LinePlotLayout {
  const titleH = p.title ? CELL_H + 10 : 0;
  const topAxisH = p.top ? 2 * CELL_H + 12 : 0;
  const yTickW = textWidth('0.00') + 8;
  const left = MARGIN + CELL_H + 8 + yTickW;
  const top = MARGIN + titleH + CELL_H + 8 + topAxisH;
  const bottom = HEIGHT - MARGIN - 2 * CELL_H - 14;
  const right = WIDTH - MARGIN - 4;
  return { width: WIDTH, height: HEIGHT, plot: { x: left, y: top, w: right - left, h: bottom - top } };
}

/** Round tick values (1, 2 or 5 × 10^k apart) covering [lo, hi] with about `target` steps. */
export function niceTicks(lo: number, hi: number, target = 6): number[] {
  if (!(hi > lo)) return [lo];
  const raw = (hi - lo) / target;
  const p = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((m) => m * p).find((s) => s >= raw) ?? 10 * p;
  const out: number[] = [];
  for (let v = Math.ceil(lo / step - 1e-9) * step; v <= hi + step * 1e-9; v += step) out.push(Math.abs(v) < step * 1e-9 ? 0 : v);
  return out;
}

function tickText(v: number, ticks: number[]): string {
  const step = ticks.length > 1 ? Math.abs(ticks[1]! - ticks[0]!) : 1;
  const decimals = Math.max(0, Math.min(6, -Math.floor(Math.log10(step) + 1e-9)));
  return v.toFixed(decimals);
}

export function renderLinePlot(p: LinePlotInput): Buffer {
  return encodePng(drawLinePlots([p]));
}

/** Several plots one above the other in one picture (a profile's linear and log views). */
export function renderLinePlots(plots: LinePlotInput[]): Buffer {
  return encodePng(drawLinePlots(plots));
}

function drawLinePlots(plots: LinePlotInput[]): RgbImage {
  const layouts = plots.map(layoutLinePlot);
  const width = Math.max(...layouts.map((l) => l.width));
  const height = layouts.reduce((s, l) => s + l.height, 0);
  // (Every pixel is written: the background fills it all first.) Indexed: a plot has a handful of
  // colours (an image given more than 256 turns into RGB as it is drawn).
  const img = indexedImage('line-plot', width, height);
  fillRect(img, { x: 0, y: 0, w: width, h: height }, BACKGROUND);
  let top = 0;
  plots.forEach((p, i) => {
    drawLinePlot(img, top, p);
    top += layouts[i]!.height;
  });
  return img;
}

/** One plot into img, its layout shifted down by `top` pixels. */
function drawLinePlot(img: RgbImage, top: number, p: LinePlotInput): void {
  for (const r of [p.xRange, p.yRange]) {
    if (!(Number.isFinite(r[0]) && Number.isFinite(r[1]) && r[1] > r[0])) throw new RangeError(`line plot: bad range [${r[0]}, ${r[1]}]`);
  }
  const base = layoutLinePlot(p);
  const width = base.width;
  const plot = { ...base.plot, y: base.plot.y + top };
  const MARGIN_TOP = MARGIN + top;
  const [x0, x1] = p.xRange;
  const [y0, y1] = p.yRange;
  const px = (x: number) => plot.x + ((x - x0) / (x1 - x0)) * (plot.w - 1);
  const py = (y: number) => plot.y + plot.h - 1 - ((y - y0) / (y1 - y0)) * (plot.h - 1);

  if (p.title) drawText(img, MARGIN, MARGIN_TOP, clip(p.title, width - 2 * MARGIN), TEXT);
  // The y axis title sits above the axis (the font has no rotated form).
  const labelY = plot.y - CELL_H - 8 - (p.top ? 2 * CELL_H + 12 : 0);
  drawText(img, MARGIN, labelY, p.yLabel, TEXT);
  if (p.note) {
    const room = width - 2 * MARGIN - textWidth(p.yLabel) - 12;
    const text = clip(p.note, room);
    drawText(img, width - MARGIN - textWidth(text), labelY, text, NOTE);
  }

  const xt = niceTicks(x0, x1, 8);
  const yt = niceTicks(y0, y1, 10);
  for (const v of xt) {
    const x = Math.round(px(v));
    fillRect(img, { x, y: plot.y, w: 1, h: plot.h }, GRID);
    fillRect(img, { x, y: plot.y + plot.h, w: 1, h: TICK }, TEXT);
    const s = tickText(v, xt);
    drawText(img, x - Math.floor(textWidth(s) / 2), plot.y + plot.h + TICK + 3, s, TEXT);
  }
  for (const v of yt) {
    const y = Math.round(py(v));
    fillRect(img, { x: plot.x, y, w: plot.w, h: 1 }, GRID);
    fillRect(img, { x: plot.x - TICK - 1, y, w: TICK, h: 1 }, TEXT);
    const s = tickText(v, yt);
    drawText(img, plot.x - TICK - 4 - textWidth(s), y - Math.floor(CELL_H / 2) + 1, s, TEXT);
  }
  drawText(img, plot.x + Math.floor((plot.w - textWidth(p.xLabel)) / 2), plot.y + plot.h + TICK + CELL_H + 8, p.xLabel, TEXT);
  if (p.top) {
    const f = p.top.factor;
    const tt = niceTicks(x0 * f, x1 * f, 6);
    for (const v of tt) {
      const x = Math.round(px(v / f));
      fillRect(img, { x, y: plot.y - TICK - 1, w: 1, h: TICK }, TEXT);
      const s = tickText(v, tt);
      drawText(img, x - Math.floor(textWidth(s) / 2), plot.y - TICK - 3 - CELL_H, s, TEXT);
    }
    drawText(img, plot.x + Math.floor((plot.w - textWidth(p.top.label)) / 2), plot.y - TICK - 2 * CELL_H - 8, p.top.label, TEXT);
  }

  for (const s of p.series) drawSeries(img, plot, s, px, py);
  frame(img, plot, FRAME);

  // Legend: top right inside the plot, a short line sample and the label per series.
  const sample = 18;
  // Series without a label (a second marker of one kind) have no line of their own.
  const legend = p.series.filter((s) => s.label !== '');
  if (legend.length === 0) return;
  const lw = Math.max(...legend.map((s) => textWidth(s.label))) + sample + 14;
  const lx = plot.x + plot.w - lw - 6;
  let ly = plot.y + 6;
  fillRect(img, { x: lx - 4, y: ly - 4, w: lw + 4, h: legend.length * (CELL_H + 4) + 6 }, BACKGROUND);
  for (const s of legend) {
    const yMid = ly + Math.floor(CELL_H / 2);
    for (let i = 0; i < sample; i++) if (!s.dashed || Math.floor(i / 4) % 2 === 0) fillRect(img, { x: lx + i, y: yMid - 1, w: 1, h: 2 }, s.colour);
    drawText(img, lx + sample + 6, ly, s.label, TEXT);
    ly += CELL_H + 4;
  }
}

/**
 * A line through the series' points (NaN and infinite values break it), `width` px wide, clipped to
 * the plot: a square of width² pixels every half pixel along each segment, dashes 6 px of run long.
 * Hot (a profile in decades swings through hundreds of pixels between neighbouring points): the
 * squares are not painted one by one but gathered into columns, the squares at one x whose rows
 * follow on, each column filled once as one rectangle: the same pixels, each written once.
 */
function drawSeries(img: RgbImage, plot: Rect, s: LineSeries, px: (x: number) => number, py: (y: number) => number): void {
  let run = 0; // length along the line, for the dashes
  const w = Math.max(1, Math.round(s.width ?? 2));
  const half = (w - 1) / 2;
  const dashed = !!s.dashed;
  const xMax = plot.x + plot.w, yMax = plot.y + plot.h;
  // The column being gathered: squares at x = cx with top rows cy0..cy1 (none while cx < 0).
  let cx = -1, cy0 = 0, cy1 = 0;
  const flush = () => {
    if (cx >= 0) fillRect(img, { x: cx, y: cy0, w, h: cy1 - cy0 + w }, s.colour);
    cx = -1;
  };
  const n = Math.min(s.x.length, s.y.length);
  for (let i = 1; i < n; i++) {
    const ax = s.x[i - 1]!, ay = s.y[i - 1]!, bx = s.x[i]!, by = s.y[i]!;
    if (!(Number.isFinite(ax) && Number.isFinite(ay) && Number.isFinite(bx) && Number.isFinite(by))) continue;
    const xa = px(ax);
    const ya = py(ay);
    const xb = px(bx);
    const yb = py(by);
    const len = Math.hypot(xb - xa, yb - ya);
    const steps = Math.max(1, Math.ceil(len * 2));
    const stepRun = len / steps;
    for (let k = 0; k <= steps; k++) {
      const t = k / steps;
      if (!(dashed && Math.floor(run / 6) % 2 === 1)) {
        const xi = Math.round(xa + t * (xb - xa) - half);
        const yi = Math.round(ya + t * (yb - ya) - half);
        if (xi >= plot.x && xi + w <= xMax && yi >= plot.y && yi + w <= yMax) {
          if (xi === cx && yi >= cy0 - 1 && yi <= cy1 + 1) {
            if (yi < cy0) cy0 = yi;
            else if (yi > cy1) cy1 = yi;
          } else {
            flush();
            (cx = xi), (cy0 = yi), (cy1 = yi);
          }
        }
      }
      if (k < steps) run += stepRun;
    }
  }
  flush();
}

/** The text cut to fit `room` pixels of the bitmap font, with an ellipsis where it was cut. */
export function clip(text: string, room: number): string {
  if (textWidth(text) <= room) return text;
  const chars = [...text];
  while (chars.length > 0 && textWidth(chars.join('') + '...') > room) chars.pop();
  return chars.join('') + '...';
}
