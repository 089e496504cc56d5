// PNG bytes → grey levels 0…1, one per pixel (row-major, the image's top row first), for masks
// given as images. Decoded by pngjs after the header has been checked here, so that a small file
// declaring a huge image is refused before anything is allocated for it.
//
// What is read: greyscale at 1, 2, 4, 8 and 16 bits, grey + alpha, palette images, and RGB(A)
// whose pixels are all grey (R = G = B: a grey picture saved in colour, as paint programs do).
// A pixel's level is its grey value over the largest value of its bit depth (8 bits: v/255,
// 16 bits: v/65535), times its alpha likewise: a transparent pixel is what shows over black,
// nothing passes. Gamma chunks are ignored: the stored value is the level.
// What is refused, with the reason: colour (which colour's grey would be the transmission?),
// interlaced PNGs (their decompression is not bounded by the library: a small file could inflate
// without end), more than MAX_IMAGE_PIXELS pixels, and anything that is not a whole, valid PNG.
import { PNG } from 'pngjs';
import { z } from 'zod';
import { safeEcho } from '../safe-text.js';

/** Longest path of an image accepted (PATH_MAX on Linux). */
export const IMAGE_PATH_MAX = 4096;

/**
 * A job key naming a PNG image (relative to the job file's folder): a non-empty path of at most
 * IMAGE_PATH_MAX characters, without control characters (NUL cannot be in a path at all; the others
 * would be echoed in messages). `example` is the path the messages suggest.
 */
export function imagePathSchema(example: string) {
  const msg = `expected the path of a PNG image such as '${example}' (relative to the job file's folder)`;
  return z
    .string({ error: msg })
    .min(1, { error: msg })
    .max(IMAGE_PATH_MAX, { error: `expected a path of at most ${IMAGE_PATH_MAX} characters` })
    .refine((t) => !/[\u0000-\u001f\u007f-\u009f]/.test(t), { error: `${msg}, without control characters` });
}

/**
 * Largest image read: 2^22 pixels (2048 × 2048, or 4096 × 1024...). The decoder holds 8 bytes a
 * pixel (RGBA at 16 bits: 32 MiB), each plane travels with every case to its worker thread as
 * 4 bytes a pixel, and the planner samples each pixel with at least one grid cell along each axis
 * (usually two or more), so a larger image would make grids beyond the memory limits anyway.
 */
export const MAX_IMAGE_PIXELS = 2 ** 22;
/** Largest width or height (a 2^22-pixel image 1 pixel tall would still be absurd to sample). */
export const MAX_IMAGE_SIDE = 16384;
/** Largest image file: 32 MiB, more than any PNG of MAX_IMAGE_PIXELS grey pixels at 16 bits. */
export const MAX_IMAGE_BYTES = 32 * 1024 * 1024;

export interface GreyImage {
  width: number;
  height: number;
  /** Grey level × alpha, 0…1, row-major from the top row. */
  levels: Float32Array;
}

const SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

/** Decodes a PNG into grey levels, or throws an Error whose message is the reason in words. */
export function decodeGreyPng(buf: Buffer): GreyImage {
  if (buf.length < 33 || SIGNATURE.some((b, i) => buf[i] !== b)) throw new Error('is not a PNG image (it does not start with the PNG signature)');
  if (buf.toString('latin1', 12, 16) !== 'IHDR') throw new Error('is not a valid PNG image (its first chunk is not the header)');
  const width = buf.readUInt32BE(16);
  const height = buf.readUInt32BE(20);
  const interlaced = buf[28] !== 0;
  if (width === 0 || height === 0) throw new Error(`is an empty image (${width} × ${height} pixels)`);
  if (width > MAX_IMAGE_SIDE || height > MAX_IMAGE_SIDE || width * height > MAX_IMAGE_PIXELS) {
    throw new Error(`is ${width} × ${height} pixels, more than the ${MAX_IMAGE_PIXELS} pixels (${MAX_IMAGE_SIDE} a side) an image mask may hold`);
  }
  if (interlaced) throw new Error('is an interlaced (Adam7) PNG, which is not read: save it without interlacing');
  let png: { width: number; height: number; depth: number; colorType: number; data: ArrayLike<number> };
  try {
    png = PNG.sync.read(buf, { skipRescale: true }) as unknown as typeof png;
  } catch (e) {
    throw new Error(`is not a readable PNG image: ${safeEcho((e as Error)?.message ?? String(e), 120)}`);
  }
  const { depth, colorType, data } = png;
  if (png.width !== width || png.height !== height || data.length !== 4 * width * height) {
    throw new Error('is not a readable PNG image: its data does not match its header');
  }
  // Palette entries are 8-bit colours whatever the index depth; other samples keep their depth.
  const max = colorType === 3 ? 255 : 2 ** depth - 1;
  const colour = colorType === 2 || colorType === 3 || colorType === 6;
  const levels = new Float32Array(width * height);
  const scale = 1 / (max * max);
  for (let k = 0; k < width * height; k++) {
    const r = data[4 * k]!;
    if (colour && (data[4 * k + 1] !== r || data[4 * k + 2] !== r)) {
      const x = k % width;
      const y = Math.floor(k / width);
      throw new Error(
        `is in colour (the pixel at column ${x}, row ${y} from the top left is R ${r}, G ${data[4 * k + 1]}, B ${data[4 * k + 2]}): ` +
          'save it as greyscale, whose grey level is the transmission',
      );
    }
    levels[k] = r * data[4 * k + 3]! * scale;
  }
  return { width, height, levels };
}
