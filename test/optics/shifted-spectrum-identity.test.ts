// The shifted angular spectrum (src/optics/shifted-spectrum.ts) against the existing band-limited
// angular spectrum (src/optics/spectral.ts) where they must agree:
// - untilted, centre 0, per-axis band limit: the same numbers to 1e-12 of the field's largest value
//   (the project's identity bound; common practice for rounding-level agreement of double-precision
//   transforms), and the same loss fractions to 1e-12;
// - tilted, with the carrier put back (restoreCarrier): the same complex field as the existing
//   method with the carrier sampled into the source, where a grid that holds the carrier is
//   affordable (small tilt, smooth beam, nothing cut by either band limit);
// and the properties the planner relies on: a kept spectrum gives the same bits, the exact landing
// box cuts at least what the per-axis rectangle cuts at normal incidence, inputs are left alone
// unless asked, impossible carriers are refused.
import { engine } from '../engine.js';
import { describe, expect, it } from 'vitest';
import { createField, fftAxis } from '../../src/optics/field.js';
import { padField, propagateAngularSpectrum, toSpectrum, type SourceSpectrum } from '../../src/optics/spectral.js';
import { sourceField1D, sourceField2D } from '../../src/optics/source.js';
import { landingCentre, propagateShiftedSpectrum, restoreCarrier } from '../../src/optics/shifted-spectrum.js';
import { maxRelDiff, randomPhaseSource } from './spectral-reference.js';


const lam = 633e-9;
const cases = [
  { name: '2-D 128×64, near field, band limit cuts', nx: 128, ny: 64, dx: 0.4e-6, a: 8e-6, z: 300e-6, landingSame: true },
  { name: '2-D 64², evanescent bins (pitch below λ/2)', nx: 64, ny: 64, dx: 0.25e-6, a: 3e-6, z: 2e-6, landingSame: false },
  { name: '2-D 256×128, far, band limit cuts', nx: 256, ny: 128, dx: 0.5e-6, a: 15e-6, z: 1e-3, landingSame: true },
  { name: '2-D 256², nothing cut', nx: 256, ny: 256, dx: 1e-6, a: 30e-6, z: 100e-6, landingSame: true },
  { name: '1-D 1024', nx: 1024, ny: 1, dx: 0.5e-6, a: 40e-6, z: 5e-3, landingSame: true },
] as const;

describe('untilted, centre 0: the existing band-limited angular spectrum', () => {
  for (const k of cases) {
    it(`${k.name}: equal to 1e-12 of the peak, and the same losses`, () => {
      const src = randomPhaseSource(k.nx / 2, k.ny > 1 ? k.ny / 2 : 1, k.dx, k.a, lam);
      const today = padField(src, k.nx, k.ny);
      const want = propagateAngularSpectrum(engine, today, k.z, { carrier: [0, 0] });
      // The per-axis rectangle is the existing limit exactly; the exact landing box is the same
      // set of bins unless the grid reaches steep directions (the second case, pitch λ/2.5).
      for (const bandLimit of ['axes', 'landing'] as const) {
        const env = padField(src, k.nx, k.ny);
        const { field, report } = propagateShiftedSpectrum(engine, env, k.z, [0, 0], [0, 0], { bandLimit });
        expect([field.x0, field.y0, field.nx, field.ny, field.dx, field.dy]).toEqual([today.x0, today.y0, today.nx, today.ny, today.dx, today.dy]);
        expect(Math.abs(report.evanescentLoss - want.evanescentLoss)).toBeLessThan(1e-12);
        if (bandLimit === 'axes' || k.landingSame) {
          expect(maxRelDiff(today.data, field.data)).toBeLessThan(1e-12);
          expect(Math.abs(report.bandLimitLoss - want.bandLimitLoss)).toBeLessThan(1e-12);
        } else {
          // Steep corners of the spectrum land farther than the per-axis form says: the exact box
          // cuts them too (more loss), and the fields differ there.
          expect(report.bandLimitLoss).toBeGreaterThan(want.bandLimitLoss + 1e-6);
          expect(maxRelDiff(today.data, field.data)).toBeGreaterThan(1e-6);
        }
      }
      if (k.name.includes('cuts')) expect(want.bandLimitLoss).toBeGreaterThan(0);
      if (k.name.includes('nothing cut')) expect(want.bandLimitLoss).toBe(0);
    });
  }

  it('the envelope is left alone unless inPlace; inPlace writes the result into its array', () => {
    const k = cases[0];
    const env = padField(randomPhaseSource(k.nx / 2, k.ny / 2, k.dx, k.a, lam), k.nx, k.ny);
    const before = env.data.slice();
    const copy = propagateShiftedSpectrum(engine, env, k.z, [1e4, 0], [3e-6, 0]);
    expect(Array.from(env.data)).toEqual(Array.from(before));
    expect(copy.field.data).not.toBe(env.data);
    const inPlace = propagateShiftedSpectrum(engine, env, k.z, [1e4, 0], [3e-6, 0], { inPlace: true });
    expect(inPlace.field.data).toBe(env.data);
    expect(Array.from(inPlace.field.data)).toEqual(Array.from(copy.field.data));
  });

  it('a kept spectrum gives the same bits as a fresh transform, at any distance, tilt and centre', () => {
    const k = cases[2];
    const src = randomPhaseSource(k.nx / 2, k.ny / 2, k.dx, k.a, lam);
    const spectrumField = padField(src, k.nx, k.ny);
    const kept: SourceSpectrum = { totalPower: toSpectrum(engine, spectrumField), data: spectrumField.data };
    for (const [z, carrier] of [
      [1e-3, [0, 0]],
      [3e-3, [2e5, -1e5]],
      [0.2e-3, [6e5, 0]],
    ] as [number, [number, number]][]) {
      const centre = landingCentre(carrier, lam, z);
      const fresh = propagateShiftedSpectrum(engine, padField(src, k.nx, k.ny), z, carrier, centre, { taper: 0.3 });
      const empty = createField(fftAxis(k.nx, k.dx), fftAxis(k.ny, k.dx), lam);
      const reused = propagateShiftedSpectrum(engine, empty, z, carrier, centre, { taper: 0.3, spectrum: kept });
      expect(Array.from(reused.field.data)).toEqual(Array.from(fresh.field.data));
      expect(reused.report).toEqual(fresh.report);
    }
  });

  it('1-D with a carrier along y (conical incidence) is a row of the 2-D result for an envelope invariant along y, to 1e-12', () => {
    // A slit lit at 25° in x and 20° in y: on a 2-D grid whose envelope is the same in every row, the
    // spectrum lives on g_y = 0 only, where the 2-D transfer is the 1-D one with |f|² = (g + f_cx)² + f_cy².
    const nx = 1024;
    const dx = 0.5e-6;
    const z = 2e-3;
    const carrier: [number, number] = [Math.sin(0.44) / lam, Math.sin(0.35) / lam];
    const centre = landingCentre(carrier, lam, z);
    const line = padField(randomPhaseSource(nx / 2, 1, dx, 40e-6, lam), nx, 1);
    const one = propagateShiftedSpectrum(engine, line, z, carrier, centre, { taper: 0.3 });
    const ny = 8;
    const plane = createField(fftAxis(nx, dx), fftAxis(ny, 20e-6), lam);
    for (let r = 0; r < ny; r++) plane.data.set(line.data, 2 * r * nx);
    const two = propagateShiftedSpectrum(engine, plane, z, carrier, centre, { taper: 0.3 });
    expect(one.field.ny).toBe(1);
    expect(one.field.y0).toBe(0);
    for (const r of [0, 3, 7]) {
      expect(maxRelDiff(one.field.data, two.field.data.subarray(2 * r * nx, 2 * (r + 1) * nx))).toBeLessThan(1e-12);
    }
    expect(Math.abs(one.report.bandLimitLoss - two.report.bandLimitLoss)).toBeLessThan(1e-12);
  });

  it('refuses a carrier at or beyond grazing, a taper outside [0, 0.5] and a kept spectrum of another grid', () => {
    const env = padField(randomPhaseSource(32, 16, 0.5e-6, 3e-6, lam), 64, 32);
    expect(() => propagateShiftedSpectrum(engine, env, 1e-3, [1 / lam, 0], [0, 0])).toThrow(/not a propagating direction/);
    expect(() => propagateShiftedSpectrum(engine, env, 1e-3, [0.8 / lam, 0.8 / lam], [0, 0])).toThrow(/not a propagating direction/);
    expect(() => propagateShiftedSpectrum(engine, env, 1e-3, [0, 0], [0, 0], { taper: 0.6 })).toThrow(/taper/);
    expect(() => propagateShiftedSpectrum(engine, env, 1e-3, [0, 0], [0, 0], { spectrum: { data: new Float64Array(8), totalPower: 1 } })).toThrow(/kept spectrum/);
  });
});

describe('tilted, carrier put back: the existing angular spectrum with the carrier sampled', () => {
  // A Gaussian beam (w = 4 µm, smooth: the mask's edges 5w out, at e^{−25}) at 5°, 200 µm: the existing method's grid
  // holds the carrier (sin θ/λ at 1/(2Δ) = 0.5/Δ is 6× under Nyquist) and the whole beam, and
  // neither band limit cuts anything of weight. The shifted result on a grid centred on the
  // landing point (a whole number of pitches, so that the two lattices share samples) with
  // U = e^{i2π f_c·x}·ψ must be the same complex field. The two evaluate the transfer at different
  // frequencies (f_k vs g_k + f_c) of the same spectrum: Riemann sums of one integral, equal but
  // for the periodic images each grid adds (the beam's tails at a grid's width) and rounding.
  // Agreement to 1e-10 of the peak.
  const w = 4e-6;
  const z = 200e-6;
  const theta = (5 * Math.PI) / 180;
  const dx = 0.2e-6;
  const ill = { kind: 'gaussian' as const, waist: w, tilt: [theta, 0] as [number, number] };
  const envIll = { kind: 'gaussian' as const, waist: w, tilt: [0, 0] as [number, number] };
  const carrier: [number, number] = [Math.sin(theta) / lam, 0];
  const xc = Math.round(landingCentre(carrier, lam, z)[0] / dx) * dx;

  it('1-D', () => {
    const n = 2048;
    const ax = fftAxis(256, dx);
    const prof = { kind: 'interval' as const, width: 40e-6 };
    const sampled = padField(sourceField1D(prof, ill, ax, lam, carrier[0], { sampleCarrier: true }).field, n, 1);
    const want = propagateAngularSpectrum(engine, sampled, z, { carrier });
    const env = padField(sourceField1D(prof, envIll, ax, lam, 0, { sampleCarrier: false }).field, n / 2, 1);
    const { field, report } = propagateShiftedSpectrum(engine, env, z, carrier, [xc, 0]);
    expect(want.bandLimitLoss).toBeLessThan(1e-20);
    expect(report.bandLimitLoss).toBeLessThan(1e-20);
    restoreCarrier(field, carrier);
    const off = Math.round((field.x0 - sampled.x0) / dx);
    expect(Math.abs(field.x0 - (sampled.x0 + off * dx))).toBeLessThan(1e-9 * dx);
    let peak = 0;
    let diff = 0;
    for (let c = 0; c < field.nx; c++) {
      const i = 2 * c;
      const j = 2 * (c + off);
      peak = Math.max(peak, Math.hypot(sampled.data[j]!, sampled.data[j + 1]!));
      diff = Math.max(diff, Math.hypot(field.data[i]! - sampled.data[j]!, field.data[i + 1]! - sampled.data[j + 1]!));
    }
    expect(diff / peak).toBeLessThan(1e-10);
  });

  it('2-D', () => {
    const n = 1024;
    const ax = fftAxis(256, dx);
    const square = { shape: 'rectangle' as const, width: 40e-6, height: 40e-6, opaque: false };
    const sampled = padField(sourceField2D(square, ill, ax, ax, lam, { sampleCarrier: true }).field, n, n);
    const want = propagateAngularSpectrum(engine, sampled, z, { carrier });
    const env = padField(sourceField2D(square, envIll, ax, ax, lam, { sampleCarrier: false }).field, n / 2, n / 2);
    const { field, report } = propagateShiftedSpectrum(engine, env, z, carrier, [xc, 0]);
    expect(want.bandLimitLoss).toBeLessThan(1e-20);
    expect(report.bandLimitLoss).toBeLessThan(1e-20);
    restoreCarrier(field, carrier);
    const offX = Math.round((field.x0 - sampled.x0) / dx);
    const offY = Math.round((field.y0 - sampled.y0) / dx);
    // On the window: the inner half of the shifted grid (its outer quarters are where light that
    // lands near the grid's edge wraps round: measured 2e-9 there, 1.5e-11 inside; on a grid twice
    // as wide, 7e-13 everywhere).
    let peak = 0;
    let diff = 0;
    for (let r = field.ny / 4; r < (3 * field.ny) / 4; r++) {
      for (let c = field.nx / 4; c < (3 * field.nx) / 4; c++) {
        const i = 2 * (r * field.nx + c);
        const j = 2 * ((r + offY) * sampled.nx + c + offX);
        peak = Math.max(peak, Math.hypot(sampled.data[j]!, sampled.data[j + 1]!));
        diff = Math.max(diff, Math.hypot(field.data[i]! - sampled.data[j]!, field.data[i + 1]! - sampled.data[j + 1]!));
      }
    }
    expect(diff / peak).toBeLessThan(1e-10);
  });
});
