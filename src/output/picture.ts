// Intensity picture writer: one PNG with a linear and a log panel side by side,
// each with axes in µm or mm (ticks below and, for 2-D maps, left; the optical
// axis marked on both), a colour bar and a physical scale bar. Plain raster
// drawing on purpose — this writes a picture of a result, it is not a plotting
// library. Rows go down the picture as they go down intensity.npy: y grows downwards.

import { CELL_H, drawText, textWidth, type Colour, type RgbImage } from './font.js';
import { gray, shoal, type ColourScale } from './colour-scales.js';
import { buildLut, encodePngs, fillRect, frame, LUT_LEVELS, type Rect } from './raster.js';
import { indexedImage, packColour } from './indexed.js';
import { isOneD } from '../model/grid.js';
import { mapProblem, type IntensityMap } from '../model/intensity-map.js';
import { niceTicks } from './line-plot.js';
import { scratchZeros } from './scratch.js';

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
/**
 * A map of up to this many samples along its long side (square pixels) is shown one display pixel a
 * sample, a little over LONG_SIDE: shrinking 401 samples to 400 pixels would make the middle
 * columns averages of two samples, and cost a resampling of the whole map.
 */
const ONE_TO_ONE = LONG_SIDE + LONG_SIDE / 16;
const STRIPE_HEIGHT = 120; // height of a 1-D panel: tall enough to read as stripes
const MIN_SLOT = 280; // narrowest panel column, so labels and colour bars still fit
const MARGIN = 16;
const GUTTER = 28;

const BACKGROUND: Colour = [30, 30, 34];
const FRAME: Colour = [96, 96, 108];
const TEXT: Colour = [225, 225, 225];
const AXIS_MARK: Colour = [250, 200, 90];

const SCALES: Record<ScaleName, ColourScale> = { gray, shoal };

/**
 * The colour-table levels of a panel and its colour bar: 256 less the four colours drawn around
 * them, so that a picture is one 8-bit palette (PNG colour type 3): the image is drawn once in
 * levels and written in every scale by its palette alone (output/raster.ts encodePngs). Steps of
 * 1/251 of the range instead of 1/255: no eye tells them apart.
 */
export const PANEL_LEVELS = 256 - 4;

// Vertical offsets inside a panel column, from its top.
const LABEL_GAP = 6;
const LABEL_SCALE = 2; // panel names a size up from the small print
const BAR_GAP = 9; // image bottom -> scale bar
const BAR_THICK = 3;
const CBAR_GAP = 14; // scale bar -> colour bar
const CBAR_H = 12;
const TICK_LABEL_GAP = 6; // colour bar bottom -> tick labels (ticks are 3 px of it)
const AXIS_TICK = 3; // length of a position tick outside the panel
const X_AXIS_H = AXIS_TICK + 2 + CELL_H + 2 + CELL_H; // ticks, their labels, the axis title
const AXIS_ROOM = 6; // tick labels <-> the panel's left edge

interface Plan {
  layout: PictureLayout;
  titleScale: number;
  title: string;
  slotX: [number, number];
  slotW: number;
}

export function displaySize(p: PictureInput): { w: number; h: number } {
  const m = p.map;
  if (isOneD(m)) return { w: fitLength(m.nx), h: STRIPE_HEIGHT };
  const squarePixels = Math.abs(m.dx - m.dy) <= 1e-9 * Math.max(m.dx, m.dy);
  const n = Math.max(m.ny, m.nx);
  if (squarePixels && n <= LONG_SIDE / 2) {
    // Whole display pixels per data pixel, so enlarged blocks all have one size.
    const cell = Math.floor(LONG_SIDE / n);
    return { w: m.nx * cell, h: m.ny * cell };
  }
  if (squarePixels && n > LONG_SIDE && n <= ONE_TO_ONE) return { w: m.nx, h: m.ny };
  const W = m.nx * m.dx, H = m.ny * m.dy;
  const k = LONG_SIDE / Math.max(W, H);
  return { w: Math.max(1, Math.round(W * k)), h: Math.max(1, Math.round(H * k)) };
}

function fitLength(n: number): number {
  return n <= LONG_SIDE / 2 ? n * Math.floor(LONG_SIDE / n) : n > LONG_SIDE && n <= ONE_TO_ONE ? n : LONG_SIDE;
}

/** Room left of a 2-D panel for its y tick labels (none for a 1-D map). */
export function yAxisRoom(p: PictureInput): number {
  if (isOneD(p.map)) return 0;
  const t = positionTicks(p.map.y0 - p.map.dy / 2, p.map.ny * p.map.dy);
  return Math.max(...t.ticks.map((v) => textWidth(t.text(v)))) + AXIS_TICK + AXIS_ROOM;
}

function plan(p: PictureInput, disp: { w: number; h: number }): Plan {
  const yRoom = yAxisRoom(p);
  const slotW = Math.max(disp.w + yRoom, MIN_SLOT);
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

  // A 2-D map's y axis title sits above its tick labels, below the panel's name.
  const imgY = top + CELL_H * LABEL_SCALE + LABEL_GAP + 1 + (yRoom > 0 ? CELL_H + 4 : 0);
  const barY = imgY + disp.h + 1 + X_AXIS_H + BAR_GAP;
  const cbY = barY + BAR_THICK + CBAR_GAP + 1;
  const bottom = cbY + CBAR_H + 1 + TICK_LABEL_GAP + CELL_H + 6 + CELL_H;
  const slotX: [number, number] = [MARGIN, MARGIN + slotW + GUTTER];
  const panel = (sx: number): Rect => ({ x: sx + yRoom + Math.floor((slotW - yRoom - disp.w) / 2), y: imgY, w: disp.w, h: disp.h });
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

/** Checks the input; returns the map's peak (its greatest value, 0 for none), found in the same pass. */
function validate(p: PictureInput): number {
  const problem = mapProblem(p.map);
  if (problem) throw new RangeError(`picture: ${problem}`);
  const d = p.logDecades ?? 5;
  if (!Number.isFinite(d) || d <= 0) throw new RangeError(`picture: logDecades must be > 0, got ${d}`);
  const values = p.map.intensity;
  let peak = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i]!;
    if (!(v >= 0 && v < Infinity)) throw new RangeError(`picture: intensity values must be finite and >= 0, found ${v}`);
    if (v > peak) peak = v;
  }
  return peak;
}

export function layoutPicture(p: PictureInput): PictureLayout {
  validate(p);
  return plan(p, displaySize(p)).layout;
}

export function renderIntensityPng(p: PictureInput): Buffer {
  return renderIntensityPngs(p, [p.scale])[0]!;
}

/**
 * The picture in several colour scales at once (a case writes shoal and gray): the map is
 * resampled, normalised and drawn around once, and only the panels and colour bars are painted
 * per scale. Each picture is the one renderIntensityPng draws for that scale.
 */
export function renderIntensityPngs(p: Omit<PictureInput, 'scale'>, scales: readonly ScaleName[]): Buffer[] {
  const input: PictureInput = { ...p, scale: scales[0] ?? 'gray' };
  const peak = validate(input);
  const disp = displaySize(input);
  const { layout, title, titleScale, slotX, slotW } = plan(input, disp);
  // Indexed: palette entries 0..PANEL_LEVELS − 1 are the colour table's levels (the colours of the
  // scale, given when it is written), the colours drawn around the panels come after them.
  // (Every pixel is written: the background fills it all first.)
  const img = indexedImage('picture', layout.width, layout.height, PANEL_LEVELS);
  fillRect(img, { x: 0, y: 0, w: img.width, h: img.height }, BACKGROUND);
  if (title) drawText(img, MARGIN, MARGIN, title, TEXT, titleScale);

  const decades = p.logDecades ?? 5;

  const views = [
    { label: 'linear', ticks: [{ t: 0, text: '0' }, { t: 1, text: compact(peak) }], caption: `relative irradiance, peak ${compact(peak)}` },
    {
      label: 'log10, relative to peak',
      ticks: logTicks(decades, layout.colourBars[1].w),
      caption: peak > 0 ? `spans ${fmtDecades(decades)} below peak` : 'peak 0: nothing to show',
    },
  ];

  // Everything around the panels and colour bars (none of it reaches inside them).
  views.forEach((view, k) => {
    const panel = layout.panels[k]!;
    const cbar = layout.colourBars[k]!;
    const yTitle = isOneD(p.map) ? 0 : CELL_H + 4;
    drawText(img, slotX[k]!, panel.y - 1 - LABEL_GAP - yTitle - CELL_H * LABEL_SCALE, view.label, TEXT, LABEL_SCALE);
    frame(img, panel, FRAME);
    drawPositionAxes(img, panel, p.map);
    drawScaleBar(img, panel, p.map.nx * p.map.dx);
    frame(img, cbar, FRAME);
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

  // The panels and colour bars in table levels, which are their palette indices. Where every
  // display pixel shows one sample (the map enlarged, or shown one to one) the levels are those of
  // the samples, found once a sample and repeated; a shrunk map is resampled first.
  const m = p.map;
  if (disp.w >= m.nx && disp.h >= m.ny) {
    const cols = axisWeights(m.nx, disp.w).index;
    const rows = axisWeights(m.ny, disp.h).index;
    const samples: Rect = { x: 0, y: 0, w: m.nx, h: m.ny };
    paintSamples(img, layout.panels[0], viewLevels(m.intensity, 'linear', peak, decades, samples), m.nx, cols, rows);
    paintSamples(img, layout.panels[1], viewLevels(m.intensity, 'log', peak, decades, samples), m.nx, cols, rows);
  } else {
    const shown = resampleForDisplay(input, disp.w, disp.h);
    paintLevels(img, layout.panels[0], viewLevels(shown, 'linear', peak, decades, layout.panels[0]), layout.panels[0].w);
    paintLevels(img, layout.panels[1], viewLevels(shown, 'log', peak, decades, layout.panels[1]), layout.panels[1].w);
  }
  for (const cbar of layout.colourBars) {
    const levels = new Uint8Array(cbar.w);
    for (let x = 0; x < cbar.w; x++) levels[x] = lutLevel(cbar.w > 1 ? x / (cbar.w - 1) : 1, cbar.x + x, cbar.y);
    paintLevels(img, cbar, levels, 0);
  }

  const around = img.palette!.slice(PANEL_LEVELS);
  return encodePngs(
    img,
    scales.map((scale) => [...panelPalette(scale), ...around]),
  );
}

/** A scale's colours for the panel levels, 0xRRGGBB (a memo: two scales, built once a thread). */
function panelPalette(scale: ScaleName): readonly number[] {
  let p = PANEL_PALETTES.get(scale);
  if (!p) {
    const lut = buildLut(SCALES[scale], PANEL_LEVELS);
    p = Array.from({ length: PANEL_LEVELS }, (_, k) => packColour([lut[3 * k]!, lut[3 * k + 1]!, lut[3 * k + 2]!]));
    PANEL_PALETTES.set(scale, p);
  }
  return p;
}
const PANEL_PALETTES = new Map<ScaleName, number[]>();

/**
 * Table levels of a panel's display pixels in the linear view (v / peak) or the log view
 * (1 + log10(v / peak) / decades, 0 where v is 0). Normalised to the peak of the data, not of the
 * resampled view: the label then states the true peak, and a resampled view shows what a coarser
 * detector would see relative to it.
 */
function viewLevels(shown: Float64Array, view: 'linear' | 'log', peak: number, decades: number, panel: Rect): Uint8Array {
  const out = new Uint8Array(shown.length);
  // A peak of 0 (or none) shows every pixel at level 0, NaN or not, as the views define it.
  if (!(peak > 0)) return out;
  const top = PANEL_LEVELS - 1;
  // Hot (two views of 160 000 pixels a case): one loop per view, no branch on the view inside it.
  // The level of every pixel is the same expression as before the split: Math.round(clamp(t)·top).
  if (view === 'linear') {
    for (let i = 0; i < shown.length; i++) {
      const t = shown[i]! / peak;
      if (t !== t) nanAt(panel, i);
      // Math.round(clamp(t)·top) without Math.round (twice as fast here): x + 0.5 truncated, less
      // one where the sum rounded up to the next whole number (x just under a half).
      const x = t >= 1 ? top : t > 0 ? t * top : 0;
      let k = (x + 0.5) | 0;
      if (k - x > 0.5) k--;
      out[i] = k;
    }
    return out;
  }
  return logLevels(shown, peak, decades, out, PANEL_LEVELS);
}

/**
 * The log view's table levels of values (v / peak): Math.round(clamp(1 + log10(v/peak)/decades)·top),
 * top = levels − 1 (at most 255), 0 where v ≤ 0 or NaN and where peak is not above 0, written into
 * `out` (the contact sheet's log tiles use it too, with 256 levels).
 */
export function logLevels(shown: Float64Array, peak: number, decades: number, out: Uint8Array, levels = LUT_LEVELS): Uint8Array {
  if (!(levels >= 2 && levels <= 256)) throw new RangeError(`logLevels: ${levels} levels (2 to 256)`);
  const top = levels - 1;
  if (!(peak > 0)) return out.fill(0);
  const level = (x: number) => Math.round(Math.min(1, Math.max(0, 1 + Math.log10(x) / decades)) * top);
  if (!(decades >= 0.01 && decades <= 100)) {
    // Outside what a job can ask (1 to 12 decades) the bounds are not worth their search.
    for (let i = 0; i < shown.length; i++) {
      const v = shown[i]!;
      out[i] = v > 0 ? level(v / peak) : 0;
    }
    return out;
  }
  const bounds = logBounds(decades, top, level);
  // The level by a binary search over the bounds (eight halvings over 256 entries, those above top
  // infinite), each step a comparison added in, with no branch
  // to mispredict (a first guess from the exponent and a walk took three times as long).
  // Below bounds[1] (v ≤ 0 and NaN too: no comparison passes) the level is 0, as the array holds.
  const below = bounds[1]!;
  for (let i = 0; i < shown.length; i++) {
    const x = shown[i]! / peak;
    if (!(x >= below)) {
      out[i] = 0;
      continue;
    }
    let k = +(x >= bounds[128]!) << 7;
    k += +(x >= bounds[k + 64]!) << 6;
    k += +(x >= bounds[k + 32]!) << 5;
    k += +(x >= bounds[k + 16]!) << 4;
    k += +(x >= bounds[k + 8]!) << 3;
    k += +(x >= bounds[k + 4]!) << 2;
    k += +(x >= bounds[k + 2]!) << 1;
    k += +(x >= bounds[k + 1]!);
    // Within a hair of a bound (a relative 1e-12, thousands of ulps of log10's result), the
    // expression itself decides, so the level never rests on log10 being monotone to the last ulp.
    out[i] = k > 0 && k < top && (x < bounds[k]! * NEAR_ABOVE || x > bounds[k + 1]! * NEAR_BELOW) ? level(x) : k;
  }
  return out;
}

const NEAR_ABOVE = 1 + 1e-12;
const NEAR_BELOW = 1 - 1e-12;

/**
 * The log view's levels without a logarithm per pixel: bounds[k] is the least x = v/peak (a double)
 * whose level, Math.round(clamp(1 + log10(x)/decades)·top), is k or more (k = 1..top; bounds[0] = 0,
 * bounds[top + 1] = ∞), found by bisection on the doubles' bit patterns, which order positive
 * doubles as their values. A pixel's level is then the k with bounds[k] ≤ x < bounds[k + 1]: the
 * same as the expression's, a few comparisons instead of a log10 (which took a quarter of a case's
 * pictures). Kept per decades value (one or two in a run).
 */
function logBounds(decades: number, top: number, level: (x: number) => number): Float64Array {
  const key = `${decades}/${top}`;
  const known = LOG_BOUNDS.get(key);
  if (known) return known;
  // 257 entries whatever top is: the search reads up to bounds[256].
  const bounds = new Float64Array(257);
  bounds.fill(Infinity, top + 1);
  const f = new Float64Array(1);
  const u = new BigUint64Array(f.buffer);
  const bitsOf = (x: number) => ((f[0] = x), u[0]!);
  const valueOf = (b: bigint) => ((u[0] = b), f[0]!);
  for (let k = 1; k <= top; k++) {
    // Where the level steps to k in exact arithmetic, then a bracket around it, then bisection.
    const guess = 10 ** (decades * ((k - 0.5) / top - 1));
    let lo = guess / 1.001;
    let hi = guess * 1.001;
    while (level(lo) >= k) lo /= 1.001;
    while (level(hi) < k) hi *= 1.001;
    let a = bitsOf(lo);
    let b = bitsOf(hi);
    while (b - a > 1n) {
      const m = (a + b) >> 1n;
      if (level(valueOf(m)) >= k) b = m;
      else a = m;
    }
    bounds[k] = valueOf(b);
  }
  if (LOG_BOUNDS.size > 16) LOG_BOUNDS.clear();
  LOG_BOUNDS.set(key, bounds);
  return bounds;
}
const LOG_BOUNDS = new Map<string, Float64Array>();

/** A NaN here would index past the table and quietly paint black; it is a bug upstream, so say so. */
function nanAt(panel: Rect, i: number): never {
  throw new Error(`picture: NaN colour value at (${panel.x + (i % panel.w)}, ${panel.y + Math.floor(i / panel.w)})`);
}

/** The panel table's level for t (clamped to [0, 1]). */
function lutLevel(t: number, x: number, y: number): number {
  // A NaN here would index past the table and quietly paint black; it is a bug upstream, so say so.
  if (Number.isNaN(t)) throw new Error(`picture: NaN colour value at (${x}, ${y})`);
  return Math.round(Math.min(1, Math.max(0, t)) * (PANEL_LEVELS - 1));
}

/** Writes rect r of an indexed image from table levels (its palette indices), row y at levels[y·rowStep + x] (rowStep 0: every row alike). */
function paintLevels(img: RgbImage, r: Rect, levels: Uint8Array, rowStep: number): void {
  for (let y = 0; y < r.h; y++) img.data.set(levels.subarray(y * rowStep, y * rowStep + r.w), (r.y + y) * img.width + r.x);
}

/**
 * Writes rect r of an indexed image from the levels of a map's samples (nx a row): display pixel
 * (x, y) shows sample (cols[x], rows[y]), resampleForDisplay's nearest sample when it enlarges.
 */
function paintSamples(img: RgbImage, r: Rect, levels: Uint8Array, nx: number, cols: Int32Array, rows: Int32Array): void {
  const d = img.data;
  // One display column a sample: each row is a copy of the levels' row.
  const oneToOne = r.w === nx;
  for (let y = 0; y < r.h; y++) {
    const to = (r.y + y) * img.width + r.x;
    // A display row showing the same samples as the one above it is a copy of it.
    if (y > 0 && rows[y] === rows[y - 1]) {
      d.copyWithin(to, to - img.width, to - img.width + r.w);
      continue;
    }
    const from = rows[y]! * nx;
    if (oneToOne) d.set(levels.subarray(from, from + nx), to);
    else for (let x = 0; x < r.w; x++) d[to + x] = levels[from + cols[x]!]!;
  }
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
export function resampleForDisplay(p: PictureInput, w: number, h: number): Float64Array {
  // A 1-D map has one row (the grid's 1-D form), stretched to the stripe height below.
  const { intensity: src, ny: rows, nx: cols } = p.map;
  const wx = axisWeights(cols, w);
  const tmp = scratchZeros('resample-rows', rows * w);
  const { start, index, weight } = wx;
  for (let r = 0; r < rows; r++) {
    const row = r * cols;
    for (let o = 0; o < w; o++) {
      let s = 0;
      const end = start[o + 1]!;
      for (let q = start[o]!; q < end; q++) s += weight[q]! * src[row + index[q]!]!;
      tmp[r * w + o] = s;
    }
  }
  const wy = axisWeights(rows, h);
  const out = scratchZeros('resample', h * w);
  for (let o = 0; o < h; o++) {
    const end = wy.start[o + 1]!;
    const to = o * w;
    for (let q = wy.start[o]!; q < end; q++) {
      const wt = wy.weight[q]!;
      const from = wy.index[q]! * w;
      for (let x = 0; x < w; x++) out[to + x]! += wt * tmp[from + x]!;
    }
  }
  return out;
}

/** Each display pixel o's data pixels index[start[o]..start[o+1]) and their weights. */
interface AxisWeights {
  start: Int32Array;
  index: Int32Array;
  weight: Float64Array;
}

function axisWeights(n: number, m: number): AxisWeights {
  const start = new Int32Array(m + 1);
  const step = n / m;
  // Shrinking: a display pixel covers at most ceil(step) + 1 data pixels.
  const cap = m >= n ? m : m * (Math.ceil(step) + 1);
  const index = new Int32Array(cap);
  const weight = new Float64Array(cap);
  let q = 0;
  for (let o = 0; o < m; o++) {
    start[o] = q;
    if (m >= n) {
      index[q] = Math.min(n - 1, Math.floor((o + 0.5) * step));
      weight[q++] = 1;
      continue;
    }
    const a = o * step, b = (o + 1) * step;
    for (let i = Math.floor(a); i < Math.min(n, Math.ceil(b)); i++) {
      const overlap = Math.min(b, i + 1) - Math.max(a, i);
      if (overlap > 0) {
        index[q] = i;
        weight[q++] = overlap / step;
      }
    }
  }
  start[m] = q;
  return { start, index, weight };
}

/** Ticks over [lo, lo + span] (m) in the unit that reads best, with their labels. */
function positionTicks(lo: number, span: number): { ticks: number[]; unit: string; text: (v: number) => string } {
  const reach = Math.max(Math.abs(lo), Math.abs(lo + span));
  const [f, unit] = reach >= 1e-3 ? [1e3, 'mm'] : reach >= 1e-6 ? [1e6, 'µm'] : [1e9, 'nm'];
  const ticks = niceTicks(lo * f, (lo + span) * f, 5);
  const step = ticks.length > 1 ? ticks[1]! - ticks[0]! : 1;
  const decimals = Math.max(0, Math.min(6, -Math.floor(Math.log10(step) + 1e-9)));
  return { ticks: ticks.map((v) => v / f), unit, text: (v: number) => (v * f).toFixed(decimals) };
}

/**
 * Position ticks below the panel (x) and left of it (y, 2-D maps), with the axis titles, and the
 * optical axis (x = 0, y = 0) marked by longer ticks in their own colour where the window holds it.
 * A display pixel j spans data from x0 − dx/2 + j·(nx·dx)/w (resampleForDisplay's grid).
 */
export function drawPositionAxes(img: RgbImage, panel: Rect, m: IntensityMap): void {
  const xLo = m.x0 - m.dx / 2;
  const xSpan = m.nx * m.dx;
  const xt = positionTicks(xLo, xSpan);
  const xPix = (v: number) => panel.x + Math.round(((v - xLo) / xSpan) * panel.w - 0.5);
  const below = panel.y + panel.h + 1;
  for (const v of xt.ticks) {
    const x = xPix(v);
    if (x < panel.x || x >= panel.x + panel.w) continue;
    fillRect(img, { x, y: below, w: 1, h: AXIS_TICK }, TEXT);
    const s = xt.text(v);
    drawText(img, x - Math.floor(textWidth(s) / 2), below + AXIS_TICK + 2, s, TEXT);
  }
  const xTitle = `x (${xt.unit})`;
  drawText(img, panel.x + Math.floor((panel.w - textWidth(xTitle)) / 2), below + AXIS_TICK + 2 + CELL_H + 2, xTitle, TEXT);
  if (xLo < 0 && xLo + xSpan > 0) fillRect(img, { x: xPix(0), y: below, w: 1, h: AXIS_TICK + 2 }, AXIS_MARK);
  if (isOneD(m)) return;
  const yLo = m.y0 - m.dy / 2;
  const ySpan = m.ny * m.dy;
  const yt = positionTicks(yLo, ySpan);
  const yPix = (v: number) => panel.y + Math.round(((v - yLo) / ySpan) * panel.h - 0.5);
  const left = panel.x - 1;
  for (const v of yt.ticks) {
    const y = yPix(v);
    if (y < panel.y || y >= panel.y + panel.h) continue;
    fillRect(img, { x: left - AXIS_TICK, y, w: AXIS_TICK, h: 1 }, TEXT);
    const s = yt.text(v);
    drawText(img, left - AXIS_TICK - 2 - textWidth(s), y - Math.floor(CELL_H / 2) + 1, s, TEXT);
  }
  const yTitle = `y (${yt.unit})`;
  drawText(img, Math.max(0, panel.x - textWidth(yTitle) - 2), panel.y - CELL_H - 3, yTitle, TEXT);
  if (yLo < 0 && yLo + ySpan > 0) fillRect(img, { x: left - AXIS_TICK - 1, y: yPix(0), w: AXIS_TICK + 2, h: 1 }, AXIS_MARK);
}

/** A round length (1, 2 or 5 ×10^k) near a fifth of the panel, drawn under its left edge. */
export function drawScaleBar(img: RgbImage, panel: Rect, physWidth: number): void {
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
  const y = panel.y + panel.h + 1 + X_AXIS_H + BAR_GAP;
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
