// Zernike polynomials (Noll's indexing and normalisation), the wavefront built from them, the
// Strehl estimate and the pupil's cell averages.
//
// Sources: R. J. Noll, "Zernike polynomials and atmospheric turbulence", JOSA 66, 207–211 (1976),
// Table I (the 22 expressions below are written from memory, not copied from a scan of the table);
// V. N. Mahajan, "Strehl ratio for primary aberrations: some analytical results for circular and
// annular pupils", JOSA 72, 1258–1266 (1982) for exp(−(2πσ)²) (title and the "few per cent for
// σ ≤ 0.1 wave" from memory; the figures asserted below are measured here); Gauss–Legendre quadrature from
// test/reference/quadrature.ts (Abramowitz & Stegun 25.4.29), which shares no code with src/.
import { describe, expect, it } from 'vitest';
import { gaussLegendre } from '../reference/quadrature.js';
import { mulberry32 } from '../helpers.js';
import {
  cellRuleFor,
  nollToNM,
  pupilCellAverages,
  strehlEstimate,
  wavefrontRms,
  wavefrontSlopeMax,
  wavefrontWaves,
  zernike,
  type ZernikeTerm,
} from '../../src/optics/zernike.js';
import type { Axis } from '../../src/optics/field.js';

const s = Math.sqrt;
const c = Math.cos;
const sn = Math.sin;

/** Noll 1976, Table I: Z_1 … Z_22 with their (n, m) (m signed: cos for even j, sin for odd j). From memory. */
const NOLL_TABLE: { n: number; m: number; z: (r: number, t: number) => number }[] = [
  { n: 0, m: 0, z: () => 1 },
  { n: 1, m: 1, z: (r, t) => 2 * r * c(t) },
  { n: 1, m: -1, z: (r, t) => 2 * r * sn(t) },
  { n: 2, m: 0, z: (r) => s(3) * (2 * r ** 2 - 1) },
  { n: 2, m: -2, z: (r, t) => s(6) * r ** 2 * sn(2 * t) },
  { n: 2, m: 2, z: (r, t) => s(6) * r ** 2 * c(2 * t) },
  { n: 3, m: -1, z: (r, t) => s(8) * (3 * r ** 3 - 2 * r) * sn(t) },
  { n: 3, m: 1, z: (r, t) => s(8) * (3 * r ** 3 - 2 * r) * c(t) },
  { n: 3, m: -3, z: (r, t) => s(8) * r ** 3 * sn(3 * t) },
  { n: 3, m: 3, z: (r, t) => s(8) * r ** 3 * c(3 * t) },
  { n: 4, m: 0, z: (r) => s(5) * (6 * r ** 4 - 6 * r ** 2 + 1) },
  { n: 4, m: 2, z: (r, t) => s(10) * (4 * r ** 4 - 3 * r ** 2) * c(2 * t) },
  { n: 4, m: -2, z: (r, t) => s(10) * (4 * r ** 4 - 3 * r ** 2) * sn(2 * t) },
  { n: 4, m: 4, z: (r, t) => s(10) * r ** 4 * c(4 * t) },
  { n: 4, m: -4, z: (r, t) => s(10) * r ** 4 * sn(4 * t) },
  { n: 5, m: 1, z: (r, t) => s(12) * (10 * r ** 5 - 12 * r ** 3 + 3 * r) * c(t) },
  { n: 5, m: -1, z: (r, t) => s(12) * (10 * r ** 5 - 12 * r ** 3 + 3 * r) * sn(t) },
  { n: 5, m: 3, z: (r, t) => s(12) * (5 * r ** 5 - 4 * r ** 3) * c(3 * t) },
  { n: 5, m: -3, z: (r, t) => s(12) * (5 * r ** 5 - 4 * r ** 3) * sn(3 * t) },
  { n: 5, m: 5, z: (r, t) => s(12) * r ** 5 * c(5 * t) },
  { n: 5, m: -5, z: (r, t) => s(12) * r ** 5 * sn(5 * t) },
  { n: 6, m: 0, z: (r) => s(7) * (20 * r ** 6 - 30 * r ** 4 + 12 * r ** 2 - 1) },
];

/** W in waves from the table's expressions (independent of src/), any ρ. */
function tableWave(terms: readonly ZernikeTerm[], R: number, x: number, y: number): number {
  const r = Math.hypot(x, y) / R;
  const t = Math.atan2(y, x);
  let w = 0;
  for (const k of terms) w += k.rms * NOLL_TABLE[k.j - 1]!.z(r, t);
  return w;
}

/**
 * The mean over the unit disc of g(ρ, θ): (1/2π)∫₀¹du∫₀^{2π}dθ g(√u, θ), Gauss–Legendre in u = ρ²
 * (exact for polynomials in u of degree < 2nu) and the uniform rule in θ (exact for trigonometric
 * polynomials of degree < nθ; common practice).
 */
function discMean(g: (rho: number, theta: number) => [number, number], nu: number, nTheta: number): [number, number] {
  const { x, w } = gaussLegendre(nu);
  let re = 0;
  let im = 0;
  for (let i = 0; i < nu; i++) {
    const rho = Math.sqrt(0.5 * (x[i]! + 1));
    for (let k = 0; k < nTheta; k++) {
      const [a, b] = g(rho, (2 * Math.PI * k) / nTheta);
      re += 0.5 * w[i]! * a;
      im += 0.5 * w[i]! * b;
    }
  }
  return [re / nTheta, im / nTheta];
}

describe("Noll's indexing and Table I (Noll 1976)", () => {
  it('nollToNM gives the (n, m) of Table I for j = 1 … 22', () => {
    for (let j = 1; j <= 22; j++) expect(nollToNM(j)).toEqual({ n: NOLL_TABLE[j - 1]!.n, m: NOLL_TABLE[j - 1]!.m });
  });

  it('up to j = 231 (n ≤ 20): rows fill in order, |m| ≤ n with n − |m| even, each (n, m) once, cos for even j', () => {
    const seen = new Set<string>();
    let prevN = 0;
    for (let j = 1; j <= 231; j++) {
      const { n, m } = nollToNM(j);
      expect(n >= prevN && n <= prevN + 1).toBe(true);
      expect(Math.abs(m) <= n && (n - Math.abs(m)) % 2 === 0).toBe(true);
      if (m !== 0) expect(m > 0).toBe(j % 2 === 0);
      seen.add(`${n},${m}`);
      prevN = n;
    }
    expect(seen.size).toBe(231);
    expect(nollToNM(231).n).toBe(20);
  });

  it('zernike(j) equals the expressions of Table I to 1e-13 at 200 random points of the disc', () => {
    const rnd = mulberry32(1976);
    let worst = 0;
    for (let i = 0; i < 200; i++) {
      const rho = Math.sqrt(rnd());
      const theta = 2 * Math.PI * rnd() - Math.PI;
      for (let j = 1; j <= 22; j++) worst = Math.max(worst, Math.abs(zernike(j, rho, theta) - NOLL_TABLE[j - 1]!.z(rho, theta)));
    }
    expect(worst).toBeLessThan(1e-13);
  });

  it('defocus and primary spherical at chosen points: Z4 = √3(2ρ²−1), Z11 = √5(6ρ⁴−6ρ²+1) (Table I)', () => {
    expect(zernike(4, 0, 0)).toBeCloseTo(-Math.sqrt(3), 14);
    expect(zernike(4, 1, 1.3)).toBeCloseTo(Math.sqrt(3), 14);
    expect(zernike(4, Math.SQRT1_2, 0)).toBeCloseTo(0, 14);
    expect(zernike(11, 0, 0)).toBeCloseTo(Math.sqrt(5), 14);
    expect(zernike(11, 1, 0)).toBeCloseTo(Math.sqrt(5), 14);
    expect(zernike(11, 0.5, 2)).toBeCloseTo(Math.sqrt(5) * (6 / 16 - 6 / 4 + 1), 14);
  });

  it('is 0 outside the unit disc', () => {
    expect(zernike(4, 1.0001, 0)).toBe(0);
    expect(zernike(1, 2, 0)).toBe(0);
  });
});

describe('orthonormality over the unit disc (Noll 1976, eq. 3 and the normalisation of Table I)', () => {
  it('mean of Z_j Z_k over the disc is δ_jk to 1e-12 for j, k ≤ 36 (GL in ρ², 16 nodes; 32 uniform angles)', () => {
    // n ≤ 7 for j ≤ 36: Z_j Z_k is a polynomial of degree ≤ 7 in u = ρ² once the angular rule has
    // removed the odd-|m|-sum products (those vanish exactly in θ), and trigonometric of degree ≤ 14.
    let worst = 0;
    for (let j = 1; j <= 36; j++) {
      for (let k = j; k <= 36; k++) {
        const [m] = discMean((r, t) => [zernike(j, r, t) * zernike(k, r, t), 0], 16, 32);
        worst = Math.max(worst, Math.abs(m - (j === k ? 1 : 0)));
      }
    }
    expect(worst).toBeLessThan(1e-12);
  });
});

describe('wavefront from terms', () => {
  const terms: ZernikeTerm[] = [
    { j: 4, rms: 0.03 },
    { j: 8, rms: -0.02 },
    { j: 11, rms: 0.015 },
    { j: 1, rms: 0.2 },
  ];

  it('wavefrontWaves is Σ rms·Z_j at (x/R, y/R) (Table I), 0 outside the pupil', () => {
    const R = 2.5e-3;
    const rnd = mulberry32(7);
    for (let i = 0; i < 50; i++) {
      const x = (2 * rnd() - 1) * R;
      const y = (2 * rnd() - 1) * R;
      const expected = x * x + y * y <= R * R ? tableWave(terms, R, x, y) : 0;
      expect(Math.abs(wavefrontWaves(terms, R, x, y) - expected)).toBeLessThan(1e-14);
    }
  });

  it('wavefrontRms is √Σrms² without piston, and equals the RMS about the mean by quadrature (orthonormality)', () => {
    expect(wavefrontRms(terms)).toBeCloseTo(Math.sqrt(0.03 ** 2 + 0.02 ** 2 + 0.015 ** 2), 15);
    // A repeated index adds up before squaring.
    expect(wavefrontRms([{ j: 5, rms: 0.01 }, { j: 5, rms: 0.02 }])).toBeCloseTo(0.03, 15);
    const [mean] = discMean((r, t) => [tableWave(terms, 1, r * Math.cos(t), r * Math.sin(t)), 0], 16, 32);
    const [sq] = discMean((r, t) => [(tableWave(terms, 1, r * Math.cos(t), r * Math.sin(t)) - mean) ** 2, 0], 16, 32);
    expect(Math.abs(Math.sqrt(sq) - wavefrontRms(terms))).toBeLessThan(1e-14);
  });

  it('wavefrontSlopeMax bounds |∇W| sampled densely (each term j ≤ 22, and random mixtures), within 1.6 % for one term, exact for tilt', () => {
    const R = 3e-3;
    /** max |∇W| by central differences on a polar grid of 100 radii × 180 angles (inside the disc). */
    const sampled = (ts: ZernikeTerm[]): number => {
      const h = 1e-6 * R;
      let m = 0;
      for (let i = 1; i <= 100; i++) {
        const r = (i / 100) * R - 2 * h;
        for (let k = 0; k < 180; k++) {
          const x = r * Math.cos((2 * Math.PI * k) / 180);
          const y = r * Math.sin((2 * Math.PI * k) / 180);
          const gx = (tableWave(ts, R, x + h, y) - tableWave(ts, R, x - h, y)) / (2 * h);
          const gy = (tableWave(ts, R, x, y + h) - tableWave(ts, R, x, y - h)) / (2 * h);
          m = Math.max(m, Math.hypot(gx, gy));
        }
      }
      return m;
    };
    let loosest = 1;
    for (let j = 2; j <= 22; j++) {
      const ts = [{ j, rms: 0.1 }];
      const bound = wavefrontSlopeMax(ts, R);
      const seen = sampled(ts);
      expect(seen).toBeLessThanOrEqual(bound * (1 + 1e-6));
      loosest = Math.max(loosest, bound / seen);
    }
    const rnd = mulberry32(3);
    for (let i = 0; i < 5; i++) {
      const ts = [2, 4, 7, 11, 14, 22].map((j) => ({ j, rms: 0.1 * (2 * rnd() - 1) }));
      expect(sampled(ts)).toBeLessThanOrEqual(wavefrontSlopeMax(ts, R) * (1 + 1e-6));
    }
    // Tilt: W = 0.1·2x/R, |∇W| = 0.2/R. Defocus: 0.1·√3·4ρ/R, largest at the rim (calculus).
    expect(wavefrontSlopeMax([{ j: 2, rms: 0.1 }], R)).toBeCloseTo(0.2 / R, 9);
    const defocus = wavefrontSlopeMax([{ j: 4, rms: 0.1 }], R) / ((0.4 * Math.sqrt(3)) / R);
    expect(defocus >= 1 && defocus <= 1.016).toBe(true);
    // One term: the bound's only slack is the sampling margin (≤ 1.6 %) over the dense sampling's
    // own shortfall (the finite-difference grid misses the exact maximum by well under 1 %).
    expect(loosest).toBeLessThan(1.03);
  });
});

describe('Strehl ratio of a small aberration (Mahajan 1982)', () => {
  /** |mean over the disc of exp(i2πW)|², W from the table's expressions; 48 nodes in ρ², 96 angles. */
  const strehl = (ts: ZernikeTerm[]): number => {
    const [re, im] = discMean((r, t) => {
      const p = 2 * Math.PI * tableWave(ts, 1, r * Math.cos(t), r * Math.sin(t));
      return [Math.cos(p), Math.sin(p)];
    }, 48, 96);
    return re * re + im * im;
  };

  it('strehlEstimate is exp(−(2πσ)²); at the Maréchal criterion σ = 1/14 wave it is 0.8 or more (common practice)', () => {
    expect(strehlEstimate(0)).toBe(1);
    expect(strehlEstimate(0.05)).toBeCloseTo(Math.exp(-((2 * Math.PI * 0.05) ** 2)), 15);
    expect(strehlEstimate(1 / 14)).toBeGreaterThan(0.8);
    expect(strehlEstimate(1 / 14)).toBeLessThan(0.82);
  });

  it('the disc quadrature is exact for defocus: S = [sin a / a]², a = 2√3π·c (closed form of ∫₀¹ e^{i2πc√3(2u−1)} du)', () => {
    for (const c of [0.02, 0.05, 0.1, 0.2]) {
      const a = 2 * Math.sqrt(3) * Math.PI * c;
      expect(Math.abs(strehl([{ j: 4, rms: c }]) - (Math.sin(a) / a) ** 2)).toBeLessThan(1e-12);
    }
  });

  it('primary aberrations (Mahajan 1982: defocus, astigmatism, coma, spherical; j = 4 … 11), σ ≤ 0.1 wave: within 2 % (measured 1.7 %, defocus at 0.1)', () => {
    let worst = 0;
    for (let j = 4; j <= 11; j++) {
      for (const sigma of [0.02, 0.05, 0.07, 0.1]) {
        const exact = strehl([{ j, rms: sigma }]);
        worst = Math.max(worst, Math.abs(strehlEstimate(sigma) - exact) / exact);
      }
    }
    expect(worst).toBeLessThan(0.02);
    expect(worst).toBeGreaterThan(0.01); // the approximation is not exact: this is a measurement
  });

  it('single higher terms j = 12 … 22 at σ ≤ 0.1: within 3 % (measured 2.6 %, Z20/Z21 at 0.1)', () => {
    let worst = 0;
    for (let j = 12; j <= 22; j++) {
      for (const sigma of [0.05, 0.1]) {
        const exact = strehl([{ j, rms: sigma }]);
        worst = Math.max(worst, Math.abs(strehlEstimate(sigma) - exact) / exact);
      }
    }
    expect(worst).toBeLessThan(0.03);
  });

  it('random mixtures of nine terms: within 1 % at σ = 0.05 (measured 0.3 %) and 10 % at σ = 0.1 (measured 4.3 %)', () => {
    const rnd = mulberry32(1982);
    let worst05 = 0;
    let worst10 = 0;
    for (let i = 0; i < 20; i++) {
      const ts = [4, 5, 6, 7, 8, 11, 12, 16, 22].map((j) => ({ j, rms: 2 * rnd() - 1 }));
      const norm = wavefrontRms(ts);
      for (const sigma of [0.05, 0.1]) {
        const exact = strehl(ts.map((t) => ({ j: t.j, rms: (t.rms * sigma) / norm })));
        const rel = (strehlEstimate(sigma) - exact) / exact;
        if (sigma === 0.05) worst05 = Math.max(worst05, Math.abs(rel));
        else worst10 = Math.max(worst10, Math.abs(rel));
      }
    }
    expect(worst05).toBeLessThan(0.01);
    expect(worst10).toBeLessThan(0.1);
    // The approximation's error grows like σ⁴ (the fourth moment of the phase): 16× from 0.05 to 0.1.
    expect(worst10).toBeGreaterThan(4 * worst05);
  });
});

describe('pupilCellAverages', () => {
  const R = 1e-3;
  const xa: Axis = { n: 70, start: -1.13e-3, step: 3.3e-5 };
  const ya: Axis = { n: 80, start: -1.21e-3, step: 3.1e-5 };

  it('with W = 0 the cells sum to the disc area πR² (the exact open fractions), to 1e-12', () => {
    const u = pupilCellAverages([], R, xa, ya);
    let re = 0;
    let im = 0;
    for (let i = 0; i < u.length; i += 2) {
      re += u[i]!;
      im += u[i + 1]!;
    }
    expect(Math.abs((re * xa.step * ya.step) / (Math.PI * R * R) - 1)).toBeLessThan(1e-12);
    expect(im).toBe(0);
  });

  it('piston of a quarter wave turns every open cell by i: the same open fractions times e^{iπ/2}', () => {
    const flat = pupilCellAverages([], R, xa, ya);
    const u = pupilCellAverages([{ j: 1, rms: 0.25 }], R, xa, ya);
    let worst = 0;
    for (let i = 0; i < u.length; i += 2) worst = Math.max(worst, Math.abs(u[i]!), Math.abs(u[i + 1]! - flat[i]!));
    // Rim cells are integrated over their open part (disc-rim-cells.ts), the flat pupil takes
    // mask.ts's closed-form fraction: the two agree to that form's rounding (measured 1.7e-12 at
    // one cell, where a 40-digit evaluation of the segment's area sides with the integral).
    expect(worst).toBeLessThan(1e-11);
  });

  it('tilt: interior cells are e^{iκx_c}·sin(κΔ/2)/(κΔ/2) exactly (calculus), to 1e-13', () => {
    // W = a·2x/R (Z2), κ = 4πa/R; a phase step of 1.2 rad per cell.
    const a = (1.2 * R) / (4 * Math.PI * xa.step);
    const kappa = (4 * Math.PI * a) / R;
    const u = pupilCellAverages([{ j: 2, rms: a }], R, xa, ya);
    let worst = 0;
    let count = 0;
    for (let r = 0; r < ya.n; r++) {
      for (let col = 0; col < xa.n; col++) {
        const x = xa.start + col * xa.step;
        const y = ya.start + r * ya.step;
        if (Math.hypot(Math.abs(x) + xa.step / 2, Math.abs(y) + ya.step / 2) >= R) continue;
        const sinc = Math.sin((kappa * xa.step) / 2) / ((kappa * xa.step) / 2);
        const i = 2 * (r * xa.n + col);
        worst = Math.max(worst, Math.hypot(u[i]! - sinc * Math.cos(kappa * x), u[i + 1]! - sinc * Math.sin(kappa * x)));
        count++;
      }
    }
    expect(count).toBeGreaterThan(2000);
    expect(worst).toBeLessThan(1e-13);
  });

  const steep: ZernikeTerm[] = [
    { j: 5, rms: 0.4 },
    { j: 8, rms: 0.6 },
    { j: 11, rms: -0.5 },
    { j: 22, rms: 0.3 },
  ];

  it('the rule per cell: 7 nodes per axis at four samples per period (π/2 per cell), 8 at Nyquist', () => {
    expect(cellRuleFor(Math.PI / 4)).toEqual({ panels: 1, nodes: 7 });
    expect(cellRuleFor(Math.PI / 2)).toEqual({ panels: 1, nodes: 8 });
    expect(cellRuleFor(3).panels).toBeGreaterThan(1);
  });

  it('interior cells of a steep wavefront equal a 40 × 40 Gauss–Legendre average to 1e-12', () => {
    // The slope bound gives a phase step near π/2 per cell (the planner's four samples per period).
    const G = wavefrontSlopeMax(steep, R);
    const step = 1 / (4 * G);
    const ax: Axis = { n: 9, start: -0.9 * R, step };
    const ay: Axis = { n: 9, start: 0.1 * R, step };
    const u = pupilCellAverages(steep, R, ax, ay);
    const { x: gx, w: gw } = gaussLegendre(40);
    let worst = 0;
    for (let r = 0; r < ay.n; r++) {
      for (let col = 0; col < ax.n; col++) {
        const xc = ax.start + col * step;
        const yc = ay.start + r * step;
        let re = 0;
        let im = 0;
        for (let a = 0; a < 40; a++) {
          for (let b = 0; b < 40; b++) {
            const p = 2 * Math.PI * tableWave(steep, R, xc + 0.5 * step * gx[b]!, yc + 0.5 * step * gx[a]!);
            re += 0.25 * gw[a]! * gw[b]! * Math.cos(p);
            im += 0.25 * gw[a]! * gw[b]! * Math.sin(p);
          }
        }
        const i = 2 * (r * ax.n + col);
        worst = Math.max(worst, Math.hypot(u[i]! - re, u[i + 1]! - im));
      }
    }
    expect(worst).toBeLessThan(1e-12);
  });

  it('rim cells equal the exact average over cell ∩ disc (to the reference\'s own error, 5e-7)', () => {
    // A grid over the whole pupil, the wavefront scaled to eight samples per period at its steepest.
    const step = R / 19.3;
    const k = 1 / (8 * step * wavefrontSlopeMax(steep, R));
    const terms = steep.map((t) => ({ j: t.j, rms: t.rms * k }));
    const ax: Axis = { n: 41, start: -20 * step, step };
    const u = pupilCellAverages(terms, R, ax, ax);
    const { x: gx, w: gw } = gaussLegendre(16);
    const rnd = mulberry32(11);
    let checked = 0;
    const done = new Set<number>();
    let worstRatio = 0;
    let worstAbs = 0;
    for (let tries = 0; tries < 4000 && checked < 12; tries++) {
      const r = Math.floor(rnd() * ax.n);
      const col = Math.floor(rnd() * ax.n);
      const xc = ax.start + col * step;
      const yc = ax.start + r * step;
      const near = Math.hypot(Math.max(0, Math.abs(xc) - step / 2), Math.max(0, Math.abs(yc) - step / 2));
      const far = Math.hypot(Math.abs(xc) + step / 2, Math.abs(yc) + step / 2);
      if (!(near < R && far > R) || done.has(r * ax.n + col)) continue;
      done.add(r * ax.n + col);
      // Exact average over the open part: 64 panels in x, 16-point GL in y over the chord ∩ cell.
      let re = 0;
      let im = 0;
      let area = 0;
      let lo = Infinity;
      let hi = -Infinity;
      const panels = 64;
      for (let p = 0; p < panels; p++) {
        for (let b = 0; b < 16; b++) {
          const x = xc - step / 2 + (p + 0.5 + 0.5 * gx[b]!) * (step / panels);
          const wx = 0.5 * gw[b]! * (step / panels);
          if (Math.abs(x) >= R) continue;
          const half = Math.sqrt(R * R - x * x);
          const y0 = Math.max(yc - step / 2, -half);
          const y1 = Math.min(yc + step / 2, half);
          if (y1 <= y0) continue;
          for (let a = 0; a < 16; a++) {
            const y = 0.5 * (y0 + y1) + 0.5 * (y1 - y0) * gx[a]!;
            const wy = 0.5 * gw[a]! * (y1 - y0);
            const ph = 2 * Math.PI * tableWave(terms, R, x, y);
            re += wx * wy * Math.cos(ph);
            im += wx * wy * Math.sin(ph);
            area += wx * wy;
          }
        }
      }
      // Phase range over the whole cell (dense sampling of the continuation).
      for (let a = 0; a <= 20; a++) {
        for (let b = 0; b <= 20; b++) {
          const ph = 2 * Math.PI * tableWave(terms, R, xc + step * (b / 20 - 0.5), yc + step * (a / 20 - 0.5));
          lo = Math.min(lo, ph);
          hi = Math.max(hi, ph);
        }
      }
      const q = area / (step * step);
      const i = 2 * (r * ax.n + col);
      const err = Math.hypot(u[i]! - re / (step * step), u[i + 1]! - im / (step * step));
      // The reference's own error (the chord's square-root ends inside a panel): measured 2.0e-7 at
      // worst here (test/optics/disc-rim-cells.test.ts holds the rim cells to 1e-10 of a polar one).
      // (The whole cell's mean times q, as rim cells were before they took their open part only,
      // was up to 2.4e-2 off here, about half of q(1−q)·range.)
      expect(err).toBeLessThanOrEqual(5e-7);
      worstRatio = Math.max(worstRatio, q * (1 - q) * (hi - lo));
      worstAbs = Math.max(worstAbs, err);
      checked++;
    }
    expect(checked).toBe(12);
    // The wavefront is steep enough that the whole cell's mean would be far off (the bound's scale).
    expect(worstRatio).toBeGreaterThan(0.01);
    expect(worstAbs).toBeLessThanOrEqual(5e-7);
  });
});
