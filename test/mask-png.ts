// Writing small PNG masks for the image-mask tests (pngjs), in the formats the loader reads.
import { PNG } from 'pngjs';
import { writeFile } from 'node:fs/promises';
import { deflateSync } from 'node:zlib';

export interface MaskPngOptions {
  /** 8 (default) or 16 bits a sample. */
  bitDepth?: 8 | 16;
  /** 0 grey (default), 4 grey + alpha, 2 RGB, 6 RGBA. */
  colorType?: 0 | 2 | 4 | 6;
}

/**
 * A PNG of width × height pixels whose sample at column i, row k (from the top) is
 * value(i, k) = [grey] or [r, g, b] (and alpha last for types 4 and 6), as integers of its depth.
 */
export function maskPng(width: number, height: number, value: (i: number, k: number) => number[], opts: MaskPngOptions = {}): Buffer {
  const bitDepth = opts.bitDepth ?? 8;
  const colorType = opts.colorType ?? 0;
  const channels = { 0: 1, 2: 3, 4: 2, 6: 4 }[colorType];
  const samples = new (bitDepth === 16 ? Uint16Array : Uint8Array)(width * height * channels);
  for (let k = 0; k < height; k++) {
    for (let i = 0; i < width; i++) {
      const v = value(i, k);
      if (v.length !== channels) throw new Error(`maskPng: ${v.length} samples for colour type ${colorType}`);
      for (let c = 0; c < channels; c++) samples[(k * width + i) * channels + c] = v[c]!;
    }
  }
  const png = new PNG({ width, height, bitDepth, colorType, inputColorType: colorType, inputHasAlpha: colorType >= 4 });
  png.data = Buffer.from(samples.buffer, samples.byteOffset, samples.byteLength);
  return PNG.sync.write(png, { bitDepth, colorType, inputColorType: colorType, inputHasAlpha: colorType >= 4 });
}

export async function writeMaskPng(path: string, width: number, height: number, value: (i: number, k: number) => number[], opts?: MaskPngOptions): Promise<void> {
  await writeFile(path, maskPng(width, height, value, opts));
}

/** CRC-32 of PNG chunks (ISO 3309 / ITU-T V.42 polynomial 0xEDB88320, as the PNG specification gives it). */
function crc32(buf: Buffer): number {
  let c = ~0;
  for (const b of buf) {
    c ^= b;
    for (let k = 0; k < 8; k++) c = c & 1 ? (c >>> 1) ^ 0xedb88320 : c >>> 1;
  }
  return ~c >>> 0;
}

function chunk(type: string, data: Buffer): Buffer {
  const head = Buffer.alloc(8);
  head.writeUInt32BE(data.length, 0);
  head.write(type, 4, 'latin1');
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(Buffer.concat([head.subarray(4), data])), 0);
  return Buffer.concat([head, data, crc]);
}

/**
 * A PNG put together chunk by chunk, for what pngjs does not write (palettes, 1-bit grey): rows
 * are the packed scanlines without their filter byte (filter 0 is added), per the PNG
 * specification (ISO/IEC 15948).
 */
export function rawPng(o: { width: number; height: number; depth: number; colorType: number; rows: Buffer[]; palette?: [number, number, number][]; alphas?: number[] }): Buffer {
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(o.width, 0);
  ihdr.writeUInt32BE(o.height, 4);
  ihdr[8] = o.depth;
  ihdr[9] = o.colorType;
  const parts = [Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), chunk('IHDR', ihdr)];
  if (o.palette) parts.push(chunk('PLTE', Buffer.from(o.palette.flat())));
  if (o.alphas) parts.push(chunk('tRNS', Buffer.from(o.alphas)));
  const scan = Buffer.concat(o.rows.map((r) => Buffer.concat([Buffer.from([0]), r])));
  parts.push(chunk('IDAT', deflateSync(scan)), chunk('IEND', Buffer.alloc(0)));
  return Buffer.concat(parts);
}
