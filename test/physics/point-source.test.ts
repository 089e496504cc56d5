// A point source at a distance before the aperture (plan/curved-light.ts: the Fresnel scaling
// theorem), against published results and an independent quadrature of the exact integral.
import { describe, expect, it } from 'vitest';
import { planCase } from '../../src/plan/planner.js';
import { mm, nm, um } from '../helpers.js';
import { exactOnAxis, run, sourceCase, valueAt } from './curved-light-helpers.js';

const lam = 633 * nm;

describe('point source', () => {
  // Born & Wolf, Principles of Optics §8.8 (and Goodman, Introduction to Fourier Optics): behind a
  // circular opening of radius a lit by a point source at s, the on-axis field is the free wave
  // times 1 − e^{iπN_F}, N_F = a²(1/s + 1/z)/λ, so I = I_geometric·4 sin²(πN_F/2) with
  // I_geometric = (s/(s + z))² (the point's irradiance at the screen, 1 at the aperture's centre;
  // inverse square law). Checked at Fresnel numbers from 0.5 to 3.5, through maxima and minima.
  const a = 0.5 * mm;
  const s = 1;
  for (const nf of [0.5, 1, 1.5, 2.5, 3.5]) {
    it(`on the axis behind a 1 mm hole, source 1 m before it, N_F = ${nf}: (s/(s+z))²·4sin²(πN_F/2) (Born & Wolf §8.8)`, () => {
      const z = 1 / (((nf * lam) / (a * a)) - 1 / s);
      const { rec, codes } = run(sourceCase({ shape: 'circle', diameter: 2 * a, opaque: false }, z, { kind: 'point', distance: s, at: [0, 0] }));
      const geometric = (s / (s + z)) ** 2;
      const expected = geometric * 4 * Math.sin((Math.PI * nf) / 2) ** 2;
      const got = valueAt(rec.computed, 0, 0);
      // Error budget: the planner's grids hold 0.25 % of the peak (limits.ts oversampling2D) and the
      // paraxial scaling drops ka⁴/(8s³) + ka⁴/(8z³) ≲ 2e-3 rad here: 1 % of the free wave's 4·I_geometric.
      expect(Math.abs(got - expected)).toBeLessThan(0.01 * 4 * geometric);
      // The independent exact integral agrees to the same budget.
      expect(Math.abs(exactOnAxis(lam, a, s, z) - expected)).toBeLessThan(0.01 * 4 * geometric);
      expect(codes).not.toContain('curved-light-paraxial');
    });
  }

  it('the plan says what it did: flat light at z_eff = zs/(s+z), magnified (s+z)/s', () => {
    const z = 300 * mm;
    const plan = planCase(sourceCase({ shape: 'circle', diameter: 1 * mm, opaque: false }, z, { kind: 'point', distance: 120 * mm, at: [0, 0] }));
    expect(plan.flatLight!.plan.case.distance).toBeCloseTo((z * 0.12) / (z + 0.12), 12);
    expect(plan.flatLight!.magnification).toBeCloseTo((0.12 + z) / 0.12, 12);
    expect(plan.reasons[0]).toMatch(/point source 120 mm before the aperture, on the axis/);
    expect(plan.reasons[0]).toMatch(/z_eff = zR\/\(R \+ z\) = 85\.7\d* mm and magnified ×3\.5/);
    // The window is on the real screen: the geometric shadow is 1 mm × 3.5 wide.
    expect(2 * plan.x.windowHalf).toBeGreaterThan(3.5 * mm);
  });

  it('a pinhole images an off-axis point to a spot centred at −ξ·z/s (the pinhole camera; common practice)', () => {
    const s = 100 * mm;
    const z = 150 * mm;
    for (const at of [[2 * mm, 0], [-1 * mm, 1.5 * mm]] as [number, number][]) {
      const { rec, codes } = run(sourceCase({ shape: 'circle', diameter: 60 * um, opaque: false }, z, { kind: 'point', distance: s, at }));
      const [cx, cy] = rec.metrics.centroid;
      // The spot (about 2λz_eff/D·M ≈ 5 mm⁄… wide) is symmetric about its centre: the centroid within
      // 0.5 % of the shift (the window's 2 % loss target may clip its tails unevenly).
      expect(Math.abs(cx - (-at[0] * z) / s)).toBeLessThan(0.005 * Math.hypot(...at) * (z / s));
      expect(Math.abs(cy! - (-at[1] * z) / s)).toBeLessThan(0.005 * Math.hypot(...at) * (z / s));
      expect(codes).not.toContain('curved-light-paraxial');
    }
  });

  it("an opaque disc lit by a point source: Poisson's spot on the axis as bright as the unobstructed wave, (s/(s+z))² (Born & Wolf §8.8)", () => {
    const s = 0.5;
    const z = 0.5;
    const { rec, plan, codes } = run(sourceCase({ shape: 'circle', diameter: 1 * mm, opaque: true }, z, { kind: 'point', distance: s, at: [0, 0] }));
    expect(plan.babinet).toBe(true);
    // Error budget: the grids 0.25 % of the free wave, the paraxial phases under 1e-3 rad: 1 %.
    expect(Math.abs(valueAt(rec.computed, 0, 0) / (s / (s + z)) ** 2 - 1)).toBeLessThan(0.01);
    expect(codes).toEqual([]);
  });

  it('a grating lit by an off-axis point: its orders land at z·tan θ_m, sin θ_m = sin θ_i + mλ/d, θ_i the direction from the point (the grating equation; common practice), with no warning', () => {
    // (The flat case's distance z_eff = 0.5 m is past W·d/λ = 0.19 m, where the orders part.)
    const d = 100 * um;
    const s = 1;
    const z = 1;
    const xi = 5 * mm;
    const { rec, codes } = run(sourceCase({ shape: 'slits', count: 12, width: 30 * um, period: d, opaque: false }, z, { kind: 'point', distance: s, at: [xi, 0] }));
    expect(codes).toEqual([]);
    const sinI = -xi / Math.hypot(xi, s);
    for (const o of rec.metrics.orders!.filter((o) => Math.abs(o.m) <= 2)) {
      const sinM = sinI + (o.m * lam) / d;
      // The order's measured centre within a fiftieth of the order spacing λz/d.
      expect(Math.abs(o.position! - (z * sinM) / Math.sqrt(1 - sinM * sinM))).toBeLessThan((0.02 * lam * z) / d);
    }
  });

  it('a point source and a slit (1-D) give the intensity of a point source and a long rectangle near the axis: 1/M² (separable Fresnel integrals; Goodman §4.2)', () => {
    const s = 0.3;
    const z = 0.4;
    const w = 0.4 * mm;
    const src = { kind: 'point' as const, distance: s, at: [0, 0] as [number, number] };
    const slit = run(sourceCase({ shape: 'slit', width: w, opaque: false }, z, src)).rec.computed;
    // The rectangle 60 mm long: along y its edges are 30 mm out, where their fringes on the axis are
    // at most 4× the Fresnel integrals' tail amplitude 1/(π·u·√2) (two edges in phase, and |1 + ε|² ≈
    // 1 + 2ε), u = 30 mm·√(2/(λz_eff)) ≈ 129: 0.7 %, and about 0.08 % at this length's phase (measured;
    // 1.0 % at 40 mm, where the bound is 1.05 %). 100 mm long (0.4 % at most) took 2.5× the work.
    const rect = run(sourceCase({ shape: 'rectangle', width: w, height: 60 * mm, opaque: false }, z, src, { window: [3 * mm, 1 * mm] })).rec.computed;
    for (const x of [0, 0.1 * mm, 0.25 * mm, 0.4 * mm]) {
      expect(Math.abs(valueAt(slit, x, 0) / valueAt(rect, x, 0) - 1)).toBeLessThan(0.01);
    }
  });

  it("a lens images a point: 1/s + 1/s' = 1/f, the spot at −ξ·s'/s with the focus's peak (πa²/(λs'))² (Born & Wolf §8.8, the intensity at a focus)", () => {
    const f = 100 * mm;
    const s = 300 * mm;
    const image = 1 / (1 / f - 1 / s);
    const stop = 4 * mm;
    const xi = 2 * mm;
    const lens = { shape: 'lens' as const, focal: f, stop, aberrations: [], opaque: false };
    const { rec, plan, codes } = run(sourceCase(lens as never, image, { kind: 'point', distance: s, at: [xi, 0] }));
    // The flat case is the lens at its focal plane: z_eff = s'·s/(s + s') = f.
    expect(plan.flatLight!.plan.case.distance).toBeCloseTo(f, 12);
    const peak = ((Math.PI * (stop / 2) ** 2) / (lam * image)) ** 2;
    // Error budget: the grids 0.25 % of the peak, reading the peak between samples 0.5 %: 1 %.
    expect(Math.abs(rec.metrics.peakIntensity / peak - 1)).toBeLessThan(0.01);
    expect(Math.abs(rec.metrics.peakPosition[0] - (-xi * image) / s)).toBeLessThan(0.1 * (lam * image) / stop);
    expect(codes).not.toContain('curved-light-paraxial');
  });

  it('warns (accuracy) where the spherical wave is not paraxial across the aperture, and stays quiet where it is', () => {
    // A 4 mm hole 5 mm from the source: ka⁴/(8s³) ≈ 200 rad.
    const near = planCase(sourceCase({ shape: 'circle', diameter: 4 * mm, opaque: false }, 100 * mm, { kind: 'point', distance: 5 * mm, at: [0, 0] }));
    expect(near.warnings.map((w) => w.code)).toContain('curved-light-paraxial');
    const far = planCase(sourceCase({ shape: 'circle', diameter: 1 * mm, opaque: false }, 100 * mm, { kind: 'point', distance: 500 * mm, at: [0, 0] }));
    expect(far.warnings.map((w) => w.code)).not.toContain('curved-light-paraxial');
  });
});
