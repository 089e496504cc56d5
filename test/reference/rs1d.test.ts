// The exact 1-D Rayleigh–Sommerfeld reference (rs1d.ts) against itself refined, the Fresnel
// integrals in the paraxial limit, the far-field formula, the Gaussian beam and published values.
import { describe, expect, it } from 'vitest';
import besselj1 from '@stdlib/math-base-special-besselj1';
import bessely1 from '@stdlib/math-base-special-bessely1';
import { complementWithin, gratingIntervals, intensity, rs1d, type Problem1D } from './rs1d.js';
import { fresnel1D, paraxialBound } from './fresnel.js';
import { maxDiffOverPeak } from '../helpers.js';

const nm = 1e-9;
const um = 1e-6;
const mm = 1e-3;

function linspace(a: number, b: number, n: number): number[] {
  return Array.from({ length: n }, (_, i) => a + ((b - a) * i) / (n - 1));
}

describe('Hankel function H₁ = J₁ + iY₁ from @stdlib at large arguments', () => {
  // Large-argument expansion (Abramowitz & Stegun 9.2.5–9.2.10, from memory):
  // J₁ + iY₁ = √(2/πx) e^{i(x − 3π/4)} (P + iQ), P ≈ 1 + 15/(128x²), Q ≈ 3/(8x) − 105/(1024x³).
  it.each([1e4, 3.7e6, 2.5e9])('agrees with the expansion at x = %f to 1e-11 of its modulus', (x) => {
    const P = 1 + 15 / (128 * x * x);
    const Q = 3 / (8 * x) - 105 / (1024 * x ** 3);
    const m = Math.sqrt(2 / (Math.PI * x));
    // e^{i(x − 3π/4)} with x reduced exactly enough: Math.cos/sin reduce large arguments exactly.
    const c = Math.cos(x) * Math.cos((3 * Math.PI) / 4) + Math.sin(x) * Math.sin((3 * Math.PI) / 4);
    const s = Math.sin(x) * Math.cos((3 * Math.PI) / 4) - Math.cos(x) * Math.sin((3 * Math.PI) / 4);
    const J = m * (c * P - s * Q);
    const Y = m * (s * P + c * Q);
    expect(Math.abs(besselj1(x) - J) / m).toBeLessThan(1e-11);
    expect(Math.abs(bessely1(x) - Y) / m).toBeLessThan(1e-11);
  });
});

describe('convergence: every panel halved and more nodes change the field by < 1e-11 of the peak', () => {
  const cases: [string, Problem1D, number[]][] = [
    ['near-field slit at 3 λ (non-paraxial)', { wavelength: 500 * nm, distance: 1.5 * um, intervals: [[-4 * um, 4 * um]], light: { kind: 'plane', sinTilt: 0 }, opaque: false }, linspace(-8 * um, 8 * um, 41)],
    ['tilted grating of 7 slits, N_F ≈ 3', { wavelength: 633 * nm, distance: 2 * mm, intervals: gratingIntervals(7, 20 * um, 50 * um), light: { kind: 'plane', sinTilt: Math.sin(0.3) }, opaque: false }, linspace(0.3 * mm, 1 * mm, 41)],
    ['Gaussian through a slit, obstacle', { wavelength: 1 * um, distance: 0.2 * mm, intervals: [[-15 * um, 15 * um]], light: { kind: 'gaussian', waist: 40 * um, sinTilt: 0 }, opaque: true }, linspace(-0.1 * mm, 0.1 * mm, 41)],
  ];
  it.each(cases)('%s', (_name, p, xs) => {
    const a = intensity(rs1d(p, xs));
    const b = intensity(rs1d(p, xs, { nodes: 24, phasePerPanel: 4 }));
    expect(maxDiffOverPeak(a, b)).toBeLessThan(1e-11);
  });
});

describe('the interpolated kernel path (large kr) agrees with stdlib J₁, Y₁ at every node', () => {
  it.each([
    ['far field, tilted grating', { wavelength: 500 * nm, distance: 3, intervals: gratingIntervals(9, 12 * um, 40 * um), light: { kind: 'plane' as const, sinTilt: 0.2 }, opaque: false }, linspace(0.2, 1.0, 31)],
    ['near field, wide slit at 1 mm', { wavelength: 1 * um, distance: 1 * mm, intervals: [[-0.4 * mm, 0.4 * mm]] as [number, number][], light: { kind: 'plane' as const, sinTilt: 0 }, opaque: false }, linspace(-0.6 * mm, 0.6 * mm, 31)],
    ['Gaussian obstacle', { wavelength: 633 * nm, distance: 0.05, intervals: [[-0.1 * mm, 0.05 * mm]] as [number, number][], light: { kind: 'gaussian' as const, waist: 0.3 * mm, sinTilt: 0.01 }, opaque: true }, linspace(-1 * mm, 1.5 * mm, 31)],
  ] as const)('%s: to 1e-10 of the peak', (_n, p, xs) => {
    const a = intensity(rs1d(p as Problem1D, xs));
    const b = intensity(rs1d(p as Problem1D, xs, { direct: true }));
    expect(maxDiffOverPeak(a, b)).toBeLessThan(1e-10);
  });
});

describe('paraxial limit: the Fresnel integrals (Born & Wolf §8.7), z = 20 m', () => {
  it.each([
    [1, 0],
    [3, 0],
    [2, 0.0002],
  ])('slit at N_F = %f, tilt sin θ = %f: agrees to 1e-6 of the peak, and within the proven bound', (nf, alpha) => {
    const lam = 500 * nm;
    const z = 20;
    const a = Math.sqrt(nf * lam * z);
    const xs = linspace(-1.5 * a + alpha * z, 1.5 * a + alpha * z, 201);
    const p: Problem1D = { wavelength: lam, distance: z, intervals: [[-a, a]], light: { kind: 'plane', sinTilt: alpha }, opaque: false };
    const rs = intensity(rs1d(p, xs));
    const fr = xs.map((x) => {
      const u = fresnel1D(lam, z, [[-a, a]], alpha, x, false);
      return u.re * u.re + u.im * u.im;
    });
    const B = paraxialBound(lam, z, 2 * a, 2.5 * a + Math.abs(alpha) * z, true);
    const peak = Math.max(...fr);
    // Within the proven bound on |ΔI| (2|U|B + B²), and below 1e-6 of the peak.
    expect(maxDiffOverPeak(rs, fr)).toBeLessThan((2 * Math.sqrt(peak) * B + B * B) / peak);
    expect(maxDiffOverPeak(rs, fr)).toBeLessThan(1e-6);
  });

  it('a wire (opaque strip) agrees with the free wave less the Fresnel slit, to 1e-6', () => {
    const lam = 500 * nm;
    const z = 20;
    const a = Math.sqrt(2 * lam * z);
    const xs = linspace(-3 * a, 3 * a, 201);
    const rs = intensity(rs1d({ wavelength: lam, distance: z, intervals: [[-a, a]], light: { kind: 'plane', sinTilt: 0 }, opaque: true }, xs));
    const fr = xs.map((x) => {
      const u = fresnel1D(lam, z, [[-a, a]], 0, x, true);
      return u.re * u.re + u.im * u.im;
    });
    expect(maxDiffOverPeak(rs, fr)).toBeLessThan(1e-6);
  });
});

describe('far-field limit', () => {
  // In the far field (N_F = a²/λz = 1e-7 here) the 1-D integral becomes
  // U = (z/r) e^{ikr}/√(iλr) · w sinc(w sinθ/λ) (stationary form of the H₁ kernel; Goodman §4.3 in 1-D),
  // so I = (z/r)² w²/(λr) sinc²(w x/(λr)).
  const lam = 500 * nm;
  const w = 2 * um;
  const z = 20;
  const p: Problem1D = { wavelength: lam, distance: z, intervals: [[-w / 2, w / 2]], light: { kind: 'plane', sinTilt: 0 }, opaque: false };
  const xs = linspace(0, 12, 601); // out to sin θ ≈ 0.5
  const rs = intensity(rs1d(p, xs));
  it('matches the far-field formula with obliquity to 1e-6 of the peak', () => {
    const ff = xs.map((x) => {
      const r = Math.hypot(x, z);
      const u = (Math.PI * w * x) / (lam * r);
      const sinc = u === 0 ? 1 : Math.sin(u) / u;
      return (z / r) ** 2 * ((w * w) / (lam * r)) * sinc * sinc;
    });
    expect(maxDiffOverPeak(rs, ff)).toBeLessThan(1e-6);
  });
  it('has its first side lobe at 4.72 % of the peak (Hecht, Optics, §10.2: sinc² side lobe 0.0472)', () => {
    // Finely sampled near the first side lobe (w sinθ/λ ≈ 1.43); the obliquity and spreading
    // factors (z/r)²/r are divided out, so what remains is the sinc² of sin θ.
    const xs2 = linspace((1.3 * lam) / w, (1.6 * lam) / w, 301).map((s) => (z * s) / Math.sqrt(1 - s * s));
    const I = intensity(rs1d(p, xs2)).map((v, i) => {
      const r = Math.hypot(xs2[i]!, z);
      return (v * (r / z) ** 2 * r) / z;
    });
    const I0 = intensity(rs1d(p, [0]))[0]!;
    expect(Math.max(...I) / I0).toBeCloseTo(0.0472, 4);
  });
});

describe('Gaussian beam through a wide slit', () => {
  // A 1-D (cylindrical) Gaussian beam of amplitude radius w₀ at its waist: |U|² = (w₀/w) e^{−2x²/w²},
  // w = w₀√(1 + (z/z_R)²), z_R = πw₀²/λ (Siegman, Lasers, ch. 17; the 1-D amplitude factor is the
  // square root of the 2-D one). Paraxial error ~ (λ/πw₀)² = 1e-8 here.
  it('follows the paraxial beam to 1e-6 of the peak at z = z_R', () => {
    const lam = 500 * nm;
    const w0 = 0.9 * mm;
    const zr = (Math.PI * w0 * w0) / lam;
    const wz = w0 * Math.SQRT2;
    const xs = linspace(-2.5 * wz, 2.5 * wz, 101);
    const rs = intensity(rs1d({ wavelength: lam, distance: zr, intervals: [[-10 * w0, 10 * w0]], light: { kind: 'gaussian', waist: w0, sinTilt: 0 }, opaque: false }, xs));
    const g = xs.map((x) => (w0 / wz) * Math.exp((-2 * x * x) / (wz * wz)));
    expect(maxDiffOverPeak(rs, g)).toBeLessThan(1e-6);
  });
  it("Babinet: a wire's field plus its slit's field is the free beam (identity of the complement code, 1e-10)", () => {
    // 1e-10: kr ≈ 5e5 here, and J₁, Y₁ take kr rounded to double (a phase noise of k·ulp(r) per node).
    const base = { wavelength: 633 * nm, distance: 0.05, light: { kind: 'gaussian' as const, waist: 0.3 * mm, sinTilt: 0.01 } };
    const ivs: [number, number][] = [[-0.1 * mm, 0.05 * mm]];
    const xs = linspace(-1 * mm, 1.5 * mm, 51);
    const open = rs1d({ ...base, intervals: ivs, opaque: false }, xs);
    const wire = rs1d({ ...base, intervals: ivs, opaque: true }, xs);
    const free = rs1d({ ...base, intervals: [[-2 * mm, 2 * mm]], opaque: false }, xs);
    let worst = 0;
    for (let i = 0; i < xs.length; i++) worst = Math.max(worst, Math.hypot(open.re[i]! + wire.re[i]! - free.re[i]!, open.im[i]! + wire.im[i]! - free.im[i]!));
    expect(worst).toBeLessThan(1e-10);
    expect(complementWithin([[-1, 0], [1, 2]], 3)).toEqual([[-3, -1], [0, 1], [2, 3]]);
  });
});
