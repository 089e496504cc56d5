// The three forms of the Fresnel integral the planner chooses between must give the same field.
import { engine } from '../engine.js';
import { describe, expect, it } from 'vitest';
import { centredAxis, fftAxis, intensityOf, xAxisOf, yAxisOf } from '../../src/optics/field.js';
import { sourceField1D, sourceField2D } from '../../src/optics/source.js';
import { padField, propagateFresnelTransfer } from '../../src/optics/spectral.js';
import { propagateFresnelDirect } from '../../src/optics/direct.js';
import { propagateFresnelSingleFFT } from '../../src/optics/single-fft.js';
import { maxDiffOverPeak, mm, nm, um } from '../helpers.js';

const lam = 633 * nm;
const plane = { kind: 'plane' as const, tilt: [0, 0] as [number, number] };

describe('Fresnel forms', () => {
  it('single FFT and direct sums compute the same discrete integral (1-D, to 1e-10 of the peak)', () => {
    const z = 0.2;
    const src = sourceField1D({ kind: 'interval', width: 0.4 * mm }, plane, centredAxis(401, 1.25 * um), lam, 0, { sampleCarrier: false }).field;
    const single = propagateFresnelSingleFFT(engine, padField(src, 4096, 1), z);
    const direct = propagateFresnelDirect(src, z, xAxisOf(single), null);
    expect(maxDiffOverPeak(single.data, direct.data)).toBeLessThan(1e-10);
  });

  it('single FFT and direct sums agree in 2-D (to 1e-10 of the peak)', () => {
    const z = 0.5;
    const ax = centredAxis(65, 4 * um);
    const src = sourceField2D({ shape: 'circle', diameter: 0.24 * mm, opaque: false }, plane, ax, ax, lam, { sampleCarrier: false }).field;
    const single = propagateFresnelSingleFFT(engine, padField(src, 256, 256), z);
    const direct = propagateFresnelDirect(src, z, xAxisOf(single), yAxisOf(single));
    expect(maxDiffOverPeak(single.data, direct.data)).toBeLessThan(1e-10);
  });

  it('the transfer-function form agrees with the direct form where both are well sampled (0.2 % of the peak)', () => {
    // Voelz's rule Δx ≥ λz/L holds here: Δx = 2 µm, λz/L = 633e-9·0.02/(4096·2e-6) = 1.5 µm.
    const z = 0.02;
    const ax = fftAxis(2048, 2 * um);
    const src = sourceField1D({ kind: 'interval', width: 1 * mm }, plane, ax, lam, 0, { sampleCarrier: false }).field;
    const grid = padField(src, 4096, 1);
    propagateFresnelTransfer(engine, grid, z, { carrier: [0, 0] });
    const window = { n: 801, start: -0.8 * mm, step: 2 * um };
    const c0 = Math.round((window.start - grid.x0) / grid.dx);
    const tf = intensityOf(grid).subarray(c0, c0 + window.n);
    const direct = intensityOf(propagateFresnelDirect(src, z, window, null));
    expect(maxDiffOverPeak(tf, direct)).toBeLessThan(2e-3);
  });
});
