// A sweep in distance over one aperture on one grid computes the source's spectrum once and
// reuses it. Reuse must not change a result: each case equals the same case computed alone, bit
// for bit (the same arithmetic on the same spectrum; the project's identity bound is 1e-12,
// common practice for rounding-level agreement).
import { describe, expect, it } from 'vitest';
import { planCase } from '../../src/plan/planner.js';
import { shareSourceSpectra, sourceSpectrumKey } from '../../src/plan/share.js';
import { computeCase } from '../../src/run/compute.js';
import { testContext } from '../engine.js';
import { makeCase } from '../helpers.js';

const um = 1e-6;
const mm = 1e-3;

function sweep(distances: number[], grid?: { size: number; pitch: number }, method: 'angular-spectrum' | 'fresnel' = 'angular-spectrum') {
  return distances.map((z, i) => ({
    ...planCase({
      ...makeCase({
        wavelength: 633e-9,
        distance: z,
        aperture: { shape: 'circle', diameter: 40 * um, opaque: false },
        method,
        ...(grid ? { grid } : {}),
        window: [120 * um, 120 * um],
      }),
      index: i,
      id: `z${i}`,
    }),
  }));
}

describe('shared source spectra across a distance sweep', () => {
  it('marks plans on one grid and adds the kept spectrum to their memory', () => {
    const plans = sweep([0.5 * mm, 1 * mm, 2 * mm], { size: 256, pitch: 0.5 * um });
    const before = plans.map((p) => p.memoryBytes);
    expect(new Set(plans.map((p) => `${p.x.paddedSamples}`)).size).toBe(1);
    expect(shareSourceSpectra(plans)).toBe(2);
    for (const [i, p] of plans.entries()) {
      expect(p.sharedSpectrum).toEqual({ id: plans[0]!.sharedSpectrum!.id, cases: 3 });
      expect(p.memoryBytes - before[i]!).toBe(16 * p.x.paddedSamples * p.y!.paddedSamples);
    }
    // Marking twice changes nothing.
    shareSourceSpectra(plans);
    expect(plans.map((p) => p.memoryBytes)).toEqual(before.map((b, i) => b + 16 * plans[i]!.x.paddedSamples * plans[i]!.y!.paddedSamples));
  });

  it('does not mark plans whose grids differ, nor a lone plan', () => {
    const a = sweep([1 * mm], { size: 256, pitch: 0.5 * um });
    const b = sweep([1 * mm], { size: 256, pitch: 0.4 * um });
    expect(sourceSpectrumKey(a[0]!)).not.toBe(sourceSpectrumKey(b[0]!));
    const plans = [...a, ...b];
    expect(shareSourceSpectra(plans)).toBe(0);
    expect(plans.every((p) => p.sharedSpectrum === undefined)).toBe(true);
  });

  for (const method of ['angular-spectrum', 'fresnel'] as const) {
    it(`${method}: every case of the shared sweep equals the case computed alone`, () => {
      const distances = [0.4 * mm, 0.8 * mm, 1.6 * mm, 3.2 * mm];
      const grid = { size: 256, pitch: 0.5 * um };
      // Each case alone: a fresh context, nothing kept.
      const alone = sweep(distances, grid, method).map((p) => computeCase(p, testContext()));
      const shared = sweep(distances, grid, method);
      shareSourceSpectra(shared);
      expect(shared[0]!.sharedSpectrum).toBeDefined();
      if (method === 'fresnel') expect(shared[0]!.form).toBe('transfer-function');
      // The sweep in one context, as a worker runs it.
      const ctx = testContext();
      const got = shared.map((p) => computeCase(p, ctx));
      for (let i = 0; i < distances.length; i++) {
        expect(got[i]!.ny).toBe(alone[i]!.ny);
        expect(Array.from(got[i]!.intensity)).toEqual(Array.from(alone[i]!.intensity));
        const { sourceSpectrum, ...rest } = got[i]!.diagnostics;
        expect(sourceSpectrum).toBe(i === 0 ? 'computed' : 'reused');
        expect(rest).toEqual(alone[i]!.diagnostics);
      }
      // The cases differ from each other (the reuse did not hand back one answer four times).
      expect(got[0]!.intensity[0]).not.toBe(got[3]!.intensity[0]);
    });
  }
});
