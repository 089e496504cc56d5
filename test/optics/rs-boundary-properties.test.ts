// The boundary form (src/optics/rs-boundary.ts) on whole output grids: against the boundaryField of
// test/reference/rs2d.ts (an independent implementation of the same formula, by a colleague; 1e-12)
// up to N_F = 1e3, the radial table against direct integration, mirror symmetry, continuity across
// the aperture's edge, Babinet's principle, and the cost estimate against what was done.
import { describe, expect, it } from 'vitest';
import {
  boundaryRegionsOf,
  costRsBoundary,
  rsBoundary,
  rsBoundaryWithStats,
  type BoundaryRegion,
} from '../../src/optics/rs-boundary.js';
import { centredAxis, type Axis } from '../../src/optics/field.js';
import { boundaryField, type Problem2D, type SignedRegion } from '../reference/rs2d.js';

const um = 1e-6;

/** The reference problem for signed regions (a 'plane' region makes it an obstacle). */
function problem(regions: BoundaryRegion[], lam: number, z: number): Problem2D {
  const opaque = regions.some((r) => r.kind === 'plane');
  const list: SignedRegion[] = [];
  for (const r of regions) {
    if (r.kind === 'plane') continue;
    const sign = (opaque ? -r.sign : r.sign) as 1 | -1;
    list.push(r.kind === 'disc' ? { region: { kind: 'disc', radius: r.radius }, sign } : { region: { kind: 'rect', x0: r.x0, x1: r.x1, y0: r.y0, y1: r.y1 }, sign });
  }
  return { wavelength: lam, distance: z, regions: list, light: { kind: 'plane', sinTilt: 0 }, opaque };
}

/** Grid samples [index, x, y] spread over the window (every sample when few). */
function spread(X: Axis, Y: Axis, count: number): [number, number, number][] {
  const n = X.n * Y.n;
  const step = Math.max(1, Math.floor(n / count));
  const out: [number, number, number][] = [];
  // A stride coprime-ish with the row length visits every column and row region.
  for (let q = 0, i = 0; q < Math.min(count, n); q++, i = (i + step * 7 + 1) % n) out.push([i, X.start + (i % X.n) * X.step, Y.start + Math.floor(i / X.n) * Y.step]);
  return out;
}

/** Largest |I − I_ref| over the samples, over the largest I_ref among them. */
function errorAgainstReference(regions: BoundaryRegion[], lam: number, z: number, X: Axis, Y: Axis, samples: number, opts = {}) {
  const r = rsBoundaryWithStats(regions, lam, z, X, Y, opts);
  const pts = spread(X, Y, samples);
  const ref = boundaryField(problem(regions, lam, z), pts.map(([, x, y]) => [x, y]));
  let peak = 0;
  let worst = 0;
  let worstField = 0;
  pts.forEach(([i], q) => {
    const Ir = ref.re[q]! ** 2 + ref.im[q]! ** 2;
    const I = r.field.data[2 * i]! ** 2 + r.field.data[2 * i + 1]! ** 2;
    peak = Math.max(peak, Ir);
    worst = Math.max(worst, Math.abs(I - Ir));
    worstField = Math.max(worstField, Math.hypot(r.field.data[2 * i]! - ref.re[q]!, r.field.data[2 * i + 1]! - ref.im[q]!));
  });
  // The field's error in units of the peak amplitude: the phase matters to whatever uses the field
  // next (|δI| ≈ 2|U||δU|, so a bound b on this allows about 2b of the peak in intensity).
  return { error: worst / peak, fieldError: worstField / Math.sqrt(peak), stats: r.stats, peak };
}

const grating = (count: number, width: number, period: number, length: number): BoundaryRegion[] =>
  boundaryRegionsOf({ shape: 'slits', count, width, period, length, opaque: false })!;

describe('whole grids against the reference boundaryField (test/reference/rs2d.ts)', () => {
  // Budget: the rules ≈ 1e-8 of the field; the radial table's interpolation ≤ 1e-5 of the peak by
  // design (default tolerance 1e-4); the reference 1e-12. So 1e-5 where a table is interpolated,
  // 1e-6 where every output is integrated. The peak: the largest reference intensity among the
  // samples (each window holds the geometrical region or the far-field peak).
  const lam = 0.5 * um;
  it('a disc at N_F = 1e3 (a = 0.1 mm, z = 20 µm: edge waves at up to 86° from the axis), radial table: within 1e-5 of the peak', () => {
    const X = centredAxis(201, 0.28e-3 / 200);
    const r = errorAgainstReference([{ kind: 'disc', radius: 0.1e-3, sign: 1 }], lam, 20 * um, X, X, 100);
    expect(r.stats.radial).toBe(true);
    expect(r.error).toBeLessThan(1e-5);
    expect(r.fieldError).toBeLessThan(1e-5);
  });

  it('an annulus at N_F = 200, off-centre window (no mirror): within 1e-5 of the peak', () => {
    const X: Axis = { n: 180, start: -150 * um, step: 2.1 * um };
    const Y: Axis = { n: 90, start: 20 * um, step: -3.3 * um };
    const r = errorAgainstReference([{ kind: 'disc', radius: 200 * um, sign: 1 }, { kind: 'disc', radius: 60 * um, sign: -1 }], lam, 0.4e-3, X, Y, 150);
    expect(r.stats.mirrored).toEqual([false, false]);
    expect(r.error).toBeLessThan(1e-5);
    expect(r.fieldError).toBeLessThan(1e-5);
  });

  it('an opaque disc (obstacle) at N_F = 20: within 1e-5 of the peak', () => {
    const X = centredAxis(201, 300 * um / 200);
    const r = errorAgainstReference(boundaryRegionsOf({ shape: 'circle', diameter: 200 * um, opaque: true })!, lam, 1e-3, X, X, 150);
    expect(r.error).toBeLessThan(1e-5);
    expect(r.fieldError).toBeLessThan(1e-5);
  });

  it('a rectangle at N_F = 1e3 along x (1 mm × 0.2 mm, z = 0.5 mm), mirrored quadrant: within 1e-6 of the peak', () => {
    const X = centredAxis(201, 1.4e-3 / 200);
    const Y = centredAxis(61, 0.4e-3 / 60);
    const r = errorAgainstReference([{ kind: 'rect', x0: -0.5e-3, x1: 0.5e-3, y0: -0.1e-3, y1: 0.1e-3, sign: 1 }], lam, 0.5e-3, X, Y, 150);
    expect(r.stats.mirrored).toEqual([true, true]);
    expect(r.stats.readings).toBeGreaterThan(0); // the tables were used
    expect(r.error).toBeLessThan(1e-6);
    expect(r.fieldError).toBeLessThan(1e-6);
  });

  it('a grating of 9 lines near the aperture and far away (tables, and direct stretches): within 1e-6 of the peak', () => {
    const g = grating(9, 10 * um, 20 * um, 100 * um);
    const near = errorAgainstReference(g, lam, 2e-3, centredAxis(151, 400 * um / 150), centredAxis(51, 200 * um / 50), 120);
    expect(near.stats.readings).toBeGreaterThan(0);
    expect(near.error).toBeLessThan(1e-6);
    expect(near.fieldError).toBeLessThan(1e-6);
    // 0.5 m away on a window of ±11°: rows far wider than the grating, so each line's stretches
    // are integrated per output instead of tabulated.
    const far = errorAgainstReference(g, lam, 0.5, centredAxis(61, 0.2 / 60), centredAxis(21, 0.04 / 20), 80);
    expect(far.stats.readings).toBe(0);
    expect(far.error).toBeLessThan(1e-6);
    expect(far.fieldError).toBeLessThan(1e-6);
  });

  it('a rectangle with a disc on it and a square hole in both: mixed regions within 1e-5 of the peak', () => {
    const regions: BoundaryRegion[] = [
      { kind: 'disc', radius: 50 * um, sign: 1 },
      { kind: 'rect', x0: -80 * um, x1: 80 * um, y0: -5 * um, y1: 5 * um, sign: 1 },
      { kind: 'rect', x0: -5 * um, x1: 5 * um, y0: -5 * um, y1: 5 * um, sign: -1 },
    ];
    const X = centredAxis(161, 300 * um / 160);
    const r = errorAgainstReference(regions, lam, 1e-3, X, X, 150);
    expect(r.error).toBeLessThan(1e-5);
    expect(r.fieldError).toBeLessThan(1e-5);
  });
});

describe('properties that must hold whatever the numbers', () => {
  const lam = 0.633 * um;

  it('radial table against direct integration at every output: within the 1e-5 interpolation target, and 1e-7 with tolerance 1e-6', () => {
    const regions: BoundaryRegion[] = [{ kind: 'disc', radius: 80 * um, sign: 1 }, { kind: 'disc', radius: 20 * um, sign: -1 }];
    const X = centredAxis(121, 200 * um / 120, 3 * um); // off-centre: no mirror, every radius its own
    const Y = centredAxis(101, 160 * um / 100);
    for (const [tol, bound] of [[1e-4, 1e-5], [1e-6, 1e-7]] as const) {
      const table = rsBoundaryWithStats(regions, lam, 2e-3, X, Y, { tolerance: tol });
      const direct = rsBoundaryWithStats(regions, lam, 2e-3, X, Y, { tolerance: tol, radial: 'never' });
      expect(table.stats.radial).toBe(true);
      expect(direct.stats.radial).toBe(false);
      const a = table.field.data;
      const b = direct.field.data;
      let peak = 0;
      let worst = 0;
      let worstField = 0;
      for (let i = 0; i < a.length; i += 2) {
        const Ib = b[i]! ** 2 + b[i + 1]! ** 2;
        peak = Math.max(peak, Ib);
        worst = Math.max(worst, Math.abs(a[i]! ** 2 + a[i + 1]! ** 2 - Ib));
        worstField = Math.max(worstField, Math.hypot(a[i]! - b[i]!, a[i + 1]! - b[i + 1]!));
      }
      expect(worst / peak).toBeLessThan(bound);
      expect(worstField / Math.sqrt(peak)).toBeLessThan(bound); // the phase too
    }
  });

  it('mirror symmetry: the quadrant mirrored equals the whole window computed (to 1e-12)', () => {
    const cases: BoundaryRegion[][] = [
      [{ kind: 'rect', x0: -30 * um, x1: 30 * um, y0: -12 * um, y1: 12 * um, sign: 1 }],
      grating(4, 5 * um, 12 * um, 40 * um),
      [{ kind: 'disc', radius: 40 * um, sign: 1 }],
    ];
    for (const regions of cases) {
      const X = centredAxis(41, 3 * um);
      const Y = centredAxis(30, 2.5 * um); // even count: no sample on the axis
      const m = rsBoundaryWithStats(regions, lam, 0.5e-3, X, Y);
      const f = rsBoundaryWithStats(regions, lam, 0.5e-3, X, Y, { symmetry: false });
      expect(m.stats.mirrored).toEqual([true, true]);
      expect(f.stats.mirrored).toEqual([false, false]);
      let worst = 0;
      for (let i = 0; i < m.field.data.length; i++) worst = Math.max(worst, Math.abs(m.field.data[i]! - f.field.data[i]!));
      expect(worst).toBeLessThan(1e-12);
    }
    // An off-centre rectangle is not mirrored.
    const off = rsBoundaryWithStats([{ kind: 'rect', x0: -30 * um, x1: 31 * um, y0: -12 * um, y1: 12 * um, sign: 1 }], lam, 0.5e-3, centredAxis(41, 3 * um), centredAxis(30, 2.5 * um));
    expect(off.stats.mirrored).toEqual([false, true]);
  });

  it('continuity: feet exactly on an edge, a corner or the circle agree with feet a nanometre away and with the reference', () => {
    const z = 50 * um;
    const rect: BoundaryRegion[] = [{ kind: 'rect', x0: -20 * um, x1: 20 * um, y0: -10 * um, y1: 10 * um, sign: 1 }];
    const disc: BoundaryRegion[] = [{ kind: 'disc', radius: 20 * um, sign: 1 }];
    const at = (regions: BoundaryRegion[], x: number, y: number) => rsBoundary(regions, lam, z, { n: 1, start: x, step: 1 }, { n: 1, start: y, step: 1 }).data;
    const checks: [BoundaryRegion[], number, number][] = [
      [rect, 20 * um, 3 * um],
      [rect, 20 * um, 10 * um],
      [rect, -7 * um, -10 * um],
      [disc, 20 * um, 0],
      [disc, 12 * um, 16 * um],
    ];
    for (const [regions, x, y] of checks) {
      const on = at(regions, x, y);
      // |∇U| ≲ k·|U|: a nanometre moves U by ~1e-2 at most; the test asks 1e-3 of that scale.
      for (const [dx, dy] of [[1e-9, 0], [-1e-9, 0], [0, 1e-9], [0, -1e-9]]) {
        const near = at(regions, x + dx!, y + dy!);
        expect(Math.hypot(on[0]! - near[0]!, on[1]! - near[1]!)).toBeLessThan(2e-2);
      }
      const ref = boundaryField(problem(regions, lam, z), [[x, y]]); // nudges the foot a hair
      expect(Math.hypot(on[0]! - ref.re[0]!, on[1]! - ref.im[0]!)).toBeLessThan(1e-8);
    }
  });

  it("Babinet's principle: a hole and the complementary obstacle sum to the free wave e^{ikz} (Born & Wolf §8.3.2, from memory)", () => {
    const z = 0.8e-3;
    const k = (2 * Math.PI) / lam;
    const X = centredAxis(81, 4 * um);
    const Y = centredAxis(61, 4 * um, 1 * um);
    for (const a of [
      { shape: 'circle' as const, diameter: 200 * um },
      { shape: 'annulus' as const, outer: 200 * um, inner: 90 * um },
      { shape: 'rectangle' as const, width: 150 * um, height: 60 * um },
    ]) {
      const hole = rsBoundary(boundaryRegionsOf({ ...a, opaque: false })!, lam, z, X, Y).data;
      const stop = rsBoundary(boundaryRegionsOf({ ...a, opaque: true })!, lam, z, X, Y).data;
      const c = Math.cos(k * z);
      const s = Math.sin(k * z);
      let worst = 0;
      for (let i = 0; i < hole.length; i += 2) worst = Math.max(worst, Math.hypot(hole[i]! + stop[i]! - c, hole[i + 1]! + stop[i + 1]! - s));
      expect(worst).toBeLessThan(1e-12);
      // Not trivially: both parts are far from the free wave somewhere on the window.
      let spread = 0;
      for (let i = 0; i < hole.length; i += 2) spread = Math.max(spread, Math.hypot(hole[i]!, hole[i + 1]!), Math.hypot(stop[i]!, stop[i + 1]!));
      expect(spread).toBeGreaterThan(0.9);
    }
  });

  it('the cost estimate counts what the computation does (within 5 %), from the geometry alone', () => {
    const cases: [BoundaryRegion[], number, number, Axis, Axis][] = [
      [[{ kind: 'disc', radius: 300 * um, sign: 1 }, { kind: 'disc', radius: 100 * um, sign: -1 }], lam, 1e-3, centredAxis(201, 4 * um), centredAxis(201, 4 * um)],
      [[{ kind: 'disc', radius: 300 * um, sign: 1 }], lam, 1e-3, centredAxis(7, 100 * um), centredAxis(5, 100 * um)], // direct
      [[{ kind: 'rect', x0: -0.3e-3, x1: 0.3e-3, y0: -20 * um, y1: 20 * um, sign: 1 }], 2.2 * um, 16e-3, centredAxis(201, 6 * um), centredAxis(151, 6 * um)],
      [grating(9, 10 * um, 20 * um, 100 * um), lam, 0.5, centredAxis(61, 0.2 / 60), centredAxis(21, 0.04 / 20)],
    ];
    for (const [regions, l, z, X, Y] of cases) {
      const cost = costRsBoundary(regions, l, z, X, Y);
      const { stats } = rsBoundaryWithStats(regions, l, z, X, Y);
      expect(Math.abs(cost.evaluations - stats.evaluations) / stats.evaluations).toBeLessThan(0.05);
      expect(Math.abs(cost.readings - stats.readings)).toBeLessThanOrEqual(0.05 * stats.readings);
      expect(cost.interpolated).toBe(stats.interpolated);
      expect(cost.work).toBeGreaterThan(0);
      expect(cost.memory).toBeGreaterThanOrEqual(16 * X.n * Y.n);
    }
  });
});
