import { describe, expect, it, vi } from 'vitest';

// Every string the sheet prints goes through drawText; recording them (with where they were
// drawn) lets the tests read the labels without optical character recognition.
const drawn = vi.hoisted(() => [] as { x: number; y: number; text: string }[]);
vi.mock('../../src/output/font.js', async (importOriginal) => {
  const m = await importOriginal<typeof import('../../src/output/font.js')>();
  return {
    ...m,
    drawText: (...args: Parameters<typeof m.drawText>) => {
      drawn.push({ x: args[1], y: args[2], text: args[3] });
      m.drawText(...args);
    },
  };
});

import { layoutContactSheet, renderContactSheet, type SheetTile } from '../../src/report/contact-sheet.js';
import { shoal } from '../../src/output/colour-scales.js';
import { decode, type Px } from '../png.js';


function render(tiles: SheetTile[], opts: Parameters<typeof renderContactSheet>[1] = {}) {
  drawn.length = 0;
  const img = decode(renderContactSheet(tiles, opts));
  return { img, layout: layoutContactSheet(tiles, opts), texts: [...drawn] };
}

// Lightness, computed here independently of the module under test: sRGB decoding and the
// luminance row of its matrix (IEC 61966-2-1), L* from CIE 15 (CIELAB).
function lightness([r, g, b]: readonly number[]): number {
  const lin = (c8: number) => {
    const c = c8 / 255;
    return c <= 0.04045 ? c / 12.92 : Math.pow((c + 0.055) / 1.055, 2.4);
  };
  const Y = 0.2126 * lin(r!) + 0.7152 * lin(g!) + 0.0722 * lin(b!);
  return Y > (6 / 29) ** 3 ? 116 * Math.cbrt(Y) - 16 : (29 / 3) ** 3 * Y;
}
const round3 = (c: readonly number[]): Px => [Math.round(c[0]!), Math.round(c[1]!), Math.round(c[2]!)];

/**
 * A Gaussian spot I = exp(−2r²/w²) (the 1/e² intensity radius w; Siegman, Lasers, ch. 17) on an
 * n×n grid centred on the axis.
 */
function gaussianTile(n: number, pitch: number, w: number, label: string): SheetTile {
  const origin = -((n - 1) / 2) * pitch;
  const a = new Float64Array(n * n);
  for (let r = 0; r < n; r++) {
    for (let c = 0; c < n; c++) {
      const x = origin + c * pitch, y = origin + r * pitch;
      a[r * n + c] = 3.5 * Math.exp((-2 * (x * x + y * y)) / (w * w));
    }
  }
  return { label, map: { nx: n, ny: n, dx: pitch, dy: pitch, x0: origin, y0: origin, intensity: a } };
}

describe('contact sheet: one physical scale', () => {
  // Two spots of radii w and 2w on grids with pitches p and 2p: each fills the same share of its
  // own grid, so a sheet that scaled tiles to their grids would show them equal.
  const p = 1e-6, w = 8e-6, n = 64, T = 160;
  const tiles = [gaussianTile(n, p, w, 'D 80 µm'), gaussianTile(n, 2 * p, 2 * w, 'D 40 µm')];
  // Common field of view: the larger window, n · 2p = 128 µm, over T display pixels.
  const fov = n * 2 * p;
  const mPerPx = fov / T;
  const { img, layout, texts } = render(tiles, { tilePixels: T, title: 'two spots, one scale' });

  // Half maximum of exp(−2r²/w²) at r = w·√(ln 2 / 2) (from the formula above).
  const hwhm = (radius: number) => radius * Math.sqrt(Math.LN2 / 2);
  // Pixels at or above half of the tile's peak, read back through lightness (shoal's L* rises
  // monotonically; the threshold is the colour the sheet's 256-level table gives t = 0.5).
  const halfL = lightness(round3(shoal(Math.round(0.5 * 255) / 255)));
  function brightPixels(k: number) {
    const r = layout.tiles[k]!;
    const pts: [number, number][] = [];
    for (let y = r.y; y < r.y + r.h; y++) for (let x = r.x; x < r.x + r.w; x++) if (lightness(img.at(x, y)) >= halfL - 1e-9) pts.push([x, y]);
    return pts;
  }

  it('decodes with the size of its layout, tiles of the asked size', () => {
    expect([img.width, img.height]).toEqual([layout.width, layout.height]);
    expect(layout.tiles.map((r) => [r.w, r.h])).toEqual([[T, T], [T, T]]);
    expect(layout.fieldOfView).toBeCloseTo(fov, 15);
  });

  it('spots of radii w and 2w sit at the tile centres with half-maximum radii in the ratio 2, ± a pixel', () => {
    const radii = [0, 1].map((k) => {
      const pts = brightPixels(k);
      const r = layout.tiles[k]!;
      // The axis x = y = 0 is the tile's centre: between pixels T/2 − 1 and T/2.
      const cx = pts.reduce((s, q) => s + q[0], 0) / pts.length;
      const cy = pts.reduce((s, q) => s + q[1], 0) / pts.length;
      expect(Math.abs(cx - (r.x + T / 2 - 0.5))).toBeLessThanOrEqual(0.5);
      expect(Math.abs(cy - (r.y + T / 2 - 0.5))).toBeLessThanOrEqual(0.5);
      return Math.sqrt(pts.length / Math.PI); // radius of the disc with that area
    });
    expect(Math.abs(radii[1]! - 2 * radii[0]!)).toBeLessThanOrEqual(1);
    // And each at its physical size in display pixels (≈ 5.9 and 11.8 px here).
    expect(Math.abs(radii[0]! - hwhm(w) / mPerPx)).toBeLessThanOrEqual(1);
    expect(Math.abs(radii[1]! - hwhm(2 * w) / mPerPx)).toBeLessThanOrEqual(1);
  });

  it('shows the background where a tile has no data (outside the smaller window)', () => {
    const bg = img.at(2, img.height - 3); // sheet margin
    const r = layout.tiles[0]!; // its data covers the central 64 µm of the 128 µm view
    expect(img.at(r.x + 5, r.y + 5)).toEqual(bg);
    expect(img.at(r.x + T / 2, r.y + 5)).toEqual(bg);
    // Inside its data but far from the spot: the dark end of the scale, which is not the background.
    const inside = img.at(r.x + T / 2 - 35, r.y + T / 2);
    expect(inside).toEqual(round3(shoal(0)));
    expect(inside).not.toEqual(bg);
    // The larger tile's data fills its view.
    const r1 = layout.tiles[1]!;
    expect(img.at(r1.x + 2, r1.y + 2)).toEqual(round3(shoal(0)));
  });

  it('prints each tile peak under it and says that tiles are scaled to their own peaks', () => {
    // The samples nearest the axis are half a pitch off it in x and y: peak 3.5·exp(−2·2(p/2)²/w²),
    // the same for both tiles as each scales with its pitch. It is the data's peak, not the view's.
    const peak = 3.5 * Math.exp((-2 * 2 * (p / 2) ** 2) / w ** 2);
    expect(peak.toPrecision(3)).toBe('3.45');
    expect(texts.filter((t) => t.text.startsWith('peak ')).map((t) => t.text)).toEqual(['peak 3.45', 'peak 3.45']);
    expect(texts.some((t) => /own peak/.test(t.text))).toBe(true);
    expect(texts.map((t) => t.text)).toEqual(expect.arrayContaining(['D 80 µm', 'D 40 µm', 'two spots, one scale']));
  });

  it('has one scale bar whose length in pixels matches its label at the sheet scale', () => {
    // Find the bar: a horizontal run of text colour, 3 rows thick, longer than any glyph, below the tiles.
    const ink: Px = [225, 225, 225];
    const same = (a: Px, b: Px) => a[0] === b[0] && a[1] === b[1] && a[2] === b[2];
    const below = Math.max(...layout.tiles.map((r) => r.y + r.h + 20));
    const runs: { x: number; y: number; len: number }[] = [];
    for (let y = below; y < img.height; y++) {
      let x = 0;
      while (x < img.width) {
        if (!same(img.at(x, y), ink)) { x++; continue; }
        const x0 = x;
        while (x < img.width && same(img.at(x, y), ink)) x++;
        if (x - x0 >= 20) runs.push({ x: x0, y, len: x - x0 });
      }
    }
    const rows = new Set(runs.map((r) => r.y));
    expect(runs.length).toBe(3); // one bar, three rows thick
    expect(rows.size).toBe(3);
    const bar = runs[0]!;
    expect(runs.every((r) => r.x === bar.x && r.len === bar.len)).toBe(true);

    // Its label: the text drawn just right of the bar, on its line.
    const label = texts.find((t) => t.x > bar.x + bar.len && t.x < bar.x + bar.len + 12 && Math.abs(t.y - bar.y) < 10)!;
    const m = /^([\d.]+) (nm|µm|mm|m)$/.exec(label.text)!;
    expect(m).not.toBeNull();
    // SI prefixes (BIPM, The International System of Units, table 7).
    const metres = Number(m[1]) * { nm: 1e-9, µm: 1e-6, mm: 1e-3, m: 1 }[m[2] as 'nm']!;
    expect(Math.abs(bar.len - metres / mPerPx)).toBeLessThanOrEqual(0.5);
    // A round length (1, 2 or 5 × 10^k, common practice) between a tenth and half of the view.
    expect(metres).toBeGreaterThan(fov / 10);
    expect(metres).toBeLessThan(fov / 2);
  });
});

describe('contact sheet: 1-D tiles and downsampling', () => {
  it('draws a 1-D result (one row, dy = 0) as stripes: every row alike, bright along the axis', () => {
    // Far field of a slit, I ∝ sinc²(x/s) (Goodman, Introduction to Fourier Optics, ch. 4).
    const n = 200, p = 1e-6, s = 10e-6;
    const prof = new Float64Array(n);
    for (let c = 0; c < n; c++) {
      const u = ((c - (n - 1) / 2) * p) / s;
      prof[c] = u === 0 ? 1 : (Math.sin(u) / u) ** 2;
    }
    const tile: SheetTile = { label: 'slit', map: { nx: n, ny: 1, dx: p, dy: 0, x0: -((n - 1) / 2) * p, y0: 0, intensity: prof } };
    const { img, layout } = render([tile, gaussianTile(64, 1e-6, 8e-6, 'spot')], { tilePixels: 100 });
    const r = layout.tiles[0]!;
    const row = (y: number) => Array.from({ length: r.w }, (_, x) => img.at(r.x + x, y).join(','));
    const first = row(r.y);
    for (let y = r.y + 1; y < r.y + r.h; y++) expect(row(y)).toEqual(first);
    // Not uniform: bright centre, dark first zeros.
    const L = Array.from({ length: r.w }, (_, x) => lightness(img.at(r.x + x, r.y)));
    const brightest = L.indexOf(Math.max(...L));
    expect(Math.abs(brightest - (r.w / 2 - 0.5))).toBeLessThanOrEqual(0.5);
    expect(Math.min(...L)).toBeLessThan(L[brightest]! - 50);
  });

  it('averages fine fringes when shrinking instead of aliasing them', () => {
    // Stripes of period 2 data pixels, shrunk 4:1: every display pixel covers two periods, so a
    // box average is 0.5 of the peak everywhere; point sampling would give all 0 or all 1.
    const n = 400, p = 1e-6;
    const a = new Float64Array(n * n);
    for (let r = 0; r < n; r++) for (let c = 0; c < n; c++) a[r * n + c] = c % 2;
    const origin = -((n - 1) / 2) * p;
    const tile: SheetTile = { label: 'fringes', map: { nx: n, ny: n, dx: p, dy: p, x0: origin, y0: origin, intensity: a } };
    const { img, layout } = render([tile], { tilePixels: 100 });
    const r = layout.tiles[0]!;
    const want = lightness(round3(shoal(0.5)));
    for (const [x, y] of [[10, 10], [50, 50], [77, 31], [90, 95]] as const) {
      expect(Math.abs(lightness(img.at(r.x + x, r.y + y)) - want)).toBeLessThan(1);
    }
  });

  it('rejects what it cannot draw', () => {
    expect(() => renderContactSheet([])).toThrow(RangeError);
    const bad = gaussianTile(8, 1e-6, 2e-6, 'x');
    expect(() => renderContactSheet([{ ...bad, map: { ...bad.map, ny: 7 } }])).toThrow(/values/);
    expect(() => renderContactSheet([{ ...bad, map: { ...bad.map, dx: 0 } }])).toThrow(/pitch/);
    // dy = 0 is the 1-D form of one row only (src/model/grid.ts).
    expect(() => renderContactSheet([{ ...bad, map: { ...bad.map, dy: 0 } }])).toThrow(/pitch/);
    expect(() => renderContactSheet([{ ...bad, map: { ...bad.map, x0: NaN } }])).toThrow(/origin/);
    const nan = new Float64Array(bad.map.intensity);
    nan[3] = NaN;
    expect(() => renderContactSheet([{ ...bad, map: { ...bad.map, intensity: nan } }])).toThrow(/finite/);
  });
});

describe('contact sheet: windows of very different sizes, log scale, true peaks', () => {
  // A near-field spot in a 64 µm window beside a far-field one in a 2.56 mm window (40×): on one
  // field the first would be 4 display pixels wide.
  const near = gaussianTile(64, 1e-6, 8e-6, 'z 1 mm');
  const far = gaussianTile(64, 40e-6, 320e-6, 'z 1 m');

  it('gives each tile its own window, with a scale bar of its own, where the windows differ by more than 4×', () => {
    const { img, layout, texts } = render([near, far], { tilePixels: 100 });
    expect(layout.own).toBe(true);
    expect(layout.fields[0]).toBeCloseTo(64e-6, 12);
    expect(layout.fields[1]).toBeCloseTo(64 * 40e-6, 12);
    // Both spots fill their tiles alike: the bright (above half the peak) share of each is the same.
    const bright = (i: number) => {
      const r = layout.tiles[i]!;
      let n = 0;
      for (let y = 0; y < r.h; y++) for (let x = 0; x < r.w; x++) if (lightness(img.at(r.x + x, r.y + y)) > lightness(round3(shoal(0.5)))) n++;
      return n;
    };
    expect(bright(0)).toBeGreaterThan(50);
    expect(Math.abs(bright(0) - bright(1))).toBeLessThanOrEqual(0.05 * bright(0));
    // One bar label per tile (round lengths nearest a quarter of each window: 16 µm → 20, 640 µm → 500), and the caption says so.
    expect(texts.map((t) => t.text)).toEqual(expect.arrayContaining(['20 µm', '500 µm']));
    expect(texts.some((t) => /its own window/.test(t.text))).toBe(true);
    // One field when asked.
    expect(layoutContactSheet([near, far], { tilePixels: 100, field: 'common' }).own).toBe(false);
  });

  it('draws log brightness over the decades asked, and prints the case peak given with the tile', () => {
    const { img, layout, texts } = render([{ ...near, peak: 0.031 }, far], { tilePixels: 100, scale: 'log', logDecades: 4 });
    const r = layout.tiles[0]!;
    // At 2w from the centre I/peak = e^{−8} = 3.4e-4: on a 4-decade log scale, 1 + log10(3.4e-4)/4 = 0.13 of the scale.
    const x = Math.round(r.w / 2 - 0.5 + (2 * 8e-6) / (64e-6 / r.w));
    const want = lightness(round3(shoal(1 + Math.log10(Math.exp(-8)) / 4)));
    expect(Math.abs(lightness(img.at(r.x + x, r.y + Math.round(r.h / 2 - 0.5))) - want)).toBeLessThan(4);
    expect(texts.map((t) => t.text)).toEqual(expect.arrayContaining(['peak 0.0310', 'peak 3.45']));
    expect(texts.some((t) => /log scale over 4 decades/.test(t.text))).toBe(true);
  });
});
