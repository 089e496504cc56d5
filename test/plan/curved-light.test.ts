// The curved-light transform (src/plan/curved-light.ts) on its own: the Fresnel scaling theorem's
// numbers, the Gaussian beam's radius and curvature, the stand-in flat light and the paraxial checks.
import { describe, expect, it } from 'vitest';
import {
  beamRadiusAfter,
  curvatureRadius,
  flatEquivalent,
  flatIllumination,
  projectedHalfWidths,
  rayleighRange,
  sourcePad,
  sourcePhase,
} from '../../src/plan/curved-light.js';
import { makeCase } from '../helpers.js';

const lam = 633e-9;

describe('curved light: the transform', () => {
  it('a point source: R = s, z_eff = zs/(s+z), M = (s+z)/s, intensity 1/M² in 2-D and 1/M in 1-D (Goodman §4.2, the Fresnel scaling theorem)', () => {
    const c = { ...makeCase({ wavelength: lam, distance: 0.3, aperture: { shape: 'circle', diameter: 1e-3, opaque: false }, window: [6e-3, 4e-3] }), source: { kind: 'point' as const, distance: 0.12, at: [0, 0] as [number, number] } };
    const eq = flatEquivalent(c, false);
    expect(eq.radius).toBe(0.12);
    expect(eq.zEff).toBeCloseTo((0.3 * 0.12) / 0.42, 14);
    expect(eq.magnification).toBeCloseTo(0.42 / 0.12, 14);
    expect(eq.intensityScale).toBeCloseTo((0.12 / 0.42) ** 2, 14);
    // A 1-D aperture: a point's light spreads along the slits as well (1/M²), a slit source's does not (1/M).
    expect(flatEquivalent(c, true).intensityScale).toBeCloseTo((0.12 / 0.42) ** 2, 14);
    const line = { ...c, source: { kind: 'extended' as const, shape: 'slit' as const, size: [1e-3, 1e-3] as [number, number], distance: 0.12, at: [0, 0] as [number, number] } };
    expect(flatEquivalent(line, true).intensityScale).toBeCloseTo(0.12 / 0.42, 14);
    expect(flatEquivalent(line, false).intensityScale).toBeCloseTo((0.12 / 0.42) ** 2, 14);
    // The window asked for is on the real screen; the flat case's is M times smaller.
    expect(eq.case.window![0]).toBeCloseTo(6e-3 / 3.5, 15);
    expect(eq.case.window![1]).toBeCloseTo(4e-3 / 3.5, 15);
    expect(eq.case.distance).toBe(eq.zEff);
    expect('source' in eq.case).toBe(false);
  });

  it("a Gaussian waist d before the aperture: w(d) = w₀√(1+(d/z_R)²), R = d(1+(z_R/d)²) (Siegman, Lasers, ch. 17)", () => {
    const w0 = 0.4e-3;
    const zr = rayleighRange(w0, lam);
    expect(zr).toBeCloseTo((Math.PI * w0 * w0) / lam, 12);
    for (const d of [0.1 * zr, zr, 5 * zr]) {
      const src = { kind: 'gaussian' as const, waist: w0, waistDistance: d, tilt: [0, 0] as [number, number] };
      expect(beamRadiusAfter(w0, lam, d)).toBeCloseTo(w0 * Math.sqrt(1 + (d / zr) ** 2), 15);
      expect(curvatureRadius(src, lam)).toBeCloseTo(d * (1 + (zr / d) ** 2), 10);
      const ill = flatIllumination(src, lam);
      expect(ill.kind === 'gaussian' && ill.waist).toBeCloseTo(beamRadiusAfter(w0, lam, d), 15);
    }
    // At the Rayleigh range the radius is √2 w₀ and the curvature the smallest, 2z_R.
    expect(beamRadiusAfter(w0, lam, zr) / w0).toBeCloseTo(Math.SQRT2, 14);
    expect(curvatureRadius({ kind: 'gaussian', waist: w0, waistDistance: zr, tilt: [0, 0] }, lam)).toBeCloseTo(2 * zr, 10);
  });

  it('an off-axis point sends its light along the direction from it to the aperture centre', () => {
    const ill = flatIllumination({ kind: 'point', distance: 0.1, at: [2e-3, -1e-3] }, lam);
    expect(ill.kind).toBe('plane');
    const r = Math.hypot(2e-3, 1e-3, 0.1);
    expect(Math.sin(ill.tilt[0])).toBeCloseTo(-2e-3 / r, 15);
    expect(Math.sin(ill.tilt[1])).toBeCloseTo(1e-3 / r, 15);
  });

  it("the source leg's dropped phase is kρ⁴/(8s³) across the aperture (the binomial expansion's next term; common practice)", () => {
    const k = (2 * Math.PI) / lam;
    const a = 2e-3;
    const s = 0.05;
    const p = sourcePhase({ kind: 'point', distance: s, at: [0, 0] }, lam, a, a);
    // Over a box of half width a the farthest point is at a√2.
    const rho = a * Math.SQRT2;
    expect(p / ((k * rho ** 4) / (8 * s ** 3))).toBeGreaterThan(0.99);
    expect(p / ((k * rho ** 4) / (8 * s ** 3))).toBeLessThan(1.0);
    // A Gaussian beam is paraxial by itself: nothing dropped along its axis; tilted by θ, its sphere
    // about its own axis differs from tilt × sphere about the normal by kx²sin²θ/(2R) (+ the cubic).
    const g = { kind: 'gaussian' as const, waist: 1e-3, waistDistance: 0.1, tilt: [0, 0] as [number, number] };
    expect(sourcePhase(g, lam, a, a)).toBe(0);
    const R = curvatureRadius(g, lam);
    const tilted = sourcePhase({ ...g, tilt: [0.1, 0] }, lam, a, a);
    expect(tilted).toBeGreaterThan((k * a * a * Math.sin(0.1) ** 2) / (2 * R));
    expect(tilted).toBeLessThan(1.1 * ((k * a * a * Math.sin(0.1) ** 2) / (2 * R)));
  });

  it("an extended source's projection is its size times z/s, and the window widens by whole cells that reach it", () => {
    expect(projectedHalfWidths({ kind: 'extended', shape: 'rectangle', size: [1e-3, 2e-3], distance: 0.2, at: [0, 0] }, 0.4)).toEqual([1e-3, 2e-3]);
    expect(projectedHalfWidths({ kind: 'extended', shape: 'slit', size: [1e-3, 1e-3], distance: 0.2, at: [0, 0] }, 0.4)).toEqual([1e-3, 0]);
    expect(sourcePad(0, 1e-6)).toBe(0);
    // A half width of 2.4 cells reaches the cell at 2 (edge 1.5) and not the one at 3 (edge 2.5).
    expect(sourcePad(2.4e-6, 1e-6)).toBe(3);
    expect(sourcePad(2.6e-6, 1e-6)).toBe(4);
  });
});
