// A lens's stop rim, averaged over the open part of each cell (src/optics/disc-rim-cells.ts), against
// the exact Fresnel references of random-lenses.ts (Goodman, Introduction to Fourier Optics, §4.2 and
// §5.1–5.2: the Hankel transform of the pupil by Gauss–Legendre quadrature, and on the axis the
// closed form (π/(λz))·(e^{cR²} − 1)/c). Far from the focus the rim's light is half the field on the
// axis (the e^{cR²} term), so a rim cell's mean taken over the whole cell instead of its open part
// showed there first: these cases were 2.5–9.8 % of the peak off without a warning before (found by
// the random lens test with more cases and other seeds: random-lenses-report.mjs), and are now
// within 0.13 % (measured). The tolerance, 0.5 % of the peak, sits between the two: a judgement,
// well under the random lens test's 2 % and well over what the sampling leaves.
import { describe, expect, it } from 'vitest';
import { ACCURACY_CODES } from '../../src/warnings/catalogue.js';
import type { Aperture } from '../../src/optics/aperture.js';
import { describeLensOutcome, runLens, type DrawnLens, type LensAperture } from './random-lenses.js';

function lensCase(index: number, where: string, wavelength: number, distance: number, lens: Omit<LensAperture, 'shape' | 'opaque'>): DrawnLens {
  const l: LensAperture = { shape: 'lens', opaque: false, ...lens };
  return { index, where, lens: l, spec: { wavelength, distance, aperture: l as unknown as Aperture, illumination: { kind: 'plane', tilt: [0, 0] } } };
}

const CASES: DrawnLens[] = [
  // Defocused far behind the lens (the lens's phase sampled, the single-transform Fresnel form).
  lensCase(1, 'z = 23|f|, diverging', 643e-9, 5.23, { focal: -0.226, stop: 3.46e-3, aberrations: [] }),
  lensCase(2, 'z = 9.9 f', 2.59e-6, 1.626, { focal: 0.164, stop: 4.54e-3, aberrations: [] }),
  // At the focus behind a strongly aberrated pupil (the lens folded into the chirp; the pupil's
  // Zernike phase is what the rim cells average).
  lensCase(3, 'focus, 0.09 wave of Z22', 1.47e-6, 1.0091, { focal: 1.0091, stop: 42.6e-3, aberrations: [{ j: 22, rms: 0.09, unit: 'waves' }] }),
  lensCase(4, 'focus, 0.24 wave of Z11', 2.42e-6, 0.04229, { focal: 0.04229, stop: 8.31e-3, aberrations: [{ j: 4, rms: 66.5e-9, unit: 'm' }, { j: 11, rms: 0.24, unit: 'waves' }] }),
];

describe('a lens stop rim averaged over its open part: defocused and aberrated pupils against the exact references', () => {
  for (const d of CASES) {
    it(`#${d.index} ${d.where}: within 0.5 % of the peak`, () => {
      const o = runLens(d, ACCURACY_CODES);
      expect(o.status, describeLensOutcome(o)).toBe('compared');
      expect(o.error!, describeLensOutcome(o)).toBeLessThan(0.005);
    });
  }
});
