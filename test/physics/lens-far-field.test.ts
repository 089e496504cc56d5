// Diverging lenses seen far behind (z = 15–30 |f|), where the far-field formula had been chosen:
// the lens's own quadratic phase meets the phase the formula neglects (π·N_F) linearly, and two
// random lenses came out 6.1 % and 2.6 % off the Fresnel reference with no warning (seeds of
// random-lenses-report.mjs). The planner now counts that cross term (methods/validity.ts
// lensOwnCross) and hands them to a Fresnel form. Reference: the random lens test's Hankel
// quadrature of the Fresnel integral (Goodman, Introduction to Fourier Optics §4.2 with circular
// symmetry), test/physics/random-lenses.ts.
import { describe, expect, it } from 'vitest';
import { ACCURACY_CODES } from '../../src/warnings/catalogue.js';
import { describeLensOutcome, drawLenses, isLensFailure, runLens } from './random-lenses.js';

describe('diverging lenses far behind: the far-field formula is not taken where the lens phase would make it wrong', () => {
  for (const [seed, index] of [[1983781, 226], [20261203, 261]] as const) {
    it(`random lens seed ${seed} #${index}: within 2 % of the Fresnel reference or warned, not by the far-field formula`, () => {
      const d = drawLenses(seed, index + 1)[index]!;
      expect(d.lens.focal).toBeLessThan(0);
      const o = runLens(d, ACCURACY_CODES);
      if (process.env.SPOTCAST_SHOW) console.log(describeLensOutcome(o));
      expect(o.status).toBe('compared');
      expect(o.method).not.toMatch(/^fraunhofer/);
      expect(isLensFailure(o, 0.02)).toBe(false);
    });
  }
});
