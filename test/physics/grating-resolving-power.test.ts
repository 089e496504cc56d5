// Resolving power of a grating order, R = λ/Δλ = |m|·N (Born & Wolf, Principles of Optics, §8.6.3;
// Hecht, Optics, §10.2.8), with N the periods the light covers: all of them under a plane wave,
// an effective count under a Gaussian beam narrower than the grating (analysis/resolving-power.ts:
// the uniformly lit count whose lines dip as deep between two lines just resolved, 8/π², Rayleigh's
// criterion in its general form, Born & Wolf §7.6.3). Checked on the tool's own propagation: two
// incoherent lines λ and λ + λ/R computed as two cases, added in intensity on the screen, read by
// analysis/resolution.ts, dip to 8/π² (just resolved).
import { describe, expect, it } from 'vitest';
import { ordersWithAnswers, gratingUse } from '../../src/analysis/grating-answers.js';
import { readTwoLines, RAYLEIGH_DIP } from '../../src/analysis/resolution.js';
import { GAUSSIAN_RAYLEIGH_U, illuminatedPeriods, rayleighSeparation, UNTRUNCATED_WAISTS } from '../../src/analysis/resolving-power.js';
import type { Illumination } from '../../src/optics/aperture.js';
import { mm, nm, runCase, um } from '../helpers.js';

const lam = 633 * nm;

/**
 * A computed row at x (m) by band-limited interpolation: the far-field intensity of an aperture of
 * width D is band-limited to 2D/(λz) cycles per metre on the screen (near the axis, where x is
 * proportional to the direction cosine), and the planner samples it at λz/(8D), 4× finer than
 * Nyquist (Whittaker–Shannon; a Lanczos window of 32 samples a side keeps the truncated sum's error
 * near 1e-4 of the peak, where linear interpolation at 8 samples per lobe is off by about 2 %).
 */
function sampleAt(c: { intensity: Float64Array; nx: number; x0: number; dx: number }, x: number): number {
  const f = (x - c.x0) / c.dx;
  const i0 = Math.floor(f);
  const a = 32;
  if (i0 - a < 0 || i0 + a >= c.nx) return NaN;
  const sinc = (u: number) => (u === 0 ? 1 : Math.sin(Math.PI * u) / (Math.PI * u));
  let s = 0;
  for (let i = i0 - a + 1; i <= i0 + a; i++) s += c.intensity[i]! * sinc(f - i) * sinc((f - i) / a);
  return s;
}

/**
 * A thin sinusoidal phase grating of `count` periods (every order present, J_q²(1.25); no edges to
 * sample finely), far field, lit by `ill`, at wavelength l.
 */
function gratingAt(l: number, count: number, d: number, ill: Illumination, z: number, window: number) {
  return runCase({
    wavelength: l,
    distance: z,
    method: 'fraunhofer',
    window: [window, window],
    aperture: { shape: 'grating', profile: { kind: 'sinusoidal-phase', modulation: 2.5 }, count, period: d, opaque: false },
    illumination: ill,
  });
}

/**
 * The dip between order m of λ and of λ + δλ, two cases added in intensity on a common screen
 * axis (sampled finely around the order's landing point, between the two lines' positions).
 */
function dipOfTwoLines(count: number, d: number, ill: Illumination, m: number, dl: number, window: number, z: number) {
  const a = gratingAt(lam, count, d, ill, z, window);
  const b = gratingAt(lam + dl, count, d, ill, z, window);
  const xa = a.rec.metrics.orders!.find((o) => o.m === m)!.position!;
  const xb = b.rec.metrics.orders!.find((o) => o.m === m)!.position!;
  const sep = xb - xa;
  const n = 801;
  const from = xa - 1.5 * sep;
  const step = (4 * sep) / (n - 1);
  // Rayleigh's criterion is for two lines of equal strength: each case is scaled to its own peak
  // (the far-field peak goes as 1/λ², 5 % apart for λ/δλ = 40).
  const peakNear = (c: typeof a.c, x: number) => Math.max(...Array.from({ length: 201 }, (_, i) => sampleAt(c, x + ((i - 100) / 100) * 0.3 * sep)));
  const [pa, pb] = [peakNear(a.c, xa), peakNear(b.c, xb)];
  const sum = Array.from({ length: n }, (_, i) => sampleAt(a.c, from + i * step) / pa + sampleAt(b.c, from + i * step) / pb);
  const reading = readTwoLines(sum, (xa - from) / step, (xb - from) / step, 0.4 * (sep / step));
  return { reading, a, b, pitch: a.c.dx, sep };
}

describe('R = |m|N for a grating lit uniformly (Born & Wolf §8.6.3; Hecht §10.2.8)', () => {
  it('two sinc² lines one first zero apart dip to 8/π²: the Rayleigh separation of a uniformly lit grating of N periods is 1/(Nd) in spatial frequency', () => {
    const sinc2 = (q: number) => (q === 0 ? 1 : (Math.sin(Math.PI * q) / (Math.PI * q)) ** 2);
    expect(rayleighSeparation(sinc2, 1)).toBeCloseTo(1, 6);
  });

  const N = 100;
  const d = 10 * um;
  const { plan, rec } = gratingAt(lam, N, d, { kind: 'plane', tilt: [0, 0] }, 20, 6);
  const orders = ordersWithAnswers(plan, rec.metrics.orders!);
  it('gives each order that lands R = |m|·N and Δλ = λ/(|m|N); none for the zero order and the evanescent ones', () => {
    for (const o of orders) {
      if (o.m !== 0 && o.angle !== null) {
        expect(o.resolvingPower).toBe(Math.abs(o.m) * N);
        expect(o.smallestResolvable! / (lam / (Math.abs(o.m) * N))).toBeCloseTo(1, 12);
      } else {
        expect(o.resolvingPower).toBeNull();
        expect(o.smallestResolvable).toBeNull();
      }
    }
    expect(gratingUse(plan)!.periodsRule).toBe('uniform');
  });
  it.each([1, 2])('computed: order %i of λ and λ + λ/(|m|N) added in intensity dip to 8/π² within 2 %', (m) => {
    // Budget: the array factor of 100 periods is sinc² to O(1/N²) near its peak; the second line is
    // wider by δλ/λ = 1/(mN) (1 % for m = 1), which moves the dip by about as much; the band-limited
    // interpolation is good to 1e-4. Measured: 1.0 % (m = 1) and 0.5 % (m = 2) above 8/π².
    const { reading, pitch, sep } = dipOfTwoLines(N, d, { kind: 'plane', tilt: [0, 0] }, m, lam / (m * N), 6, 20);
    expect(sep / pitch).toBeGreaterThan(8);
    expect(reading).not.toBeNull();
    expect(Math.abs(reading!.dip / RAYLEIGH_DIP - 1)).toBeLessThan(0.02);
  });
});

describe('R = |m|·N_eff for a Gaussian beam over a long grating', () => {
  const d = 20 * um;
  const count = 500; // 10 mm of grating
  const w = 0.5 * mm;
  const gauss: Illumination = { kind: 'gaussian', waist: w, tilt: [0, 0] };
  it('counts πw/(1.318·d) periods for a beam well inside the grating: 1.19 × the periods within its 1/e² diameter', () => {
    const n = illuminatedPeriods(d, count, w);
    expect(n.rule).toBe('beam');
    expect(GAUSSIAN_RAYLEIGH_U).toBeCloseTo(1.318, 3);
    expect(n.periods).toBeCloseTo((Math.PI * w) / (GAUSSIAN_RAYLEIGH_U * d), 9);
    expect(n.periods / ((2 * w) / d)).toBeCloseTo(1.19, 2);
  });
  it('joins the truncated beam\'s count where the grating\'s ends reach 3 w, and tends to the whole count for a wide beam', () => {
    const atEdge = (UNTRUNCATED_WAISTS * 2 * w) / d; // periods whose ends are 3 w out
    const cut = illuminatedPeriods(d, Math.floor(atEdge) - 1, w);
    // (Simpson's rule and the bisection hold the truncated count to better than 1e-4.)
    expect(cut.rule).toBe('truncated-beam');
    expect(cut.periods / illuminatedPeriods(d, count, w).periods).toBeCloseTo(1, 3);
    const wide = illuminatedPeriods(d, 100, 1000 * 100 * d);
    expect(wide.periods / 100).toBeCloseTo(1, 4);
  });
  it('computed: order 1 of λ and λ + λ/N_eff under the beam dip as two Gaussian lines of those widths do (within 0.3 %), 8/π² but for the lines\' width difference', () => {
    const nEff = illuminatedPeriods(d, count, w).periods;
    const dl = lam / nEff;
    const { reading, pitch, sep } = dipOfTwoLines(count, d, gauss, 1, dl, 1.6, 20);
    expect(sep / pitch).toBeGreaterThan(8);
    // Reference: the far field of exp(−x²/w²) is exp(−2(πw·s/λ)²) in the direction cosine s about
    // each line (Siegman, Lasers, ch. 17: a Gaussian beam's far field is Gaussian with divergence
    // λ/(πw)); lines at s = 0 and mδλ/d, widths ∝ λ and λ + δλ, sampled finely.
    const line = (s: number, l: number, c: number) => Math.exp(-2 * ((Math.PI * w * (s - c)) / l) ** 2);
    const ds = dl / d;
    const pts = Array.from({ length: 20001 }, (_, i) => -ds + (3 * ds * i) / 20000).map((s) => [s, line(s, lam, 0) + line(s, lam + dl, ds)] as const);
    const p1 = Math.max(...pts.filter(([s]) => s < ds / 2).map(([, v]) => v));
    const p2 = Math.max(...pts.filter(([s]) => s > ds / 2).map(([, v]) => v));
    const valley = Math.min(...pts.filter(([s]) => s > 0 && s < ds).map(([, v]) => v));
    const reference = valley / Math.min(p1, p2);
    expect(Math.abs(reading!.dip / reference - 1)).toBeLessThan(3e-3);
    // Equal widths would dip to exactly 8/π² (the definition of N_eff); the 1/N_eff width
    // difference lifts it by 1.4 % here.
    expect(Math.abs(reference / RAYLEIGH_DIP - 1)).toBeLessThan(0.02);
    expect(count / nEff).toBeGreaterThan(8);
  }, 30_000);
});
