// Indexed pictures (output/indexed.ts, raster.ts encodePng/encodePngs): drawn one byte a pixel into
// a palette, written as PNG colour type 3 (ISO/IEC 15948 §11.2.2, PLTE; §11.2.1, IHDR) and read back
// by pngjs, a general-purpose decoder, pixel for pixel against the same drawing in RGB.
import { describe, expect, it } from 'vitest';
import { inflateSync } from 'node:zlib';
import { colourIndex, indexedImage, packColour, toRgb } from '../../src/output/indexed.js';
import { encodePng, encodePngs, fillRect, frame } from '../../src/output/raster.js';
import { drawText, type Colour, type RgbImage } from '../../src/output/font.js';
import { renderIntensityPngs, PANEL_LEVELS } from '../../src/output/picture.js';
import { renderLinePlot } from '../../src/output/line-plot.js';
import { decode } from '../png.js';

/** The PNG's chunks: type and data. */
function chunks(png: Buffer): { type: string; data: Buffer }[] {
  const out: { type: string; data: Buffer }[] = [];
  for (let o = 8; o < png.length; ) {
    const n = png.readUInt32BE(o);
    out.push({ type: png.toString('latin1', o + 4, o + 8), data: png.subarray(o + 8, o + 8 + n) });
    o += 12 + n;
  }
  return out;
}

/** The same drawing on any image: a background, rectangles, a frame and text in a few colours. */
function draw(img: RgbImage, colours: Colour[]): void {
  fillRect(img, { x: 0, y: 0, w: img.width, h: img.height }, [30, 30, 34]);
  colours.forEach((c, i) => fillRect(img, { x: (i * 7) % img.width, y: 3 + ((i * 5) % (img.height - 6)), w: 9, h: 4 }, c));
  frame(img, { x: 5, y: 5, w: 40, h: 20 }, [150, 150, 160]);
  drawText(img, 8, 30, 'λ = 633 nm, 2.5 µm', [225, 225, 225], 2);
}

describe('indexed images', () => {
  it('write palette PNGs that decode to the same pixels as the RGB drawing', () => {
    const colours: Colour[] = [[240, 160, 80], [110, 190, 240], [0, 0, 0], [255, 255, 255]];
    const indexed = indexedImage('test-indexed', 120, 60);
    draw(indexed, colours);
    const rgb: RgbImage = { width: 120, height: 60, data: new Uint8Array(120 * 60 * 3) };
    draw(rgb, colours);
    expect(indexed.palette!.length).toBe(7);
    const png = encodePng(indexed);
    const types = chunks(png).map((c) => c.type);
    expect(types).toEqual(['IHDR', 'PLTE', 'IDAT', 'IEND']);
    expect(chunks(png)[0]!.data[9]).toBe(3); // colour type 3: indexed
    const a = decode(png);
    const b = decode(encodePng(rgb));
    for (let y = 0; y < 60; y++) for (let x = 0; x < 120; x++) expect(a.at(x, y)).toEqual(b.at(x, y));
  });

  it('turns into RGB when a 257th colour is drawn, with every pixel kept', () => {
    const img = indexedImage('test-indexed', 300, 20);
    const rgb: RgbImage = { width: 300, height: 20, data: new Uint8Array(300 * 20 * 3) };
    const colours: Colour[] = Array.from({ length: 270 }, (_, i) => [i % 256, (i * 7) % 256, Math.floor(i / 256)]);
    for (const target of [img, rgb]) {
      fillRect(target, { x: 0, y: 0, w: 300, h: 20 }, [30, 30, 34]);
      colours.forEach((c, i) => fillRect(target, { x: i, y: 0, w: 1, h: 20 }, c));
    }
    expect(img.palette).toBeUndefined();
    expect(img.data.length).toBe(300 * 20 * 3);
    expect(Buffer.from(img.data).equals(Buffer.from(rgb.data))).toBe(true);
    expect(chunks(encodePng(img))[0]!.data[9]).toBe(2); // RGB
  });

  it('refuses a colour beyond the reserved entries, and a palette that leaves one unset', () => {
    const img = indexedImage('test-indexed', 10, 10, 254);
    expect(colourIndex(img, [1, 2, 3])).toBe(254);
    expect(colourIndex(img, [1, 2, 4])).toBe(255);
    expect(colourIndex(img, [1, 2, 3])).toBe(254);
    expect(() => colourIndex(img, [9, 9, 9])).toThrow(/no room/);
    img.data.fill(0);
    expect(() => encodePng(img)).toThrow(/every palette entry/);
    const palette = img.palette!.map((p, i) => (p < 0 ? packColour([i, i, i]) : p));
    expect(decode(encodePngs(img, [palette])[0]!).at(3, 3)).toEqual([0, 0, 0]);
  });

  it('toRgb writes each pixel as its palette colour', () => {
    const img = indexedImage('test-indexed', 4, 1);
    img.data.set([0, 1, 1, 0]);
    img.palette = [packColour([1, 2, 3]), packColour([250, 251, 252])];
    toRgb(img);
    expect([...img.data]).toEqual([1, 2, 3, 250, 251, 252, 250, 251, 252, 1, 2, 3]);
  });
});

describe('intensity pictures in several scales', () => {
  const n = 64;
  const intensity = new Float64Array(n * n);
  for (let r = 0; r < n; r++) for (let c = 0; c < n; c++) intensity[r * n + c] = Math.exp(-((r - 30) ** 2 + (c - 33) ** 2) / 40);
  const map = { nx: n, ny: n, dx: 1e-6, dy: 1e-6, x0: -32e-6, y0: -32e-6, intensity };

  it('share one deflated image, each scale its own palette, each the picture drawn alone', () => {
    const [shoalPng, grayPng] = renderIntensityPngs({ map, title: 'a spot' }, ['shoal', 'gray']);
    const [shoalAlone] = renderIntensityPngs({ map, title: 'a spot' }, ['shoal']);
    expect(shoalPng!.equals(shoalAlone!)).toBe(true);
    const idat = (png: Buffer) => chunks(png).find((c) => c.type === 'IDAT')!.data;
    expect(idat(shoalPng!).equals(idat(grayPng!))).toBe(true);
    const plte = (png: Buffer) => chunks(png).find((c) => c.type === 'PLTE')!.data;
    // The panel levels differ by scale; the colours around the panels are the same.
    expect(plte(shoalPng!).subarray(0, 3 * PANEL_LEVELS).equals(plte(grayPng!).subarray(0, 3 * PANEL_LEVELS))).toBe(false);
    expect(plte(shoalPng!).subarray(3 * PANEL_LEVELS).equals(plte(grayPng!).subarray(3 * PANEL_LEVELS))).toBe(true);
    // One byte a pixel after each row's filter byte.
    const ihdr = chunks(shoalPng!)[0]!.data;
    expect(inflateSync(idat(shoalPng!)).length).toBe((ihdr.readUInt32BE(0) + 1) * ihdr.readUInt32BE(4));
  });

  it('line plots are indexed too', () => {
    const png = renderLinePlot({ xLabel: 'x (µm)', yLabel: 'y', xRange: [0, 1], yRange: [0, 1], series: [{ label: 'a', x: [0, 1], y: [0, 1], colour: [240, 160, 80] }] });
    expect(chunks(png)[0]!.data[9]).toBe(3);
  });
});
