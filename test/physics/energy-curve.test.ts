// The encircled-energy curve (src/analysis/encircled.ts energyCurve). Its definition: each sample
// stands for its cell, its power spread evenly over it, and the curve at radius R is the sum of
// power × the fraction of each cell inside the disc of radius R (2-D). The fast pass models the
// circles that cross a cell far from the centre; here it is held to the definition computed with the
// exact areas (discRectangleArea, itself checked against closed forms), on random maps drawn with a
// fixed seed (mulberry32), and to closed forms for a uniform map and a Gaussian beam. A 1-D curve is
// still the sub-cell definition, bit for bit.
import { describe, expect, it } from 'vitest';
import { discRectangleArea, energyCurve } from '../../src/analysis/encircled.js';
import type { IntensityMap } from '../../src/model/intensity-map.js';
import { mulberry32 } from '../helpers.js';

/** rMax and the bin width energyCurve uses: the farthest window corner over the bin count. */
function binsOf(map: IntensityMap, centre: [number, number], points: number): { bins: number; binWidth: number } {
  const xs = [map.x0 - map.dx / 2, map.x0 + (map.nx - 0.5) * map.dx];
  const ys = [map.y0 - map.dy / 2, map.y0 + (map.ny - 0.5) * map.dy];
  let rMax = 0;
  for (const x of xs) for (const y of ys) rMax = Math.max(rMax, Math.hypot(x - centre[0], y - centre[1]));
  const bins = Math.max(points, 16);
  return { bins, binWidth: rMax / bins };
}

/** The 2-D curve by the definition: every cell's exact area inside every circle. */
function curveByDefinition(map: IntensityMap, centre: [number, number], reference: number, points: number): Float64Array {
  const { bins, binWidth } = binsOf(map, centre, points);
  const out = new Float64Array(bins + 1);
  for (let r = 0; r < map.ny; r++) {
    for (let c = 0; c < map.nx; c++) {
      const v = map.intensity[r * map.nx + c]!;
      if (v === 0) continue;
      const x = map.x0 + c * map.dx - centre[0];
      const y = map.y0 + r * map.dy - centre[1];
      for (let k = 1; k <= bins; k++) out[k] += v * discRectangleArea(k * binWidth, x - map.dx / 2, x + map.dx / 2, y - map.dy / 2, y + map.dy / 2);
    }
  }
  return out.map((v) => v / reference);
}

describe('discRectangleArea', () => {
  const R = 1.7;
  it('gives the closed forms of a disc cut by rectangles (common practice)', () => {
    // Wholly inside: the rectangle's area.
    expect(discRectangleArea(R, -0.5, 0.7, -0.3, 0.6)).toBeCloseTo(1.2 * 0.9, 14);
    // A rectangle holding the disc: πR².
    expect(discRectangleArea(R, -2, 3, -5, 2)).toBeCloseTo(Math.PI * R * R, 13);
    // Quarter and half discs.
    expect(discRectangleArea(R, 0, 9, 0, 9)).toBeCloseTo((Math.PI * R * R) / 4, 13);
    expect(discRectangleArea(R, -9, 9, -9, 0)).toBeCloseTo((Math.PI * R * R) / 2, 13);
    // A circular segment beyond the chord at distance h: R² acos(h/R) − h√(R² − h²).
    for (const h of [-1.2, 0, 0.4, 1.1, 1.69]) {
      expect(discRectangleArea(R, h, 9, -9, 9)).toBeCloseTo(R * R * Math.acos(h / R) - h * Math.sqrt(R * R - h * h), 13);
    }
    // Entirely outside.
    expect(discRectangleArea(R, 1.3, 2, 1.3, 2)).toBeCloseTo(0, 15);
  });

  it('adds up: the four quadrants of any rectangle about a point make the whole (random, seed 3)', () => {
    const rand = mulberry32(3);
    for (let t = 0; t < 50; t++) {
      const [x0, x1] = [-2 + 2 * rand(), 2 * rand()].sort((a, b) => a - b) as [number, number];
      const [y0, y1] = [-2 + 2 * rand(), 2 * rand()].sort((a, b) => a - b) as [number, number];
      const px = x0 + (x1 - x0) * rand();
      const py = y0 + (y1 - y0) * rand();
      const sum = discRectangleArea(R, x0, px, y0, py) + discRectangleArea(R, px, x1, y0, py) + discRectangleArea(R, x0, px, py, y1) + discRectangleArea(R, px, x1, py, y1);
      expect(sum).toBeCloseTo(discRectangleArea(R, x0, x1, y0, y1), 12);
    }
  });
});

describe('energyCurve', () => {
  it('is the exact-area definition within 1e-4 of the total on random maps, centres, pitches and bin counts (seed 12)', () => {
    const rand = mulberry32(12);
    let worst = 0;
    for (let t = 0; t < 12; t++) {
      const nx = 5 + Math.floor(rand() * 40);
      const ny = 5 + Math.floor(rand() * 40);
      const dx = 1e-6 * (0.5 + rand());
      const dy = rand() < 0.5 ? dx : 1e-6 * (0.5 + rand());
      const intensity = Float64Array.from({ length: nx * ny }, () => (rand() < 0.2 ? 0 : rand() ** 3));
      const map: IntensityMap = { nx, ny, dx, dy, x0: -nx * dx * rand(), y0: -ny * dy * rand(), intensity };
      // Centres inside, on a sample and outside the window.
      const centre: [number, number] = t % 3 === 0 ? [map.x0, map.y0] : t % 3 === 1 ? [(rand() - 0.5) * 1e-5, (rand() - 0.5) * 1e-5] : [2 * nx * dx, -ny * dy];
      const points = [16, 100, 400, 1000][t % 4]!;
      let total = 0;
      for (const v of intensity) total += v * dx * dy;
      const got = energyCurve(map, centre, total, points);
      const want = curveByDefinition(map, centre, total, points);
      expect(got.fraction.length).toBe(want.length);
      expect(got.fraction[0]).toBe(0);
      // Every cell is inside the last circle (through the farthest corner).
      expect(got.fraction[want.length - 1]!).toBeCloseTo(1, 12);
      for (let k = 0; k < want.length; k++) worst = Math.max(worst, Math.abs(got.fraction[k]! - want[k]!));
    }
    // (6e-5 at worst on these maps, where 4 × 4 sub-cells a sample, the curve before, were off by up to 5e-3.)
    expect(worst).toBeLessThan(1e-4);
  });

  it('holds the Gaussian spot (2 to 20 samples) and the Airy pattern to the exact-area definition within 3e-5', () => {
    const n = 91;
    const spot = (f: (x: number, y: number) => number, dy: number): IntensityMap => {
      const intensity = new Float64Array(n * n);
      for (let r = 0; r < n; r++) for (let c = 0; c < n; c++) intensity[r * n + c] = f(c - 45, (r - 45) * dy);
      return { nx: n, ny: n, dx: 1, dy, x0: -45, y0: -45 * dy, intensity };
    };
    const airy = (v: number) => {
      // (2 J1(v)/v)², J1 by its series (common practice), v ≤ 40 here.
      let term = v / 2;
      let sum = term;
      for (let k = 1; k < 80; k++) sum += term *= -(v * v) / (4 * k * (k + 1));
      return v === 0 ? 1 : ((2 * sum) / v) ** 2;
    };
    const cases: [IntensityMap, [number, number]][] = [
      ...[2, 5, 10, 20].map((w): [IntensityMap, [number, number]] => [spot((x, y) => Math.exp((-2 * (x * x + y * y)) / (w * w)), 1), [0.3, -0.2]]),
      [spot((x, y) => Math.exp((-2 * (x * x + y * y)) / 36), 0.5), [0.1, 0.1]],
      [spot((x, y) => airy(Math.hypot(x, y) / 2.5), 1), [0.1, 0.05]],
    ];
    for (const [map, centre] of cases) {
      let total = 0;
      for (const v of map.intensity) total += v * map.dx * map.dy;
      const got = energyCurve(map, centre, total, 200).fraction;
      const want = curveByDefinition(map, centre, total, 200);
      let worst = 0;
      for (let k = 0; k < want.length; k++) worst = Math.max(worst, Math.abs(got[k]! - want[k]!));
      expect(worst).toBeLessThan(3e-5);
    }
  });

  it('gives πR² of a uniform map inside its inscribed circle (exact geometry, common practice)', () => {
    const n = 81;
    const d = 2e-6;
    const map: IntensityMap = { nx: n, ny: n, dx: d, dy: d, x0: -40 * d, y0: -40 * d, intensity: new Float64Array(n * n).fill(1) };
    const centre: [number, number] = [0.37 * d, -0.21 * d];
    const curve = energyCurve(map, centre, 1);
    const inscribed = 40 * d;
    for (let k = 1; k < curve.radius.length && curve.radius[k]! < inscribed; k++) {
      const disc = Math.PI * curve.radius[k]! ** 2;
      expect(Math.abs(curve.fraction[k]! - disc) / (n * n * d * d)).toBeLessThan(2e-6);
    }
  });

  it('holds 1 − exp(−2r²/w²) of a Gaussian beam sampled 24 to the waist (Siegman, Lasers (1986), §17.1)', () => {
    const n = 161;
    const w = 24;
    const intensity = new Float64Array(n * n);
    for (let r = 0; r < n; r++) for (let c = 0; c < n; c++) intensity[r * n + c] = Math.exp((-2 * ((c - 80) ** 2 + (r - 80) ** 2)) / (w * w));
    const map: IntensityMap = { nx: n, ny: n, dx: 1, dy: 1, x0: -80, y0: -80, intensity };
    // The continuous beam's power: πw²/2.
    const curve = energyCurve(map, [0, 0], (Math.PI * w * w) / 2);
    for (let k = 4; k < curve.radius.length && curve.radius[k]! < 3 * w; k += 7) {
      const r = curve.radius[k]!;
      // Spreading each sample over its cell adds about pitch²/12 to the variance per axis (w² to
      // w² + pitch²/3), which moves the curve by up to (1/e)·pitch²/(3w²) ≈ 2.1e-4 (2.5e-4 found).
      expect(Math.abs(curve.fraction[k]! - (1 - Math.exp((-2 * r * r) / (w * w))))).toBeLessThan(3e-4);
    }
  });

  it('holds (r/R)² of a uniform disc within a sub-cell ring (exact geometry, common practice)', () => {
    const n = 201;
    const d = 1e-6;
    const R = 60 * d;
    const intensity = new Float64Array(n * n);
    for (let r = 0; r < n; r++) for (let c = 0; c < n; c++) if (Math.hypot((c - 100) * d, (r - 100) * d) <= R) intensity[r * n + c] = 1;
    const map: IntensityMap = { nx: n, ny: n, dx: d, dy: d, x0: -100 * d, y0: -100 * d, intensity };
    let total = 0;
    for (const v of intensity) total += v * d * d;
    const curve = energyCurve(map, [0, 0], total);
    for (const f of [0.25, 0.5, 0.75]) {
      const r = f * R;
      const k = Math.round(r / curve.radius[1]!);
      // The disc's sampled rim and the bin's width allow about 2 % here.
      expect(curve.fraction[k]!).toBeCloseTo((curve.radius[k]! / R) ** 2, 1);
      expect(Math.abs(curve.fraction[k]! - (curve.radius[k]! / R) ** 2)).toBeLessThan(0.02);
    }
    expect(curve.fraction[curve.fraction.length - 1]!).toBeCloseTo(1, 12);
  });

  it('is the sub-cell definition bit for bit in 1-D (random, seed 7)', () => {
    const rand = mulberry32(7);
    for (let t = 0; t < 8; t++) {
      const nx = 5 + Math.floor(rand() * 300);
      const dx = 1e-6 * (0.5 + rand());
      const intensity = Float64Array.from({ length: nx }, () => (rand() < 0.2 ? 0 : rand() ** 3));
      const map: IntensityMap = { nx, ny: 1, dx, dy: 0, x0: -nx * dx * rand(), y0: 0, intensity };
      const cx = (rand() - 0.5) * nx * dx;
      const points = [16, 100, 400][t % 3]!;
      const rMax = Math.max(Math.abs(map.x0 - dx / 2 - cx), Math.abs(map.x0 + (nx - 0.5) * dx - cx));
      const bins = Math.max(points, 16);
      const hist = new Float64Array(bins + 1);
      for (let c = 0; c < nx; c++) {
        const v = (intensity[c]! * dx) / 4;
        if (v === 0) continue;
        for (let i = 0; i < 4; i++) {
          const x = map.x0 + c * dx - cx + ((i + 0.5) / 4 - 0.5) * dx;
          hist[Math.min(bins, Math.floor(Math.abs(x) * (1 / (rMax / bins))))]! += v;
        }
      }
      const got = energyCurve(map, [cx, 0], 0.37, points).fraction;
      let acc = 0;
      for (let k = 0; k < bins; k++) expect(Object.is(got[k + 1], (acc += hist[k]!) / 0.37)).toBe(true);
    }
  });
});
