// Profile plots (output/profile-plot.ts) and the textbook far-field curves drawn in them
// (analysis/textbook.ts), the latter against the test references' closed forms, which share no code
// with src/ (test/reference/far-field.ts: the rect pair and the Airy amplitude, Goodman §2.2 and
// Born & Wolf §8.5.2, on a flat screen, Goodman §4.2), and the N-slit array factor (Hecht §10.2.3).
import { describe, expect, it } from 'vitest';
import { textbookFarField } from '../../src/analysis/textbook.js';
import { renderProfilePng } from '../../src/output/profile-plot.js';
import { layoutLinePlot } from '../../src/output/line-plot.js';
import { discTransform, farFieldIntensity, rectTransform, sinc } from '../reference/far-field.js';
import { decode } from '../png.js';

const lam = 633e-9;
const plane = { kind: 'plane' as const, tilt: [0, 0] as [number, number] };

describe('textbook far-field curves', () => {
  const z = 0.5;
  const pts = [0, 1e-4, 7e-4, 2.3e-3, 9e-3, 0.05].flatMap((x) => [[x, 0], [x, 3e-3], [-x, 1.1e-2]] as [number, number][]);
  it('a disc and a rectangle: the reference closed forms to 1e-12', () => {
    const disc = textbookFarField({ shape: 'circle', diameter: 80e-6, opaque: false }, plane, lam, z)!;
    const rect = textbookFarField({ shape: 'rectangle', width: 90e-6, height: 40e-6, opaque: false }, plane, lam, z)!;
    for (const [x, y] of pts) {
      const d = farFieldIntensity((fx, fy) => discTransform(80e-6, [0, 0], fx, fy), lam, z, x, y);
      const r = farFieldIntensity((fx, fy) => rectTransform(90e-6, 40e-6, [0, 0], fx, fy), lam, z, x, y);
      expect(Math.abs(disc.at(x, y) - d)).toBeLessThanOrEqual(1e-12 * Math.max(d, 1e-30) + 1e-300);
      expect(Math.abs(rect.at(x, y) - r)).toBeLessThanOrEqual(1e-12 * Math.max(r, 1e-30) + 1e-300);
    }
    // Airy peak (πa²/(λz))² (Born & Wolf §8.5.2).
    expect(disc.at(0, 0)).toBeCloseTo((Math.PI * 40e-6 ** 2 / (lam * z)) ** 2, 12);
  });
  it('a 1-D slit and N slits: w²/(λr)·sinc²·(z/r)², times the array factor (N² at the orders)', () => {
    const w = 20e-6;
    const p = 50e-6;
    const one = textbookFarField({ shape: 'slit', width: w, opaque: false }, plane, lam, z)!;
    const five = textbookFarField({ shape: 'slits', count: 5, width: w, period: p, opaque: false }, plane, lam, z)!;
    for (const x of [0, 3e-4, 1.7e-3, 6.3e-3, 2e-2]) {
      const r = Math.hypot(x, z);
      const f = x / (lam * r);
      const ref = ((w * sinc(w * f)) ** 2 * (z / r) ** 2) / (lam * r);
      expect(Math.abs(one.at(x, 0) - ref)).toBeLessThanOrEqual(1e-12 * ref + 1e-300);
      const af = Math.abs(Math.sin(5 * Math.PI * p * f)) < 1e-300 ? 5 : Math.sin(5 * Math.PI * p * f) / Math.sin(Math.PI * p * f);
      if (Math.abs(Math.sin(Math.PI * p * f)) > 1e-6) expect(Math.abs(five.at(x, 0) - ref * af * af)).toBeLessThanOrEqual(1e-9 * ref * 25 + 1e-300);
    }
    // First order, sin θ = λ/p: the array factor is N = 5, so 25 times the single slit there.
    const x1 = (z * (lam / p)) / Math.sqrt(1 - (lam / p) ** 2);
    expect(five.at(x1, 0) / one.at(x1, 0)).toBeCloseTo(25, 6);
  });
  it('has no curve for tilted or Gaussian light, or an obstacle', () => {
    expect(textbookFarField({ shape: 'circle', diameter: 1e-4, opaque: false }, { kind: 'plane', tilt: [0.1, 0] }, lam, 1)).toBeNull();
    expect(textbookFarField({ shape: 'circle', diameter: 1e-4, opaque: false }, { kind: 'gaussian', waist: 1e-4, tilt: [0, 0] }, lam, 1)).toBeNull();
    expect(textbookFarField({ shape: 'circle', diameter: 1e-4, opaque: true }, plane, lam, 1)).toBeNull();
  });
});

describe('profile plot', () => {
  it('draws the curve where the data are: its top at the peak position, on linear and log views', () => {
    const x = Array.from({ length: 401 }, (_, i) => -2e-3 + i * 1e-5);
    // A Gaussian peak at +0.5 mm.
    const I = x.map((v) => 0.8 * Math.exp(-(((v - 5e-4) / 2e-4) ** 2)));
    const img = decode(renderProfilePng({ title: 'test', x, intensity: I, axis: 'x', edges: [-1e-3, 1e-3] }));
    const L = layoutLinePlot({ xLabel: '', yLabel: '', xRange: [0, 1], yRange: [0, 1], series: [] });
    expect(img.width).toBe(L.width);
    expect(img.height).toBe(2 * L.height);
    // In the linear view the computed colour's highest pixel is at x = 0.5 mm: 2.5 mm from the left of a 4 mm span.
    const orange = (p: readonly number[]) => p[0] === 240 && p[1] === 160 && p[2] === 80;
    let best = { y: Infinity, x: -1 };
    for (let yy = L.plot.y; yy < L.plot.y + L.plot.h; yy++) {
      for (let xx = L.plot.x; xx < L.plot.x + L.plot.w; xx++) if (orange(img.at(xx, yy)) && yy < best.y) best = { y: yy, x: xx };
      if (best.x >= 0) break;
    }
    const want = L.plot.x + (2.5 / 4) * (L.plot.w - 1);
    expect(Math.abs(best.x - want)).toBeLessThanOrEqual(3);
    // And the log view has the curve too (below the first plot).
    let seen = 0;
    for (let yy = L.height + L.plot.y; yy < L.height + L.plot.y + L.plot.h; yy++) for (let xx = L.plot.x; xx < L.plot.x + L.plot.w; xx++) if (orange(img.at(xx, yy))) seen++;
    expect(seen).toBeGreaterThan(200);
  });
});
