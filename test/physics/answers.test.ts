// The answers a case gives beyond its map: encircled energy, widths, detector fractions, verdicts,
// the smallest-spot search and overlapping orders, against published values.
import { describe, expect, it } from 'vitest';
import { energyCurve, fractionWithin } from '../../src/analysis/encircled.js';
import { AIRY_HALF_POWER_V, SINC_HALF_POWER_U, sineIntegral } from '../../src/analysis/verdict.js';
import { orderOverlaps, type OrderSet } from '../../src/analysis/overlap.js';
import { planCase } from '../../src/plan/planner.js';
import { runPlannedCase } from '../../src/run/run-case.js';
import { answerQuestions, smallestSpot } from '../../src/run/searches.js';
import { searchPicture } from '../../src/output/extra-pictures.js';
import { testContext } from '../engine.js';
import besselj0 from '@stdlib/math-base-special-besselj0';
import besselj1 from '@stdlib/math-base-special-besselj1';
import { makeCase, mm, nm, runCase, um, type CaseSpec } from '../helpers.js';

const lam = 633 * nm;

describe('constants of the verdict measures', () => {
  it('Si(2π) = 1.41815 (Abramowitz & Stegun Table 5.1, from memory)', () => {
    expect(sineIntegral(2 * Math.PI)).toBeCloseTo(1.4181515761, 9);
  });
  it('the Airy half-power radius solves 1 − J0² − J1² = ½ (J from a reference library)', () => {
    const v = AIRY_HALF_POWER_V;
    expect(1 - besselj0(v) ** 2 - besselj1(v) ** 2).toBeCloseTo(0.5, 10);
  });
  it('the sinc² half-power half-width u holds half the power', () => {
    // Independent check by Simpson's rule on sinc² itself.
    const n = 20000;
    const u = SINC_HALF_POWER_U;
    const f = (t: number) => (t === 0 ? 1 : (Math.sin(Math.PI * t) / (Math.PI * t)) ** 2);
    let s = f(0) + f(u);
    for (let i = 1; i < n; i++) s += (i % 2 ? 4 : 2) * f((i * u) / n);
    expect((2 * s * u) / (3 * n)).toBeCloseTo(0.5, 8);
  });
});

describe('far-field pinhole: encircled energy, FWHM, detector', () => {
  const D = 50 * um;
  const z = 1;
  const spec: CaseSpec = {
    wavelength: lam,
    distance: z,
    aperture: { shape: 'circle', diameter: D, opaque: false },
    analysis: { detectors: [{ kind: 'pinhole', size: 2 * z * Math.tan(Math.asin((1.21967 * lam) / D)) }] },
  };
  const { rec, c } = runCase(spec);
  const r0 = z * Math.tan(Math.asin((1.21967 * lam) / D));

  it('holds 83.8 % of the power within the first dark ring (Born & Wolf §8.5.2), to 0.2 %', () => {
    const curve = energyCurve(c, [0, 0], rec.metrics.powerThroughAperture!);
    expect(Math.abs(fractionWithin(curve, r0) - 0.8378) / 0.8378).toBeLessThan(2e-3);
  });
  it('puts 83.8 % on a pinhole detector as wide as the first dark ring', () => {
    expect(Math.abs(rec.metrics.detectors[0]!.fraction! - 0.8378) / 0.8378).toBeLessThan(2e-3);
  });
  it('has FWHM = 1.029 λz/D (from memory; the Airy half-maximum at v = 1.6163)', () => {
    const ref = (1.029 * lam * z) / D;
    expect(Math.abs(rec.metrics.fwhm[0]! - ref) / ref).toBeLessThan(2e-3);
  });
  it('writes the encircled-energy curve, rising to the window fraction', () => {
    expect(rec.energy).not.toBeNull();
    const f = rec.energy!.fraction;
    for (let i = 1; i < f.length; i++) expect(f[i]!).toBeGreaterThanOrEqual(f[i - 1]!);
    expect(f[f.length - 1]!).toBeCloseTo(rec.metrics.windowFraction!, 6);
  });
});

describe('Gaussian beam widths', () => {
  const w0 = 0.25 * mm;
  const lamG = 1064 * nm;
  const zr = (Math.PI * w0 * w0) / lamG;
  const { rec } = runCase({
    wavelength: lamG,
    distance: 2 * zr,
    aperture: { shape: 'circle', diameter: 10 * w0, opaque: false },
    illumination: { kind: 'gaussian', waist: w0, tilt: [0, 0] },
    analysis: { detectors: [{ kind: 'pinhole', size: 2 * w0 * Math.sqrt(5) }] },
  });
  const w = w0 * Math.sqrt(5); // w(2 z_R), Siegman ch. 17
  it('D4σ = 2w (ISO 11146: the second-moment diameter of a Gaussian is 2w)', () => {
    expect(Math.abs(rec.metrics.d4sigma[0] - 2 * w) / (2 * w)).toBeLessThan(5e-3);
    expect(Math.abs(rec.metrics.d4sigma[1]! - 2 * w) / (2 * w)).toBeLessThan(5e-3);
  });
  it('1/e² full width = 2w (the definition of w, Siegman ch. 17)', () => {
    expect(Math.abs(rec.metrics.e2Width[0]! - 2 * w) / (2 * w)).toBeLessThan(5e-3);
  });
  it('a pinhole of radius w passes 1 − e⁻² = 86.5 % (Siegman ch. 17)', () => {
    expect(Math.abs(rec.metrics.detectors[0]!.fraction! - (1 - Math.exp(-2))) / (1 - Math.exp(-2))).toBeLessThan(5e-3);
  });
});

describe('diffraction-limited verdicts', () => {
  const ctx = testContext();
  const verdict = (s: CaseSpec) => {
    const rec = runPlannedCase(planCase(makeCase(s)), ctx);
    answerQuestions(rec, ctx);
    return rec.metrics.verdicts!;
  };
  const pinhole = { shape: 'circle' as const, diameter: 50 * um, opaque: false };

  it('50 µm pinhole, 633 nm, at 1 m: far field, hundreds of times the shadow', () => {
    const [v] = verdict({ wavelength: lam, distance: 1, aperture: pinhole });
    expect(v!.kind).toBe('far-field');
    expect(Math.abs(v!.spotOverFarField! - 1)).toBeLessThan(0.002);
    expect(v!.diffractionOverShadow).toBeGreaterThan(300);
    // Common practice: the far field begins near 2D²/λ = 7.9 mm.
    expect(v!.farFieldFrom! / ((2 * (50 * um) ** 2) / lam)).toBeGreaterThan(0.7);
    expect(v!.farFieldFrom! / ((2 * (50 * um) ** 2) / lam)).toBeLessThan(1.4);
    expect(v!.sentence).toMatch(/Diffraction-limited \(far field\)/);
    expect(v!.sentence).toMatch(/15\.4 mm/); // the Airy first zero 1.22λz/D
  });

  it('the same pinhole at 10 mm: just past 2D²/λ, the far-field size within 1 %', () => {
    const [v] = verdict({ wavelength: lam, distance: 10 * mm, aperture: pinhole });
    expect(v!.fresnelNumber).toBeCloseTo(0.0987, 3);
    expect(Math.abs(v!.spotOverFarField! - 1)).toBeLessThan(0.01);
    expect(v!.kind).toBe('far-field');
  });

  it('at 4.5 mm (N_F = 0.22) diffraction dominates but the far-field size is not reached', () => {
    const [v] = verdict({ wavelength: lam, distance: 4.5 * mm, aperture: pinhole });
    expect(v!.kind).toBe('diffraction-dominated');
    expect(v!.spotOverFarField!).toBeGreaterThan(1.01);
  });

  it('a 2 mm pinhole at 10 cm (N_F = 16) is geometric: the spot is about the shadow', () => {
    const [v] = verdict({ wavelength: lam, distance: 0.1, aperture: { shape: 'circle', diameter: 2 * mm, opaque: false } });
    expect(v!.kind).toBe('geometric');
    expect(Math.abs(v!.spotOverShadow! - 1)).toBeLessThan(0.05);
  });

  it('a rectangle gets one verdict per axis', () => {
    const vs = verdict({ wavelength: lam, distance: 0.5, aperture: { shape: 'rectangle', width: 50 * um, height: 1 * mm, opaque: false } });
    expect(vs.map((v) => v.axis)).toEqual(['x', 'y']);
    expect(vs[0]!.kind).toBe('far-field'); // N_F 0.002 along x
    expect(vs[1]!.kind).not.toBe('far-field'); // N_F 0.8 along y
  });
});

describe('smallest-spot search', () => {
  it('finds a size whose spot is smaller than its neighbours, beside the textbook √(2.44λz)', () => {
    const z = 0.2;
    const c = makeCase({
      wavelength: lam,
      distance: z,
      aperture: { shape: 'circle', diameter: 100 * um, opaque: false },
      analysis: { detectors: [], smallestSpot: { between: [100 * um, 2 * mm], measure: 'energy' } },
    });
    const ctx = testContext();
    const s = smallestSpot(c, ctx);
    expect(s.textbook).toBeCloseTo(Math.sqrt(2.44 * lam * z), 12);
    // A local minimum: 5 % either side gives a larger spot.
    const around = [s.best / 1.05, s.best * 1.05].map((d) =>
      smallestSpot({ ...c, analysis: { detectors: [], smallestSpot: { between: [d * 0.9999, d * 1.0001], measure: 'energy' } } }, ctx).bestMeasure,
    );
    for (const m of around) expect(m).toBeGreaterThan(s.bestMeasure);
    // The textbook balance of shadow and Airy disc lands within a factor 2 (common practice).
    expect(s.best / s.textbook).toBeGreaterThan(0.5);
    expect(s.best / s.textbook).toBeLessThan(2);
    expect(s.textbookMeasure!).toBeGreaterThanOrEqual(s.bestMeasure * 0.999);
    // Every evaluation is kept for the search's plot, in order of size, the optimum among them.
    expect(s.samples!.length).toBe(s.evaluations);
    for (let i = 1; i < s.samples!.length; i++) expect(s.samples![i]![0]).toBeGreaterThanOrEqual(s.samples![i - 1]![0]);
    expect(Math.min(...s.samples!.map((p) => p[1]))).toBe(s.bestMeasure);
    const png = searchPicture(s, 'pinhole');
    expect(png).not.toBeNull();
  });
});

describe('overlapping orders', () => {
  it('flags order 3 of 400 nm and order 2 of 600 nm (equal mλ), not orders 1 of both', () => {
    const d = 20 * um;
    // A 2 m window holds orders 1 to 3 of 400 nm and 1 to 2 of 600 nm (the overlap at 0.60 m): the
    // planner's own window would hold every order out to grazing, ±70 m and 2·10⁵ samples, 15 s a case,
    // and the overlap is read from the same order positions either way.
    const sets: OrderSet[] = [400 * nm, 600 * nm].map((wl) => {
      const { rec } = runCase({ wavelength: wl, distance: 10, window: [2, 2], aperture: { shape: 'slits', count: 40, width: 0.4 * d, period: d, opaque: false } });
      return { caseId: String(wl), wavelength: wl, distance: 10, count: 40, period: d, group: 'g', orders: rec.metrics.orders! };
    });
    const o = orderOverlaps(sets);
    const pairs = o.map((x) => `${x.orderA}/${x.orderB}`);
    expect(pairs).toContain('3/2');
    expect(pairs).toContain('-3/-2');
    expect(pairs).not.toContain('1/1');
    for (const x of o) expect(Math.abs(x.orderA * x.wavelengthA - x.orderB * x.wavelengthB)).toBeLessThan(1e-12);
  });
});
