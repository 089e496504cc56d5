// The dispatcher (reference.ts): which reference it picks, and that its fallbacks agree with the
// exact references where both can be had.
import { describe, expect, it } from 'vitest';
import { referenceIntensity, type RefCase } from './reference.js';
import { axisIntensity } from './rs2d.js';
import { maxDiffOverPeak } from '../helpers.js';

const nm = 1e-9;
const um = 1e-6;
const mm = 1e-3;

const plane = { kind: 'plane' as const, tilt: [0, 0] as [number, number] };

describe('reference dispatcher', () => {
  it('1-D: the paraxial fallback (taken when the exact one is over budget) agrees with the exact one to 0.1 % of the peak', () => {
    const c: RefCase = { wavelength: 633 * nm, distance: 5, aperture: { shape: 'slits', count: 4, width: 0.5 * mm, period: 1.5 * mm, opaque: false }, illumination: plane };
    const pts = Array.from({ length: 61 }, (_, i): [number, number] => [(-4 + (8 * i) / 60) * mm, 0]);
    const exact = referenceIntensity(c, pts, 1e9);
    const fallback = referenceIntensity(c, pts, 1);
    expect(exact.ok && exact.how).toBe('exact 1-D Rayleigh–Sommerfeld');
    expect(fallback.ok && fallback.how).toMatch(/^paraxial Fresnel integrals/);
    if (exact.ok && fallback.ok) expect(maxDiffOverPeak(fallback.intensity, exact.intensity)).toBeLessThan(1e-3);
  });

  it('2-D rectangle: the paraxial fallback agrees with the boundary form to 0.1 % of the peak', () => {
    const c: RefCase = { wavelength: 500 * nm, distance: 10, aperture: { shape: 'rectangle', width: 3 * mm, height: 2 * mm, opaque: false }, illumination: plane };
    const pts = Array.from({ length: 21 }, (_, i): [number, number] => [(-3 + (6 * i) / 20) * mm, 0.5 * mm]);
    const exact = referenceIntensity(c, pts, 1e9);
    const fallback = referenceIntensity(c, pts, 1);
    expect(exact.ok && exact.how).toBe('exact boundary form of the Rayleigh–Sommerfeld integral');
    expect(fallback.ok && fallback.how).toMatch(/^paraxial Fresnel integrals/);
    if (exact.ok && fallback.ok) expect(maxDiffOverPeak(fallback.intensity, exact.intensity)).toBeLessThan(1e-3);
  });

  it('2-D: with no budget and no paraxial bound, only the on-axis closed form of a disc is given (Osterberg & Smith 1961, from memory)', () => {
    const c: RefCase = { wavelength: 500 * nm, distance: 40 * um, aperture: { shape: 'circle', diameter: 60 * um, opaque: true }, illumination: plane };
    const pts: [number, number][] = [[-10 * um, 0], [0, 0], [10 * um, 0]];
    const r = referenceIntensity(c, pts, 1, 1);
    expect(r.ok && r.how).toBe('exact on-axis value only');
    if (r.ok) {
      expect(r.points).toEqual([[0, 0]]);
      expect(r.intensity[0]).toBeCloseTo(axisIntensity(500 * nm, 40 * um, [{ radius: 30 * um, sign: 1 }], true), 12);
    }
  });

  it('says why when there is no reference', () => {
    const c: RefCase = { wavelength: 500 * nm, distance: 40 * um, aperture: { shape: 'rectangle', width: 60 * um, height: 50 * um, opaque: false }, illumination: { kind: 'gaussian', waist: 20 * um, tilt: [0.2, 0] } };
    const r = referenceIntensity(c, [[0, 0]], 1);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(/over budget/);
  });
});
