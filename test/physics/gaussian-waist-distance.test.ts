// A Gaussian beam whose waist lies before the aperture (plan/curved-light.ts): at the aperture its
// radius is w(d) and its wavefront radius R(d); against the free beam's q-parameter law with a wide
// aperture, and against the on-axis Fresnel integral of the clipped beam in closed form.
import { describe, expect, it } from 'vitest';
import { gaussianThrough } from '../reference/gaussian-beam.js';
import { mm, nm } from '../helpers.js';
import { run, sourceCase, valueAt } from './curved-light-helpers.js';

const lam = 633 * nm;
const w0 = 0.2 * mm;
const zr = (Math.PI * w0 * w0) / lam; // 198.5 mm

describe('Gaussian beam with its waist before the aperture', () => {
  // Kogelnik & Li, Appl. Opt. 5, 1550 (1966); Siegman, Lasers, ch. 17 (test/reference/gaussian-beam.ts):
  // past a gap d + z from its waist the beam has radius w(d+z) and axis (w₀/w)²; relative to the
  // aperture's centre (the case's normalisation) the axis is (w(d)/w(d+z))².
  for (const [d, z] of [[100 * mm, 300 * mm], [400 * mm, 150 * mm], [50 * mm, 2000 * mm]] as const) {
    it(`through a wide hole (8 w(d)), waist ${d * 1e3} mm before it, screen ${z * 1e3} mm behind: axis and radius as the free beam's q-parameter law`, () => {
      const atAperture = gaussianThrough(lam, w0, [{ gap: d }]);
      const atScreen = gaussianThrough(lam, w0, [{ gap: d + z }]);
      const hole = { shape: 'circle' as const, diameter: 8 * atAperture.radius, opaque: false };
      const { rec, plan, codes } = run(sourceCase(hole, z, { kind: 'gaussian', waist: w0, waistDistance: d, tilt: [0, 0] }));
      expect(plan.reasons[0]).toMatch(/Gaussian beam of waist radius 200 µm/);
      const axis = atScreen.onAxis / atAperture.onAxis;
      // Error budget: the hole's edge at 4 w(d) leaves e⁻³² of the intensity (nothing); the grids
      // hold 0.25 % of the peak (limits.ts); so 0.5 %.
      expect(Math.abs(valueAt(rec.computed, 0, 0) / axis - 1)).toBeLessThan(0.005);
      // D4σ = 2w for a Gaussian (ISO 11146; Siegman ch. 17), to 1 %: the window holds ±3w.
      expect(Math.abs(rec.metrics.d4sigma[0] / (2 * atScreen.radius) - 1)).toBeLessThan(0.01);
      expect(codes).not.toContain('curved-light-paraxial');
    });
  }

  it('clipped by a hole of radius w(d)/2: the axis against the closed-form Fresnel integral', () => {
    // On the axis, U = (k/(iz))·∫₀^a e^{−βr²} r dr = (k/(iz))·(1 − e^{−βa²})/(2β) with
    // β = 1/w² − (ik/2)(1/R + 1/z): the Fresnel integral (Goodman, Introduction to Fourier Optics,
    // eq. 4-17) of the beam's amplitude e^{−r²/w²} and wavefront e^{ikr²/2R} over the disc, in closed form.
    const k = (2 * Math.PI) / lam;
    for (const [d, z] of [[300 * mm, 200 * mm], [100 * mm, 1000 * mm]] as const) {
      const w = w0 * Math.sqrt(1 + (d / zr) ** 2);
      const R = d * (1 + (zr / d) ** 2);
      const a = w / 2;
      const bRe = 1 / (w * w);
      const bIm = -(k / 2) * (1 / R + 1 / z);
      // 1 − e^{−βa²}
      const e = Math.exp(-bRe * a * a);
      const nRe = 1 - e * Math.cos(-bIm * a * a);
      const nIm = -e * Math.sin(-bIm * a * a);
      const expected = (k / (2 * z)) ** 2 * (nRe * nRe + nIm * nIm) / (bRe * bRe + bIm * bIm);
      const { rec } = run(sourceCase({ shape: 'circle', diameter: 2 * a, opaque: false }, z, { kind: 'gaussian', waist: w0, waistDistance: d, tilt: [0, 0] }));
      // Error budget: grids 0.25 % of the peak; the paraxial phases are below 1e-3 rad.
      expect(Math.abs(valueAt(rec.computed, 0, 0) / expected - 1)).toBeLessThan(0.005);
    }
  });
});
