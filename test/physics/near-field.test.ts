// Near field and transition (N_F ≳ 1/8) on planner-chosen grids, against closed forms.
import { describe, expect, it } from 'vitest';
import fresnel from '@stdlib/math-base-special-fresnel';
import { mm, nm, runCase } from '../helpers.js';

const lam = 633 * nm;

describe('the Fresnel integrals used as the reference', () => {
  // Abramowitz & Stegun, Handbook of Mathematical Functions, Table 7.7, C(x) = ∫cos(πt²/2), S(x) =
  // ∫sin(πt²/2) (table values as recalled: from memory).
  it.each([
    [0.5, 0.4923442, 0.0647324],
    [1.0, 0.7798934, 0.4382591],
    [2.0, 0.4882534, 0.3434157],
  ])('C(x) and S(x) at x = %f agree with the table to 1e-6', (x, C, S) => {
    const [s, c] = fresnel(x);
    expect(c).toBeCloseTo(C, 6);
    expect(s).toBeCloseTo(S, 6);
  });
});

/**
 * Slit of half-width a, plane wave, paraxial: I(x) = ½{[C(α₂)−C(α₁)]² + [S(α₂)−S(α₁)]²},
 * α₁,₂ = √(2/λz)(∓a − x) (Hecht, Optics, §10.3; Born & Wolf §8.7).
 */
function slitIntensity(x: number, a: number, z: number): number {
  const s = Math.sqrt(2 / (lam * z));
  const [s1, c1] = fresnel(s * (-a - x));
  const [s2, c2] = fresnel(s * (a - x));
  return 0.5 * ((c2 - c1) ** 2 + (s2 - s1) ** 2);
}

describe.each([0.5, 2, 10])('slit in the Fresnel regime, N_F = %f', (nf) => {
  // z large enough that the paraxial approximation holds (quartic phase 2π N_F²λ/z ≪ 0.1 rad).
  const z = 0.5;
  const a = Math.sqrt(nf * lam * z);
  const { plan, rec, c, x } = runCase({ wavelength: lam, distance: z, aperture: { shape: 'slit', width: 2 * a, opaque: false } });

  it('is planned with a method valid here (Fresnel, or an exact one where it is cheaper), without warnings', () => {
    expect(plan.options.find((o) => o.method === plan.method && o.form === plan.form)!.valid).toBe(true);
    expect(['fresnel', 'angular-spectrum', 'rayleigh-sommerfeld']).toContain(plan.method);
    expect(plan.regime).toBe(nf > 1 ? 'near-field' : 'transition');
    expect(rec.warnings).toEqual([]);
  });

  it('matches the Fresnel-integral pattern within 0.2 % of the peak', () => {
    let worst = 0;
    let peak = 0;
    for (let col = 0; col < c.nx; col++) {
      const ref = slitIntensity(x(col), a, z);
      peak = Math.max(peak, ref);
      worst = Math.max(worst, Math.abs(c.intensity[col]! - ref));
    }
    expect(worst / peak).toBeLessThan(2e-3);
  });

  it('conserves power: the window holds what went through the slit, less the planned margin', () => {
    expect(rec.metrics.windowFraction!).toBeGreaterThan(0.95);
    expect(rec.metrics.windowFraction!).toBeLessThan(1.0001);
  });
});

describe('slit by the angular spectrum, forced, in a paraxial geometry', () => {
  // Where the paraxial approximation holds, the exact method must agree with the Fresnel integrals.
  const z = 0.5;
  const a = Math.sqrt(3 * lam * z);
  const { plan, rec, c, x } = runCase({
    wavelength: lam,
    distance: z,
    aperture: { shape: 'slit', width: 2 * a, opaque: false },
    method: 'angular-spectrum',
  });
  it('agrees with the Fresnel integrals within 0.2 % of the peak', () => {
    expect(plan.method).toBe('angular-spectrum');
    let worst = 0;
    for (let col = 0; col < c.nx; col++) worst = Math.max(worst, Math.abs(c.intensity[col]! - slitIntensity(x(col), a, z)));
    expect(worst / rec.metrics.peakIntensity).toBeLessThan(2e-3);
  });
});

describe.each([
  [1 * mm, 10 * mm],
  [0.4 * mm, 20 * mm],
  [2 * mm, 100 * mm],
])('circular aperture D = %f m at z = %f m, on axis', (D, z) => {
  const a = D / 2;
  const { plan, rec } = runCase({ wavelength: lam, distance: z, aperture: { shape: 'circle', diameter: D, opaque: false } });
  it('matches the exact Rayleigh–Sommerfeld on-axis intensity within 0.5 % of 4 (the largest possible value)', () => {
    // First-kind Rayleigh–Sommerfeld on axis: U = e^{ikz} − (z/R)e^{ikR}, R = √(z²+a²)
    // (closed form, e.g. Heurtley, J. Opt. Soc. Am. 63, 1003 (1973); from memory), so
    // I = 1 + (z/R)² − 2(z/R)cos k(R − z).
    const k = (2 * Math.PI) / lam;
    const R = Math.hypot(z, a);
    const ref = 1 + (z / R) ** 2 - 2 * (z / R) * Math.cos(k * (R - z));
    expect(Math.abs(rec.metrics.onAxisIntensity! - ref)).toBeLessThan(0.02);
    expect(plan.regime).toBe('near-field');
  });
});

describe('Gaussian beam through a wide aperture', () => {
  // w(z) = w₀√(1+(z/z_R)²), z_R = πw₀²/λ (Siegman, Lasers, ch. 17); the second-moment radius of
  // an intensity exp(−2r²/w²) is w = 2σ (ISO 11146 defines the D4σ width = 4σ = 2w).
  const w0 = 0.25 * mm;
  const lamG = 1064 * nm;
  const zr = (Math.PI * w0 * w0) / lamG;
  it.each([0.3, 1, 3, 10])('at z = %f z_R: w(z) and the peak (w₀/w)² within half a percent', (t) => {
    const z = t * zr;
    const { rec, c, x, y } = runCase({
      wavelength: lamG,
      distance: z,
      aperture: { shape: 'circle', diameter: 10 * w0, opaque: false },
      illumination: { kind: 'gaussian', waist: w0, tilt: [0, 0] },
    });
    let s = 0;
    let sxx = 0;
    let syy = 0;
    for (let r = 0; r < c.ny; r++) {
      for (let col = 0; col < c.nx; col++) {
        const v = c.intensity[r * c.nx + col]!;
        s += v;
        sxx += v * x(col) ** 2;
        syy += v * y(r) ** 2;
      }
    }
    expect(Math.abs(Math.sqrt(sxx / syy) - 1)).toBeLessThan(1e-6); // a round beam stays round
    const w = 2 * Math.sqrt(sxx / s);
    const wz = w0 * Math.sqrt(1 + t * t);
    expect(Math.abs(w - wz) / wz).toBeLessThan(5e-3);
    expect(Math.abs(rec.metrics.peakIntensity - (w0 / wz) ** 2) / (w0 / wz) ** 2).toBeLessThan(5e-3);
  });
});
