// The encircled-energy curve (src/analysis/encircled.ts energyCurve) against its definition written
// out plainly here: each sample split into s × s sub-cells, each sub-cell's power added to bin
// min(bins, floor(√(x² + y²)/binWidth)), sub-cells visited sample by sample, x then y. The fast
// loop must give the same curve bit for bit (the metrics in result.json are read off it). Maps are
// drawn at random with a fixed seed (mulberry32); and a uniform disc against the exact area ratio.
import { describe, expect, it } from 'vitest';
import { energyCurve } from '../../src/analysis/encircled.js';
import type { IntensityMap } from '../../src/model/intensity-map.js';
import { mulberry32 } from '../helpers.js';

/** The curve by the definition, as a plain loop. */
function curveByDefinition(map: IntensityMap, centre: [number, number], reference: number, points: number): Float64Array {
  const s = map.nx * map.ny <= 1 << 20 ? 4 : 2;
  const xs = [map.x0 - map.dx / 2, map.x0 + (map.nx - 0.5) * map.dx];
  const ys = [map.y0 - map.dy / 2, map.y0 + (map.ny - 0.5) * map.dy];
  let rMax = 0;
  for (const x of xs) for (const y of ys) rMax = Math.max(rMax, Math.hypot(x - centre[0], y - centre[1]));
  const bins = Math.max(points, 16);
  const binWidth = rMax / bins;
  const cell = (map.dx * map.dy) / (s * s);
  const off = (i: number, pitch: number) => ((i + 0.5) / s - 0.5) * pitch;
  const hist = new Float64Array(bins + 1);
  for (let r = 0; r < map.ny; r++) {
    for (let c = 0; c < map.nx; c++) {
      const v = map.intensity[r * map.nx + c]! * cell;
      if (v === 0) continue;
      for (let i = 0; i < s; i++) {
        const x = map.x0 + c * map.dx - centre[0] + off(i, map.dx);
        for (let j = 0; j < s; j++) {
          const y = map.y0 + r * map.dy - centre[1] + off(j, map.dy);
          hist[Math.min(bins, Math.floor(Math.sqrt(x * x + y * y) * (1 / binWidth)))]! += v;
        }
      }
    }
  }
  const fraction = new Float64Array(bins + 1);
  let acc = 0;
  for (let k = 0; k < bins; k++) fraction[k + 1] = (acc += hist[k]!) / reference;
  return fraction;
}

describe('energyCurve', () => {
  it('is the definition bit for bit on random maps, centres and bin counts (seed 12)', () => {
    const rand = mulberry32(12);
    for (let t = 0; t < 12; t++) {
      const nx = 5 + Math.floor(rand() * 60);
      const ny = 5 + Math.floor(rand() * 60);
      const dx = 1e-6 * (0.5 + rand());
      const dy = rand() < 0.5 ? dx : 1e-6 * (0.5 + rand());
      const intensity = Float64Array.from({ length: nx * ny }, () => (rand() < 0.2 ? 0 : rand() ** 3));
      const map: IntensityMap = { nx, ny, dx, dy, x0: -nx * dx * rand(), y0: -ny * dy * rand(), intensity };
      // Centres inside, on a sample and outside the window.
      const centre: [number, number] = t % 3 === 0 ? [map.x0, map.y0] : t % 3 === 1 ? [(rand() - 0.5) * 1e-5, (rand() - 0.5) * 1e-5] : [2 * nx * dx, -ny * dy];
      const points = [16, 100, 400, 1000][t % 4]!;
      const got = energyCurve(map, centre, 0.37, points).fraction;
      const want = curveByDefinition(map, centre, 0.37, points);
      expect(got.length).toBe(want.length);
      for (let k = 0; k < want.length; k++) expect(Object.is(got[k], want[k]), `map ${t}, bin ${k}: ${got[k]} vs ${want[k]}`).toBe(true);
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
});
