// The dense axial curve (analysis/on-axis.ts) against exact axial fields. A circular hole lit by a
// unit plane wave, first Rayleigh–Sommerfeld solution, on the axis: U(z) = e^{ikz} − (z/R)e^{ikR},
// R = √(z² + a²) (Heurtley, J. Opt. Soc. Am. 63, 1003 (1973); from memory), so
// I = 1 + z²/R² − 2(z/R)cos k(R − z); an annulus is the difference of two such terms, and an
// opaque disc leaves (z/R)e^{ikR}: the bright spot on the axis, I = z²/(z² + a²). The 1-D slit
// and the rectangle against the project's independent references (test/reference: exact 1-D
// Rayleigh–Sommerfeld and a 2-D quadrature of the integral).
import { describe, expect, it } from 'vitest';
import { logDistances, onAxisCurve } from '../../src/analysis/on-axis.js';
import type { Aperture } from '../../src/optics/aperture.js';
import { referenceIntensity } from '../reference/reference.js';

const plane = { kind: 'plane' as const, tilt: [0, 0] as [number, number] };
const lam = 633e-9;
const k = (2 * Math.PI) / lam;
const term = (a: number, z: number): [number, number] => {
  const R = Math.hypot(a, z);
  return [(z / R) * Math.cos(k * R), (z / R) * Math.sin(k * R)];
};

describe('axial intensity against distance', () => {
  const a = 100e-6;
  // Fresnel numbers a²/(λz) from 60 down to 0.05: through every axial zero and maximum.
  const zs = logDistances(a * a / (lam * 60), a * a / (lam * 0.05), 300);

  it('a circle: 1 + z²/R² − 2(z/R)cos k(R − z), to 1e-4 of the maximum 4 (300 distances)', () => {
    const c = onAxisCurve({ shape: 'circle', diameter: 2 * a, opaque: false }, plane, lam, zs)!;
    expect(c).not.toBeNull();
    let worst = 0;
    for (let i = 0; i < zs.length; i++) {
      const z = zs[i]!;
      const [tr, ti] = term(a, z);
      const re = Math.cos(k * z) - tr;
      const im = Math.sin(k * z) - ti;
      worst = Math.max(worst, Math.abs(c.intensity[i]! - (re * re + im * im)));
    }
    expect(worst).toBeLessThan(4e-4);
    // It reaches the maxima of 4 (N_F odd) and the zeros (N_F even) the sweep passes.
    expect(Math.max(...c.intensity)).toBeGreaterThan(3.9);
    expect(Math.min(...c.intensity)).toBeLessThan(0.05);
  });

  it('an annulus and an opaque disc: the difference of the terms, and the bright spot z²/(z² + a²)', () => {
    const inner = 40e-6;
    const ann = onAxisCurve({ shape: 'annulus', outer: 2 * a, inner: 2 * inner, opaque: false }, plane, lam, zs)!;
    const disc = onAxisCurve({ shape: 'circle', diameter: 2 * a, opaque: true }, plane, lam, zs)!;
    for (let i = 0; i < zs.length; i += 7) {
      const z = zs[i]!;
      const [ar, ai] = term(inner, z);
      const [br, bi] = term(a, z);
      expect(Math.abs(ann.intensity[i]! - ((ar - br) ** 2 + (ai - bi) ** 2))).toBeLessThan(4e-4);
      expect(Math.abs(disc.intensity[i]! - (z * z) / (z * z + a * a))).toBeLessThan(1e-4);
    }
  });

  it('a slit and a rectangle: the independent exact references on the axis, within 1e-3 of the peak', () => {
    for (const ap of [
      { shape: 'slit', width: 150e-6, opaque: false },
      { shape: 'rectangle', width: 150e-6, height: 90e-6, opaque: false },
      { shape: 'slit', width: 60e-6, opaque: true },
    ] as Aperture[]) {
      const z8 = logDistances(2e-3, 0.2, 8);
      const c = onAxisCurve(ap, plane, lam, z8)!;
      expect(c).not.toBeNull();
      for (let i = 0; i < z8.length; i++) {
        const ref = referenceIntensity({ wavelength: lam, distance: z8[i]!, aperture: ap, illumination: plane }, [[0, 0]], 2e6, 0);
        expect(ref.ok).toBe(true);
        if (ref.ok) expect(Math.abs(c.intensity[i]! - ref.intensity[0]!) / Math.max(1, ref.intensity[0]!)).toBeLessThan(1e-3);
      }
    }
  });

  it('gives null for light it has no cheap exact form for (a Gaussian beam, a tilt)', () => {
    const zs3 = logDistances(1e-3, 1e-2, 3);
    expect(onAxisCurve({ shape: 'circle', diameter: 1e-4, opaque: false }, { kind: 'gaussian', waist: 1e-4, tilt: [0, 0] }, lam, zs3)).toBeNull();
    expect(onAxisCurve({ shape: 'circle', diameter: 1e-4, opaque: false }, { kind: 'plane', tilt: [0.1, 0] }, lam, zs3)).toBeNull();
  });
});
