// Planning grids for the shifted angular spectrum (src/optics/shifted-spectrum.ts): the grid a
// tilted beam needs against the grid the existing angular spectrum needs for it, the band check of
// a planned grid against what a propagation on it reports, and the landing formula against the
// existing band limit.
import { engine } from '../engine.js';
import { describe, expect, it } from 'vitest';
import { apertureFacts } from '../../src/optics/aperture.js';
import { fftAxis } from '../../src/optics/field.js';
import { bandLimitFrequency, padField } from '../../src/optics/spectral.js';
import { sourceField1D, sourceField2D } from '../../src/optics/source.js';
import {
  edgeSpectrumTail,
  frequencyLandingAt,
  landingCentre,
  propagateShiftedSpectrum,
  shiftedBand,
  shiftedGridFor,
} from '../../src/optics/shifted-spectrum.js';
import { DEFAULT_MAX_MEMORY, planCase } from '../../src/plan/planner.js';
import { makeCase } from '../helpers.js';
import { rsSquare } from './square-quadrature.js';


describe('the grid a tilted beam needs: 200 µm square, 633 nm, 30°, 100 mm', () => {
  const lam = 633e-9;
  const z = 0.1;
  const D = 200e-6;
  const theta = Math.PI / 6;
  const aperture = { shape: 'rectangle' as const, width: D, height: D, opaque: false };

  it('axis-centred: over the memory limit (the grid spans aperture to window at the carrier’s pitch); shifted: a grid of a few thousand that matches the exact integral', () => {
    const plan = planCase(makeCase({ wavelength: lam, distance: z, aperture, illumination: { kind: 'plane', tilt: [theta, 0] }, method: 'angular-spectrum' }));
    // The planner costs both forms of the angular spectrum and takes the shifted one.
    const centred = plan.options.find((o) => o.method === 'angular-spectrum' && o.form === undefined)!;
    expect(centred.memoryBytes!).toBeGreaterThan(DEFAULT_MAX_MEMORY);
    expect(centred.fits).toBe(false);
    expect(plan.form).toBe('shifted');
    expect(plan.error).toBeUndefined();
    // The axis-centred grid's size from its memory as the planner counts it (32 bytes per padded sample at least).
    const todayGrid = centred.memoryBytes! / 32;
    // The same window and the planner's own feature rule (16 samples across the smallest feature).
    const facts = apertureFacts(aperture);
    const carrier: [number, number] = [Math.sin(theta) / lam, 0];
    const grid = shiftedGridFor({
      wavelength: lam,
      z,
      carrier,
      centre: [plan.x.windowCentre, plan.y!.windowCentre],
      footprint: [D / 2, D / 2],
      window: [plan.x.windowHalf, plan.y!.windowHalf],
      maxPitch: [facts.minFeature / 16, facts.minFeature / 16],
    });
    expect(grid.windowClear).toBe(true);
    const shiftedGrid = grid.samples[0] * grid.samples[1];
    // Memory as the planner counts an FFT case: the padded grid and the FFT kernel's copy of it.
    const shiftedBytes = 32 * shiftedGrid;
    expect(shiftedBytes).toBeLessThan(DEFAULT_MAX_MEMORY / 8);
    expect(todayGrid / shiftedGrid).toBeGreaterThan(1e4);

    // And it computes: against the Rayleigh–Sommerfeld integral at the spot's centre, half a lobe
    // out and off axis, within 2e-3 of the peak (the area-sampled edge's aliasing at this pitch,
    // (πgΔ)²/3 at the lobe's frequencies, is about 2e-4).
    const n = 2 * Math.ceil(D / grid.pitch[0] / 2 + 2);
    const src = sourceField2D(aperture, { kind: 'plane', tilt: [0, 0] }, fftAxis(n, grid.pitch[0]), fftAxis(n, grid.pitch[1]), lam, { sampleCarrier: false }).field;
    const { field, report } = propagateShiftedSpectrum(engine, padField(src, grid.samples[0], grid.samples[1]), z, carrier, grid.centre, {
      taper: grid.taper,
      bandTaper: grid.bandTaper,
      inPlace: true,
    });
    expect(report.bandLimitLoss).toBeLessThan(0.01);
    const lobe = (lam * z) / (D * Math.cos(theta) ** 3);
    let peak = 0;
    let diff = 0;
    for (const [ox, oy] of [
      [0, 0],
      [0.5, 0],
      [0.3, -0.4],
    ] as const) {
      const c = Math.round((landingCentre(carrier, lam, z)[0] + ox * lobe - field.x0) / field.dx);
      const r = Math.round((oy * lobe - field.y0) / field.dy);
      const [re, im] = rsSquare(lam, z, D / 2, Math.sin(theta), field.x0 + c * field.dx, field.y0 + r * field.dy);
      const want = re * re + im * im;
      const i = 2 * (r * field.nx + c);
      peak = Math.max(peak, want);
      diff = Math.max(diff, Math.abs(field.data[i]! ** 2 + field.data[i + 1]! ** 2 - want));
    }
    expect(diff / peak).toBeLessThan(2e-3);
  });
});

describe('landing and band checks', () => {
  it('frequencyLandingAt: with no cross component and X = ±L/2 it is bandLimitFrequency to the last bit; its light lands at X', () => {
    const lam = 633e-9;
    for (const [z, L] of [
      [1e-3, 2e-3],
      [0.1, 1.3e-2],
      [5e-6, 4e-5],
    ] as const) {
      expect(frequencyLandingAt(L / 2, 0, lam, z)).toBe(bandLimitFrequency(z, lam, L));
      expect(frequencyLandingAt(-L / 2, 0, lam, z)).toBe(-bandLimitFrequency(z, lam, L));
      for (const other of [0, 3e5, -7e5]) {
        for (const X of [-L / 3, L / 7, 2 * L]) {
          const f = frequencyLandingAt(X, other, lam, z);
          const landed = (z * lam * f) / Math.sqrt(1 - lam * lam * (f * f + other * other));
          expect(Math.abs(landed - X)).toBeLessThan(1e-12 * Math.abs(X));
        }
      }
    }
  });

  it('1-D: the band a planned grid passes is what the propagation passes, and the edge-tail estimate of the cut is within a factor 2 of the measured cut', () => {
    // A 20 µm slit at 40°, a grid too short for its tails on purpose (the band limit cuts).
    const lam = 0.5e-6;
    const z = 2e-3;
    const a = 10e-6;
    const carrier: [number, number] = [Math.sin((40 * Math.PI) / 180) / lam, 0];
    const pitch = (2 * a) / 41;
    const nx = 4096;
    const centre = landingCentre(carrier, lam, z);
    const tail = edgeSpectrumTail([2 / (2 * a), 0]);
    const band = shiftedBand({ nx, ny: 1, dx: pitch, dy: 0, wavelength: lam }, z, carrier, centre, tail);
    const src = sourceField1D({ kind: 'interval', width: 2 * a }, { kind: 'plane', tilt: [0, 0] }, fftAxis(64, pitch), lam, 0, { sampleCarrier: false }).field;
    const { report } = propagateShiftedSpectrum(engine, padField(src, nx, 1), z, carrier, centre);
    const bin = 1 / (nx * pitch);
    expect(report.passed).not.toBeNull();
    expect(Math.abs(report.passed!.x[0] - band.passed[0][0])).toBeLessThanOrEqual(bin);
    expect(Math.abs(report.passed!.x[1] - band.passed[0][1])).toBeLessThanOrEqual(bin);
    expect(report.bandLimitLoss).toBeGreaterThan(1e-3);
    expect(band.cutEstimate / report.bandLimitLoss).toBeGreaterThan(0.5);
    expect(band.cutEstimate / report.bandLimitLoss).toBeLessThan(2);
    // Everything passed lands on the grid.
    expect(report.landing!.x[0]).toBeGreaterThanOrEqual(-(nx * pitch) / 2);
    expect(report.landing!.x[1]).toBeLessThanOrEqual((nx * pitch) / 2);
  });

  it('shiftedGridFor: centred where the carrier lands by default; 1-D grids have one row; a given pitch too coarse for the window is flagged', () => {
    const lam = 0.5e-6;
    const z = 1e-3;
    const carrier: [number, number] = [Math.sin(0.6) / lam, Math.sin(0.2) / lam];
    const g2 = shiftedGridFor({ wavelength: lam, z, carrier, footprint: [20e-6, 20e-6], window: [200e-6, 100e-6] });
    expect(g2.centre).toEqual(landingCentre(carrier, lam, z));
    expect(g2.windowClear).toBe(true);
    for (const i of [0, 1] as const) {
      const half = (g2.samples[i] * g2.pitch[i]) / 2;
      // Window reach + gap + taper zone inside the half-width; the taper zone at least 2ρ.
      expect(half).toBeGreaterThanOrEqual([220e-6, 120e-6][i]! + 4 * g2.fresnelScale[i]);
      expect(g2.taper * half).toBeGreaterThanOrEqual(2 * g2.fresnelScale[i] * (1 - 1e-9));
      // The band that reaches the window lies inside the untapered band, with a gap of 2/ρ.
      const nyq = 0.5 / g2.pitch[i];
      expect((1 - g2.bandTaper) * nyq).toBeGreaterThanOrEqual(Math.max(-g2.reaching[i][0], g2.reaching[i][1]) + (2 / g2.fresnelScale[i]) * (1 - 1e-9));
    }
    const g1 = shiftedGridFor({ wavelength: lam, z, carrier: [carrier[0], 0], footprint: [20e-6, 0], window: [200e-6, 0], oneD: true });
    expect(g1.samples[1]).toBe(1);
    expect(g1.pitch[1]).toBe(0);
    expect(g1.windowClear).toBe(true);
    const coarse = shiftedGridFor({ wavelength: lam, z, carrier, footprint: [20e-6, 20e-6], window: [200e-6, 100e-6], pitch: [10e-6, 10e-6] });
    expect(coarse.windowClear).toBe(false);
    const sharp = shiftedGridFor({ wavelength: lam, z, carrier, footprint: [20e-6, 20e-6], window: [200e-6, 100e-6], taper: 0 });
    expect(sharp.windowClear).toBe(false);
  });
});
