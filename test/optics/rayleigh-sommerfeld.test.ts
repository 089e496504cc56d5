// The direct first Rayleigh–Sommerfeld sums in 1-D: the kernel's constant, the paraxial and the
// far-field limits, per-period sums against the plain sum, and the grating equation at real angles.
import { describe, expect, it } from 'vitest';
import besselj1 from '@stdlib/math-base-special-besselj1';
import bessely1 from '@stdlib/math-base-special-bessely1';
import fresnel from '@stdlib/math-base-special-fresnel';
import {
  cellsFromIntervals,
  costRsDirect1D,
  costRsPerPeriod1D,
  periodicAxis,
  rsDirect1D,
  rsMaxCell,
  rsPerPeriod1D,
  type Interval,
} from '../../src/optics/rayleigh-sommerfeld.js';

const um = 1e-6;
const nm = 1e-9;

function intensity(u: Float64Array): Float64Array {
  const out = new Float64Array(u.length / 2);
  for (let i = 0; i < out.length; i++) out[i] = u[2 * i]! ** 2 + u[2 * i + 1]! ** 2;
  return out;
}

const sinc = (x: number) => (x === 0 ? 1 : Math.sin(Math.PI * x) / (Math.PI * x));

describe('cells from exact intervals', () => {
  const lam = 500 * nm;
  it('cover each interval exactly with equal cells no wider than maxCell', () => {
    const open: Interval[] = [
      { lo: -3 * um, hi: 1.7 * um },
      { lo: 4 * um, hi: 4.25 * um },
    ];
    const c = cellsFromIntervals(open, { sinTilt: 0.2 }, lam, 0.4 * um);
    expect(c.n).toBe(Math.ceil(4.7 / 0.4) + 1);
    let covered = 0;
    for (let j = 0; j < c.n; j++) {
      expect(c.width[j]!).toBeLessThanOrEqual(0.4 * um * (1 + 1e-12));
      covered += c.width[j]!;
    }
    expect(covered).toBeCloseTo(4.95 * um, 18);
    // First and last cells end on the interval's edges (to rounding).
    expect(c.centre[0]! - c.width[0]! / 2).toBeCloseTo(-3 * um, 18);
    expect(c.centre[c.n - 1]! + c.width[c.n - 1]! / 2).toBeCloseTo(4.25 * um, 18);
    // The carrier e^{ik·sinθ·ξ} at each centre, slope k·sinθ.
    const k = (2 * Math.PI) / lam;
    expect(Math.atan2(c.amp[1]!, c.amp[0]!)).toBeCloseTo(Math.atan2(Math.sin(k * 0.2 * c.centre[0]!), Math.cos(k * 0.2 * c.centre[0]!)), 12);
    expect(c.slope[3]).toBeCloseTo(k * 0.2, 6);
  });

  it('give a Gaussian its envelope and log-slopes, and stop where the envelope is below rounding', () => {
    const w = 2 * um;
    const c = cellsFromIntervals([{ lo: -1, hi: 1 }], { sinTilt: 0, waist: w }, lam, w / 4);
    const reach = Math.sqrt(37) * w;
    expect(c.centre[0]! - c.width[0]! / 2).toBeCloseTo(-reach, 15);
    for (const j of [0, 7, 20]) {
      const x = c.centre[j]!;
      expect(c.amp[2 * j]!).toBeCloseTo(Math.exp(-(x * x) / (w * w)), 15);
      expect(c.logSlope[j]!).toBeCloseTo((-2 * x) / (w * w), 3);
      expect(c.logCurv[j]!).toBeCloseTo(-1 / (w * w), 3);
    }
  });

  it('refuse reversed intervals and non-positive cell widths', () => {
    expect(() => cellsFromIntervals([{ lo: 1, hi: 0 }], { sinTilt: 0 }, lam, 1e-6)).toThrow(/bad interval/);
    expect(() => cellsFromIntervals([{ lo: 0, hi: 1 }], { sinTilt: 0 }, lam, 0)).toThrow(/maxCell/);
  });
});

describe('the cell rule', () => {
  it('is √(8εz/k), or z/8 close to the aperture, or w/4 for a Gaussian', () => {
    const lam = 600 * nm;
    const k = (2 * Math.PI) / lam;
    expect(rsMaxCell(lam, 0.1, { phaseBudget: 0.05 })).toBeCloseTo(Math.sqrt((8 * 0.05 * 0.1) / k), 15);
    expect(rsMaxCell(lam, 2 * lam)).toBeCloseTo(lam / 4, 18);
    expect(rsMaxCell(lam, 1, { waist: 20 * um })).toBeCloseTo(5 * um, 18);
  });
});

describe('the 1-D kernel (ikz/2r)·H₁⁽¹⁾(kr)', () => {
  const lam = 500 * nm;
  const k = (2 * Math.PI) / lam;
  // One cell of λ/1000: its factor differs from 1 by (kh)²/24 ≈ 2e-6 at most, so U/(a·h) is the
  // kernel at the cell's centre.
  const h = lam / 1000;
  const one = (x: number) => ({ n: 1, start: x, step: 1 });
  const kernelAt = (x: number, z: number) => {
    const c = cellsFromIntervals([{ lo: -h / 2, hi: h / 2 }], { sinTilt: 0 }, lam, h);
    const u = rsDirect1D(c, lam, z, one(x));
    return [u[0]! / h, u[1]! / h] as const;
  };

  it('tends to the 1-D far-field prefactor (z/r)·e^{ikr}/√(iλr) with the next term i·3/(8kr) (A&S 9.2.5)', () => {
    for (const [x, z] of [[0, 200 * lam], [300 * lam, 400 * lam], [-2e-3, 1e-2]] as const) {
      const r = Math.hypot(x, z);
      const [ur, ui] = kernelAt(x, z);
      const amp = z / r / Math.sqrt(lam * r);
      const ph = k * r - Math.PI / 4;
      // ratio = U / prefactor
      const pr = amp * Math.cos(ph);
      const pi = amp * Math.sin(ph);
      const d = pr * pr + pi * pi;
      const rr = (ur * pr + ui * pi) / d;
      const ri = (ui * pr - ur * pi) / d;
      const q = 3 / (8 * k * r);
      expect(Math.abs(rr - 1)).toBeLessThan(5e-6);
      expect(Math.abs(ri - q)).toBeLessThan(0.05 * q + 5e-6);
    }
  });

  it('is (ikz/2r)·(J₁ + iY₁) of @stdlib close to the source (kr < 20, z = λ/2)', () => {
    const z = lam / 2;
    for (const x of [0, 0.3 * lam, -1.1 * lam]) {
      const r = Math.hypot(x, z);
      const f = (k * z) / (2 * r);
      const j = besselj1(k * r);
      const y = bessely1(k * r);
      const [ur, ui] = kernelAt(x, z);
      // i·f·(J + iY) = −fY + i·fJ; the cell factor's error here is (h/z)²-small (4e-6).
      expect(Math.hypot(ur + f * y, ui - f * j) / Math.hypot(f * y, f * j)).toBeLessThan(1e-5);
    }
  });
});

describe('paraxial limit: a wide slit against the Fresnel integrals', () => {
  // Slit of half-width a, N_F = a²/(λz) = 2, plane wave. Paraxial pattern (Hecht, Optics, §10.3;
  // Born & Wolf §8.7): I = ½{[C(α₂)−C(α₁)]² + [S(α₂)−S(α₁)]²}, α₁,₂ = √(2/λz)(∓a − x), with C, S from
  // @stdlib (A&S ch. 7). Goodman's condition (Introduction to Fourier Optics, eq. 4-18) holds with a
  // factor 10⁴: over |x| ≤ 2a the neglected quartic phase k·max(x−ξ)⁴/(8z³) is 1e-4 rad; the
  // obliquity and 1/√r terms differ from the paraxial ones by (Δx/z)² ≈ 7e-6. Budget: that, plus the
  // cells at the default rule (≤ 6.8e-4 of the peak measured), stays under 1e-3.
  const lam = 500 * nm;
  const z = 1.3;
  const a = Math.sqrt(2 * lam * z);
  const cells = cellsFromIntervals([{ lo: -a, hi: a }], { sinTilt: 0 }, lam, rsMaxCell(lam, z));
  const out = { n: 801, start: -2 * a, step: (4 * a) / 800 };
  const I = intensity(rsDirect1D(cells, lam, z, out));

  it('holds Goodman’s condition strongly here', () => {
    expect(z ** 3 / ((Math.PI / (4 * lam)) * (3 * a) ** 4)).toBeGreaterThan(1e3);
  });

  it('matches within 1e-3 of the peak', () => {
    const s = Math.sqrt(2 / (lam * z));
    let worst = 0;
    let peak = 0;
    for (let i = 0; i < out.n; i++) {
      const x = out.start + i * out.step;
      const [s1, c1] = fresnel(s * (-a - x));
      const [s2, c2] = fresnel(s * (a - x));
      const ref = 0.5 * ((c2 - c1) ** 2 + (s2 - s1) ** 2);
      peak = Math.max(peak, ref);
      worst = Math.max(worst, Math.abs(I[i]! - ref));
    }
    expect(worst / peak).toBeLessThan(1e-3);
  });
});

describe('far-field limit: a narrow slit', () => {
  // Slit of width w = 5λ at z = 10⁵λ, out to 72° on both sides. Far field of the 1-D integral
  // (Goodman §4.2–4.3 with the obliquity kept; the 1-D prefactor 1/√(iλr)):
  // I = [(z/r)·w·sinc(w(sin θ − sin θᵢ)/λ)]²/(λr). Budget: the aperture's own quadratic phase,
  // k w²/(8z) = 2e-4 rad, enters the intensity squared (4e-8); H₁'s correction i·3/(8kr) is a phase
  // (1e-12 in intensity). 1e-6 of the peak.
  const lam = 500 * nm;
  const w = 5 * lam;
  const z = 1e5 * lam;
  it.each([0, 20])('matches (z/r)²w²sinc²/(λr) within 1e-6 of the peak, tilt %f°', (deg) => {
    const sinI = Math.sin((deg * Math.PI) / 180);
    const cells = cellsFromIntervals([{ lo: -w / 2, hi: w / 2 }], { sinTilt: sinI }, lam, rsMaxCell(lam, z));
    const out = { n: 1201, start: -3 * z, step: (6 * z) / 1200 };
    const I = intensity(rsDirect1D(cells, lam, z, out));
    let worst = 0;
    let peak = 0;
    for (let i = 0; i < out.n; i++) {
      const x = out.start + i * out.step;
      const r = Math.hypot(x, z);
      const ref = ((z / r) * w * sinc((w * (x / r - sinI)) / lam)) ** 2 / (lam * r);
      peak = Math.max(peak, ref);
      worst = Math.max(worst, Math.abs(I[i]! - ref));
    }
    expect(worst / peak).toBeLessThan(1e-6);
  });
});

describe('periodic output axes', () => {
  it('take the coarsest step s·d/p ≤ the wanted step with the smallest p, covering the range', () => {
    const d = 1.667 * um;
    const a = periodicAxis(d, 40 * um, -1.1, 1.1);
    expect(a.p).toBe(1);
    expect(a.s).toBe(23);
    expect(a.axis.step).toBeCloseTo(23 * d, 18);
    expect(a.axis.start).toBeLessThanOrEqual(-1.1);
    expect(a.axis.start + (a.axis.n - 1) * a.axis.step).toBeGreaterThanOrEqual(1.1);
    const f = periodicAxis(d, 0.3 * um, -1e-4, 1e-4);
    expect(f.p).toBe(6);
    expect(f.s).toBe(1);
    expect(f.axis.step).toBeLessThanOrEqual(0.3 * um);
    // A wanted step of exactly three periods, as computed, is three periods.
    expect(periodicAxis(d, 3 * d, 0, 1e-3).s).toBe(3);
  });
});

/** N slits of width w, period d, centred on 0. */
function grating(n: number, d: number, w: number) {
  const firstOrigin = -((n - 1) * d + w) / 2;
  const slits: Interval[] = Array.from({ length: n }, (_, i) => ({ lo: firstOrigin + i * d, hi: firstOrigin + i * d + w }));
  return { period: d, count: n, firstOrigin, open: [{ lo: 0, hi: w }], slits };
}

describe('per-period sums', () => {
  // The recurrence T_i = V_i + w·T_{i−p}, U = T_i − w^N·T_{i−Np} is the same sum regrouped: it
  // must equal the plain sum over all slits' cells (the same cells) to rounding. Budget: the
  // rounding of ~N·(cells) terms of phases up to k·r ≈ 600 rad, ~1e-13 of the peak; 1e-10 as asked.
  const lam = 500 * nm;
  const g = grating(20, 2 * um, 0.8 * um);
  const z = 50 * um;
  it.each([0, 12])('equal the direct sum over 20 slits to 1e-10 of the peak, tilt %f°', (deg) => {
    const sinT = Math.sin((deg * Math.PI) / 180);
    const h = rsMaxCell(lam, z);
    const ax = periodicAxis(g.period, 0.3 * um, -150 * um, 150 * um);
    const direct = rsDirect1D(cellsFromIntervals(g.slits, { sinTilt: sinT }, lam, h), lam, z, ax.axis);
    const pp = rsPerPeriod1D(g, { sinTilt: sinT }, lam, z, ax, h);
    let peak = 0;
    let worst = 0;
    for (let i = 0; i < ax.axis.n; i++) {
      peak = Math.max(peak, Math.hypot(direct[2 * i]!, direct[2 * i + 1]!));
      worst = Math.max(worst, Math.hypot(direct[2 * i]! - pp[2 * i]!, direct[2 * i + 1]! - pp[2 * i + 1]!));
    }
    expect(peak).toBeGreaterThan(0);
    expect(worst / peak).toBeLessThan(1e-10);
  });

  it('refuse an output axis whose step is not s·period/p', () => {
    const ax = periodicAxis(g.period, 0.3 * um, -1e-5, 1e-5);
    expect(() => rsPerPeriod1D(g, { sinTilt: 0 }, lam, z, { ...ax, s: 2 }, 1e-6)).toThrow(/not s·period\/p/);
  });

  it('cost far less than the plain sum on a large grating', () => {
    const outputs = 57381;
    expect(costRsPerPeriod1D(1, 1000, outputs, 1, 23)).toBeLessThan(costRsDirect1D(1000, outputs) / 30);
  });
});

describe('the grating equation at real angles: 1000 slits of 1 µm, period 1.667 µm, 589 nm, z = 1 m', () => {
  // A thin grating lit at θᵢ sends order m along sin θ_m = sin θᵢ + mλ/d (Goodman §4.4; DESIGN.md
  // §4), to x = z·tan θ_m on a screen at distance z, and only where |sin θ_m| < 1. Each order
  // carries the thin-grating share (w/d)²sinc²(m·w/d) of the field's Fourier series; on a plane
  // parallel to the grating its footprint is the grating's width, so ∫|U|²dx / ∫|U₀|²dx =
  // (w/d)²sinc²(m·w/d)/(w/d). The evanescent orders' share never reaches the screen.
  const lam = 589 * nm;
  const d = 1.667 * um;
  const w = 1 * um;
  const n = 1000;
  const z = 1;
  const g = grating(n, d, w);
  const thin = (m: number) => ((w / d) ** 2 * sinc((m * w) / d) ** 2) / (w / d);

  describe.each([
    [0, 1.1],
    [10, 2.0],
  ])('lit at %f°, window ±%f m', (deg, half) => {
    const sinI = Math.sin((deg * Math.PI) / 180);
    const ax = periodicAxis(d, 40 * um, -half, half);
    const I = intensity(rsPerPeriod1D(g, { sinTilt: sinI }, lam, z, ax, rsMaxCell(lam, z)));
    const x = (i: number) => ax.axis.start + i * ax.axis.step;
    const orders: number[] = [];
    for (let m = -6; m <= 6; m++) if (Math.abs(sinI + (m * lam) / d) < 1) orders.push(m);
    const position = (m: number) => {
      const s = sinI + (m * lam) / d;
      return (z * s) / Math.sqrt(1 - s * s);
    };
    const pos = orders.map(position);
    const inputPower = n * w;
    /** The part of the window nearer to order q's position than to its neighbours'. */
    const region = (q: number) => [q === 0 ? -Infinity : (pos[q - 1]! + pos[q]!) / 2, q === orders.length - 1 ? Infinity : (pos[q]! + pos[q + 1]!) / 2];

    it('has every propagating order inside the window', () => {
      expect(pos.every((p) => Math.abs(p) < half - 0.05)).toBe(true);
      expect(orders.length).toBe(deg === 0 ? 5 : 6);
    });

    it('puts the peak of each order within two output steps of z·tan θ_m (z·sin θ_m is 24 mm off or more)', () => {
      orders.forEach((_m, q) => {
        const [lo, hi] = region(q);
        let best = -1;
        let at = 0;
        for (let i = 0; i < I.length; i++) {
          if (x(i) < lo! || x(i) >= hi!) continue;
          if (I[i]! > best) {
            best = I[i]!;
            at = x(i);
          }
        }
        expect(Math.abs(at - pos[q]!)).toBeLessThan(2 * ax.axis.step);
      });
    });

    // Budget: the tails of neighbouring orders reaching into a region (edge diffraction of a beam
    // 1.7 mm wide, intensity falling as 1/Δx²: ~2e-4 of its power beyond 0.19 m), the window's cut,
    // and the Riemann sum of |U|² at 38 µm pitch across a beam of fringes ≥ 0.3 mm: well under 1 %.
    it('gives each order its thin-grating power within 1 %', () => {
      orders.forEach((m, q) => {
        const [lo, hi] = region(q);
        let p = 0;
        for (let i = 0; i < I.length; i++) if (x(i) >= lo! && x(i) < hi!) p += I[i]! * ax.axis.step;
        expect(Math.abs(p / inputPower - thin(m)) / thin(m)).toBeLessThan(0.01);
      });
    });

    it('carries to the screen only the propagating orders’ power (the evanescent ones’ is missing), within 0.5 %', () => {
      let total = 0;
      for (let i = 0; i < I.length; i++) total += I[i]! * ax.axis.step;
      const propagating = orders.reduce((s, m) => s + thin(m), 0);
      expect(Math.abs(total / inputPower - propagating) / propagating).toBeLessThan(5e-3);
      // What the evanescent orders hold is not small here (over 5 % of ∫|U₀|²): the check can fail.
      expect(1 - propagating).toBeGreaterThan(0.05);
    });
  });

  it('has nothing where a paraxial model would put the first evanescent orders (x = ±z·3λ/d, normal incidence)', () => {
    const ax = periodicAxis(d, 40 * um, -1.1, 1.1);
    const I = intensity(rsPerPeriod1D(g, { sinTilt: 0 }, lam, z, ax, rsMaxCell(lam, z)));
    // What order ±3 would have there if it propagated: |c₃|² = ((w/d)·sinc(3w/d))² ≈ 4e-3.
    const would = ((w / d) * sinc((3 * w) / d)) ** 2;
    let near = 0;
    for (let i = 0; i < ax.axis.n; i++) {
      const xi = ax.axis.start + i * ax.axis.step;
      if (Math.abs(Math.abs(xi) - (3 * lam * z) / d) < 0.01) near = Math.max(near, I[i]!);
    }
    expect(near).toBeLessThan(1e-3 * would);
  });
});
