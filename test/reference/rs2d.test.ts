// The exact 2-D references (rs2d.ts) against each other, the paraxial ones (fresnel.ts), the
// Gaussian beam and published values.
import { describe, expect, it } from 'vitest';
import besselj1 from '@stdlib/math-base-special-besselj1';
import { axisIntensity, boundaryField, quad2dField, roundOnAxisIntensity, type Problem2D } from './rs2d.js';
import { fresnelRadial, fresnelSeparableIntensity } from './fresnel.js';
import { maxDiffOverPeak } from '../helpers.js';

const nm = 1e-9;
const um = 1e-6;
const mm = 1e-3;

function I(f: { re: Float64Array; im: Float64Array }): number[] {
  return Array.from(f.re, (r, i) => r * r + f.im[i]! ** 2);
}

const plane = { kind: 'plane' as const, sinTilt: 0 };
const disc = (a: number) => ({ region: { kind: 'disc' as const, radius: a }, sign: 1 as const });
const hole = (a: number) => ({ region: { kind: 'disc' as const, radius: a }, sign: -1 as const });
const rect = (w: number, h: number) => ({ region: { kind: 'rect' as const, x0: -w / 2, x1: w / 2, y0: -h / 2, y1: h / 2 }, sign: 1 as const });

describe('on the axis: boundary form, 2-D quadrature and the closed form agree', () => {
  // Closed form U(0,z) = e^{ikz} − (z/R)e^{ikR} (Osterberg & Smith 1961, from memory; derivation in rs2d.ts).
  it.each([
    ['disc, N_F = 8, z = 20 λ', 0.5 * um, 10 * um, [disc(5 * um)], false],
    ['annulus, near field', 0.633 * um, 40 * um, [disc(12 * um), hole(6 * um)], false],
    ['opaque disc (Poisson spot)', 1 * um, 30 * um, [disc(8 * um)], true],
  ] as const)('%s: to 1e-10', (_n, lam, z, regions, opaque) => {
    const p: Problem2D = { wavelength: lam, distance: z, regions: [...regions], light: plane, opaque };
    const closed = axisIntensity(lam, z, regions.map((r) => ({ radius: r.region.radius, sign: r.sign })), opaque);
    const b = I(boundaryField(p, [[0, 0]]))[0]!;
    const q = I(quad2dField(p, [[0, 0]]))[0]!;
    expect(Math.abs(b - closed)).toBeLessThan(1e-10);
    expect(Math.abs(q - closed)).toBeLessThan(1e-10);
    expect(Math.abs(roundOnAxisIntensity(lam, z, regions.map((r) => ({ radius: r.region.radius, sign: r.sign })), Infinity, opaque) - closed)).toBeLessThan(1e-12);
  });

  it('the Poisson spot of an opaque disc far behind it is the incident irradiance, (z/R)² (Born & Wolf §8.8, from memory)', () => {
    const z = 0.5;
    const a = 0.5 * mm;
    const v = axisIntensity(633 * nm, z, [{ radius: a, sign: 1 }], true);
    expect(Math.abs(v - z * z / (z * z + a * a))).toBeLessThan(1e-12);
  });
});

describe('off the axis: the boundary form and the 2-D quadrature agree (plane wave, normal incidence)', () => {
  const pts: [number, number][] = [
    [0, 0],
    [3 * um, 0],
    [5 * um, 1 * um], // near the disc's edge
    [5 * um, 0], // on the disc's edge
    [9 * um, -4 * um], // in the shadow
    [0, 7 * um],
  ];
  it.each([
    ['disc', [disc(5 * um)], false],
    ['annulus', [disc(6 * um), hole(2.5 * um)], false],
    ['rectangle', [rect(10 * um, 6 * um)], false],
    ['opaque rectangle', [rect(10 * um, 4 * um)], true],
    ['two rectangles (slits of finite length)', [{ region: { kind: 'rect' as const, x0: -6 * um, x1: -2 * um, y0: -5 * um, y1: 5 * um }, sign: 1 as const }, { region: { kind: 'rect' as const, x0: 2 * um, x1: 6 * um, y0: -5 * um, y1: 5 * um }, sign: 1 as const }], false],
  ] as const)('%s at z = 8 λ: to 1e-9 of the peak', (_n, regions, opaque) => {
    const p: Problem2D = { wavelength: 0.5 * um, distance: 4 * um, regions: [...regions], light: plane, opaque };
    expect(maxDiffOverPeak(I(boundaryField(p, pts)), I(quad2dField(p, pts)))).toBeLessThan(1e-9);
  });
});

describe('paraxial limit: Fresnel integrals (Born & Wolf §8.7) and the radial Fresnel integral (Goodman §4.2)', () => {
  const lam = 500 * nm;
  const z = 20;
  it('rectangle, N_F = 2 × 1, plane wave: boundary form vs Fresnel integrals to 1e-6', () => {
    const ax = Math.sqrt(2 * lam * z);
    const ay = Math.sqrt(lam * z);
    const pts: [number, number][] = Array.from({ length: 31 }, (_, i): [number, number] => [(-1.5 + (3 * i) / 30) * ax, 0.3 * ay]);
    const p: Problem2D = { wavelength: lam, distance: z, regions: [rect(2 * ax, 2 * ay)], light: plane, opaque: false };
    const fr = pts.map(([x, y]) => fresnelSeparableIntensity(lam, z, [[-ax, ax]], [[-ay, ay]], 0, x, y, false));
    expect(maxDiffOverPeak(I(boundaryField(p, pts)), fr)).toBeLessThan(1e-6);
  });
  it('rectangle, tilted plane wave (sin θ = 1e-4): 2-D quadrature vs Fresnel integrals to 1e-6', () => {
    const a = Math.sqrt(0.5 * lam * z);
    const alpha = 1e-4;
    const pts: [number, number][] = Array.from({ length: 9 }, (_, i): [number, number] => [alpha * z + (-1.5 + (3 * i) / 8) * a, 0.2 * a]);
    const p: Problem2D = { wavelength: lam, distance: z, regions: [rect(2 * a, 2 * a)], light: { kind: 'plane', sinTilt: alpha }, opaque: false };
    const fr = pts.map(([x, y]) => fresnelSeparableIntensity(lam, z, [[-a, a]], [[-a, a]], alpha, x, y, false));
    expect(maxDiffOverPeak(I(quad2dField(p, pts)), fr)).toBeLessThan(1e-6);
  });
  it('disc, N_F = 3, off the axis: boundary form vs the radial Fresnel integral to 1e-6', () => {
    const a = Math.sqrt(3 * lam * z);
    const pts: [number, number][] = Array.from({ length: 31 }, (_, i): [number, number] => [(1.5 * a * i) / 30, 0]);
    const p: Problem2D = { wavelength: lam, distance: z, regions: [disc(a)], light: plane, opaque: false };
    const fr = pts.map(([x, y]) => {
      const u = fresnelRadial(lam, z, 0, a, Infinity, Math.hypot(x, y), false);
      return u.re * u.re + u.im * u.im;
    });
    expect(maxDiffOverPeak(I(boundaryField(p, pts)), fr)).toBeLessThan(1e-6);
  });
  it('the radial Fresnel integral on the axis is 4 sin²(πN_F/2) (Goodman §4.5, problem on the axis; from memory) to 1e-10', () => {
    const a = Math.sqrt(1.3 * lam * z);
    const u = fresnelRadial(lam, z, 0, a, Infinity, 0, false);
    expect(Math.abs(u.re ** 2 + u.im ** 2 - 4 * Math.sin((Math.PI * 1.3) / 2) ** 2)).toBeLessThan(1e-10);
  });
});

describe('Gaussian beam (Siegman, Lasers, ch. 17): w(z) = w₀√(1 + (z/z_R)²), peak (w₀/w)²', () => {
  it('through a wide disc, at z = z_R: 2-D quadrature and the on-axis quadrature follow the beam to 1e-6', () => {
    const lam = 1 * um;
    const w0 = 20 * um; // paraxial error ~ (λ/πw₀)² = 2.5e-4 of the phase curvature, less in intensity
    const zr = (Math.PI * w0 * w0) / lam;
    const wz = w0 * Math.SQRT2;
    const pts: [number, number][] = [[0, 0], [0.5 * wz, 0], [wz, 0], [0, 1.5 * wz]];
    const p: Problem2D = { wavelength: lam, distance: zr, regions: [disc(8 * w0)], light: { kind: 'gaussian', waist: w0, sinTilt: 0 }, opaque: false };
    const q = I(quad2dField(p, pts));
    const g = pts.map(([x, y]) => (w0 / wz) ** 2 * Math.exp((-2 * (x * x + y * y)) / (wz * wz)));
    expect(maxDiffOverPeak(q, g)).toBeLessThan(1e-3);
    expect(Math.abs(roundOnAxisIntensity(lam, zr, [{ radius: 8 * w0, sign: 1 }], w0, false) - q[0]!)).toBeLessThan(1e-9);
  });
  it('paraxial regime (w₀ = 0.5 mm): the 2-D quadrature follows the beam to 1e-6 of the peak', () => {
    const lam = 500 * nm;
    const w0 = 0.5 * mm;
    const zr = (Math.PI * w0 * w0) / lam;
    const wz = w0 * Math.SQRT2;
    const pts: [number, number][] = [[0, 0], [0.7 * wz, 0]];
    const p: Problem2D = { wavelength: lam, distance: zr, regions: [rect(14 * w0, 14 * w0)], light: { kind: 'gaussian', waist: w0, sinTilt: 0 }, opaque: false };
    const g = pts.map(([x, y]) => (w0 / wz) ** 2 * Math.exp((-2 * (x * x + y * y)) / (wz * wz)));
    expect(maxDiffOverPeak(I(quad2dField(p, pts)), g)).toBeLessThan(1e-6);
  });
  it("Babinet in a tilted Gaussian beam: obstacle + hole = the beam's disc (identity of the complement code)", () => {
    const base = { wavelength: 0.8 * um, distance: 30 * um, light: { kind: 'gaussian' as const, waist: 6 * um, sinTilt: 0.2 } };
    const pts: [number, number][] = [[0, 0], [8 * um, 1 * um], [-3 * um, -4 * um]];
    const o = quad2dField({ ...base, regions: [rect(5 * um, 3 * um)], opaque: true }, pts);
    const h = quad2dField({ ...base, regions: [rect(5 * um, 3 * um)], opaque: false }, pts);
    const f = quad2dField({ ...base, regions: [disc(6.5 * 6 * um)], opaque: false }, pts);
    for (let i = 0; i < pts.length; i++) {
      expect(Math.hypot(o.re[i]! + h.re[i]! - f.re[i]!, o.im[i]! + h.im[i]! - f.im[i]!)).toBeLessThan(1e-12);
    }
  });
});

describe('far field of a disc (Airy pattern, Born & Wolf §8.5.2)', () => {
  // N_F = a²/(λz) = 1e-6: the boundary form must give the Airy pattern (πa²/λz)²[2J₁(v)/v]² with
  // obliquity, and its first zero at sin θ = 1.21967 λ/D.
  const lam = 500 * nm;
  const a = 10 * um;
  const z = (a * a) / (lam * 1e-6);
  const p: Problem2D = { wavelength: lam, distance: z, regions: [disc(a)], light: plane, opaque: false };
  it('has the peak (πa²/λz)² to 1e-6 and the Airy profile to 1e-5 of the peak (paraxial angles)', () => {
    const pts: [number, number][] = Array.from({ length: 41 }, (_, i): [number, number] => [((3 * lam * z) / (2 * a)) * (i / 40), 0]);
    const b = I(boundaryField(p, pts));
    const peak = ((Math.PI * a * a) / (lam * z)) ** 2;
    expect(Math.abs(b[0]! - peak) / peak).toBeLessThan(1e-6);
    const airy = pts.map(([x]) => {
      const r = Math.hypot(x, z);
      const v = (2 * Math.PI * a * x) / (lam * r);
      const f = v === 0 ? 1 : (2 * besselj1(v)) / v;
      return peak * (z / r) ** 4 * f * f; // (z/r)² obliquity and (z/r)² spreading in 2-D
    });
    expect(maxDiffOverPeak(b, airy)).toBeLessThan(1e-5);
  });
  it('has its first zero at sin θ = 1.21967 λ/D to 1e-5', () => {
    // Golden-section search for the minimum near the expected zero.
    const f = (s: number) => I(boundaryField(p, [[(z * s) / Math.sqrt(1 - s * s), 0]]))[0]!;
    let lo = (1.1 * lam) / (2 * a);
    let hi = (1.3 * lam) / (2 * a);
    const g = (Math.sqrt(5) - 1) / 2;
    for (let i = 0; i < 60; i++) {
      const m1 = hi - g * (hi - lo);
      const m2 = lo + g * (hi - lo);
      if (f(m1) < f(m2)) hi = m2;
      else lo = m1;
    }
    expect(Math.abs((lo + hi) / 2 / (lam / (2 * a)) - 1.21967) / 1.21967).toBeLessThan(1e-5);
  });
});
