// Two mutually incoherent points (illumination kind points): the two-point resolution case, at
// infinity and at a distance, read off the computed map by analysis/two-points.ts.
import besselj1 from '@stdlib/math-base-special-besselj1';
import { describe, expect, it } from 'vitest';
import { metricQuantities } from '../../src/metrics/registry.js';
import { mm, nm, um } from '../helpers.js';
import { run, sourceCase, valueAt } from './curved-light-helpers.js';

const lam = 633 * nm;
const D = 100 * um;
const pinhole = { shape: 'circle' as const, diameter: D, opaque: false };
// The Airy pattern's first zero, v = 3.8317 (Born & Wolf §8.5.2): at angle 1.21967λ/D.
const J1_ZERO = 3.831705970207512;
const rayleighAngle = (J1_ZERO / Math.PI) * (lam / D);
// Two Airy patterns one first zero apart: the peaks stay 1 (each sits on the other's zero) and
// the midpoint holds 2·[2J₁(v)/v]² at v = 3.8317/2, about 73.5 % (Born & Wolf §7.6.3), J₁ by @stdlib.
const v = J1_ZERO / 2;
const RAYLEIGH_AIRY_DIP = 2 * ((2 * besselj1(v)) / v) ** 2;

describe('two incoherent points through a circular pupil', () => {
  it(`the Airy dip at the Rayleigh separation is ${(100 * RAYLEIGH_AIRY_DIP).toFixed(2)} % (reference value)`, () => {
    expect(RAYLEIGH_AIRY_DIP).toBeGreaterThan(0.73);
    expect(RAYLEIGH_AIRY_DIP).toBeLessThan(0.74);
  });

  it('two points at infinity 1.22λ/D apart, a 100 µm pinhole, screen 2 m away (far field): dip ≈ 73.5 %, resolved', () => {
    const z = 2;
    const { rec, plan } = run(sourceCase(pinhole, z, { kind: 'points', distance: null, points: [{ at: [-rayleighAngle / 2, 0], power: 1 }, { at: [rayleighAngle / 2, 0], power: 1 }] }));
    expect(plan.flatLight!.magnification).toBe(1);
    const t = rec.metrics.twoPoints!;
    expect(t.separation).toBeCloseTo(z * 2 * Math.tan(rayleighAngle / 2), 12);
    // Error budget: the far field here has N_F = 0.002, whose quadratic phase changes the Airy
    // pattern by (πN_F)²/12 ≈ 4e-6; the grids 0.25 % of the peak; reading between samples: 0.005.
    expect(Math.abs(t.dip! - RAYLEIGH_AIRY_DIP)).toBeLessThan(0.005);
    expect(t.resolved).toBe(true);
    // summary.csv's columns read the same reading (metrics/two-points.ts).
    const cols = metricQuantities({ cases: [rec.plan.case], records: [rec] });
    const read = (h: string) => cols.find((q) => q.header === h)!.read(rec);
    expect(read('two_point_dip')).toBe(t.dip);
    expect(read('two_point_rayleigh')).toBe('resolved');
    expect(read('two_point_sparrow')).toBe('resolved');
  });

  it('two points 0.5 m before the pinhole, 1.22λs/D apart: their patterns land δ·z/s apart, one Airy radius, and dip the same', () => {
    const s = 0.5;
    const z = 2;
    const delta = (rayleighAngle * s);
    const { rec } = run(sourceCase(pinhole, z, { kind: 'points', distance: s, points: [{ at: [0, -delta / 2], power: 1 }, { at: [0, delta / 2], power: 1 }] }));
    const t = rec.metrics.twoPoints!;
    expect(t.separation).toBeCloseTo((delta * z) / s, 12);
    expect(Math.abs(t.dip! - RAYLEIGH_AIRY_DIP)).toBeLessThan(0.005);
  });

  it('two stars through a lens of 5 mm stop, 1.22λ/D apart, at its focus: the dip of two Airy patterns', () => {
    const stop = 5 * mm;
    const f = 100 * mm;
    const angle = (J1_ZERO / Math.PI) * (lam / stop);
    const lens = { shape: 'lens' as const, focal: f, stop, aberrations: [], opaque: false };
    const { rec, plan } = run(sourceCase(lens as never, f, { kind: 'points', distance: null, points: [{ at: [-angle / 2, 0], power: 1 }, { at: [angle / 2, 0], power: 1 }] }));
    const t = rec.metrics.twoPoints!;
    // The focal plane holds the Fourier transform at x = f·tan θ (Goodman §5.2).
    expect(t.separation).toBeCloseTo(2 * f * Math.tan(angle / 2), 12);
    expect(Math.abs(t.dip! - RAYLEIGH_AIRY_DIP)).toBeLessThan(0.005);
    expect(plan.warnings.map((w) => w.code)).not.toContain('curved-light-paraxial');
  });

  it('half again as far apart they are resolved more clearly; at 0.7 of it not at all (Rayleigh: 8/π²)', () => {
    const z = 2;
    const case_ = (f: number) => sourceCase(pinhole, z, { kind: 'points', distance: null, points: [{ at: [(-f * rayleighAngle) / 2, 0], power: 1 }, { at: [(f * rayleighAngle) / 2, 0], power: 1 }] });
    const wide = run(case_(1.5)).rec.metrics.twoPoints!;
    expect(wide.resolved).toBe(true);
    expect(wide.dip!).toBeLessThan(RAYLEIGH_AIRY_DIP - 0.2);
    const close = run(case_(0.7)).rec.metrics.twoPoints!;
    expect(close.resolved).toBe(false);
  });

  it("Sparrow's limit: two equal Airy patterns keep a dip down to 0.947λ/D (Born & Wolf §7.6.3; common practice), none at 0.85λ/D", () => {
    const z = 2;
    const sparrowAngle = 0.947 * (lam / D);
    const case_ = (f: number) => sourceCase(pinhole, z, { kind: 'points', distance: null, points: [{ at: [(-f * sparrowAngle) / 2, 0], power: 1 }, { at: [(f * sparrowAngle) / 2, 0], power: 1 }] });
    // 5 % above the limit: a shallow dip (not Rayleigh-resolved); 10 % below: one flat-topped peak.
    const above = run(case_(1.05)).rec.metrics.twoPoints!;
    expect(above.sparrow).toBe(true);
    expect(above.resolved).toBe(false);
    const below = run(case_(0.9)).rec.metrics.twoPoints!;
    expect(below.sparrow).toBe(false);
  });

  it('unequal powers land on their own sides: the brighter point at +ξ casts the brighter peak at −ξ·z/s (the pinhole inverts)', () => {
    const s = 0.5;
    const z = 1;
    const xi = 15 * mm;
    const { rec } = run(sourceCase(pinhole, z, { kind: 'points', distance: s, points: [{ at: [xi, 0], power: 2 }, { at: [-xi, 0], power: 1 }] }));
    const m = rec.computed;
    const bright = valueAt(m, (-xi * z) / s, 0);
    const dim = valueAt(m, (xi * z) / s, 0);
    // The powers' shares 2/3 and 1/3: the peaks in that ratio (8 Airy radii apart: the Airy tail there is under 1e-3 of a peak).
    expect(Math.abs(bright / dim - 2)).toBeLessThan(0.02);
    // And the total irradiance at the aperture is 1: the brighter peak is 2/3 of the single point's
    // far-field peak (πa²/(λ·z_eff))²/M² (Born & Wolf §8.5.2) with z_eff = zs/(s+z), M = (s+z)/s.
    const zEff = (z * s) / (s + z);
    const M = (s + z) / s;
    const airyPeak = ((Math.PI * (D / 2) ** 2) / (lam * zEff)) ** 2 / (M * M);
    expect(Math.abs(bright / ((2 / 3) * airyPeak) - 1)).toBeLessThan(0.01);
  });
});
