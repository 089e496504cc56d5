// Small raster helpers shared by the case pictures and the contact sheet: colour tables, filled
// rectangles and frames on an RGB image.
import { PNG } from 'pngjs';
import type { Colour, RgbImage } from './font.js';
import type { ColourScale } from './colour-scales.js';

export const LUT_LEVELS = 256; // one per 8-bit step: finer tables only add rounding dips

export function buildLut(scale: ColourScale): Uint8Array {
  const lut = new Uint8Array(LUT_LEVELS * 3);
  for (let i = 0; i < LUT_LEVELS; i++) {
    const c = scale(i / (LUT_LEVELS - 1));
    for (let j = 0; j < 3; j++) lut[i * 3 + j] = Math.round(c[j]!);
  }
  return lut;
}

export function putLut(img: RgbImage, x: number, y: number, lut: Uint8Array, t: number): void {
  // A NaN here would index past the table and quietly paint black; it is a bug upstream, so say so.
  if (Number.isNaN(t)) throw new Error(`picture: NaN colour value at (${x}, ${y})`);
  const k = Math.round(Math.min(1, Math.max(0, t)) * (LUT_LEVELS - 1)) * 3;
  const i = (y * img.width + x) * 3;
  img.data[i] = lut[k]!;
  img.data[i + 1] = lut[k + 1]!;
  img.data[i + 2] = lut[k + 2]!;
}

export interface Rect {
  x: number;
  y: number;
  w: number;
  h: number;
}

export function fillRect(img: RgbImage, r: Rect, c: Colour): void {
  for (let y = Math.max(0, r.y); y < Math.min(img.height, r.y + r.h); y++) {
    for (let x = Math.max(0, r.x); x < Math.min(img.width, r.x + r.w); x++) {
      const i = (y * img.width + x) * 3;
      img.data[i] = c[0];
      img.data[i + 1] = c[1];
      img.data[i + 2] = c[2];
    }
  }
}

/** A one-pixel frame just outside `r`. */
export function frame(img: RgbImage, r: Rect, c: Colour): void {
  fillRect(img, { x: r.x - 1, y: r.y - 1, w: r.w + 2, h: 1 }, c);
  fillRect(img, { x: r.x - 1, y: r.y + r.h, w: r.w + 2, h: 1 }, c);
  fillRect(img, { x: r.x - 1, y: r.y, w: 1, h: r.h }, c);
  fillRect(img, { x: r.x + r.w, y: r.y, w: 1, h: r.h }, c);
}

/** PNG file bytes of an RGB image (8-bit, no alpha). */
export function encodePng(img: RgbImage): Buffer {
  const png = new PNG({ width: img.width, height: img.height });
  for (let i = 0, j = 0; i < img.data.length; i += 3, j += 4) {
    png.data[j] = img.data[i]!;
    png.data[j + 1] = img.data[i + 1]!;
    png.data[j + 2] = img.data[i + 2]!;
    png.data[j + 3] = 255;
  }
  return PNG.sync.write(png, { colorType: 2 });
}
