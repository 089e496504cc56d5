// The spot's FWHM is the width of its envelope: between the outermost half-maximum crossings of the
// profile through the peak. Near field (a square at N_F ≈ 5), against the Fresnel-integral pattern
// (Abramowitz & Stegun ch. 7; C and S from a reference library); far field unchanged: Airy and sinc²
// half-maximum widths from their closed forms (Born & Wolf §8.5.2; Hecht, Optics, §10.2).
import besselj1 from '@stdlib/math-base-special-besselj1';
import fresnel from '@stdlib/math-base-special-fresnel';
import { describe, expect, it } from 'vitest';
import { nm, runCase, um } from '../helpers.js';

const lam = 633 * nm;

function bisect(f: (x: number) => number, lo: number, hi: number): number {
  for (let i = 0; i < 100; i++) {
    const mid = (lo + hi) / 2;
    if (f(lo) * f(mid) <= 0) hi = mid;
    else lo = mid;
  }
  return (lo + hi) / 2;
}

describe('a square at N_F ≈ 5 (near field): FWHM of the envelope, not of one fringe', () => {
  const w = 1e-3;
  const z = (w / 2) ** 2 / (lam * 5);
  // Fresnel diffraction by a slit (A&S ch. 7; Hecht §10.3): relative to the incident irradiance,
  // I(x) = ½[(C(α₂) − C(α₁))² + (S(α₂) − S(α₁))²], α = √(2/λz)·(±w/2 − x). The square's pattern is
  // I(x)·I(y), so the profile through its peak, along x, is proportional to I(x).
  const s = Math.sqrt(2 / (lam * z));
  const Ix = (x: number) => {
    const [s1, c1] = fresnel(s * (-w / 2 - x));
    const [s2, c2] = fresnel(s * (w / 2 - x));
    return 0.5 * ((c2 - c1) ** 2 + (s2 - s1) ** 2);
  };
  // The reference profile on a fine grid: its maximum, and the crossings of half of it.
  const n = 40001;
  const xs = Array.from({ length: n }, (_, i) => -w + (2 * w * i) / (n - 1));
  const vals = xs.map(Ix);
  const peak = Math.max(...vals);
  const half = (x: number) => Ix(x) - peak / 2;
  const first = vals.findIndex((v) => v > peak / 2);
  const last = n - 1 - [...vals].reverse().findIndex((v) => v > peak / 2);
  const envelope = bisect(half, xs[last]!, xs[last + 1]!) - bisect(half, xs[first - 1]!, xs[first]!);
  const iPeak = vals.indexOf(peak);
  let l = iPeak;
  while (vals[l]! > peak / 2) l--;
  let r = iPeak;
  while (vals[r]! > peak / 2) r++;
  const fringe = bisect(half, xs[r - 1]!, xs[r]!) - bisect(half, xs[l]!, xs[l + 1]!);

  const { rec, plan } = runCase({ wavelength: lam, distance: z, aperture: { shape: 'rectangle', width: w, height: w, opaque: false } });

  it('has fringes above half the peak, so the width next to the peak is that of one fringe', () => {
    // The test means something only if the two readings differ: the fringe is far narrower.
    expect(plan.checks.fresnelNumbers[0]).toBeCloseTo(5, 9);
    expect(fringe).toBeLessThan(0.5 * envelope);
  });
  it('reports the envelope width, between the outermost half-maximum crossings, to 0.3 %', () => {
    // Budget: the method's 0.25 % of the peak where the edges fall steeply (a shift of 0.25 % of
    // the peak over the edge slope is a small fraction of a sample), and linear interpolation
    // between samples at the crossing.
    expect(Math.abs(rec.metrics.fwhm[0]! - envelope) / envelope).toBeLessThan(3e-3);
    expect(Math.abs(rec.metrics.fwhm[1]! - envelope) / envelope).toBeLessThan(3e-3);
  });
});

describe('far-field widths are unchanged', () => {
  it('a pinhole: FWHM = 2v½·λz/(πD) = 1.029 λz/D, with [2J₁(v½)/v½]² = ½ (Born & Wolf §8.5.2; J₁ from a reference library), to 0.2 %', () => {
    const vh = bisect((v) => ((2 * besselj1(v)) / v) ** 2 - 0.5, 1, 2);
    expect(vh).toBeCloseTo(1.6163, 4); // from memory: the Airy half-maximum
    const D = 50 * um;
    const z = 1;
    const { rec } = runCase({ wavelength: lam, distance: z, aperture: { shape: 'circle', diameter: D, opaque: false } });
    const ref = (2 * vh * lam * z) / (Math.PI * D);
    expect(ref / ((lam * z) / D)).toBeCloseTo(1.029, 3);
    expect(Math.abs(rec.metrics.fwhm[0]! - ref) / ref).toBeLessThan(2e-3);
    expect(Math.abs(rec.metrics.fwhm[1]! - ref) / ref).toBeLessThan(2e-3);
  });
  it('a slit: FWHM = 2u½·λz/w = 0.886 λz/w, with sinc²(u½) = ½ (Hecht §10.2), to 0.2 %', () => {
    const uh = bisect((u) => (Math.sin(Math.PI * u) / (Math.PI * u)) ** 2 - 0.5, 0.1, 0.9);
    const wSlit = 100 * um;
    const z = 1;
    const { rec } = runCase({ wavelength: lam, distance: z, aperture: { shape: 'slit', width: wSlit, opaque: false } });
    const ref = (2 * uh * lam * z) / wSlit;
    expect(Math.abs(rec.metrics.fwhm[0]! - ref) / ref).toBeLessThan(2e-3);
  });
});

// D4σ of a hard-edged aperture depends on the window: the sinc² far field of a slit has wings
// whose average is 1/(2π²u²) (the mean of sin² is ½; Hecht §10.2 for sinc²), so ∫x²I dx over a
// window of half-width W grows as W and D4σ as √W: cutting the window to 80 % lowers D4σ by
// 1 − √0.8 = 10.6 % once the window holds many lobes. A Gaussian beam well inside its window has
// no such wings (ISO 11146's second moments are meant for it): its D4σ does not move.
describe('D4σ says when it depends on the window', () => {
  it('a slit in the far field: D4σ falls by about 1 − √0.8 = 10.6 % with the window cut to 80 %', () => {
    const { rec } = runCase({ wavelength: lam, distance: 1, aperture: { shape: 'slit', width: 100 * um, opaque: false }, window: [0.2, 0] });
    const change = rec.metrics.d4sigmaWindowChange[0]!;
    expect(Math.abs(change - (1 - Math.sqrt(0.8)))).toBeLessThan(0.02);
    expect(rec.metrics.d4sigmaWindowChange[1]).toBeNull();
  });
  it('a Gaussian beam (w = 0.3 mm) through a 3 mm pinhole: D4σ = 2w(z) and does not move (under 0.5 %)', () => {
    const w0 = 0.3e-3;
    const z = 0.2;
    const { rec } = runCase({ wavelength: lam, distance: z, aperture: { shape: 'circle', diameter: 3e-3, opaque: false }, illumination: { kind: 'gaussian', waist: w0, tilt: [0, 0] } });
    // w(z) = w0·√(1 + (z/zR)²), zR = πw0²/λ (Siegman, Lasers, ch. 17); D4σ of a Gaussian is 2w.
    const zR = (Math.PI * w0 * w0) / lam;
    const wz = w0 * Math.sqrt(1 + (z / zR) ** 2);
    expect(Math.abs(rec.metrics.d4sigma[0]! - 2 * wz) / (2 * wz)).toBeLessThan(0.01);
    expect(Math.abs(rec.metrics.d4sigmaWindowChange[0]!)).toBeLessThan(0.005);
    expect(Math.abs(rec.metrics.d4sigmaWindowChange[1]!)).toBeLessThan(0.005);
  });
});
