import { describe, expect, it, vi } from 'vitest';

// Every string the picture writer prints goes through drawText; recording them
// lets the tests read the labels without optical character recognition.
const drawn = vi.hoisted(() => [] as string[]);
vi.mock('../../src/output/font.js', async (importOriginal) => {
  const m = await importOriginal<typeof import('../../src/output/font.js')>();
  return {
    ...m,
    drawText: (...args: Parameters<typeof m.drawText>) => {
      drawn.push(args[3]);
      m.drawText(...args);
    },
  };
});

import { layoutPicture, PANEL_LEVELS, renderIntensityPng, type PictureInput, type Rect } from '../../src/output/picture.js';
import { gray, shoal, SHOAL_ANCHORS, type ColourScale } from '../../src/output/colour-scales.js';
import { CELL_H, drawText, hasGlyph, textWidth, type RgbImage } from '../../src/output/font.js';
import { decode, type Px } from '../png.js';
import type { IntensityMap } from '../../src/model/intensity-map.js';

/** A map with its sample [0][0] at the origin (the picture does not read positions); dy null: 1-D. */
function mapOf(intensity: Float64Array, rows: number, cols: number, dx: number, dy: number | null): IntensityMap {
  return { nx: cols, ny: rows, dx, dy: dy ?? 0, x0: 0, y0: 0, intensity };
}


function render(p: PictureInput) {
  drawn.length = 0;
  const buf = renderIntensityPng(p);
  return { img: decode(buf), layout: layoutPicture(p), texts: [...drawn] };
}

// --- Lightness, computed here independently of the module under test ---
// sRGB decoding curve and luminance row of the RGB->XYZ matrix: IEC 61966-2-1.
function srgbToLinear(c8: number): number {
  const c = c8 / 255;
  return c <= 0.04045 ? c / 12.92 : Math.pow((c + 0.055) / 1.055, 2.4);
}
// L* = 116 f(Y/Yn) - 16 with the linear toe below (6/29)^3: CIE 15 (CIELAB).
function lightness([r, g, b]: readonly number[]): number {
  const Y = 0.2126 * srgbToLinear(r!) + 0.7152 * srgbToLinear(g!) + 0.0722 * srgbToLinear(b!);
  return Y > (6 / 29) ** 3 ? 116 * Math.cbrt(Y) - 16 : (29 / 3) ** 3 * Y;
}

const round3 = (c: readonly number[]): Px => [Math.round(c[0]!), Math.round(c[1]!), Math.round(c[2]!)];

function panelPixels(img: ReturnType<typeof decode>, r: Rect): Px[] {
  const out: Px[] = [];
  for (let y = r.y; y < r.y + r.h; y++) for (let x = r.x; x < r.x + r.w; x++) out.push(img.at(x, y));
  return out;
}

function gaussian(rows: number, cols: number, cy: number, cx: number, sigma: number): Float64Array {
  const a = new Float64Array(rows * cols);
  for (let r = 0; r < rows; r++) {
    for (let c = 0; c < cols; c++) a[r * cols + c] = Math.exp(-((r - cy) ** 2 + (c - cx) ** 2) / (2 * sigma * sigma));
  }
  return a;
}

describe('lightness helper (checks the checker)', () => {
  it('matches published CIELAB values for sRGB white, grey and primaries', () => {
    expect(lightness([255, 255, 255])).toBeCloseTo(100, 6); // CIE 15: Y = Yn gives L* = 100
    expect(lightness([0, 0, 0])).toBe(0);
    // Widely tabulated sRGB -> L* values (from memory): grey 128 is 53.59, red 53.24, green 87.73, blue 32.30.
    expect(lightness([128, 128, 128])).toBeCloseTo(53.59, 1);
    expect(lightness([255, 0, 0])).toBeCloseTo(53.24, 1);
    expect(lightness([0, 255, 0])).toBeCloseTo(87.73, 1);
    expect(lightness([0, 0, 255])).toBeCloseTo(32.3, 1);
  });
});

describe('colour scales', () => {
  const scales: [string, ColourScale][] = [['gray', gray], ['shoal', shoal]];

  it.each(scales)('%s: L* rises strictly from t = 0 to t = 1 (4096 steps, unrounded)', (_name, s) => {
    let prev = -Infinity;
    for (let i = 0; i <= 4096; i++) {
      const l = lightness(s(i / 4096));
      expect(l).toBeGreaterThan(prev);
      prev = l;
    }
    expect(lightness(s(0))).toBeLessThan(0.5);
    expect(lightness(s(1))).toBeGreaterThan(95);
  });

  it.each(scales.flatMap(([name, s]) => [256, PANEL_LEVELS].map((n) => [name, s, n] as const)))('%s: the %s-level 8-bit table (contact sheet, case pictures) never gets darker', (_name, s, n) => {
    // Rounding to 8 bits may make two neighbouring levels the same colour, never a darker one.
    let prev = -Infinity;
    let distinct = 0;
    for (let i = 0; i < n; i++) {
      const l = lightness(round3(s(i / (n - 1))));
      expect(l).toBeGreaterThanOrEqual(prev);
      if (l > prev) distinct++;
      prev = l;
    }
    expect(distinct).toBeGreaterThan(n - 16);
  });

  it('shoal passes through its design anchors', () => {
    // Anchors are this project's design brief (not an outside source): the curve must hit them.
    const spec: [number, Px][] = [[0, [0, 0, 0]], [0.3, [12, 52, 78]], [0.6, [168, 72, 92]], [0.82, [236, 178, 112]], [1, [255, 250, 236]]];
    expect(SHOAL_ANCHORS.map((a) => a.t)).toEqual(spec.map((a) => a[0]));
    for (const [t, rgb] of spec) {
      const c = shoal(t);
      for (let k = 0; k < 3; k++) expect(Math.abs(c[k]! - rgb[k]!)).toBeLessThanOrEqual(0.5);
    }
  });

  it('gray is neutral with L* = 100·t', () => {
    for (let i = 0; i <= 20; i++) {
      const c = gray(i / 20);
      expect(c[1]).toBe(c[0]);
      expect(c[2]).toBe(c[0]);
      expect(lightness(c)).toBeCloseTo(5 * i, 1);
    }
  });

  it('clamps out-of-range and NaN t instead of returning NaN colours', () => {
    for (const s of [gray, shoal]) {
      expect(s(-1)).toEqual(s(0));
      expect(s(2)).toEqual(s(1));
      expect(s(Number.NaN).every(Number.isFinite)).toBe(true);
    }
  });
});

describe('renderIntensityPng', () => {
  const spot: PictureInput = {
    map: mapOf(gaussian(64, 64, 32, 32, 6), 64, 64, 1e-6, 1e-6),
    scale: 'shoal',
    title: 'circle 50 µm · 633 nm · z = 1 m',
  };
  const FRAME: Px = [96, 96, 108];

  it('writes a PNG of the laid-out size, with framed ~400 px panels', () => {
    const { img, layout } = render(spot);
    expect([img.width, img.height]).toEqual([layout.width, layout.height]);
    for (const r of layout.panels) {
      // 64 data pixels: 6 display pixels each (the largest whole factor that stays within 400).
      expect([r.w, r.h]).toEqual([384, 384]);
      expect(r.x + r.w).toBeLessThan(img.width);
      expect(r.y + r.h).toBeLessThan(img.height);
      expect(img.at(r.x - 1, r.y + 10)).toEqual(FRAME);
      expect(img.at(r.x + r.w, r.y + 10)).toEqual(FRAME);
      expect(img.at(r.x + 10, r.y - 1)).toEqual(FRAME);
      expect(img.at(r.x + 10, r.y + r.h)).toEqual(FRAME);
    }
    // Side by side: the log panel starts right of the linear one, on the same row.
    expect(layout.panels[1].x).toBeGreaterThan(layout.panels[0].x + layout.panels[0].w);
    expect(layout.panels[1].y).toBe(layout.panels[0].y);
  });

  it('keeps the physical aspect ratio when the pitches differ', () => {
    // 100 x 100 samples at 1 µm across, 2 µm down: 100 µm wide, 200 µm tall.
    const p: PictureInput = { ...spot, map: mapOf(gaussian(100, 100, 50, 50, 10), 100, 100, 1e-6, 2e-6) };
    const { img, layout } = render(p);
    expect([layout.panels[0].w, layout.panels[0].h]).toEqual([200, 400]);
    expect([img.width, img.height]).toEqual([layout.width, layout.height]);
  });

  it('shows the centre of a centred Gaussian spot in the brightest colour of the scale', () => {
    const { img, layout } = render(spot);
    const top = round3(shoal(1));
    for (const r of layout.panels) {
      const mid = img.at(r.x + Math.floor(r.w / 2), r.y + Math.floor(r.h / 2));
      expect(mid).toEqual(top);
      // ... and nothing in the panel is brighter than it.
      const maxL = panelPixels(img, r).reduce((m, px) => Math.max(m, lightness(px)), 0);
      expect(lightness(mid)).toBeCloseTo(maxL, 9);
    }
    // The linear panel's corner is far down the Gaussian tail: the dark end of the scale.
    expect(img.at(layout.panels[0].x, layout.panels[0].y)).toEqual(round3(shoal(0)));
  });

  it('keeps the spot centre at full brightness when shrinking a large array', () => {
    // 801 x 801 with a broad spot: box averaging over ~2 x 2 pixels near the top loses < 1e-3.
    const p: PictureInput = { map: mapOf(gaussian(801, 801, 400, 400, 60), 801, 801, 1e-7, 1e-7), scale: 'gray' };
    const { img, layout } = render(p);
    const r = layout.panels[0];
    expect([r.w, r.h]).toEqual([400, 400]);
    expect(img.at(r.x + 200, r.y + 200)).toEqual([255, 255, 255]);
  });

  it('shows a map a little over 400 samples one to one, and enlarges by the nearest sample, each pixel its sample\'s level', () => {
    // The linear view's level of v is round(v/peak·top) (the view's definition): computed here per
    // sample and compared with every panel pixel.
    const top = PANEL_LEVELS - 1;
    const lut = Array.from({ length: PANEL_LEVELS }, (_, k) => round3(gray(k / top)).join());
    let seed = 777;
    const rnd = () => ((seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31);
    for (const [n, side] of [[401, 401], [425, 425], [426, 400], [300, 400], [130, 390]] as const) {
      const v = Float64Array.from({ length: n * n }, () => rnd());
      v[7] = 1;
      const { img, layout } = render({ map: mapOf(v, n, n, 1e-6, 1e-6), scale: 'gray' });
      const r = layout.panels[0];
      expect([n, r.w, r.h]).toEqual([n, side, side]);
      if (side < n) continue; // shrunk: box averages (the test below)
      const wrong: string[] = [];
      for (let y = 0; y < r.h; y++) {
        for (let x = 0; x < r.w; x++) {
          // The nearest sample to the display pixel's centre.
          const col = Math.min(n - 1, Math.floor(((x + 0.5) * n) / r.w));
          const row = Math.min(n - 1, Math.floor(((y + 0.5) * n) / r.h));
          const level = Math.round(v[row * n + col]! * top);
          if (img.at(r.x + x, r.y + y).join() !== lut[level]) wrong.push(`${n}: (${x}, ${y})`);
        }
      }
      expect(wrong.slice(0, 5)).toEqual([]);
    }
  });

  it('box-averages fine fringes when shrinking instead of aliasing them', () => {
    // Common practice (sampling theorem): low-pass before decimating. Alternating
    // columns 1,0 shrunk 2:1 must become uniform half intensity; picking one sample
    // per display pixel would give all 1 or all 0.
    const n = 800;
    const a = new Float64Array(n * n);
    for (let i = 0; i < a.length; i++) a[i] = (i % n) % 2 === 0 ? 1 : 0;
    const { img, layout } = render({ map: mapOf(a, n, n, 1e-6, 1e-6), scale: 'gray' });
    const half = gray(0.5);
    const off = panelPixels(img, layout.panels[0]).filter((px) => Math.abs(px[0] - half[0]) > 1.5);
    expect(off).toEqual([]);
    // A non-integer ratio (1000 -> 400, 2.5 columns per pixel) may leave a ripple between 0.4 and 0.6, no more.
    const m = 1000;
    const b = new Float64Array(m * 10);
    for (let i = 0; i < b.length; i++) b[i] = (i % m) % 2 === 0 ? 1 : 0;
    const r2 = render({ map: mapOf(b, 10, m, 1e-6, 1e-6), scale: 'gray' });
    const ls = panelPixels(r2.img, r2.layout.panels[0]).map(lightness);
    expect(ls.filter((l) => l <= 39.5 || l >= 60.5)).toEqual([]);
  });

  it('renders a constant image as the top of the scale in both panels', () => {
    const p: PictureInput = { ...spot, map: { ...spot.map, intensity: new Float64Array(64 * 64).fill(3.7) }, title: undefined };
    const { img, layout, texts } = render(p);
    const top = round3(shoal(1));
    for (const r of layout.panels) expect(panelPixels(img, r).filter((px) => px.join() !== top.join())).toEqual([]);
    expect(texts).toContain('relative irradiance, peak 3.70');
  });

  it('renders an all-zero result without NaN and says "peak 0"', () => {
    const p: PictureInput = { ...spot, map: { ...spot.map, intensity: new Float64Array(64 * 64) } };
    const { img, layout, texts } = render(p);
    const bottom = round3(shoal(0));
    for (const r of layout.panels) expect(panelPixels(img, r).filter((px) => px.join() !== bottom.join())).toEqual([]);
    expect(texts.some((t) => /\bpeak 0\b/.test(t))).toBe(true);
    for (const t of texts) expect(t).not.toMatch(/NaN|Infinity|undefined/);
  });

  it('labels the linear colour bar 0 .. peak and the log bar in decades relative to peak', () => {
    const p: PictureInput = { ...spot, map: { ...spot.map, intensity: spot.map.intensity.map((v) => v * 1234.5) } };
    const { texts } = render(p);
    expect(texts).toContain('0');
    expect(texts).toContain('1.23e+3');
    for (const d of ['1', '1e-1', '1e-2', '1e-3', '1e-4', '1e-5']) expect(texts).toContain(d);
    expect(texts).not.toContain('1e-6');
    expect(texts.some((t) => t.includes('relative to peak'))).toBe(true);
    const { texts: t3 } = render({ ...spot, logDecades: 3 });
    expect(t3).toContain('1e-3');
    expect(t3).not.toContain('1e-4');
  });

  it.each([1, 2.5, 5, 12])('paints every log-panel pixel at the level its value defines (%s decades)', (decades) => {
    // The log view's level of a value v is round(clamp(1 + log10(v/peak)/decades)·top), 0 for v = 0,
    // top = PANEL_LEVELS − 1
    // (the view's definition, common practice for a log display relative to the peak): computed here
    // per pixel and compared with what the picture writer paints (it finds levels by bounds). A
    // 200 × 200 map is drawn 2× enlarged, each display pixel one sample's value. Values: random over
    // decades + 1 decades below the peak, and values a hair either side of each level's step.
    const n = 200;
    const v = new Float64Array(n * n);
    let seed = 12345;
    const rnd = () => ((seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31);
    for (let i = 0; i < v.length; i++) v[i] = 10 ** (-rnd() * (decades + 1));
    let i = 0;
    const top = PANEL_LEVELS - 1;
    for (let k = 1; k <= top && i + 6 < v.length; k++) {
      const step = 10 ** (decades * ((k - 0.5) / top - 1));
      for (const f of [1 - 1e-15, 1 - 2e-16, 1, 1 + 2e-16, 1 + 1e-15, 1 + 1e-12]) v[i++] = step * f;
    }
    v[i++] = 0;
    v[v.length - 1] = 1; // the peak
    const p: PictureInput = { map: mapOf(v, n, n, 1e-6, 1e-6), scale: 'gray', logDecades: decades };
    const { img, layout } = render(p);
    const r = layout.panels[1];
    expect([r.w, r.h]).toEqual([2 * n, 2 * n]);
    const lut = Array.from({ length: PANEL_LEVELS }, (_, k) => round3(gray(k / top)).join());
    const wrong: string[] = [];
    for (let row = 0; row < n; row++) {
      for (let col = 0; col < n; col++) {
        const x = v[row * n + col]!;
        const level = x > 0 ? Math.round(Math.min(1, Math.max(0, 1 + Math.log10(x) / decades)) * top) : 0;
        if (img.at(r.x + 2 * col, r.y + 2 * row).join() !== lut[level]) wrong.push(`${x} (level ${level})`);
      }
    }
    expect(wrong.slice(0, 5)).toEqual([]);
  });

  // Scale bars: expected lengths worked out by hand from the pitch, the panel
  // width and the rule "1, 2 or 5 ×10^k nearest (in ratio) to a fifth of the width".
  const bars: [string, PictureInput, string, number][] = [
    // 64 × 1 µm = 64 µm; a fifth is 12.8 µm -> 10 µm; panel 384 px -> 10/64·384 = 60 px.
    ['µm, square pixels', spot, '10 µm', 60],
    // 250 × 4 nm = 1000 nm across, 50 × 8 nm = 400 nm down -> panel 400 × 160; a fifth is 200 nm -> 80 px.
    ['nm, non-square pixels', { ...spot, map: mapOf(new Float64Array(250 * 50).fill(1), 50, 250, 4e-9, 8e-9) }, '200 nm', 80],
    // 1-D, 300 × 0.5 mm = 150 mm; a fifth is 30 mm -> 20 mm (ratio 1.5 beats 50 mm at 1.67); 20/150·400 = 53.3 px.
    ['mm, 1-D', { ...spot, map: mapOf(new Float64Array(300).fill(1), 1, 300, 5e-4, null) }, '20 mm', 53.33],
    // 100 × 0.1 m = 10 m; a fifth is 2 m; panel 400 px -> 80 px.
    ['m', { ...spot, map: mapOf(new Float64Array(100 * 100).fill(1), 100, 100, 0.1, 0.1) }, '2 m', 80],
  ];
  it.each(bars)('draws a scale bar whose length matches its label (%s)', (_n, p, label, px) => {
    const { img, layout, texts } = render(p);
    expect(texts).toContain(label);
    const r = layout.panels[0];
    const textColour = [225, 225, 225];
    let longest = 0;
    for (let y = r.y + r.h + 1; y < layout.colourBars[0].y - 1; y++) {
      let run = 0;
      for (let x = r.x - 1; x < r.x + r.w; x++) {
        run = img.at(x, y).every((v, k) => v === textColour[k]) ? run + 1 : 0;
        longest = Math.max(longest, run);
      }
    }
    expect(Math.abs(longest - px)).toBeLessThanOrEqual(1);
  });

  it('draws a 1-D result as vertical stripes that follow the profile', () => {
    const n = 400;
    const prof = new Float64Array(n);
    for (let c = 0; c < n; c++) prof[c] = 0.2 + Math.cos((c - 200) * 0.07) ** 2 * Math.exp(-(((c - 200) / 90) ** 2));
    const peak = Math.max(...prof);
    const { img, layout } = render({ map: mapOf(prof, 1, n, 1e-6, null), scale: 'gray' });
    const r = layout.panels[0];
    expect(r.w).toBe(400);
    expect(r.h).toBeGreaterThanOrEqual(60); // stripes, not a one-pixel line
    for (let x = 0; x < r.w; x++) {
      const column = new Set<string>();
      for (let y = 0; y < r.h; y++) column.add(img.at(r.x + x, r.y + y).join(','));
      expect(column.size).toBe(1);
      // Expected grey for this column's value; 256-level quantisation moves it by under 2 codes.
      const want = gray(prof[x]! / peak)[0];
      expect(Math.abs(img.at(r.x + x, r.y)[0] - want)).toBeLessThanOrEqual(2);
    }
  });

  it('fits an over-long title on one line', () => {
    const { layout, texts } = render({ ...spot, title: 'aperture '.repeat(40) });
    const title = texts[0]!;
    expect(title.endsWith('...')).toBe(true);
    expect(textWidth(title, 1)).toBeLessThanOrEqual(layout.width - 32);
  });

  it('rejects inconsistent input instead of drawing garbage', () => {
    expect(() => renderIntensityPng({ ...spot, map: { ...spot.map, ny: 63 } })).toThrow(RangeError);
    expect(() => renderIntensityPng({ ...spot, map: { ...spot.map, dx: 0 } })).toThrow(RangeError);
    expect(() => renderIntensityPng({ ...spot, map: { ...spot.map, intensity: new Float64Array(64 * 64).fill(Number.NaN) } })).toThrow(RangeError);
    expect(() => renderIntensityPng({ ...spot, logDecades: 0 })).toThrow(RangeError);
    // The grid's one 1-D form is a single row with dy = 0 (src/model/grid.ts): dy = 0 on more rows is no grid.
    expect(() => renderIntensityPng({ ...spot, map: { ...spot.map, dy: 0 } })).toThrow(/pitch/);
  });
});

describe('font', () => {
  const required = [
    ...'0123456789',
    ...'abcdefghijklmnopqrstuvwxyz',
    ...'ABCDEFGHIJKLMNOPQRSTUVWXYZ',
    ...' .,-+/():=%×²µλ·',
  ];

  it('has a glyph for every required character, each distinct and visible', () => {
    const seen = new Map<string, string>();
    for (const ch of required) {
      expect(hasGlyph(ch), `glyph for ${JSON.stringify(ch)}`).toBe(true);
      const img: RgbImage = { width: 6, height: CELL_H, data: new Uint8Array(6 * CELL_H * 3) };
      drawText(img, 0, 0, ch, [255, 255, 255]);
      const key = Array.from(img.data).join('');
      if (ch !== ' ') expect(img.data.some((v) => v > 0), `ink for ${ch}`).toBe(true);
      expect(seen.get(key), `${ch} looks like ${seen.get(key)}`).toBeUndefined();
      seen.set(key, ch);
    }
  });

  it('covers every character the picture writer prints', () => {
    const inputs: PictureInput[] = [
      { map: mapOf(gaussian(64, 64, 32, 32, 6).map((v) => v * 4.56e-7), 64, 64, 3e-10, 3e-10), scale: 'shoal', title: 'circle 50 µm · 633 nm · z = 1 m', logDecades: 12 },
      { map: mapOf(new Float64Array(64 * 64), 64, 64, 1, 1), scale: 'gray', logDecades: 1 },
      { map: mapOf(new Float64Array(300).fill(0.05), 1, 300, 2e-6, null), scale: 'gray', logDecades: 2.5, title: 'slit (λ = 0.5 µm), 2×' },
    ];
    const all = new Set<string>();
    for (const p of inputs) for (const t of render(p).texts) for (const ch of t) all.add(ch);
    expect(all.size).toBeGreaterThan(20);
    const missing = [...all].filter((ch) => !hasGlyph(ch));
    expect(missing).toEqual([]);
  });

  it('measures text as drawn: n cells minus the trailing gap, times the scale', () => {
    expect(textWidth('')).toBe(0);
    expect(textWidth('1e-3')).toBe(4 * 6 - 1);
    expect(textWidth('ab', 2)).toBe(2 * (2 * 6 - 1));
  });
});

describe('picture axes', () => {
  it('puts position ticks where the grid puts those positions, and marks the optical axis', () => {
    // A 2-D map from −60 µm to +60 µm (121 samples of 1 µm) and a 1-D one from −0.3 mm to 0.3 mm.
    const n = 121;
    const map = { nx: n, ny: n, dx: 1e-6, dy: 1e-6, x0: -60e-6, y0: -60e-6, intensity: new Float64Array(n * n).fill(1) };
    const { img, layout, texts } = render({ map, scale: 'gray' });
    expect(texts).toEqual(expect.arrayContaining(['-50', '0', '50', 'x (µm)', 'y (µm)']));
    const r = layout.panels[0];
    // The tick for x = 0 sits under display pixel (0 − (x0 − dx/2))/(nx·dx)·w, in the axis-mark colour.
    const x0px = r.x + Math.round((60.5e-6 / 121e-6) * r.w - 0.5);
    expect(img.at(x0px, r.y + r.h + 2)).toEqual([250, 200, 90]);
    // And the x = 50 µm tick in the text colour.
    const x50 = r.x + Math.round((110.5e-6 / 121e-6) * r.w - 0.5);
    expect(img.at(x50, r.y + r.h + 2)).toEqual([225, 225, 225]);
    // y: the same along the left edge (rows go down the picture).
    const y0px = r.y + Math.round((60.5e-6 / 121e-6) * r.h - 0.5);
    expect(img.at(r.x - 3, y0px)).toEqual([250, 200, 90]);
    const line = render({ map: { nx: 601, ny: 1, dx: 1e-6, dy: 0, x0: -300e-6, y0: 0, intensity: new Float64Array(601).fill(1) }, scale: 'gray' });
    expect(line.texts).toEqual(expect.arrayContaining(['x (µm)', '0']));
    expect(line.texts).not.toContain('y (µm)');
  });
});
