// Indexed pictures: one byte a pixel into a palette of at most 256 colours (PNG colour type 3). The
// case pictures are a few colours on a flat background (line plots) or colour-table levels and four
// others (intensity pictures): a third of the bytes of RGB to fill and to deflate, and a picture
// drawn once in levels can be written in several colour tables by changing the palette alone.
import type { Colour, RgbImage } from './font.js';
import { scratchBytes } from './scratch.js';

/** A colour as one number, 0xRRGGBB. */
export function packColour(c: Colour): number {
  return ((c[0] & 255) << 16) | ((c[1] & 255) << 8) | (c[2] & 255);
}

/**
 * An indexed image from a scratch slot (contents undefined: the caller fills every pixel). `reserved`
 * palette entries are kept free at the front (index 0 up), to be given colours when it is encoded
 * (output/raster.ts encodePngs); colours drawn get the indices after them, as they come.
 */
export function indexedImage(slot: string, width: number, height: number, reserved = 0): RgbImage {
  return { width, height, data: scratchBytes(slot, width * height), palette: new Array<number>(reserved).fill(-1) };
}

/**
 * The palette index of colour c in an indexed image, added to the palette when new. An image whose
 * palette is full (256 colours) turns into RGB (every pixel written out, the palette dropped), and
 * then -1 is returned: the caller draws in RGB from there on. An image with reserved entries is
 * never turned: a colour more than it has room for is a bug in its drawing, and says so.
 */
export function colourIndex(img: RgbImage, c: Colour): number {
  const palette = img.palette!;
  const packed = packColour(c);
  const known = palette.indexOf(packed);
  if (known >= 0) return known;
  if (palette.length < 256) {
    palette.push(packed);
    return palette.length - 1;
  }
  if (palette.includes(-1)) throw new Error(`picture: no room in the palette for colour ${c.join(', ')}`);
  toRgb(img);
  return -1;
}

/** Turns an indexed image into RGB in place (a new data array of 3 bytes a pixel). */
export function toRgb(img: RgbImage): void {
  const palette = img.palette;
  if (!palette) return;
  const n = img.width * img.height;
  const out = new Uint8Array(n * 3);
  const d = img.data;
  for (let i = 0, o = 0; i < n; i++, o += 3) {
    const p = palette[d[i]!]!;
    out[o] = (p >> 16) & 255;
    out[o + 1] = (p >> 8) & 255;
    out[o + 2] = p & 255;
  }
  img.data = out;
  delete img.palette;
}
