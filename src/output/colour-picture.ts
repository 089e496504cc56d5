// The true-colour picture of a result of several wavelengths (colour.png): what the eye would see
// on the screen, from the CIE 1931 tristimulus maps (run/spectrum-case.ts) in sRGB (IEC 61966-2-1,
// white point D65). Two panels as in intensity.png: linear (the brightest pixel at full scale) and
// with the luminance in decades (each pixel's colour kept, its brightness 1 + log10(Y/Ymax)/decades),
// where faint orders still show their colour. Above a 1-D result the orders of a grating are marked
// where the grating equation puts them: a bar from the shortest to the longest wavelength and the
// order number at the mean.
import { srgb8 } from '../analysis/colour.js';
import type { IntensityMap } from '../model/intensity-map.js';
import { CELL_H, drawText, textWidth, type Colour, type RgbImage } from './font.js';
import { displaySize, drawPositionAxes, drawScaleBar, resampleForDisplay, yAxisRoom } from './picture.js';
import { encodePng, fillRect, frame, type Rect } from './raster.js';

export interface ColourPictureInput {
  /** The grid (and the summed intensity, for sizing). */
  map: IntensityMap;
  X: Float64Array;
  Y: Float64Array;
  Z: Float64Array;
  logDecades: number;
  title: string;
  /** Grating orders: where the shortest and longest wavelengths land, and the order's number. */
  marks?: { from: number; to: number; label: string }[];
}

const MARGIN = 16;
const GUTTER = 28;
const MIN_SLOT = 280;
const BACKGROUND: Colour = [30, 30, 34];
const FRAME: Colour = [96, 96, 108];
const TEXT: Colour = [225, 225, 225];
const MARK: Colour = [250, 200, 90];
const X_AXIS_H = 3 + 2 + CELL_H + 2 + CELL_H;

/** colour.png as PNG bytes. */
export function renderColourPng(p: ColourPictureInput): Buffer {
  return renderColourPicture(p).png;
}

/** colour.png and where its two panels are (for tests that read its pixels). */
export function renderColourPicture(p: ColourPictureInput): { png: Buffer; panels: Rect[] } {
  const panels: Rect[] = [];
  const base = { map: p.map, scale: 'gray' as const, logDecades: p.logDecades };
  const disp = displaySize(base);
  const yRoom = yAxisRoom(base);
  const slotW = Math.max(disp.w + yRoom, MIN_SLOT);
  const width = 2 * MARGIN + 2 * slotW + GUTTER;
  const marksH = p.marks?.length ? CELL_H + 10 : 0;
  const top = MARGIN + CELL_H * 2 + 12;
  const imgY = top + CELL_H * 2 + 6 + 1 + (yRoom > 0 ? CELL_H + 4 : 0) + marksH;
  const height = imgY + disp.h + 1 + X_AXIS_H + 9 + 3 + 8 + 3 * (CELL_H + 4) + MARGIN;
  const img: RgbImage = { width, height, data: new Uint8Array(width * height * 3) };
  fillRect(img, { x: 0, y: 0, w: width, h: height }, BACKGROUND);
  const title = textWidth(p.title, 2) <= width - 2 * MARGIN ? p.title : p.title.slice(0, Math.max(0, Math.floor((width - 2 * MARGIN) / textWidth('m')) - 3)) + '...';
  drawText(img, MARGIN, MARGIN, title, TEXT, textWidth(title, 2) <= width - 2 * MARGIN ? 2 : 1);

  // The tristimulus maps at display size, each resampled as intensity.png resamples its map.
  // (Copied: resampleForDisplay returns a scratch array that its next call reuses.)
  const shown = [p.X, p.Y, p.Z].map((v) => resampleForDisplay({ ...base, map: { ...p.map, intensity: v } }, disp.w, disp.h).slice());
  let yMax = 0;
  for (let i = 0; i < p.Y.length; i++) if (p.Y[i]! > yMax) yMax = p.Y[i]!;
  const views: { label: string; brightness: (y: number) => number; caption: string }[] = [
    { label: 'true colour', brightness: (y) => y / yMax, caption: 'linear: the brightest pixel at full scale' },
    {
      label: 'true colour, log10',
      brightness: (y) => (y > 0 ? Math.max(0, 1 + Math.log10(y / yMax) / p.logDecades) : 0),
      caption: `brightness over ${p.logDecades} decades below the brightest`,
    },
  ];
  views.forEach((view, k) => {
    const sx = MARGIN + k * (slotW + GUTTER);
    const panel: Rect = { x: sx + yRoom + Math.floor((slotW - yRoom - disp.w) / 2), y: imgY, w: disp.w, h: disp.h };
    panels.push(panel);
    drawText(img, sx, top, view.label, TEXT, 2);
    paint(img, panel, shown, yMax > 0 ? view.brightness : () => 0);
    frame(img, { x: panel.x - 1, y: panel.y - 1, w: panel.w + 2, h: panel.h + 2 }, FRAME);
    drawPositionAxes(img, panel, p.map);
    drawScaleBar(img, panel, p.map.nx * p.map.dx);
    if (p.marks) drawMarks(img, panel, p.map, p.marks);
    const capY = panel.y + panel.h + 1 + X_AXIS_H + 9 + 3 + 8;
    drawText(img, sx, capY, view.caption, TEXT);
    drawText(img, sx, capY + CELL_H + 4, 'sRGB (IEC 61966-2-1), white point D65', TEXT);
    drawText(img, sx, capY + 2 * (CELL_H + 4), 'CIE 1931 2-degree observer', TEXT);
  });
  return { png: encodePng(img), panels };
}

/** Each display pixel in its colour at the view's brightness (its luminance relative to the brightest). */
function paint(img: RgbImage, panel: Rect, [X, Y, Z]: Float64Array[], brightness: (y: number) => number): void {
  const rows = panel.h;
  const cols = panel.w;
  const srcRows = X!.length / cols;
  for (let r = 0; r < rows; r++) {
    // A 1-D result has one resampled row, drawn down the whole stripe.
    const sr = srcRows === 1 ? 0 : Math.min(srcRows - 1, r);
    for (let c = 0; c < cols; c++) {
      const i = sr * cols + c;
      const y = Y![i]!;
      const rgb = y > 0 ? srgb8([X![i]!, y, Z![i]!], brightness(y)) : [0, 0, 0];
      const o = 3 * ((panel.y + r) * img.width + panel.x + c);
      img.data[o] = rgb[0]!;
      img.data[o + 1] = rgb[1]!;
      img.data[o + 2] = rgb[2]!;
    }
  }
}

/** Bars above the panel from each order's shortest to its longest wavelength, its number at the middle. */
function drawMarks(img: RgbImage, panel: Rect, m: IntensityMap, marks: { from: number; to: number; label: string }[]): void {
  const lo = m.x0 - m.dx / 2;
  const span = m.nx * m.dx;
  const px = (x: number) => panel.x + Math.round(((x - lo) / span) * panel.w - 0.5);
  const y = panel.y - 4;
  for (const mk of marks) {
    const a = Math.max(panel.x, Math.min(px(mk.from), px(mk.to)));
    const b = Math.min(panel.x + panel.w - 1, Math.max(px(mk.from), px(mk.to)));
    if (b < panel.x || a > panel.x + panel.w - 1) continue;
    fillRect(img, { x: a, y, w: Math.max(1, b - a + 1), h: 2 }, MARK);
    const w = textWidth(mk.label);
    const cx = Math.round((a + b) / 2 - w / 2);
    drawText(img, Math.min(Math.max(cx, panel.x), panel.x + panel.w - w), y - CELL_H - 2, mk.label, MARK);
  }
}

/** Whether a picture would show anything: a 2-D or 1-D map with some light. */
export function hasColour(Y: Float64Array | undefined): boolean {
  return !!Y && Y.some((v) => v > 0);
}

