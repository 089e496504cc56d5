// The zoomed view's region (output/zoom.ts): a Gaussian spot I = exp(−2x²/w²) has the marginal of a
// normal distribution with σ = w/2, which holds 99 % within ±2.5758σ = ±1.2879 w (the normal
// distribution's 99 % two-sided point; a handbook value, from memory), padded by a quarter.
import { describe, expect, it } from 'vitest';
import { cropMap, regionBox, spotBox } from '../../src/output/zoom.js';

function gaussianMap(n: number, pitch: number, w: number, cx = 0, cy = 0) {
  const x0 = -((n - 1) / 2) * pitch;
  const a = new Float64Array(n * n);
  for (let r = 0; r < n; r++) for (let c = 0; c < n; c++) a[r * n + c] = Math.exp((-2 * ((x0 + c * pitch - cx) ** 2 + (x0 + r * pitch - cy) ** 2)) / (w * w));
  return { nx: n, ny: n, dx: pitch, dy: pitch, x0, y0: x0, intensity: a };
}

describe('zoomed view', () => {
  it('boxes a small spot at ±1.29 w (99 % of the power per axis) plus a quarter, about its centroid', () => {
    const w = 10e-6;
    const m = gaussianMap(401, 1e-6, w, 30e-6, -20e-6);
    const b = spotBox(m)!;
    expect(b).not.toBeNull();
    const half = 2.5758 * (w / 2);
    const width = (b.cols[1] - b.cols[0] + 1) * m.dx;
    // 2·half held, then a quarter of that on each side: 1.5 × 2 × 1.2879 w = 38.6 µm, to a few samples.
    expect(Math.abs(width - 1.5 * 2 * half)).toBeLessThanOrEqual(4 * m.dx);
    const mid = m.x0 + ((b.cols[0] + b.cols[1]) / 2) * m.dx;
    expect(Math.abs(mid - 30e-6)).toBeLessThanOrEqual(m.dx);
    const midY = m.y0 + ((b.rows[0] + b.rows[1]) / 2) * m.dy;
    expect(Math.abs(midY + 20e-6)).toBeLessThanOrEqual(m.dy);
    // The crop holds the map's own samples on the same grid.
    const c = cropMap(m, b);
    expect(c.x0).toBeCloseTo(m.x0 + b.cols[0] * m.dx, 15);
    expect(c.intensity[5 * c.nx + 7]).toBe(m.intensity[(b.rows[0] + 5) * m.nx + b.cols[0] + 7]);
  });
  it('gives no zoom where the spot already fills the window, and a region asked for by centre and width', () => {
    expect(spotBox(gaussianMap(101, 1e-6, 40e-6))).toBeNull();
    const m = gaussianMap(101, 1e-6, 40e-6);
    const b = regionBox(m, [10e-6, 0], 20e-6)!;
    expect([b.cols[0], b.cols[1]]).toEqual([50, 70]);
    expect(regionBox(m, [1, 1], 1e-6)).toBeNull();
  });
});
