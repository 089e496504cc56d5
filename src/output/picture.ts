// Intensity picture writer: one PNG with a linear and a log panel side by side,
// each with a colour bar and a physical scale bar. Plain raster drawing on
// purpose — this writes a picture of a result, it is not a plotting library.

import { CELL_H, drawText, textWidth, type Colour, type RgbImage } from './font.js';
import { gray, shoal, type ColourScale } from './colour-scales.js';
import { buildLut, encodePng, fillRect, frame, putLut, type Rect } from './raster.js';
import { isOneD } from '../model/grid.js';
import { mapProblem, type IntensityMap } from '../model/intensity-map.js';

export type ScaleName = 'gray' | 'shoal';

export interface PictureInput {
  /** What is drawn: values >= 0; a 1-D map (the grid's 1-D form, ny = 1, dy = 0) is drawn as stripes. */
  map: IntensityMap;
  scale: ScaleName;
  logDecades?: number; // default 5: the log view spans peak·10^-decades .. peak
  title?: string; // one short line drawn at the top
}

export type { Rect } from './raster.js';

/** Where things land in the picture; exported so callers and tests can find the panels. */
export interface PictureLayout {
  width: number;
  height: number;
  /** Image areas (inside their frames) of the linear and the log panel. */
  panels: [Rect, Rect];
  /** Colour bars (inside their frames), t = 0 at the left edge, 1 at the right. */
  colourBars: [Rect, Rect];
}

const LONG_SIDE = 400; // display size of a panel's long side
const STRIPE_HEIGHT = 120; // height of a 1-D panel: tall enough to read as stripes
const MIN_SLOT = 280; // narrowest panel column, so labels and colour bars still fit
const MARGIN = 16;
const GUTTER = 28;

const BACKGROUND: Colour = [30, 30, 34];
const FRAME: Colour = [96, 96, 108];
const TEXT: Colour = [225, 225, 225];

const SCALES: Record<ScaleName, ColourScale> = { gray, shoal };

// Vertical offsets inside a panel column, from its top.
const LABEL_GAP = 6;
const LABEL_SCALE = 2; // panel names a size up from the small print
const BAR_GAP = 9; // image bottom -> scale bar
const BAR_THICK = 3;
const CBAR_GAP = 14; // scale bar -> colour bar
const CBAR_H = 12;
const TICK_LABEL_GAP = 6; // colour bar bottom -> tick labels (ticks are 3 px of it)

interface Plan {
  layout: PictureLayout;
  titleScale: number;
  title: string;
  slotX: [number, number];
  slotW: number;
}

function displaySize(p: PictureInput): { w: number; h: number } {
  const m = p.map;
  if (isOneD(m)) return { w: fitLength(m.nx), h: STRIPE_HEIGHT };
  const squarePixels = Math.abs(m.dx - m.dy) <= 1e-9 * Math.max(m.dx, m.dy);
  const n = Math.max(m.ny, m.nx);
  if (squarePixels && n <= LONG_SIDE / 2) {
    // Whole display pixels per data pixel, so enlarged blocks all have one size.
    const cell = Math.floor(LONG_SIDE / n);
    return { w: m.nx * cell, h: m.ny * cell };
  }
  const W = m.nx * m.dx, H = m.ny * m.dy;
  const k = LONG_SIDE / Math.max(W, H);
  return { w: Math.max(1, Math.round(W * k)), h: Math.max(1, Math.round(H * k)) };
}

function fitLength(n: number): number {
  return n <= LONG_SIDE / 2 ? n * Math.floor(LONG_SIDE / n) : LONG_SIDE;
}

function plan(p: PictureInput, disp: { w: number; h: number }): Plan {
  const slotW = Math.max(disp.w, MIN_SLOT);
  const width = 2 * MARGIN + 2 * slotW + GUTTER;
  // Large if it fits, small if not, cut short with "..." as a last resort:
  // the title is one line by design.
  let title = p.title ?? '';
  const room = width - 2 * MARGIN;
  const titleScale = textWidth(title, 2) <= room ? 2 : 1;
  if (textWidth(title, 1) > room) {
    const chars = [...title];
    while (chars.length > 0 && textWidth(chars.join('') + '...', 1) > room) chars.pop();
    title = chars.join('') + '...';
  }
  const top = MARGIN + (title ? CELL_H * titleScale + 12 : 0);

  const imgY = top + CELL_H * LABEL_SCALE + LABEL_GAP + 1;
  const barY = imgY + disp.h + 1 + BAR_GAP;
  const cbY = barY + BAR_THICK + CBAR_GAP + 1;
  const bottom = cbY + CBAR_H + 1 + TICK_LABEL_GAP + CELL_H + 6 + CELL_H;
  const slotX: [number, number] = [MARGIN, MARGIN + slotW + GUTTER];
  const panel = (sx: number): Rect => ({ x: sx + Math.floor((slotW - disp.w) / 2), y: imgY, w: disp.w, h: disp.h });
  const bar = (sx: number): Rect => ({ x: sx + 1, y: cbY, w: slotW - 2, h: CBAR_H });
  return {
    layout: {
      width,
      height: bottom + MARGIN,
      panels: [panel(slotX[0]), panel(slotX[1])],
      colourBars: [bar(slotX[0]), bar(slotX[1])],
    },
    titleScale,
    title,
    slotX,
    slotW,
  };
}

function validate(p: PictureInput): void {
  const problem = mapProblem(p.map);
  if (problem) throw new RangeError(`picture: ${problem}`);
  const d = p.logDecades ?? 5;
  if (!Number.isFinite(d) || d <= 0) throw new RangeError(`picture: logDecades must be > 0, got ${d}`);
  for (const v of p.map.intensity) {
    if (!Number.isFinite(v) || v < 0) throw new RangeError(`picture: intensity values must be finite and >= 0, found ${v}`);
  }
}

export function layoutPicture(p: PictureInput): PictureLayout {
  validate(p);
  return plan(p, displaySize(p)).layout;
}

export function renderIntensityPng(p: PictureInput): Buffer {
  validate(p);
  const disp = displaySize(p);
  const { layout, title, titleScale, slotX, slotW } = plan(p, disp);
  const img: RgbImage = { width: layout.width, height: layout.height, data: new Uint8Array(layout.width * layout.height * 3) };
  fillRect(img, { x: 0, y: 0, w: img.width, h: img.height }, BACKGROUND);
  if (title) drawText(img, MARGIN, MARGIN, title, TEXT, titleScale);

  const shown = resampleForDisplay(p, disp.w, disp.h);
  let peak = 0;
  for (const v of p.map.intensity) if (v > peak) peak = v;
  const decades = p.logDecades ?? 5;
  const lut = buildLut(SCALES[p.scale]);

  // Normalised to the peak of the data, not of the resampled view: the label
  // then states the true peak, and a resampled view shows what a coarser
  // detector would see relative to it.
  const toLinear = (v: number): number => (peak > 0 ? v / peak : 0);
  const toLog = (v: number): number => (peak > 0 && v > 0 ? 1 + Math.log10(v / peak) / decades : 0);

  const views = [
    { map: toLinear, label: 'linear', ticks: [{ t: 0, text: '0' }, { t: 1, text: compact(peak) }], caption: `relative irradiance, peak ${compact(peak)}` },
    {
      map: toLog,
      label: 'log10, relative to peak',
      ticks: logTicks(decades, layout.colourBars[1].w),
      caption: peak > 0 ? `spans ${fmtDecades(decades)} below peak` : 'peak 0: nothing to show',
    },
  ];

  views.forEach((view, k) => {
    const panel = layout.panels[k]!;
    const cbar = layout.colourBars[k]!;
    drawText(img, slotX[k]!, panel.y - 1 - LABEL_GAP - CELL_H * LABEL_SCALE, view.label, TEXT, LABEL_SCALE);
    frame(img, panel, FRAME);
    for (let y = 0; y < panel.h; y++) {
      for (let x = 0; x < panel.w; x++) {
        putLut(img, panel.x + x, panel.y + y, lut, view.map(shown[y * panel.w + x]!));
      }
    }
    drawScaleBar(img, panel, p.map.nx * p.map.dx);

    frame(img, cbar, FRAME);
    for (let x = 0; x < cbar.w; x++) {
      const t = cbar.w > 1 ? x / (cbar.w - 1) : 1;
      for (let y = 0; y < cbar.h; y++) putLut(img, cbar.x + x, cbar.y + y, lut, t);
    }
    const labelY = cbar.y + cbar.h + 1 + TICK_LABEL_GAP;
    for (const tick of view.ticks) {
      const tx = cbar.x + Math.round(tick.t * (cbar.w - 1));
      fillRect(img, { x: tx, y: cbar.y + cbar.h + 1, w: 1, h: 3 }, TEXT);
      const w = textWidth(tick.text);
      const lx = Math.min(Math.max(tx - Math.floor(w / 2), slotX[k]!), slotX[k]! + slotW - w);
      drawText(img, lx, labelY, tick.text, TEXT);
    }
    drawText(img, slotX[k]!, labelY + CELL_H + 6, view.caption, TEXT);
  });

  return encodePng(img);
}

/** Peak and tick values: three significant digits, exponent form outside 0.01..1000. */
function compact(v: number): string {
  if (v === 0) return '0';
  return v >= 0.01 && v < 1000 ? v.toPrecision(3) : v.toExponential(2);
}

function fmtDecades(d: number): string {
  const s = Number.isInteger(d) ? String(d) : d.toPrecision(3);
  return `${s} decade${d === 1 ? '' : 's'}`;
}

function logTicks(decades: number, barW: number): { t: number; text: string }[] {
  const widest = textWidth(`1e-${Math.floor(decades)}`);
  const step = Math.max(1, Math.ceil((widest + 8) / (barW / decades)));
  const ticks: { t: number; text: string }[] = [];
  for (let d = 0; d <= decades + 1e-9; d += step) ticks.push({ t: 1 - d / decades, text: d === 0 ? '1' : `1e-${d}` });
  return ticks;
}

/**
 * Resamples to the display grid, one axis at a time. Enlarging picks the
 * nearest data pixel (blocks show the true sampling); shrinking averages every
 * data pixel the display pixel covers, weighted by overlap, because picking
 * one sample would alias fringes finer than a display pixel into moiré.
 */
function resampleForDisplay(p: PictureInput, w: number, h: number): Float64Array {
  // A 1-D map has one row (the grid's 1-D form), stretched to the stripe height below.
  const { intensity: src, ny: rows, nx: cols } = p.map;
  const wx = axisWeights(cols, w);
  const tmp = new Float64Array(rows * w);
  for (let r = 0; r < rows; r++) {
    for (let o = 0; o < w; o++) {
      let s = 0;
      for (const [i, wt] of wx[o]!) s += wt * src[r * cols + i]!;
      tmp[r * w + o] = s;
    }
  }
  const wy = axisWeights(rows, h);
  const out = new Float64Array(h * w);
  for (let o = 0; o < h; o++) {
    for (const [i, wt] of wy[o]!) {
      for (let x = 0; x < w; x++) out[o * w + x]! += wt * tmp[i * w + x]!;
    }
  }
  return out;
}

function axisWeights(n: number, m: number): [number, number][][] {
  const out: [number, number][][] = [];
  const step = n / m;
  for (let o = 0; o < m; o++) {
    if (m >= n) {
      out.push([[Math.min(n - 1, Math.floor((o + 0.5) * step)), 1]]);
      continue;
    }
    const a = o * step, b = (o + 1) * step;
    const list: [number, number][] = [];
    for (let i = Math.floor(a); i < Math.min(n, Math.ceil(b)); i++) {
      const overlap = Math.min(b, i + 1) - Math.max(a, i);
      if (overlap > 0) list.push([i, overlap / step]);
    }
    out.push(list);
  }
  return out;
}

/** A round length (1, 2 or 5 ×10^k) near a fifth of the panel, drawn under its left edge. */
function drawScaleBar(img: RgbImage, panel: Rect, physWidth: number): void {
  const target = physWidth / 5;
  const k = Math.floor(Math.log10(target));
  let best = { m: 1, k, ratio: Infinity };
  for (const kk of [k, k + 1]) {
    for (const m of [1, 2, 5]) {
      const ratio = Math.abs(Math.log(m * 10 ** kk) - Math.log(target));
      if (ratio < best.ratio) best = { m, k: kk, ratio };
    }
  }
  const length = best.m * 10 ** best.k;
  const px = Math.round((length / physWidth) * panel.w);
  const y = panel.y + panel.h + 1 + BAR_GAP;
  fillRect(img, { x: panel.x, y, w: px, h: BAR_THICK }, TEXT);
  drawText(img, panel.x + px + 6, y + Math.floor(BAR_THICK / 2) - 4, formatLength(best.m, best.k), TEXT);
}

function formatLength(m: number, k: number): string {
  const units: [number, string][] = [[0, 'm'], [-3, 'mm'], [-6, 'µm'], [-9, 'nm']];
  const [e, unit] = units.find(([e]) => k >= e) ?? units[units.length - 1]!;
  const d = k - e;
  const value = d >= 0 ? String(m * 10 ** d) : String(Number((m * 10 ** d).toPrecision(1)));
  return `${value} ${unit}`;
}
