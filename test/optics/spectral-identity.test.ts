// The faster transfer-function propagators (quadrant symmetry, per-axis tables, the fast FFT, a
// kept source spectrum) against the straightforward per-sample evaluation they replaced
// (./spectral-reference.ts, fft.js underneath): the same numbers to 1e-12 of the field's largest
// value. A rewrite for speed must not change a result; 1e-12 is the project's identity bound
// (common practice for rounding-level agreement of double-precision transforms).
import { engine } from '../engine.js';
import { describe, expect, it } from 'vitest';
import { createField, fftAxis } from '../../src/optics/field.js';
import {
  padField,
  propagateAngularSpectrum,
  propagateFresnelTransfer,
  toSpectrum,
  type SourceSpectrum,
} from '../../src/optics/spectral.js';
import { maxRelDiff, randomPhaseSource, referenceAngularSpectrum, referenceFresnelTransfer } from './spectral-reference.js';


const lam = 633e-9;
const cases = [
  { name: '2-D 128×64, near field, with band limit cut', nx: 128, ny: 64, dx: 0.4e-6, a: 8e-6, z: 300e-6, carrier: [0, 0] },
  { name: '2-D 64², evanescent bins (pitch below λ/2)', nx: 64, ny: 64, dx: 0.25e-6, a: 3e-6, z: 2e-6, carrier: [0, 0] },
  { name: '2-D 256×128, tilted carrier', nx: 256, ny: 128, dx: 0.5e-6, a: 15e-6, z: 1e-3, carrier: [2.1e4, -1.3e4] },
  { name: '1-D 1024', nx: 1024, ny: 1, dx: 0.5e-6, a: 40e-6, z: 5e-3, carrier: [1e4, 0] },
] as const;

describe('transfer-function propagation is unchanged by the fast path', () => {
  for (const k of cases) {
    for (const method of ['angular-spectrum', 'fresnel'] as const) {
      it(`${method}: ${k.name}`, () => {
        const src = randomPhaseSource(k.nx / 2, k.ny > 1 ? k.ny / 2 : 1, k.dx, k.a, lam);
        const fast = padField(src, k.nx, k.ny);
        const ref = padField(src, k.nx, k.ny);
        const comp = { carrier: [k.carrier[0], k.carrier[1]] as [number, number] };
        const run = method === 'angular-spectrum' ? propagateAngularSpectrum : propagateFresnelTransfer;
        const refRun = method === 'angular-spectrum' ? referenceAngularSpectrum : referenceFresnelTransfer;
        const got = run(engine, fast, k.z, comp);
        const want = refRun(ref, k.z, comp);
        expect(maxRelDiff(ref.data, fast.data)).toBeLessThan(1e-12);
        // The loss fractions are sums in another order (the cut one as total less what passes):
        // equal to 1e-12 of the total power.
        expect(Math.abs(got.bandLimitLoss - want.bandLimitLoss)).toBeLessThan(1e-12);
        expect(Math.abs(got.evanescentLoss - want.evanescentLoss)).toBeLessThan(1e-12);
        if (method === 'fresnel') expect([got.bandLimitLoss, got.evanescentLoss]).toEqual([0, 0]);
        if (method === 'angular-spectrum' && k.name.includes('band limit')) expect(want.bandLimitLoss).toBeGreaterThan(0);
        if (method === 'angular-spectrum' && k.name.includes('evanescent')) expect(want.evanescentLoss).toBeGreaterThan(0);
      });
    }
  }

  it('a kept source spectrum gives the same field at every distance as a fresh transform', () => {
    const k = cases[0];
    const src = randomPhaseSource(k.nx / 2, k.ny / 2, k.dx, k.a, lam);
    const spectrumField = padField(src, k.nx, k.ny);
    const kept: SourceSpectrum = { totalPower: toSpectrum(engine, spectrumField), data: spectrumField.data };
    for (const z of [100e-6, 300e-6, 2e-3]) {
      const fresh = padField(src, k.nx, k.ny);
      const a = propagateAngularSpectrum(engine, fresh, z, { carrier: [0, 0] });
      const reused = createField(fftAxis(k.nx, k.dx), fftAxis(k.ny, k.dx), lam);
      const b = propagateAngularSpectrum(engine, reused, z, { carrier: [0, 0] }, kept);
      // Same arithmetic on the same spectrum: bit for bit.
      expect(Array.from(reused.data)).toEqual(Array.from(fresh.data));
      expect(b).toEqual(a);
    }
  });
});
