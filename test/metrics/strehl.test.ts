// The Strehl ratio metric (src/metrics/strehl.ts): its aberration-free reference against quadrature
// written here, and the ratio and verdict on computed lens cases against the pupil integral
// |⟨e^{i2πW}⟩|², exp(−(2πσ)²) (Mahajan, JOSA 72, 1258 (1982)) and Maréchal's 0.8 (Born & Wolf,
// Principles of Optics, §9.3).
import { describe, expect, it } from 'vitest';
import { idealOnAxisIntensity, lensStrehl, strehlMetrics } from '../../src/metrics/strehl.js';
import type { Plan } from '../../src/plan/types.js';
import type { MetricScope } from '../../src/metrics/types.js';
import type { CaseSummary } from '../../src/output/case-output.js';
import type { Aperture } from '../../src/optics/aperture.js';
import { makeCase, mm, nm, runCase } from '../helpers.js';

const lam = 633 * nm;

function lens(focal: number, stop: number | null, aberrations: { j: number; rms: number; unit: 'waves' | 'm' }[] = []): Aperture {
  return { shape: 'lens', focal, stop, aberrations, opaque: false } as Aperture;
}

/**
 * |U(0)|² of the aberration-free pupil behind the lens by the composite Simpson rule in r (the
 * Fresnel integral on the axis: (1/(λz))∫₀^R A(r)e^{iπr²(1/z − 1/f)/λ}2πr dr; Goodman, Introduction to
 * Fourier Optics, §4.2 and §5.1), written here without src.
 */
function onAxisQuadrature(z: number, f: number, R: number, w: number): number {
  const n = 40000;
  const c = (Math.PI * (1 / z - 1 / f)) / lam;
  let re = 0;
  let im = 0;
  for (let i = 0; i <= n; i++) {
    const r = (R * i) / n;
    const wt = i === 0 || i === n ? 1 : i % 2 === 1 ? 4 : 2;
    const a = Number.isFinite(w) ? Math.exp(-(r * r) / (w * w)) : 1;
    re += wt * a * Math.cos(c * r * r) * 2 * Math.PI * r;
    im += wt * a * Math.sin(c * r * r) * 2 * Math.PI * r;
  }
  const h = R / n / 3;
  return ((re * h) ** 2 + (im * h) ** 2) / (lam * z) ** 2;
}

describe('the aberration-free reference peak', () => {
  it('is (πR²/(λf))² in the focal plane of a uniformly lit stop (Goodman §5.2)', () => {
    const R = 5 * mm;
    const f = 0.2;
    expect(idealOnAxisIntensity(lam, f, f, R, Infinity)).toBeCloseTo(((Math.PI * R * R) / (lam * f)) ** 2, -2);
    expect(Math.abs(idealOnAxisIntensity(lam, f, f, R, Infinity) / ((Math.PI * R * R) / (lam * f)) ** 2 - 1)).toBeLessThan(1e-14);
  });

  it('is (πw²/(λf))² = (w/w₀)² at the focus of a Gaussian beam through an unbounded lens (Siegman, Lasers, ch. 17)', () => {
    const w = 2 * mm;
    const f = 0.3;
    const w0 = (lam * f) / (Math.PI * w);
    expect(Math.abs(idealOnAxisIntensity(lam, f, f, Infinity, w) / (w / w0) ** 2 - 1)).toBeLessThan(1e-14);
  });

  it('matches the on-axis quadrature within 1e-6 off the focus, for a uniform and a Gaussian-lit stop', () => {
    const R = 5 * mm;
    const f = 0.2;
    for (const z of [0.199, 0.2005, 0.25]) {
      for (const w of [Infinity, 4 * mm]) {
        const q = onAxisQuadrature(z, f, R, w);
        expect(Math.abs(idealOnAxisIntensity(lam, z, f, R, w) - q) / q, `z ${z} w ${w}`).toBeLessThan(1e-6);
      }
    }
  });
});

describe('the Strehl ratio of computed lens cases', () => {
  const D = 10 * mm;
  const f = 250 * mm;
  // |⟨e^{i2πσZ4}⟩|² over the unit disc, Z4 = √3(2ρ² − 1) (Noll 1976), Simpson in ρ.
  const pupilStrehl = (sigma: number) => {
    const n = 20000;
    let re = 0;
    let im = 0;
    for (let i = 0; i <= n; i++) {
      const rho = i / n;
      const wt = i === 0 || i === n ? 1 : i % 2 === 1 ? 4 : 2;
      const phi = 2 * Math.PI * sigma * Math.sqrt(3) * (2 * rho * rho - 1);
      re += wt * Math.cos(phi) * rho;
      im += wt * Math.sin(phi) * rho;
    }
    return ((2 * re) / (3 * n)) ** 2 + ((2 * im) / (3 * n)) ** 2;
  };
  const clean = runCase({ wavelength: lam, distance: f, aperture: lens(f, D) }).rec.metrics.strehl!;
  const small = runCase({ wavelength: lam, distance: f, aperture: lens(f, D, [{ j: 4, rms: 0.05, unit: 'waves' }]) }).rec.metrics.strehl!;
  const large = runCase({ wavelength: lam, distance: f, aperture: lens(f, D, [{ j: 4, rms: 0.1, unit: 'waves' }]) }).rec.metrics.strehl!;

  it('is 1 within 1 % for the aberration-free lens, diffraction-limited', () => {
    expect(Math.abs(clean.ratio - 1)).toBeLessThan(0.01);
    expect(clean.rmsWaves).toBe(0);
    expect(clean.diffractionLimited).toBe(true);
  });

  it('matches the pupil integral within 1 % at 0.05 and 0.1 wave RMS of defocus', () => {
    expect(Math.abs(small.ratio / pupilStrehl(0.05) - 1)).toBeLessThan(0.01);
    expect(Math.abs(large.ratio / pupilStrehl(0.1) - 1)).toBeLessThan(0.01);
  });

  it('gives exp(−(2πσ)²) beside it, and the ratio near it where σ is small (Mahajan 1982)', () => {
    expect(small.estimate).toBeCloseTo(Math.exp(-((2 * Math.PI * 0.05) ** 2)), 12);
    expect(Math.abs(small.ratio / small.estimate - 1)).toBeLessThan(0.01);
  });

  it("says diffraction-limited at 0.05 wave RMS and not at 0.1 (Maréchal's 0.8, Born & Wolf §9.3)", () => {
    expect(small.diffractionLimited).toBe(true);
    expect(large.ratio).toBeLessThan(0.8);
    expect(large.diffractionLimited).toBe(false);
  });

  it('leaves out the tilts from σ (they move the focus, not its peak)', () => {
    const tilted = runCase({ wavelength: lam, distance: f, aperture: lens(f, D, [{ j: 2, rms: 0.2, unit: 'waves' }]) }).rec.metrics.strehl!;
    expect(tilted.rmsWaves).toBe(0);
    expect(Math.abs(tilted.ratio - 1)).toBeLessThan(0.01);
  });

  it('is given within the focal depth ±2λ(f/D)² only, not behind a diverging lens, nor for a pinhole', () => {
    const at = (z: number, a: Aperture) => lensStrehl({ case: makeCase({ wavelength: lam, distance: z, aperture: a }) } as Plan, 1);
    // The quarter-wave focal depth (Born & Wolf §8.8, from memory): 2λ(f/D)² = 0.79 mm here.
    const depth = 2 * lam * (f / D) ** 2;
    expect(at(f + 0.9 * depth, lens(f, D))).not.toBeNull();
    expect(at(f - 0.9 * depth, lens(f, D))).not.toBeNull();
    expect(at(f + 1.2 * depth, lens(f, D))).toBeNull();
    expect(at(2 * f, lens(f, D))).toBeNull();
    expect(at(f, lens(-f, D))).toBeNull();
    expect(runCase({ wavelength: lam, distance: 1, aperture: { shape: 'circle', diameter: 50e-6, opaque: false } }).rec.metrics.strehl).toBeUndefined();
  });

  it('adds its columns to summary.csv only for jobs with a lens focus', () => {
    const scope = (records: Partial<CaseSummary['metrics']>[]): MetricScope => ({ cases: [], records: records.map((m) => ({ metrics: m }) as unknown as CaseSummary) });
    expect(strehlMetrics.quantities(scope([{}]))).toEqual([]);
    const qs = strehlMetrics.quantities(scope([{ strehl: small }]));
    expect(qs.map((q) => q.header)).toEqual(['strehl_ratio', 'strehl_estimate', 'wavefront_rms_waves', 'lens_verdict']);
    expect(qs[3]!.read({ metrics: { strehl: large } } as unknown as CaseSummary)).toBe('aberrated');
  });
});
