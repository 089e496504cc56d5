// Properties that must hold whatever the numbers (DESIGN.md §4): Babinet's principle, reciprocity,
// convergence with the grid, power conservation, the shift of a tilted beam.
import { engine, testContext } from '../engine.js';
import { describe, expect, it } from 'vitest';
import { planCase } from '../../src/plan/planner.js';
import { runPlannedCase } from '../../src/run/run-case.js';
import { centredAxis, fftAxis, intensityOf, type Field } from '../../src/optics/field.js';
import { sourceField1D, sourceField2D } from '../../src/optics/source.js';
import { padField, propagateAngularSpectrum } from '../../src/optics/spectral.js';
import { propagateFresnelDirect } from '../../src/optics/direct.js';
import { makeCase, maxDiffOverPeak, mm, nm, runCase, um } from '../helpers.js';

const lam = 633 * nm;

describe("Babinet's principle: an obstacle and its hole", () => {
  it('an opaque disc in a Gaussian beam equals beam minus disc-shaped hole computed directly', () => {
    // The tool propagates an obstacle in a Gaussian beam as the beam where the disc is not (its
    // closed-form free beam is paraxial, so beam − hole would not cancel where the disc blocks most
    // of it). Here the same transmission is built as beam − hole (Babinet, Born & Wolf §8.3.3) and
    // propagated by another path, the Fresnel sums; both must agree.
    // The beam and the disc at 3/4 of the sizes first used (0.4 and 0.3 mm): the same ratio, the same
    // method (angular spectrum), Fresnel numbers 1.4 (beam) and 0.2 (disc) instead of 2.5 and 0.36;
    // the direct reference over 3.5 w0 has half the samples per axis and the planner's grid is smaller.
    const w0 = 0.3 * mm;
    const D = 0.225 * mm;
    const z = 0.1;
    const ill = { kind: 'gaussian' as const, waist: w0, tilt: [0, 0] as [number, number] };
    const { c, plan } = runCase({ wavelength: lam, distance: z, aperture: { shape: 'circle', diameter: D, opaque: true }, illumination: ill });
    expect(plan.babinet).toBe(false);
    // Direct: the whole beam (out to 3.5 w0) with the disc removed, same output window.
    const pitch = 4 * um;
    const n = 2 * Math.ceil((3.5 * w0) / pitch) + 1;
    const ax = centredAxis(n, pitch);
    const beam = sourceField2D({ shape: 'circle', diameter: 7 * w0, opaque: false }, ill, ax, ax, lam, { sampleCarrier: false }).field;
    const hole = sourceField2D({ shape: 'circle', diameter: D, opaque: false }, ill, ax, ax, lam, { sampleCarrier: false }).field;
    for (let i = 0; i < beam.data.length; i++) beam.data[i] = beam.data[i]! - hole.data[i]!;
    const direct = intensityOf(propagateFresnelDirect(beam, z, plan.x.output, plan.y!.output));
    const worst = maxDiffOverPeak(c.intensity, direct);
    // Budget: both paths are converged to ~0.1 % of the peak; the direct one samples the disc's edge
    // without the cell correction at 4 µm (D/56).
    expect(worst).toBeLessThan(5e-3);
  });
});

describe("Babinet's principle in 1-D: a wire", () => {
  it('an opaque strip in a Gaussian beam equals the beam with the strip removed, propagated directly', () => {
    const w0 = 0.5 * mm;
    const wire = 0.1 * mm;
    const z = 0.3;
    const ill = { kind: 'gaussian' as const, waist: w0, tilt: [0, 0] as [number, number] };
    const { c, plan } = runCase({ wavelength: lam, distance: z, aperture: { shape: 'slit', width: wire, opaque: true }, illumination: ill });
    expect(plan.layout).toBe('one-d');
    const ax = centredAxis(2 * Math.ceil((3.5 * w0) / (0.5 * um)) + 1, 0.5 * um);
    const beam = sourceField1D({ kind: 'interval', width: 7 * w0 }, ill, ax, lam, 0, { sampleCarrier: false }).field;
    const strip = sourceField1D({ kind: 'interval', width: wire }, ill, ax, lam, 0, { sampleCarrier: false }).field;
    for (let i = 0; i < beam.data.length; i++) beam.data[i] = beam.data[i]! - strip.data[i]!;
    const direct = intensityOf(propagateFresnelDirect(beam, z, plan.x.output, null));
    expect(maxDiffOverPeak(c.intensity, direct)).toBeLessThan(2e-3);
  });
});

describe('reciprocity of the angular spectrum', () => {
  it('propagating forward by z and back by −z returns a band-limited field to 1e-9', () => {
    // A Gaussian of 40 µm radius is band-limited far inside the grid's band, so nothing is cut.
    const ax = fftAxis(1024, 1 * um);
    const src = sourceField1D({ kind: 'interval', width: 1 }, { kind: 'gaussian', waist: 40 * um, tilt: [0, 0] }, ax, lam, 0, {
      sampleCarrier: false,
    }).field;
    const f: Field = padField(src, 2048, 1);
    const before = new Float64Array(f.data);
    propagateAngularSpectrum(engine, f, 5 * mm);
    propagateAngularSpectrum(engine, f, -5 * mm);
    let worst = 0;
    for (let i = 0; i < before.length; i++) worst = Math.max(worst, Math.abs(f.data[i]! - before[i]!));
    expect(worst).toBeLessThan(1e-9);
  });
});

describe('invariance to the grid once converged', () => {
  const cases = [
    // A 40 mm window keeps the far-field case on the fast (separable) path.
    { name: 'far-field circle', aperture: { shape: 'circle' as const, diameter: 50 * um, opaque: false }, window: [40 * mm, 40 * mm] as [number, number], method: 'fraunhofer' as const },
    { name: 'transition annulus', aperture: { shape: 'annulus' as const, outer: 1 * mm, inner: 0.4 * mm, opaque: false }, method: 'rayleigh-sommerfeld' as const },
  ];
  it.each(cases)('$name: a 1.5× finer aperture pitch changes the pattern by < 0.2 % of the peak', ({ aperture, window, method }) => {
    // A sampled method valid here (the planner might take an exact one that needs no grid), so that
    // the pitch is the thing that changes.
    // The exact sums with a given pitch (the planner's own, then 1.5× finer) land on the same output
    // samples whatever the pitch, as the far-field formula's do.
    const spec = { wavelength: lam, distance: 1, aperture, method, ...(window ? { window } : {}) };
    const auto = planCase(makeCase(spec));
    const base = method === 'rayleigh-sommerfeld' ? planCase(makeCase({ ...spec, grid: { pitch: auto.x.inputPitch } })) : auto;
    expect(base.warnings).toEqual([]);
    const a = runPlannedCase(base, testContext());
    const fine = runPlannedCase(planCase(makeCase({ ...spec, grid: { pitch: base.x.inputPitch / 1.5 } })), testContext());
    expect(fine.computed.nx).toBe(a.computed.nx);
    let worst = 0;
    for (let i = 0; i < a.computed.intensity.length; i++) {
      worst = Math.max(worst, Math.abs(a.computed.intensity[i]! - fine.computed.intensity[i]!));
    }
    expect(worst / a.metrics.peakIntensity).toBeLessThan(2e-3);
  });
});

describe('power conservation', () => {
  it('angular spectrum, 2-D, near field: the window holds the power through the aperture', () => {
    // Parseval: |U|² integrated over a plane is conserved by propagation (Goodman §3.10).
    const { rec, plan } = runCase({
      wavelength: lam,
      distance: 0.5 * mm,
      aperture: { shape: 'circle', diameter: 0.2 * mm, opaque: false },
      method: 'angular-spectrum',
    });
    expect(plan.method).toBe('angular-spectrum');
    expect(rec.metrics.windowFraction!).toBeGreaterThan(0.97);
    expect(rec.metrics.windowFraction!).toBeLessThan(1.001);
  });
});

describe('a tilted beam', () => {
  it('moves the far-field pattern of a slit to z·tan θ (and the window with it)', () => {
    const tilt = (3 * Math.PI) / 180;
    const z = 1;
    const { rec, plan } = runCase({
      wavelength: lam,
      distance: z,
      aperture: { shape: 'slit', width: 100 * um, opaque: false },
      illumination: { kind: 'plane', tilt: [tilt, 0] },
    });
    expect(plan.x.windowCentre).toBeCloseTo(z * Math.tan(tilt), 12);
    // The peak of sinc²(w(sin θ − sin θ_i)/λ) is at θ = θ_i (common practice).
    expect(Math.abs(rec.metrics.peakPosition[0] - z * Math.tan(tilt))).toBeLessThan(1e-3 * (z * lam) / (100 * um));
  });

  it('moves a Gaussian beam with the angular spectrum too (centroid at z·tan θ)', () => {
    const tilt = 0.05;
    const z = 3 * mm;
    const { rec, plan } = runCase({
      wavelength: lam,
      distance: z,
      aperture: { shape: 'circle', diameter: 0.2 * mm, opaque: false },
      illumination: { kind: 'gaussian', waist: 20 * um, tilt: [tilt, 0] },
      method: 'angular-spectrum',
    });
    expect(plan.method).toBe('angular-spectrum');
    expect(Math.abs(rec.metrics.centroid[0] - z * Math.tan(tilt))).toBeLessThan(0.2 * um);
    expect(Math.abs(rec.metrics.centroid[1]!)).toBeLessThan(1e-3 * um);
  });
});
