// Thin-grating profiles (src/optics/grating-profile.ts) against sources outside the module:
// - order efficiencies against the published formulas: Goodman, Introduction to Fourier Optics,
//   §4.4 (binary amplitude: ¼, 1/π², even orders absent; sinusoidal amplitude: ¼ and m²/16;
//   sinusoidal phase: J_q²(m/2), its zeroth order vanishing at m/2 = 2.405 and its first order at
//   most 33.8 %), and for the binary phase and blazed profiles the diffractive-optics results of
//   Goodman ch. 7 (binary π step at 50 % duty: 0 and 4/π²; blazed depth α: sinc²(q − α)), the
//   latter from memory of that chapter. J_0, J_1 come from @stdlib (a general-purpose library);
// - order amplitudes against an FFT (fft.js, via fft2Reference) of one period sampled exactly on
//   2^18 cells, to 1e-10;
// - Σ_q |c_q|² against the mean of |t|² over a period (Parseval; common practice), with the
//   tail of the sum bounded in closed form;
// - cell averages against adaptive Gauss–Legendre quadrature of t(x) evaluated point by point here
//   (Abramowitz & Stegun 25.4.29 rule from test/reference/quadrature.ts, split at the profile's
//   discontinuities, bisected until a 10- and a 20-point rule agree to 1e-14 of the piece's length; t is bounded by 1), over
//   random cells from a fixed seed, including cells wider than a period and cells across the
//   grating's ends, to 1e-12;
// - binary amplitude samples against mask.ts sampleProfile for the same slits, to 1e-14.
import j0 from '@stdlib/math-base-special-besselj0';
import j1 from '@stdlib/math-base-special-besselj1';
import { describe, expect, it } from 'vitest';
import { fft2Reference } from '../../src/optics/fft.js';
import type { Axis } from '../../src/optics/field.js';
import {
  describeProfile,
  gratingCellAverages,
  localFrequencyMax,
  meanTransmission,
  orderAmplitude,
  orderEfficiency,
  profileMinFeature,
  significantOrders,
  type GratingProfile,
} from '../../src/optics/grating-profile.js';
import { sampleProfile } from '../../src/optics/mask.js';
import { mulberry32, um } from '../helpers.js';
import { gaussLegendre } from '../reference/quadrature.js';

const PI = Math.PI;
const sincRef = (u: number) => (u === 0 ? 1 : Math.sin(PI * u) / (PI * u));

/** Profiles used throughout: one or more of each kind, with values off any special case. */
const profiles: GratingProfile[] = [
  { kind: 'binary-amplitude', duty: 0.5 },
  { kind: 'binary-amplitude', duty: 0.27 },
  { kind: 'sinusoidal-amplitude', modulation: 1 },
  { kind: 'sinusoidal-amplitude', modulation: 0.42 },
  { kind: 'sinusoidal-phase', modulation: 2.4 },
  { kind: 'sinusoidal-phase', modulation: 23.7 },
  { kind: 'binary-phase', duty: 0.5, step: PI },
  { kind: 'binary-phase', duty: 0.31, step: 2.2 },
  { kind: 'blazed', depth: 1 },
  { kind: 'blazed', depth: 0.73 },
  { kind: 'blazed', depth: -2.4 },
];

describe('order efficiencies against published formulas', () => {
  it('binary amplitude, 50 % duty: order 0 ¼, ±1 1/π², even orders 0 (Goodman §4.4)', () => {
    const p: GratingProfile = { kind: 'binary-amplitude', duty: 0.5 };
    expect(orderEfficiency(p, 0)).toBeCloseTo(0.25, 15);
    expect(orderEfficiency(p, 1)).toBeCloseTo(1 / PI ** 2, 15);
    expect(orderEfficiency(p, -1)).toBeCloseTo(1 / PI ** 2, 15);
    expect(orderEfficiency(p, 3)).toBeCloseTo(1 / (9 * PI ** 2), 15);
    for (const q of [2, -2, 4, 10]) expect(orderEfficiency(p, q)).toBeLessThan(1e-30);
  });

  it.each([1, 0.42])('sinusoidal amplitude, m = %d: order 0 ¼, ±1 m²/16, the rest 0 (Goodman §4.4)', (m) => {
    const p: GratingProfile = { kind: 'sinusoidal-amplitude', modulation: m };
    expect(orderEfficiency(p, 0)).toBe(0.25);
    expect(orderEfficiency(p, 1)).toBeCloseTo(m * m / 16, 16);
    expect(orderEfficiency(p, -1)).toBeCloseTo(m * m / 16, 16);
    for (const q of [2, -2, 3, 7]) expect(orderEfficiency(p, q)).toBe(0);
  });

  it.each([0.3, 2.4, 3.6824, 9.1])('sinusoidal phase, m = %d rad: orders 0 and ±1 are J_0²(m/2), J_1²(m/2) with J from @stdlib (Goodman §4.4)', (m) => {
    const p: GratingProfile = { kind: 'sinusoidal-phase', modulation: m };
    // Tolerance: both Bessel values to ~1e-15 (bessel-jn.test.ts).
    expect(Math.abs(orderEfficiency(p, 0) - j0(m / 2) ** 2)).toBeLessThan(1e-14);
    expect(Math.abs(orderEfficiency(p, 1) - j1(m / 2) ** 2)).toBeLessThan(1e-14);
    expect(Math.abs(orderEfficiency(p, -1) - j1(m / 2) ** 2)).toBeLessThan(1e-14);
  });

  it('sinusoidal phase: no zeroth order at m/2 = 2.405 (first zero of J_0, A&S Table 9.5, from memory); at most 33.8 % in order 1, at m/2 = 1.841 (Goodman §4.4)', () => {
    expect(orderEfficiency({ kind: 'sinusoidal-phase', modulation: 2 * 2.404825557695773 }, 0)).toBeLessThan(1e-30);
    const best = orderEfficiency({ kind: 'sinusoidal-phase', modulation: 2 * 1.8411837813406593 }, 1);
    expect(best).toBeCloseTo(0.3386, 4);
    for (const a of [1.7, 1.8, 1.9, 2.0]) expect(orderEfficiency({ kind: 'sinusoidal-phase', modulation: 2 * a }, 1)).toBeLessThan(best);
  });

  it('binary phase, step π at 50 % duty: order 0 vanishes, ±1 get 4/π² each, even orders 0 (Goodman ch. 7)', () => {
    const p: GratingProfile = { kind: 'binary-phase', duty: 0.5, step: PI };
    expect(orderEfficiency(p, 0)).toBeLessThan(1e-30);
    expect(orderEfficiency(p, 1)).toBeCloseTo(4 / PI ** 2, 15);
    expect(orderEfficiency(p, -1)).toBeCloseTo(4 / PI ** 2, 15);
    expect(orderEfficiency(p, 3)).toBeCloseTo(4 / (9 * PI ** 2), 15);
    for (const q of [2, -2, 4]) expect(orderEfficiency(p, q)).toBeLessThan(1e-30);
  });

  it('binary phase, any step and duty: order 0 = 1 − 4D(1−D)sin²(φ/2), order q ≠ 0 = 4sin²(φ/2)·D²sinc²(qD) (Fourier series of the two-level profile; common practice)', () => {
    const D = 0.31;
    const phi = 2.2;
    const p: GratingProfile = { kind: 'binary-phase', duty: D, step: phi };
    const s2 = Math.sin(phi / 2) ** 2;
    expect(orderEfficiency(p, 0)).toBeCloseTo(1 - 4 * D * (1 - D) * s2, 15);
    for (const q of [1, -1, 2, 5, -7]) expect(orderEfficiency(p, q)).toBeCloseTo(4 * s2 * D * D * sincRef(q * D) ** 2, 15);
  });

  it('blazed: order q gets sinc²(q − α); depth 1 wave sends everything to order 1, ½ wave splits 4/π² to orders 0 and 1 (Goodman ch. 7)', () => {
    expect(orderEfficiency({ kind: 'blazed', depth: 1 }, 1)).toBeCloseTo(1, 15);
    for (const q of [0, 2, -1, 5]) expect(orderEfficiency({ kind: 'blazed', depth: 1 }, q)).toBeLessThan(1e-30);
    expect(orderEfficiency({ kind: 'blazed', depth: 0.5 }, 0)).toBeCloseTo(4 / PI ** 2, 15);
    expect(orderEfficiency({ kind: 'blazed', depth: 0.5 }, 1)).toBeCloseTo(4 / PI ** 2, 15);
    for (const a of [0.73, -2.4, 3.1])
      for (const q of [-3, 0, 1, 2, 4]) expect(orderEfficiency({ kind: 'blazed', depth: a }, q)).toBeCloseTo(sincRef(q - a) ** 2, 15);
  });
});

describe('order amplitudes against an FFT of one exactly sampled period (fft.js)', () => {
  // One period (count 1) on N cells covering [−d/2, d/2]: cell j is centred on s_j = −d/2 + (j + ½)d/N.
  // Its exact average is Σ_p c_p·sinc(p/N)·e^{2πi p s_j/d}, so the DFT X_q = (1/N)Σ_j a_j e^{−2πiqj/N}
  // equals Σ_{p ≡ q (mod N)} c_p·sinc(p/N)·e^{−iπp(1 − 1/N)}, and c_q = X_q·e^{iπq(1 − 1/N)}/sinc(q/N)
  // up to the aliased orders p = q + kN. Error budget: for the binary and blazed profiles
  // |c_p| ≤ √C/(π|p|) (C = 1 binary amplitude, 4 sin²(φ/2) ≤ 4 binary phase, sin²(πα) blazed) and
  // |sinc((q + kN)/N)| ≤ |q|/(N|k|), so the alias sum is ≤ √C·|q|·π/(3N²): 1.2e-10·√C at |q| = 8,
  // N = 2^18, and proportionally less at lower orders (smooth profiles: nothing). Tolerances: 2.5e-10
  // on the amplitudes (√C ≤ 2); 1e-10 on the efficiencies, which err by 2|c_q|·|δc_q| ≤ 2·(2/π)·(3e-11)
  // at q = ±1 and about the same further out (|c_q| falls as 1/q while |δc_q| grows as q).
  const N = 2 ** 18;
  const d = 3 * um;
  const axis: Axis = { n: N, start: -d / 2 + d / (2 * N), step: d / N };
  it.each(profiles.map((p) => [describeProfile(p), p] as const))('%s', (_name, p) => {
    const data = gratingCellAverages(p, d, 1, axis);
    fft2Reference(data, N, 1, false);
    let worstEff = 0;
    let worstAmp = 0;
    for (let q = -8; q <= 8; q++) {
      const k = (q + N) % N;
      const xr = data[2 * k]! / N;
      const xi = data[2 * k + 1]! / N;
      const ph = PI * q * (1 - 1 / N);
      const f = 1 / sincRef(q / N);
      const cr = (xr * Math.cos(ph) - xi * Math.sin(ph)) * f;
      const ci = (xr * Math.sin(ph) + xi * Math.cos(ph)) * f;
      const [ar, ai] = orderAmplitude(p, q);
      worstAmp = Math.max(worstAmp, Math.hypot(cr - ar, ci - ai));
      worstEff = Math.max(worstEff, Math.abs(cr * cr + ci * ci - orderEfficiency(p, q)));
    }
    expect(worstEff).toBeLessThan(1e-10);
    expect(worstAmp).toBeLessThan(2.5e-10);
  });
});

describe('Σ efficiencies = mean transmission (Parseval; common practice)', () => {
  it.each(profiles.map((p) => [describeProfile(p), p] as const))('%s', (_name, p) => {
    // Enough orders for the sinusoidal phase (J_q(11.85) < 1e-40 past q = 60) with far fewer Bessel
    // evaluations, each of which costs O(q).
    const K = p.kind === 'sinusoidal-phase' ? 300 : 20000;
    let s = 0;
    for (let q = -K; q <= K; q++) s += orderEfficiency(p, q);
    // Mean of |t|² over a period, from the profile's definition: duty (binary amplitude), ¼ + m²/8
    // (sinusoidal amplitude), 1 (phase profiles).
    const expected =
      p.kind === 'binary-amplitude' ? p.duty : p.kind === 'sinusoidal-amplitude' ? 0.25 + p.modulation ** 2 / 8 : 1;
    expect(meanTransmission(p)).toBeCloseTo(expected, 15);
    // The orders past ±K: |c_q|² ≤ C/(π q)² with C = 1 (binary amplitude), 4 sin²(φ/2) (binary phase),
    // sin²(πα) (blazed, |q − α| for q), so the two tails hold at most 2C/(π²(K − |α| − 1)); nothing
    // for the sinusoids. Plus 4e4 rounded additions of ≤ 1: 1e-11.
    const C =
      p.kind === 'binary-amplitude' ? 1 : p.kind === 'binary-phase' ? 4 * Math.sin(p.step / 2) ** 2 : p.kind === 'blazed' ? Math.sin(PI * p.depth) ** 2 : 0;
    const tail = (2 * C) / (PI ** 2 * (K - 4));
    expect(s).toBeLessThanOrEqual(expected + 1e-11);
    expect(s).toBeGreaterThanOrEqual(expected - tail - 1e-11);
  });
});

/** t(x) of the finite grating, point by point, straight from the definitions (independent of src). */
function transmittance(p: GratingProfile, d: number, count: number, x: number): [number, number] {
  const left = (-count * d) / 2;
  if (x < left || x > -left) return [0, 0];
  const k = Math.min(count - 1, Math.floor((x - left) / d));
  const s = x - left - k * d - d / 2; // in [−d/2, d/2]
  switch (p.kind) {
    case 'binary-amplitude':
      return [Math.abs(s) < (p.duty * d) / 2 ? 1 : 0, 0];
    case 'sinusoidal-amplitude':
      return [0.5 + (p.modulation / 2) * Math.cos((2 * PI * s) / d), 0];
    case 'sinusoidal-phase': {
      const ph = (p.modulation / 2) * Math.sin((2 * PI * s) / d);
      return [Math.cos(ph), Math.sin(ph)];
    }
    case 'binary-phase': {
      const ph = Math.abs(s) < (p.duty * d) / 2 ? p.step : 0;
      return [Math.cos(ph), Math.sin(ph)];
    }
    case 'blazed': {
      const ph = 2 * PI * p.depth * (s / d + 0.5);
      return [Math.cos(ph), Math.sin(ph)];
    }
  }
}

/** The points in (a, b) where t(x) may jump: period boundaries, and the step edges of binary profiles. */
function breakpoints(p: GratingProfile, d: number, count: number, a: number, b: number): number[] {
  const left = (-count * d) / 2;
  const pts: number[] = [a];
  const k0 = Math.max(0, Math.floor((a - left) / d) - 1);
  const k1 = Math.min(count, Math.ceil((b - left) / d) + 1);
  for (let k = k0; k <= k1; k++) {
    const edge = left + k * d;
    const cands = [edge];
    if ((p.kind === 'binary-amplitude' || p.kind === 'binary-phase') && k < count) {
      cands.push(edge + d / 2 - (p.duty * d) / 2, edge + d / 2 + (p.duty * d) / 2);
    }
    for (const c of cands) if (c > a && c < b) pts.push(c);
  }
  pts.push(b);
  return pts.sort((u, v) => u - v);
}

/**
 * Adaptive Gauss–Legendre on a smooth piece: bisect until the 10- and 20-point rules agree to
 * `abstol` (split in half with each bisection). Where they agree, the 20-point value is far closer.
 */
function adaptive(f: (x: number) => [number, number], a: number, b: number, abstol: number, depth = 0): [number, number] {
  const rule = (n: number): [number, number] => {
    const { x, w } = gaussLegendre(n);
    const h = (b - a) / 2;
    const m = (a + b) / 2;
    let re = 0;
    let im = 0;
    for (let i = 0; i < n; i++) {
      const [u, v] = f(m + h * x[i]!);
      re += w[i]! * u;
      im += w[i]! * v;
    }
    return [re * h, im * h];
  };
  const g10 = rule(10);
  const g20 = rule(20);
  if (Math.hypot(g20[0] - g10[0], g20[1] - g10[1]) <= abstol || depth > 30) return g20;
  const m = (a + b) / 2;
  const l = adaptive(f, a, m, abstol / 2, depth + 1);
  const r = adaptive(f, m, b, abstol / 2, depth + 1);
  return [l[0] + r[0], l[1] + r[1]];
}

/** The reference cell average over [a, b] (a < b), by quadrature. */
function referenceAverage(p: GratingProfile, d: number, count: number, a: number, b: number): [number, number] {
  const pts = breakpoints(p, d, count, a, b);
  let re = 0;
  let im = 0;
  for (let i = 0; i + 1 < pts.length; i++) {
    if (pts[i + 1]! <= pts[i]!) continue;
    const [u, v] = adaptive((x) => transmittance(p, d, count, x), pts[i]!, pts[i + 1]!, 1e-14 * (pts[i + 1]! - pts[i]!));
    re += u;
    im += v;
  }
  return [re / (b - a), im / (b - a)];
}

describe('cell averages against adaptive quadrature (random cells, fixed seed)', () => {
  it.each(profiles.map((p) => [describeProfile(p), p] as const))('%s: to 1e-12, wide cells and cells across the ends included', (_name, p) => {
    const rnd = mulberry32(77 + profiles.indexOf(p));
    let worst = 0;
    let wide = 0;
    let acrossEnd = 0;
    let outside = 0;
    for (let draw = 0; draw < 12; draw++) {
      const d = (1 + 4 * rnd()) * um;
      const count = [1, 2, 3, 7, 10, 20][Math.floor(6 * rnd())]!;
      // Cells from d/50 to 3.2 d; every fourth draw wider than a period.
      const step = draw % 4 === 3 ? d * (1.05 + 2.1 * rnd()) : d * 10 ** (-1.7 + 2.2 * rnd());
      const n = 24;
      const left = (-count * d) / 2;
      // Axes around the left end, the right end, or anywhere over the grating.
      const where = draw % 3;
      const anchor = where === 0 ? left : where === 1 ? -left : left + rnd() * count * d;
      const axis: Axis = { n, start: anchor - (n / 2 - rnd()) * step, step };
      const got = gratingCellAverages(p, d, count, axis);
      for (let j = 0; j < n; j++) {
        const x = axis.start + j * step;
        const a = x - step / 2;
        const b = x + step / 2;
        if (step > d) wide++;
        if ((a < left && b > left) || (a < -left && b > -left)) acrossEnd++;
        const lo = Math.max(a, left);
        const hi = Math.min(b, -left);
        let ref: [number, number] = [0, 0];
        if (hi > lo) {
          const r = referenceAverage(p, d, count, lo, hi);
          ref = [(r[0] * (hi - lo)) / step, (r[1] * (hi - lo)) / step];
        } else outside++;
        worst = Math.max(worst, Math.hypot(got[2 * j]! - ref[0], got[2 * j + 1]! - ref[1]));
      }
    }
    // Tolerance 1e-12 (the brief's): the closed forms are exact to rounding, the quadrature to 1e-14
    // of the cell; rounding of positions (|x| ≤ 60 µm, cells ≥ d/50 ≥ 20 nm) is ≤ 1e-14.
    expect(worst).toBeLessThan(1e-12);
    // The draws did include what the title claims.
    expect(wide).toBeGreaterThan(0);
    expect(acrossEnd).toBeGreaterThan(0);
    expect(outside).toBeGreaterThan(0);
  });

  it.each(profiles.map((p) => [describeProfile(p), p] as const))(
    '%s: a grating of 10⁶ (and 999 999) periods on cells of 37.3 periods, over its whole width, ends included',
    (_name, p) => {
      // Reference per cell: the two partial periods at its ends by quadrature, plus the number of whole
      // periods between times the quadrature of one period. Positions reach 0.5 m with d = 1 µm, so
      // each position carries a rounding of ε·0.5 m = 1.1e-16 m against cells of 37 µm: the cell's
      // average moves by up to 3e-12 per end and per unit jump of t (jumps reach 2 for the π step);
      // measured 2–8e-12; tolerance 2e-11.
      const d = 1 * um;
      const onePeriod = referenceAverage(p, d, 1, -d / 2, d / 2);
      for (const count of [1_000_000, 999_999]) {
        const left = (-count * d) / 2;
        const step = 37.3 * d;
        const n = Math.ceil((count * d) / step) + 4;
        const axis: Axis = { n, start: left - 1.7 * step, step };
        const got = gratingCellAverages(p, d, count, axis);
        const rnd = mulberry32(count);
        const picks = [0, 1, 2, 3, n - 4, n - 3, n - 2, n - 1];
        for (let i = 0; i < 20; i++) picks.push(Math.floor(rnd() * n));
        let worst = 0;
        for (const j of picks) {
          const x = axis.start + j * step;
          const lo = Math.max(x - step / 2, left);
          const hi = Math.min(x + step / 2, -left);
          let re = 0;
          let im = 0;
          if (hi > lo) {
            // Periods k with left + k·d inside (lo, hi) are whole between the first and last boundary.
            const kFirst = Math.ceil((lo - left) / d);
            const kLast = Math.floor((hi - left) / d);
            const bFirst = left + kFirst * d;
            const bLast = left + kLast * d;
            // Each partial end is one period's piece: integrate it on a single period centred as it is.
            const part = (u0: number, u1: number, k: number): [number, number] => {
              if (!(u1 > u0)) return [0, 0];
              const centre = left + (k + 0.5) * d;
              const r = referenceAverage(p, d, 1, u0 - centre, u1 - centre);
              return [r[0] * (u1 - u0), r[1] * (u1 - u0)];
            };
            const pa = part(lo, Math.min(bFirst, hi), kFirst - 1);
            const pb = kLast >= kFirst ? part(bLast, hi, kLast) : [0, 0];
            const whole = Math.max(0, kLast - kFirst);
            re = (pa[0] + pb[0]! + whole * onePeriod[0] * d) / step;
            im = (pa[1] + pb[1]! + whole * onePeriod[1] * d) / step;
          }
          worst = Math.max(worst, Math.hypot(got[2 * j]! - re, got[2 * j + 1]! - im));
        }
        expect(worst).toBeLessThan(2e-11);
      }
    },
  );

  it('cells beyond the grating are 0, and `out` is filled in place', () => {
    const p: GratingProfile = { kind: 'blazed', depth: 0.73 };
    const axis: Axis = { n: 8, start: 10 * um, step: 1 * um };
    const out = new Float64Array(16).fill(7);
    const res = gratingCellAverages(p, 2 * um, 5, axis, out);
    expect(res).toBe(out);
    expect(Array.from(out)).toEqual(new Array(16).fill(0));
  });
});

describe('binary amplitude samples equal mask.ts sampleProfile for the same slits', () => {
  it('to 1e-14 on random slits and axes (fixed seed)', () => {
    const rnd = mulberry32(2024);
    let worst = 0;
    for (let draw = 0; draw < 200; draw++) {
      const period = (1 + 9 * rnd()) * um;
      const width = period * (0.02 + 0.96 * rnd());
      const count = 1 + Math.floor(30 * rnd());
      const step = period * 10 ** (-1.5 + 2 * rnd());
      const n = 40;
      const extent = count * period;
      const axis: Axis = { n, start: -extent / 2 - 2 * step + rnd() * extent, step };
      const mine = gratingCellAverages({ kind: 'binary-amplitude', duty: width / period }, period, count, axis);
      const theirs = sampleProfile({ kind: 'grating', count, width, period }, axis);
      for (let j = 0; j < n; j++) {
        worst = Math.max(worst, Math.abs(mine[2 * j]! - theirs[j]!));
        expect(mine[2 * j + 1]).toBe(0);
      }
    }
    expect(worst).toBeLessThan(1e-14);
  });
});

describe('significantOrders', () => {
  /** Least width of any range within [−R, R] holding the target, by brute force on prefix sums. */
  function bruteForce(p: GratingProfile, tol: number, R: number): { width: number; ranges: [number, number][] } {
    const pre = [0];
    for (let q = -R; q <= R; q++) pre.push(pre.at(-1)! + orderEfficiency(p, q));
    const target = (1 - tol) * meanTransmission(p);
    for (let w = 1; w <= 2 * R + 1; w++) {
      const ranges: [number, number][] = [];
      for (let lo = -R; lo + w - 1 <= R; lo++) {
        if (pre[lo + w + R]! - pre[lo + R]! >= target * (1 - 1e-12)) ranges.push([lo, lo + w - 1]);
      }
      if (ranges.length) return { width: w, ranges };
    }
    return { width: Infinity, ranges: [] };
  }

  const cases: [GratingProfile, number][] = [
    [{ kind: 'sinusoidal-phase', modulation: 20 }, 1e-6],
    [{ kind: 'sinusoidal-phase', modulation: 2.4 }, 1e-3],
    [{ kind: 'blazed', depth: 0.73 }, 0.05],
    [{ kind: 'blazed', depth: -2.4 }, 0.02],
    [{ kind: 'binary-amplitude', duty: 0.27 }, 0.01],
    [{ kind: 'binary-phase', duty: 0.5, step: PI }, 0.02],
    [{ kind: 'sinusoidal-amplitude', modulation: 0.8 }, 1e-9],
  ];
  it.each(cases.map(([p, tol]) => [describeProfile(p), tol, p] as const))(
    '%s, tol %d: the range holds (1 − tol) of the power and no narrower range does (brute force over ±600 orders)',
    (_name, tol, p) => {
      const [lo, hi] = significantOrders(p, tol);
      let s = 0;
      for (let q = lo; q <= hi; q++) s += orderEfficiency(p, q);
      expect(s).toBeGreaterThanOrEqual((1 - tol) * meanTransmission(p) * (1 - 1e-12));
      const bf = bruteForce(p, tol, 600);
      expect(hi - lo + 1).toBe(bf.width);
      expect(bf.ranges).toContainEqual([lo, hi]);
    },
  );

  it('sinusoidal amplitude: all three orders for a small tol, two (the lower pair, equal power) once the tol exceeds one first order', () => {
    const p: GratingProfile = { kind: 'sinusoidal-amplitude', modulation: 1 };
    const first = 1 / 16 / meanTransmission(p); // a first order's share: 1/6
    expect(significantOrders(p, 1e-9)).toEqual([-1, 1]);
    expect(significantOrders(p, first * 1.01)).toEqual([-1, 0]);
    expect(significantOrders(p, 0.49)).toEqual([0, 0]);
  });

  it('blazed at an integer depth: the one order it sends everything to', () => {
    expect(significantOrders({ kind: 'blazed', depth: 3 }, 1e-6)).toEqual([3, 3]);
  });

  it('binary amplitude, 50 % duty, tol 1e-4: about 2/(π²·tol) ≈ 2026 orders each side (its 1/q² tail)', () => {
    // The orders past ±Q hold Σ_{odd |q| > Q} 1/(πq)² = (2/π²)·Σ_{odd q > Q} 1/q² ≈ (2/π²)·1/(2Q)
    // = 1/(π²Q) (the sum of 1/q² over odd q past Q by its integral; common practice); against the
    // total ½ that is tol = 2/(π²Q), so Q ≈ 2/(π²·tol). Slack of 1 % for the integral estimate.
    const [lo, hi] = significantOrders({ kind: 'binary-amplitude', duty: 0.5 }, 1e-4);
    const Q = (hi - lo) / 2;
    expect(Math.abs(Q - 2 / (PI ** 2 * 1e-4))).toBeLessThan(20);
  });

  it('refuses tolerances out of range and ranges too wide to search', () => {
    expect(() => significantOrders({ kind: 'blazed', depth: 0.5 }, 0)).toThrow(RangeError);
    expect(() => significantOrders({ kind: 'blazed', depth: 0.5 }, 0.5)).toThrow(RangeError);
    expect(() => significantOrders({ kind: 'binary-amplitude', duty: 0.01 }, 1e-9)).toThrow(/orders on each side/);
  });
});

describe('facts for the planner and words for the report', () => {
  const d = 4 * um;
  it('local frequency: (m/2)/d for the sinusoidal phase, |α|/d blazed, 1/d for the amplitude sinusoid and binary profiles', () => {
    expect(localFrequencyMax({ kind: 'sinusoidal-phase', modulation: 2.4 }, d)).toBeCloseTo(1.2 / d, 6);
    expect(localFrequencyMax({ kind: 'blazed', depth: -2.4 }, d)).toBeCloseTo(2.4 / d, 6);
    expect(localFrequencyMax({ kind: 'sinusoidal-amplitude', modulation: 0.5 }, d)).toBe(1 / d);
    expect(localFrequencyMax({ kind: 'binary-phase', duty: 0.3, step: 1 }, d)).toBe(1 / d);
  });

  it('smallest feature: min(duty, 1 − duty)·d for binary profiles, half the fastest local cycle (≤ d/2) for smooth ones', () => {
    expect(profileMinFeature({ kind: 'binary-amplitude', duty: 0.27 }, d)).toBeCloseTo(0.27 * d, 18);
    expect(profileMinFeature({ kind: 'binary-phase', duty: 0.8, step: PI }, d)).toBeCloseTo(0.2 * d, 18);
    expect(profileMinFeature({ kind: 'sinusoidal-amplitude', modulation: 1 }, d)).toBe(d / 2);
    expect(profileMinFeature({ kind: 'sinusoidal-phase', modulation: 1 }, d)).toBe(d / 2);
    expect(profileMinFeature({ kind: 'sinusoidal-phase', modulation: 8 }, d)).toBe(d / 8);
    expect(profileMinFeature({ kind: 'blazed', depth: 4 }, d)).toBe(d / 8);
  });

  it('describes each profile in words', () => {
    expect(describeProfile({ kind: 'sinusoidal-phase', modulation: 2.4 })).toBe('sinusoidal phase grating, modulation 2.4 rad peak to peak');
    expect(describeProfile({ kind: 'binary-phase', duty: 0.5, step: PI })).toBe('binary phase grating, step 3.142 rad over 0.5 of each period');
    expect(describeProfile({ kind: 'blazed', depth: 1 })).toBe('blazed grating, depth 1 wave');
    expect(describeProfile({ kind: 'binary-amplitude', duty: 0.25 })).toBe('binary amplitude grating, open fraction 0.25');
  });

  it('refuses parameters outside each profile’s range', () => {
    expect(() => orderEfficiency({ kind: 'binary-amplitude', duty: 1 }, 0)).toThrow(RangeError);
    expect(() => orderEfficiency({ kind: 'sinusoidal-amplitude', modulation: 1.2 }, 0)).toThrow(RangeError);
    expect(() => orderEfficiency({ kind: 'sinusoidal-phase', modulation: -1 }, 0)).toThrow(RangeError);
    expect(() => orderEfficiency({ kind: 'blazed', depth: Number.NaN }, 0)).toThrow(RangeError);
    expect(() => gratingCellAverages({ kind: 'blazed', depth: 1 }, d, 2.5, { n: 4, start: 0, step: d })).toThrow(RangeError);
  });
});
