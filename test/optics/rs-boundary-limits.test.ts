// The boundary form (src/optics/rs-boundary.ts) in the two limits where closed forms hold: the far
// field of a circular aperture (the Airy pattern with the Rayleigh–Sommerfeld obliquity) and the
// Fresnel pattern of a rectangle where the paraxial condition holds with a wide margin.
import { describe, expect, it } from 'vitest';
import besselj1 from '@stdlib/math-base-special-besselj1';
import fresnel from '@stdlib/math-base-special-fresnel';
import { rsBoundary, rsBoundaryWithStats, type BoundaryRegion } from '../../src/optics/rs-boundary.js';
import { centredAxis, type Axis } from '../../src/optics/field.js';

const point = (v: number): Axis => ({ n: 1, start: v, step: 1 });

describe('far field of a circular aperture: the Airy pattern (Born & Wolf, Principles of Optics, §8.5.2)', () => {
  // Far from the aperture the first Rayleigh–Sommerfeld integral tends to
  //   U = −(i/λ)(z/r)(e^{ikr}/r)·πa²·2J₁(v)/v,  v = k·a·sin θ, sin θ = ρ/r, r = √(ρ² + z²)
  // (the kernel's (1/r − ik) → −ik; Born & Wolf §8.5.2 for the pattern, Goodman §3.5 for the
  // kernel), so I = (πa²/λ)²·(z/r)²·(1/r²)·[2J₁(v)/v]²: the obliquity (z/r)² and the 1/r² spread.
  // J₁ from @stdlib/math-base-special-besselj1.
  // Budget at N_F = a²/(λz) = 1e-4: the neglected aperture-quadratic phase is πN_F = 3e-4 rad,
  // which moves the intensity by about (πN_F)² ≈ 1e-7 of the peak; the neglected 1/(kr) ≈ 3e-9;
  // the boundary form's quadrature ~1e-9 and its radial interpolation ≤ 1e-5 of the peak by design
  // (measured ~1e-8). Bound: 1e-5 of the peak on the radial table, 1e-6 at single points.
  const lam = 633e-9;
  const a = 50e-6;
  const z = (a * a) / (lam * 1e-4); // 39.5 m
  const k = (2 * Math.PI) / lam;
  const disc: BoundaryRegion[] = [{ kind: 'disc', radius: a, sign: 1 }];
  const airy = (rho: number) => {
    const r = Math.hypot(rho, z);
    const v = k * a * (rho / r);
    const f = v === 0 ? 1 : (2 * besselj1(v)) / v;
    return ((Math.PI * a * a) / lam) ** 2 * ((z / r) ** 2 / (r * r)) * f * f;
  };
  const peak = airy(0);

  it('on a 161 × 161 window out to the third dark ring (radial table, interpolated): within 1e-5 of the peak', () => {
    const ax = centredAxis(161, 2 / 160); // ±1 m: the third zero is at ρ ≈ 0.81 m
    const r = rsBoundaryWithStats(disc, lam, z, ax, ax);
    expect(r.stats.radial).toBe(true);
    const d = r.field.data;
    let worst = 0;
    for (let i = 0; i < ax.n; i++) {
      for (let j = 0; j < ax.n; j++) {
        const o = 2 * (i * ax.n + j);
        const rho = Math.hypot(ax.start + j * ax.step, ax.start + i * ax.step);
        worst = Math.max(worst, Math.abs(d[o]! ** 2 + d[o + 1]! ** 2 - airy(rho)));
      }
    }
    expect(worst / peak).toBeLessThan(1e-5);
  });

  it('at single points across the first three rings, off the axes: within 1e-6 of the peak', () => {
    for (let q = 0; q <= 40; q++) {
      const rho = q * 0.02;
      const [x, y] = [rho * Math.cos(0.3), rho * Math.sin(0.3)];
      const u = rsBoundary(disc, lam, z, point(x), point(y)).data;
      expect(Math.abs(u[0]! ** 2 + u[1]! ** 2 - airy(rho)) / peak).toBeLessThan(1e-6);
    }
  });

  it('the first dark ring at sin θ = 1.21967 λ/D (Born & Wolf §8.5.2), found by minimising |U|² along a ray', () => {
    const I = (rho: number) => {
      const u = rsBoundary(disc, lam, z, point(rho), point(0)).data;
      return u[0]! ** 2 + u[1]! ** 2;
    };
    const guess = 1.21967 * (lam / (2 * a)) * z;
    // Golden-section search on [0.9, 1.1]·guess (|U|² has one minimum there: the next ring is at
    // 2.23 λ/D). 80 steps narrow the bracket to 1e-17 of it; the minimum of a quadratic is found
    // to about √ε relative, 1e-8.
    let lo = 0.9 * guess;
    let hi = 1.1 * guess;
    const g = (Math.sqrt(5) - 1) / 2;
    let c = hi - g * (hi - lo);
    let d = lo + g * (hi - lo);
    let fc = I(c);
    let fd = I(d);
    for (let it = 0; it < 80; it++) {
      if (fc < fd) {
        hi = d;
        d = c;
        fd = fc;
        c = hi - g * (hi - lo);
        fc = I(c);
      } else {
        lo = c;
        c = d;
        fc = fd;
        d = lo + g * (hi - lo);
        fd = I(d);
      }
    }
    const rho0 = (lo + hi) / 2;
    const sinTheta = rho0 / Math.hypot(rho0, z);
    // 1.21967 is quoted to six figures (its next digit, from J₁'s first zero 3.83171/π, is 0): 5e-6.
    expect(Math.abs(sinTheta / (lam / (2 * a)) - 1.21967) / 1.21967).toBeLessThan(5e-6);
    expect(Math.min(fc, fd) / peak).toBeLessThan(1e-6); // a true zero, to the budget above
  });
});

describe('Fresnel limit of a rectangle: the Fresnel integrals (Goodman §4.5.1, from memory; Abramowitz & Stegun ch. 7)', () => {
  // stdlib's fresnel(x) returns [S(x), C(x)], C(x) = ∫₀ˣ cos(πt²/2)dt, S(x) = ∫₀ˣ sin(πt²/2)dt.
  it('stdlib agrees with Abramowitz & Stegun table 7.7 (values from memory, 8 figures)', () => {
    const table: [number, number, number][] = [
      [0.5, 0.49234423, 0.06473243],
      [1.0, 0.7798934, 0.43825915],
      [1.5, 0.44526118, 0.69750496],
      [2.0, 0.48825341, 0.34341568],
    ];
    for (const [x, C, S] of table) {
      const [s, c] = fresnel(x);
      expect(Math.abs(c - C)).toBeLessThan(1e-8);
      expect(Math.abs(s - S)).toBeLessThan(1e-8);
    }
  });

  // Paraxial pattern of a rectangle [x0, x1] × [y0, y1] (Goodman §4.5.1, from memory; normalised so
  // that a very wide rectangle gives (1 + i)²/(2i) = 1, the incident wave):
  //   U = (e^{ikz}/2i)·F(x0 − x, x1 − x)·F(y0 − y, y1 − y),
  //   F(a, b) = [C(β_b) − C(β_a)] + i[S(β_b) − S(β_a)],  β = √(2/(λz))·(·).
  // Set-up: 20 mm × 12 mm at z = 100 m, λ = 500 nm: N_F = 2 along x, the window ±12 mm × ±8 mm (the
  // geometrical region, its edges' fringes and some shadow). Every aperture point is within ρ ≤ 26 mm
  // of every output point: Goodman's condition (eq. 4-18) z³ ≫ (π/4λ)·ρ⁴ holds as 1e6 against 0.7.
  // Budget: the paraxial phase error kρ⁴/(8z³) ≤ 7.2e-7 rad and the amplitude's (obliquity z/r and
  // 1/r against 1/z) 1.5ρ²/z² ≤ 1e-7, over ∫|h| ≈ area/(λz) = 4.8: |δU| ≤ 3.9e-6; with |U| ≤ 1.4
  // (1.37² is the largest of a Fresnel edge's intensity, from memory), |δI| ≤ 2·1.4·3.9e-6 = 1.1e-5.
  // The boundary form's own error is far below (~1e-9).
  it('a 20 mm × 12 mm rectangle at 100 m (N_F = 2): within 1.5e-5 of the peak everywhere on the window', () => {
    const lam = 500e-9;
    const z = 100;
    const k = (2 * Math.PI) / lam;
    const rect = { x0: -10e-3, x1: 10e-3, y0: -6e-3, y1: 6e-3 };
    const X = centredAxis(97, 24e-3 / 96);
    const Y = centredAxis(65, 16e-3 / 64);
    const f = rsBoundary([{ kind: 'rect', ...rect, sign: 1 }], lam, z, X, Y);
    const scale = Math.sqrt(2 / (lam * z));
    const F = (a: number, b: number): [number, number] => {
      const [sa, ca] = fresnel(scale * a);
      const [sb, cb] = fresnel(scale * b);
      return [cb - ca, sb - sa];
    };
    const kz = k * z;
    const ref: number[] = [];
    const got: number[] = [];
    let worstPhase = 0;
    for (let i = 0; i < Y.n; i++) {
      for (let j = 0; j < X.n; j++) {
        const x = X.start + j * X.step;
        const y = Y.start + i * Y.step;
        const [ar, ai] = F(rect.x0 - x, rect.x1 - x);
        const [br, bi] = F(rect.y0 - y, rect.y1 - y);
        // (a·b)/(2i)
        const pr = ar * br - ai * bi;
        const pi = ar * bi + ai * br;
        const ur = pi / 2;
        const ui = -pr / 2;
        ref.push(ur * ur + ui * ui);
        const o = 2 * (i * X.n + j);
        const d = f.data;
        // The computed field relative to e^{ikz}, against the Fresnel one (same e^{ikz} factor).
        const gr = d[o]! * Math.cos(kz) + d[o + 1]! * Math.sin(kz);
        const gi = d[o + 1]! * Math.cos(kz) - d[o]! * Math.sin(kz);
        got.push(gr * gr + gi * gi);
        worstPhase = Math.max(worstPhase, Math.hypot(gr - ur, gi - ui));
      }
    }
    const peak = Math.max(...ref);
    expect(peak).toBeGreaterThan(1);
    let worst = 0;
    for (let q = 0; q < ref.length; q++) worst = Math.max(worst, Math.abs(got[q]! - ref[q]!));
    expect(worst / peak).toBeLessThan(1.5e-5);
    expect(worstPhase).toBeLessThan(3.9e-6); // the field itself, phase included
  });
});
