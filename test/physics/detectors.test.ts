// Detectors (the job's analysis.detectors): partly or wholly outside the window, and behind an
// opaque obstacle, against closed forms — the slit's far-field sinc² (Hecht, Optics, §10.2), the
// disc's Poisson spot J₀² (Born & Wolf, Principles of Optics, §8.8), the Gaussian beam (Siegman,
// Lasers, ch. 17) — and plain geometry for the area inside the window.
import besselj0 from '@stdlib/math-base-special-besselj0';
import besselj1 from '@stdlib/math-base-special-besselj1';
import { describe, expect, it } from 'vitest';
import { mapExtent } from '../../src/analysis/encircled.js';
import { mm, nm, runCase, um } from '../helpers.js';

const lam = 633 * nm;

/** Simpson's rule on [a, b] with n (even) panels. */
function simpson(f: (x: number) => number, a: number, b: number, n = 2000): number {
  const h = (b - a) / n;
  let s = f(a) + f(b);
  for (let i = 1; i < n; i++) s += (i % 2 ? 4 : 2) * f(a + i * h);
  return (s * h) / 3;
}

describe('a slit in the far field, with a strip detector half outside a 6 mm window', () => {
  const w = 100 * um;
  const z = 1;
  const { rec, c } = runCase({
    wavelength: lam,
    distance: z,
    aperture: { shape: 'slit', width: w, opaque: false },
    window: [6 * mm, 6 * mm],
    analysis: {
      detectors: [
        { kind: 'square', size: 2 * mm, at: [3 * mm, 0] },
        { kind: 'square', size: 2 * mm, at: [5 * mm, 0] },
        { kind: 'square', size: 1 * mm, at: [0, 0] },
      ],
    },
  });
  const [half, outside, inside] = rec.metrics.detectors;
  const right = mapExtent(c)[1];
  // Far-field slit, 1-D: I(x) = (w²/λz)·sinc²(wx/λz) relative to the incident irradiance
  // (Hecht §10.2; x/z ≤ 0.003 here, so the paraxial form is exact to 1e-5).
  const I = (x: number) => {
    const u = (Math.PI * w * x) / (lam * z);
    return ((w * w) / (lam * z)) * (u === 0 ? 1 : (Math.sin(u) / u) ** 2);
  };

  it('reports the fraction of its width inside the window (the outer samples’ cells included)', () => {
    expect(half!.areaInWindow).toBeCloseTo((right - 2 * mm) / (2 * mm), 12);
    expect(half!.areaInWindow).toBeGreaterThan(0.5);
    expect(half!.areaInWindow).toBeLessThan(0.51);
  });
  it('reads the power on the part inside, as a fraction of the power through the slit (sinc², to 0.3 %)', () => {
    // Budget: the far-field formula's 0.1 % of the peak (test/physics/far-field.test.ts) over a
    // region at 40–70 % of the peak, and the 8 sub-cells per sample at the strip's inner edge.
    const ref = simpson(I, 2 * mm, right) / w;
    expect(half!.reference).toBe('power-through-aperture');
    expect(Math.abs(half!.fraction! - ref) / ref).toBeLessThan(3e-3);
  });
  it('reads null, never 0, for a detector wholly outside, and warns about both', () => {
    expect(outside!.areaInWindow).toBe(0);
    expect(outside!.fraction).toBeNull();
    const warn = rec.warnings.find((x) => x.code === 'detector-outside');
    expect(warn).toBeDefined();
    expect(warn!.message).toMatch(/square 1 .* outside the window: its value counts only the part inside and is a lower bound/);
    expect(warn!.message).toMatch(/square 2 .* lies wholly outside the window: it has no value \(null\)/);
    expect(warn!.message).not.toMatch(/square 3/);
    expect(warn!.message).toMatch(/widen the window the job gives/);
  });
  it('reads a detector inside the window in full (sinc², to 0.2 %)', () => {
    expect(inside!.areaInWindow).toBe(1);
    const ref = simpson(I, -0.5 * mm, 0.5 * mm) / w;
    expect(Math.abs(inside!.fraction! - ref) / ref).toBeLessThan(2e-3);
  });
});

describe('a pinhole detector half outside the window of a far-field pinhole (2-D)', () => {
  it('has the area of the disc inside the window to 0.5 % (circular segment, common practice)', () => {
    const R = 0.2 * mm;
    const { rec, c } = runCase({
      wavelength: lam,
      distance: 0.1,
      aperture: { shape: 'circle', diameter: 50 * um, opaque: false },
      window: [1 * mm, 1 * mm],
      analysis: { detectors: [{ kind: 'pinhole', size: 2 * R, at: [0.5 * mm, 0] }] },
    });
    // The part of the disc (centre c, radius R) left of the window's edge x_e = c + e has area
    // R²·acos(−e/R) + e·√(R² − e²).
    const e = mapExtent(c)[1] - 0.5 * mm;
    const inside = (R * R * Math.acos(-e / R) + e * Math.sqrt(R * R - e * e)) / (Math.PI * R * R);
    const d = rec.metrics.detectors[0]!;
    expect(Math.abs(d.areaInWindow - inside)).toBeLessThan(5e-3);
    expect(d.fraction).not.toBeNull();
    expect(rec.warnings.map((x) => x.code)).toContain('detector-outside');
  });
});

describe('detectors behind an opaque disc (Babinet), relative to what they would receive unobstructed', () => {
  const D = 0.5 * mm;
  const z = 0.05; // N_F = a²/(λz) ≈ 2
  const a = D / 2;
  const k = (2 * Math.PI) / lam;
  // First zero of the Poisson spot J₀(k·a·r/z): r₀ = 2.405·z/(k·a). A pinhole of 0.3·r₀ radius.
  const rho = (0.3 * 2.405 * z) / (k * a);
  const { rec } = runCase({
    wavelength: lam,
    distance: z,
    aperture: { shape: 'circle', diameter: D, opaque: true },
    analysis: {
      detectors: [
        { kind: 'pinhole', size: 2 * rho, at: [0, 0] },
        { kind: 'square', size: 0.2 * mm, at: [0.6 * mm, 0] },
      ],
    },
  });
  const [spot, lit] = rec.metrics.detectors;

  it('lists every detector (none is dropped behind an obstacle) and says which reference it uses', () => {
    expect(rec.metrics.detectors).toHaveLength(2);
    expect(spot!.reference).toBe('unobstructed-beam');
    expect(lit!.reference).toBe('unobstructed-beam');
  });
  it('uses the detector’s area × 1 as the reference in a plane wave (to 0.3 %)', () => {
    expect(Math.abs(spot!.referencePower - Math.PI * rho * rho) / (Math.PI * rho * rho)).toBeLessThan(3e-3);
    expect(Math.abs(lit!.referencePower - (0.2 * mm) ** 2) / (0.2 * mm) ** 2).toBeLessThan(3e-3);
  });
  it('reads the Poisson spot: the mean of J₀²(k·a·r/z) over the pinhole, J₀²(v₀) + J₁²(v₀), to 1 %', () => {
    // Born & Wolf §8.8: behind an opaque disc the field near the axis is the unobstructed one times
    // J₀(k·a·r/z), to terms in (r/a)²; the mean over a disc of radius ρ follows from
    // ∫v·J₀²(v)dv = v²(J₀² + J₁²)/2 (Lommel's integral, from memory). J from a reference library.
    // Budget: 0.4 % for the neglected terms at N_F ≈ 2, the method's 0.25 % of the peak, and the
    // sub-cell coverage of a pinhole about six samples across.
    const v0 = (k * a * rho) / z;
    const ref = besselj0(v0) ** 2 + besselj1(v0) ** 2;
    expect(Math.abs(spot!.fraction! - ref) / ref).toBeLessThan(0.01);
  });
  it('reads about 1 well outside the shadow, where the disc takes almost nothing from the beam (to 3 %)', () => {
    // 0.6 mm from the axis, 0.35 mm outside the geometric shadow: the disc's diffracted light there
    // is a small ring pattern of mean near 0 over a 0.2 mm square (common practice); 3 % is its budget.
    expect(Math.abs(lit!.fraction! - 1)).toBeLessThan(0.03);
  });
});

describe('a detector behind an opaque disc in a Gaussian beam', () => {
  it('takes as reference the unobstructed beam’s power on it, (πw₀²/2)(1 − e^{−2ρ²/w²}) on the axis (Siegman ch. 17), to 0.3 %', () => {
    const w0 = 0.5 * mm;
    const z = 0.2;
    const rho = 0.4 * mm;
    const { rec } = runCase({
      wavelength: lam,
      distance: z,
      aperture: { shape: 'circle', diameter: 0.2 * mm, opaque: true },
      illumination: { kind: 'gaussian', waist: w0, tilt: [0, 0] },
      analysis: { detectors: [{ kind: 'pinhole', size: 2 * rho, at: [0, 0] }] },
    });
    const zr = (Math.PI * w0 * w0) / lam;
    const wz = w0 * Math.sqrt(1 + (z / zr) ** 2);
    const ref = ((Math.PI * w0 * w0) / 2) * (1 - Math.exp((-2 * rho * rho) / (wz * wz)));
    const d = rec.metrics.detectors[0]!;
    expect(d.reference).toBe('unobstructed-beam');
    expect(Math.abs(d.referencePower - ref) / ref).toBeLessThan(3e-3);
    expect(d.fraction).not.toBeNull();
    // The disc takes light from the middle of the pinhole: it reads less than the beam alone would.
    expect(d.fraction!).toBeLessThan(1);
    expect(d.fraction!).toBeGreaterThan(0.5);
  });
});
