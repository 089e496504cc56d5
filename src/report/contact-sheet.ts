// Contact sheet: the spot images of a sweep side by side. Where the windows are alike every tile
// shows the same field of view around its optical axis at the same metres per display pixel, so
// spot sizes compare by eye; where they differ by more than FIELD_RATIO (a log sweep from the near
// field, where the spot is the aperture's size, to the far field, where it is λz/D) one field
// would shrink the near spots to dots, so each tile shows its own window with a scale bar of its
// own. Brightness is per tile (each to its own peak, linear or over decades of it), because peaks
// along a sweep can differ by decades and one common brightness would blank most tiles; the peak
// printed is the case's own, from its full map, not from the reduced tile.

import { CELL_H, CELL_W, drawText, textWidth, type Colour, type RgbImage } from '../output/font.js';
import { escapeControl, safeEcho } from '../safe-text.js';
import { shoal } from '../output/colour-scales.js';
import { buildLut, encodePng, fillRect, frame, LUT_LEVELS, putLut, type Rect } from '../output/raster.js';
import { formatLength } from '../job/units.js';
import { isOneD } from '../model/grid.js';
import { mapProblem, type IntensityMap } from '../model/intensity-map.js';
import { logLevels } from '../output/picture.js';

/** One case on the sheet: its map (positions matter: each tile is centred on the optical axis) and its label. */
export interface SheetTile {
  label: string;
  map: IntensityMap;
  /** The case's peak intensity from its full map, where `map` is reduced (the tile's own max otherwise). */
  peak?: number;
}

export interface SheetOptions {
  columns?: number;
  tilePixels?: number;
  title?: string;
  /**
   * 'common': every tile the same field of view; 'own': each tile its own window, with its own
   * scale bar; default: 'own' where the windows' sizes differ by more than FIELD_RATIO.
   */
  field?: 'common' | 'own';
  /** Brightness per tile: linear to its peak (default), or log over `logDecades` decades below it. */
  scale?: 'linear' | 'log';
  logDecades?: number;
}

/** Windows differing by more than this in size get a field of view each. */
export const FIELD_RATIO = 4;

export type { Rect } from '../output/raster.js';

/** Where things land on the sheet; exported so callers and tests can find the tiles. */
export interface SheetLayout {
  width: number;
  height: number;
  /** Image areas of the tiles (inside their frames), in input order. */
  tiles: Rect[];
  /** Physical width (= height) of the largest tile's field of view (every tile's, with one field), metres. */
  fieldOfView: number;
  /** Each tile's field of view (m): all equal with one field. */
  fields: number[];
  /** Whether each tile shows its own window. */
  own: boolean;
  metresPerPixel: number;
}

// The look of the per-case pictures (src/output/picture.ts), so sheet and pictures read alike.
const BACKGROUND: Colour = [30, 30, 34];
const FRAME: Colour = [96, 96, 108];
const TEXT: Colour = [225, 225, 225];

const MARGIN = 16;
const GAP_X = 16;
const GAP_Y = 14;
const LINE = CELL_H + 3;
const MIN_SLOT = 132; // room for a label like "λ 633 nm, D 50 µm" on one line
const BAR_THICK = 3;
const CBAR_H = 10;
// A display pixel less than half covered by a tile's data shows the background: its value would
// stand for data that was never computed.
const MIN_COVER = 0.5;

interface Plan {
  layout: SheetLayout;
  columns: number;
  slotW: number;
  labelLines: string[][];
  captions: string[];
  title: string;
  titleScale: number;
  footerY: number;
}

function validate(tiles: SheetTile[], opts: SheetOptions): void {
  if (tiles.length === 0) throw new RangeError('contact sheet: no tiles');
  const posInt = (v: number): boolean => Number.isInteger(v) && v > 0;
  if (opts.columns !== undefined && !posInt(opts.columns)) throw new RangeError(`contact sheet: columns must be a positive integer, got ${opts.columns}`);
  if (opts.tilePixels !== undefined && !(posInt(opts.tilePixels) && opts.tilePixels >= 16)) {
    throw new RangeError(`contact sheet: tilePixels must be an integer >= 16, got ${opts.tilePixels}`);
  }
  for (const t of tiles) {
    const what = `contact sheet: tile "${safeEcho(t.label)}"`;
    const problem = mapProblem(t.map);
    if (problem) throw new RangeError(`${what}: ${problem}`);
    const values = t.map.intensity;
    for (let i = 0; i < values.length; i++) {
      const v = values[i]!;
      if (!(v >= 0 && v < Infinity)) throw new RangeError(`${what}: intensity must be finite and >= 0, found ${v}`);
    }
  }
}

/** Half-width of the common field of view: the farthest data edge from the axis over all tiles. */
function halfField(tiles: SheetTile[]): number {
  let h = 0;
  const reach = (origin: number, pitch: number, n: number): number =>
    Math.max(Math.abs(origin - pitch / 2), Math.abs(origin + (n - 0.5) * pitch));
  for (const t of tiles) {
    const m = t.map;
    h = Math.max(h, reach(m.x0, m.dx, m.nx));
    if (!isOneD(m)) h = Math.max(h, reach(m.y0, m.dy, m.ny));
  }
  return h;
}

/** Up to two lines, broken at ", " where possible, cut with "..." as a last resort. */
function wrapLabel(label: string, room: number): string[] {
  if (textWidth(label) <= room) return [label];
  const parts = label.split(', ');
  let first = '';
  let k = 0;
  while (k < parts.length) {
    const next = first ? `${first}, ${parts[k]}` : parts[k]!;
    if (textWidth(next + ',') > room && first) break;
    first = next;
    k++;
  }
  const lines = [k < parts.length ? first + ',' : first, parts.slice(k).join(', ')].filter((s) => s !== '');
  return lines.slice(0, 2).map((s) => cut(s, room));
}

function cut(s: string, room: number): string {
  if (textWidth(s) <= room) return s;
  // No more characters than could fit, first: the loop below then pops a few, not 100 000.
  const chars = [...s.slice(0, 2 * (Math.floor(room / CELL_W) + 2))].slice(0, Math.floor(room / CELL_W) + 2);
  while (chars.length > 0 && textWidth(chars.join('') + '...') > room) chars.pop();
  return chars.join('') + '...';
}

function plan(tiles: SheetTile[], opts: SheetOptions): Plan {
  const T = opts.tilePixels ?? 160;
  const columns = Math.min(opts.columns ?? Math.min(tiles.length, 4), tiles.length);
  const rowsOfTiles = Math.ceil(tiles.length / columns);
  const slotW = Math.max(T + 2, MIN_SLOT);
  const gridW = columns * slotW + (columns - 1) * GAP_X;
  const halves = tiles.map((t) => halfField([t]));
  const H = Math.max(...halves);
  const own = opts.field ? opts.field === 'own' : H > FIELD_RATIO * Math.min(...halves);
  const fov = formatLength(2 * H, 3);
  const decades = opts.logDecades ?? 4;
  const captions = [
    opts.scale === 'log' ? `each tile to its own peak, log scale over ${decades} decades` : 'each tile scaled to its own peak (linear)',
    own ? 'each tile its own window, centred on the axis, with its own scale bar' : `one scale: every tile ${fov} × ${fov}, centred on the axis`,
  ];
  const width = Math.max(2 * MARGIN + gridW, 2 * MARGIN + Math.max(...captions.map((c) => textWidth(c))));
  const left = Math.floor((width - gridW) / 2);

  // The title and labels may hold a job's name: control characters are drawn as their escapes
  // (\x1b), not as boxes of the font's missing glyph, and the text is cut to the room it has.
  let title = escapeControl(opts.title ?? '');
  const room = width - 2 * MARGIN;
  const titleScale = title && textWidth(title, 2) <= room ? 2 : 1;
  title = cut(title, room);
  const top = MARGIN + (title ? CELL_H * titleScale + 12 : 0);

  const labelLines = tiles.map((t) => wrapLabel(escapeControl(t.label), slotW));
  const nLines = Math.max(1, ...labelLines.map((l) => l.length));
  const cellH = nLines * LINE + 2 + T + 2 + 4 + LINE + (own ? LINE : 0); // labels, frame, image, frame, peak line (and the tile's scale bar)

  const rects = tiles.map((_, i) => {
    const c = i % columns, r = Math.floor(i / columns);
    const sx = left + c * (slotW + GAP_X);
    return { x: sx + Math.floor((slotW - T) / 2), y: top + r * (cellH + GAP_Y) + nLines * LINE + 1, w: T, h: T };
  });
  const footerY = top + rowsOfTiles * cellH + (rowsOfTiles - 1) * GAP_Y + 8;
  // Footer: scale bar, colour bar with its two ends, two caption lines.
  const height = footerY + LINE + 6 + CBAR_H + 4 + LINE + 4 + 2 * LINE + MARGIN;
  return {
    layout: { width, height, tiles: rects, fieldOfView: 2 * H, fields: own ? halves.map((h) => 2 * h) : halves.map(() => 2 * H), own, metresPerPixel: (2 * H) / T },
    columns,
    slotW,
    labelLines,
    captions,
    title,
    titleScale,
    footerY,
  };
}

export function layoutContactSheet(tiles: SheetTile[], opts: SheetOptions = {}): SheetLayout {
  validate(tiles, opts);
  return plan(tiles, opts).layout;
}

export function renderContactSheet(tiles: SheetTile[], opts: SheetOptions = {}): Buffer {
  validate(tiles, opts);
  const pl = plan(tiles, opts);
  const { layout } = pl;
  const img: RgbImage = { width: layout.width, height: layout.height, data: new Uint8Array(layout.width * layout.height * 3) };
  fillRect(img, { x: 0, y: 0, w: img.width, h: img.height }, BACKGROUND);
  if (pl.title) drawText(img, MARGIN, MARGIN, pl.title, TEXT, pl.titleScale);
  const lut = buildLut(shoal);
  const log = opts.scale === 'log' ? (opts.logDecades ?? 4) : 0;

  tiles.forEach((t, i) => {
    const r = layout.tiles[i]!;
    const slotX = r.x - Math.floor((pl.slotW - r.w) / 2);
    pl.labelLines[i]!.forEach((line, k) => drawText(img, slotX, r.y - 1 - pl.labelLines[i]!.length * LINE + k * LINE, line, TEXT));
    frame(img, r, FRAME);
    const shown = tileMax(t);
    // Brightness to the tile's own maximum (what it can show); the label gives the case's peak.
    paintTile(img, r, resample(t, layout.fields[i]! / 2, r.w), shown, lut, log);
    drawText(img, slotX, r.y + r.h + 1 + 4, `peak ${compact(t.peak ?? shown)}`, TEXT);
    if (layout.own) {
      const bar = roundLength(layout.fields[i]! / 4);
      const barPx = Math.max(1, Math.round((bar / layout.fields[i]!) * r.w));
      const y = r.y + r.h + 1 + 4 + LINE;
      fillRect(img, { x: slotX, y: y + 3, w: barPx, h: BAR_THICK }, TEXT);
      drawText(img, slotX + barPx + 6, y, formatLength(bar, 3), TEXT);
    }
  });

  // One scale bar for the whole sheet (a round length near a quarter of the field of view), where
  // the tiles share one field.
  const fy = pl.footerY;
  if (!layout.own) {
    const bar = roundLength(layout.fieldOfView / 4);
    const barPx = Math.max(1, Math.round(bar / layout.metresPerPixel));
    fillRect(img, { x: MARGIN, y: fy + 3, w: barPx, h: BAR_THICK }, TEXT);
    drawText(img, MARGIN + barPx + 6, fy, formatLength(bar, 3), TEXT);
  }

  const cbY = fy + LINE + 6;
  const cbW = Math.min(layout.width - 2 * MARGIN, 200);
  const cb: Rect = { x: MARGIN + 1, y: cbY, w: cbW, h: CBAR_H };
  frame(img, cb, FRAME);
  for (let x = 0; x < cb.w; x++) for (let y = 0; y < cb.h; y++) putLut(img, cb.x + x, cb.y + y, lut, cb.w > 1 ? x / (cb.w - 1) : 1);
  const low = log ? `1e-${log} peak` : '0';
  drawText(img, cb.x, cbY + CBAR_H + 4, low, TEXT);
  drawText(img, cb.x + cb.w - textWidth('peak'), cbY + CBAR_H + 4, 'peak', TEXT);

  const capY = cbY + CBAR_H + 4 + LINE + 4;
  pl.captions.forEach((c, k) => drawText(img, MARGIN, capY + k * LINE, c, TEXT));

  return encodePng(img);
}

/**
 * Paints a tile's display values, as fractions of its peak (or, with `decades` > 0, their log over
 * that many decades below it); NaN (no data) leaves the background.
 */
function paintTile(img: RgbImage, r: Rect, view: Float64Array, peak: number, lut: Uint8Array, decades = 0): void {
  const d = img.data;
  const top = LUT_LEVELS - 1;
  // The log levels as the case pictures take them (no logarithm a pixel; the same levels as
  // Math.round(clamp(1 + log10(v/peak)/decades)·top), 0 for v = 0 or a peak of 0).
  const logs = decades > 0 ? logLevels(view, peak, decades, new Uint8Array(view.length)) : null;
  for (let y = 0; y < r.h; y++) {
    let o = ((r.y + y) * img.width + r.x) * 3;
    for (let x = 0; x < r.w; x++, o += 3) {
      const v = view[y * r.w + x]!;
      if (Number.isNaN(v)) continue; // outside the tile's data: leave the background
      let k: number;
      if (logs) k = logs[y * r.w + x]! * 3;
      else {
        // putLut's level (raster.ts): Math.round(clamp(v/peak)·top), without Math.round (x + 0.5
        // truncated, less one where the sum rounded up to a whole number) or its NaN check.
        const f = peak > 0 ? v / peak : 0;
        const t = f >= 1 ? top : f > 0 ? f * top : 0;
        let level = (t + 0.5) | 0;
        if (level - t > 0.5) level--;
        k = level * 3;
      }
      d[o] = lut[k]!;
      d[o + 1] = lut[k + 1]!;
      d[o + 2] = lut[k + 2]!;
    }
  }
}

/**
 * For each display pixel j along one axis (the field [-H, H] cut into m pixels), the data pixels
 * it overlaps, index[start[j]..start[j+1]), their shares of it (weight) and the shares' sum (cover).
 * Overlap weights are box averaging when shrinking (fringes finer than a display pixel average out
 * instead of aliasing) and plain sampling when enlarging.
 */
interface AxisWeights {
  start: Int32Array;
  index: number[];
  weight: number[];
  cover: Float64Array;
}

function axisWeights(n: number, origin: number, pitch: number, H: number, m: number): AxisWeights {
  const s = (2 * H) / m;
  const start = new Int32Array(m + 1);
  const cover = new Float64Array(m);
  const index: number[] = [];
  const weight: number[] = [];
  for (let j = 0; j < m; j++) {
    start[j] = index.length;
    // In data-index units, data pixel i spans [i, i + 1].
    const a = (-H + j * s - origin) / pitch + 0.5;
    const b = (-H + (j + 1) * s - origin) / pitch + 0.5;
    let c = 0;
    for (let i = Math.max(0, Math.floor(a)); i < Math.min(n, Math.ceil(b)); i++) {
      const w = (Math.min(b, i + 1) - Math.max(a, i)) / (b - a);
      if (w > 0) {
        index.push(i);
        weight.push(w);
        c += w;
      }
    }
    cover[j] = c;
  }
  start[m] = index.length;
  return { start, index, weight, cover };
}

/** The greatest value of a tile's map (kept with the tile: both sheets ask). */
function tileMax(t: SheetTile): number {
  const kept = MAXIMA.get(t);
  if (kept && kept.map === t.map) return kept.max;
  const values = t.map.intensity;
  let max = 0;
  for (let k = 0; k < values.length; k++) if (values[k]! > max) max = values[k]!;
  MAXIMA.set(t, { map: t.map, max });
  return max;
}
const MAXIMA = new WeakMap<SheetTile, { map: SheetTile['map']; max: number }>();

/**
 * The tile on the common m×m display grid; NaN where the tile has no data. A job draws its sheet
 * twice (linear and log) from the same tiles on the same grid: the last grid of each tile is kept
 * with it (read only), so the second sheet does not resample again.
 */
function resample(t: SheetTile, H: number, m: number): Float64Array {
  const kept = RESAMPLED.get(t);
  if (kept && kept.H === H && kept.m === m && kept.map === t.map) return kept.out;
  const out = resampleAnew(t, H, m);
  RESAMPLED.set(t, { H, m, map: t.map, out });
  return out;
}
const RESAMPLED = new WeakMap<SheetTile, { H: number; m: number; map: SheetTile['map']; out: Float64Array }>();

function resampleAnew(t: SheetTile, H: number, m: number): Float64Array {
  const out = new Float64Array(m * m).fill(NaN);
  const g = t.map;
  const wx = axisWeights(g.nx, g.x0, g.dx, H, m);
  if (isOneD(g)) {
    // Invariant along y: the one row (the grid's 1-D form) drawn as stripes.
    const prof = g.intensity;
    for (let x = 0; x < m; x++) {
      const cover = wx.cover[x]!;
      if (cover < MIN_COVER) continue;
      let s = 0;
      for (let q = wx.start[x]!; q < wx.start[x + 1]!; q++) s += wx.weight[q]! * prof[wx.index[q]!]!;
      for (let y = 0; y < m; y++) out[y * m + x] = s / cover;
    }
    return out;
  }
  const wy = axisWeights(g.ny, g.y0, g.dy, H, m);
  // Only the data rows some display row uses are resampled along x.
  const used = new Uint8Array(g.ny);
  for (let y = 0; y < m; y++) if (wy.cover[y]! >= MIN_COVER) for (let q = wy.start[y]!; q < wy.start[y + 1]!; q++) used[wy.index[q]!] = 1;
  const tmp = new Float64Array(g.ny * m);
  for (let r = 0; r < g.ny; r++) {
    if (!used[r]) continue;
    const row = r * g.nx;
    for (let x = 0; x < m; x++) {
      let s = 0;
      const end = wx.start[x + 1]!;
      for (let q = wx.start[x]!; q < end; q++) s += wx.weight[q]! * g.intensity[row + wx.index[q]!]!;
      tmp[r * m + x] = s;
    }
  }
  for (let y = 0; y < m; y++) {
    const cover = wy.cover[y]!;
    if (cover < MIN_COVER) continue;
    const end = wy.start[y + 1]!;
    for (let x = 0; x < m; x++) {
      const cx = wx.cover[x]!;
      if (cx < MIN_COVER) continue;
      let s = 0;
      for (let q = wy.start[y]!; q < end; q++) s += wy.weight[q]! * tmp[wy.index[q]! * m + x]!;
      out[y * m + x] = s / (cover * cx);
    }
  }
  return out;
}

/** The 1, 2 or 5 × 10^k nearest (in ratio) to `target`. */
function roundLength(target: number): number {
  const k = Math.floor(Math.log10(target));
  let best = 10 ** k, err = Infinity;
  for (const kk of [k, k + 1]) {
    for (const m of [1, 2, 5]) {
      const v = m * 10 ** kk;
      const e = Math.abs(Math.log(v / target));
      if (e < err) [best, err] = [v, e];
    }
  }
  return best;
}


/** Three significant digits, exponent form outside 0.01..1000 (as the case pictures print peaks). */
function compact(v: number): string {
  if (v === 0) return '0';
  return v >= 0.01 && v < 1000 ? v.toPrecision(3) : v.toExponential(2);
}




