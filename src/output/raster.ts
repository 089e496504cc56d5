// Small raster helpers shared by the case pictures and the contact sheet: colour tables, filled
// rectangles and frames on an RGB image.
import { crc32, deflateSync } from 'node:zlib';
import type { Colour, RgbImage } from './font.js';
import type { ColourScale } from './colour-scales.js';
import { colourIndex } from './indexed.js';

export const LUT_LEVELS = 256; // one per 8-bit step: finer tables only add rounding dips

/** The colour table of a scale: `levels` colours (r, g, b), level i for t = i/(levels − 1). */
export function buildLut(scale: ColourScale, levels = LUT_LEVELS): Uint8Array {
  const lut = new Uint8Array(levels * 3);
  for (let i = 0; i < levels; i++) {
    const c = scale(i / (levels - 1));
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
  const x0 = Math.max(0, r.x), x1 = Math.min(img.width, r.x + r.w);
  const y0 = Math.max(0, r.y), y1 = Math.min(img.height, r.y + r.h);
  if (x1 <= x0 || y1 <= y0) return;
  if (img.palette) {
    const k = colourIndex(img, c);
    if (k >= 0) {
      const d = img.data;
      const w = img.width;
      // Narrow rectangles (grid lines, a line plot's gathered columns) byte by byte: a fill call a
      // row cost more than the row.
      if (x1 - x0 <= 8) {
        for (let y = y0; y < y1; y++) for (let i = y * w + x0, end = y * w + x1; i < end; i++) d[i] = k;
      } else {
        for (let y = y0; y < y1; y++) d.fill(k, y * w + x0, y * w + x1);
      }
      return;
    }
  }
  // (Read after the palette: an indexed image that ran out of colours has just become RGB.)
  const d = img.data;
  // The first row pixel by pixel, the others copied from it (a whole picture's background is
  // half a million pixels).
  const first = (y0 * img.width + x0) * 3;
  for (let i = first; i < first + (x1 - x0) * 3; i += 3) {
    d[i] = c[0];
    d[i + 1] = c[1];
    d[i + 2] = c[2];
  }
  for (let y = y0 + 1; y < y1; y++) d.copyWithin((y * img.width + x0) * 3, first, first + (x1 - x0) * 3);
}

/** A one-pixel frame just outside `r`. */
export function frame(img: RgbImage, r: Rect, c: Colour): void {
  fillRect(img, { x: r.x - 1, y: r.y - 1, w: r.w + 2, h: 1 }, c);
  fillRect(img, { x: r.x - 1, y: r.y + r.h, w: r.w + 2, h: 1 }, c);
  fillRect(img, { x: r.x - 1, y: r.y, w: 1, h: r.h }, c);
  fillRect(img, { x: r.x + r.w, y: r.y, w: 1, h: r.h }, c);
}

/**
 * PNG file bytes of an image (8-bit; RGB, or indexed with its palette), per the PNG specification
 * (ISO/IEC 15948): signature, IHDR, PLTE for an indexed image, one IDAT, IEND. Every row carries
 * filter 0 (none) and the rows are deflated by node's zlib at level DEFLATE_LEVEL. Measured on an
 * 860 × 558 case picture (busy shared machine): pngjs with its default adaptive filter (five
 * filters tried per row) and level 9 took about 160 ms and wrote 198 kB; filter 0 with zlib level
 * 1 takes about 10 ms and writes 162 kB. Our pictures are colour-mapped panels on a flat
 * background, where the "none" filter leaves long repeats that deflate finds; sub/up filters
 * compressed worse (177 and 203 kB) and cost more, and so did zlib's run-length and Huffman-only
 * strategies (4 and 5 times the bytes, and longer, because the Huffman coding of the larger output
 * costs more than the matches saved). Indexed, a picture is a third of the bytes to deflate: about
 * half the time, and half the file.
 */
export function encodePng(img: RgbImage): Buffer {
  return encodePngs(img, img.palette ? [img.palette] : [null])[0]!;
}

/**
 * One image in several palettes (an indexed image drawn in colour-table levels, written in each
 * scale's colours): the rows deflated once, a PNG per palette (null: the image's RGB). A palette
 * must give every entry a colour the image uses (reserved entries too).
 */
export function encodePngs(img: RgbImage, palettes: readonly (readonly number[] | null)[]): Buffer[] {
  const { width, height, data } = img;
  const indexed = !!img.palette;
  const stride = width * (indexed ? 1 : 3);
  // The filtered rows are deflated at once (deflateSync) and not kept: one scratch buffer serves
  // every picture (a case's two pictures allocated 3 MB for them, and the collector came round more).
  // (Up to RAW_KEPT bytes; a larger image, such as a big contact sheet, gets a buffer of its own.)
  const size = (stride + 1) * height;
  if (RAW.length < size && size <= RAW_KEPT) RAW = Buffer.allocUnsafe(size);
  const raw = size <= RAW.length ? RAW.subarray(0, size) : Buffer.allocUnsafe(size);
  for (let y = 0; y < height; y++) {
    const o = y * (stride + 1);
    raw[o] = 0; // filter type 0: none
    raw.set(data.subarray(y * stride, (y + 1) * stride), o + 1);
  }
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(width, 0);
  ihdr.writeUInt32BE(height, 4);
  ihdr[8] = 8; // bit depth
  ihdr[9] = indexed ? 3 : 2; // colour type 3: indexed, 2: RGB
  // compression 0, filter method 0, interlace 0: the bytes Buffer.alloc left there.
  const head = Buffer.concat([PNG_SIGNATURE, chunk('IHDR', ihdr)]);
  const idat = chunk('IDAT', deflateSync(raw, { level: DEFLATE_LEVEL }));
  return palettes.map((palette) => {
    if (!indexed) return Buffer.concat([head, idat, IEND]);
    if (!palette || palette.length !== img.palette!.length || palette.some((p) => !(p >= 0 && p <= 0xffffff))) {
      throw new Error('encodePngs: an indexed image needs a colour for every palette entry');
    }
    const plte = Buffer.allocUnsafe(3 * palette.length);
    palette.forEach((p, i) => {
      plte[3 * i] = (p >> 16) & 255;
      plte[3 * i + 1] = (p >> 8) & 255;
      plte[3 * i + 2] = p & 255;
    });
    return Buffer.concat([head, chunk('PLTE', plte), idat, IEND]);
  });
}

const DEFLATE_LEVEL = 1;
let RAW = Buffer.alloc(0);
const RAW_KEPT = 8 * 1024 ** 2;
const PNG_SIGNATURE = Buffer.from([137, 80, 78, 71, 13, 10, 26, 10]);

function chunk(type: string, body: Uint8Array): Buffer {
  const out = Buffer.allocUnsafe(12 + body.length);
  out.writeUInt32BE(body.length, 0);
  out.write(type, 4, 'latin1');
  out.set(body, 8);
  // CRC-32 of the chunk type and data (ISO/IEC 15948 Annex D: the same polynomial as zlib's, whose
  // crc32 node has had since 20.15; a table-driven loop in JavaScript took 1 ms a picture).
  out.writeUInt32BE(crc32(out.subarray(4, 8 + body.length)), 8 + body.length);
  return out;
}

const IEND = chunk('IEND', Buffer.alloc(0));
