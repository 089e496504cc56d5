// The cells of the exact 2-D sums: the Gauss–Legendre rule, the edge cells' weights (their
// defining property: they reproduce the open part's moments), and what the builder makes (areas,
// power, symmetry, counts).
import { describe, expect, it } from 'vitest';
import { addDiscCellWeights, edgeNodes, gaussLegendreRule } from '../../src/optics/edge-cells.js';
import { rsCellCount2D, rsCells2DFromAperture } from '../../src/optics/rs-2d-cells.js';
import type { Aperture, Illumination } from '../../src/optics/aperture.js';
import { gaussLegendre } from '../reference/quadrature.js';

describe('Gauss–Legendre rule', () => {
  it('has the tabulated 4-point nodes and weights (A&S Table 25.4, from memory)', () => {
    const r = gaussLegendreRule(4);
    expect(r.x[3]).toBeCloseTo(0.8611363115940526, 14);
    expect(r.x[2]).toBeCloseTo(0.3399810435848563, 14);
    expect(r.w[3]).toBeCloseTo(0.3478548451374538, 14);
    expect(r.w[2]).toBeCloseTo(0.6521451548625461, 14);
  });

  it('integrates x^(2n−1)·… exactly: ∫x^(2n−2) over [−1, 1] = 2/(2n−1) for n = 2 … 16', () => {
    for (let n = 2; n <= 16; n++) {
      const r = gaussLegendreRule(n);
      let s = 0;
      for (let i = 0; i < n; i++) s += r.w[i]! * r.x[i]! ** (2 * n - 2);
      expect(Math.abs(s - 2 / (2 * n - 1))).toBeLessThan(1e-14);
    }
  });

  it('agrees with the test references’ own rule (test/reference/quadrature.ts) to 1e-15', () => {
    for (const n of [2, 5, 8, 12, 16]) {
      const a = gaussLegendreRule(n);
      const b = gaussLegendre(n);
      for (let i = 0; i < n; i++) {
        expect(Math.abs(a.x[i]! - b.x[i]!)).toBeLessThan(1e-15);
        expect(Math.abs(a.w[i]! - b.w[i]!)).toBeLessThan(1e-15);
      }
    }
  });
});

/**
 * ∬ (x − cx)^a (y − cy)^b over disc(0, R) ∩ cell, independently of the code under test: by
 * Green's theorem, ∬ f dA = ∮ F dy with ∂F/∂x = f, F = (x − cx)^{a+1}(y − cy)^b/(a + 1), along the
 * boundary of the (convex) intersection counter-clockwise: the cell's sides where inside the disc,
 * the circle where inside the cell, each by 20-point Gauss–Legendre on pieces (exact on the
 * sides, where F is a polynomial; arcs cut at ≤ 0.2 rad, where F is a smooth trigonometric
 * polynomial).
 */
function discCellMoment(R: number, cx: number, cy: number, half: number, a: number, b: number): number {
  const g = gaussLegendre(20);
  const F = (x: number, y: number) => (x - cx) ** (a + 1) * (y - cy) ** b / (a + 1);
  let total = 0;
  // Sides, counter-clockwise: bottom (→ +x), right (→ +y), top (→ −x), left (→ −y).
  const corners: [number, number][] = [
    [cx - half, cy - half],
    [cx + half, cy - half],
    [cx + half, cy + half],
    [cx - half, cy + half],
  ];
  for (let s = 0; s < 4; s++) {
    const [px, py] = corners[s]!;
    const [qx, qy] = corners[(s + 1) % 4]!;
    const dx = qx - px;
    const dy = qy - py;
    // |P + t(Q − P)|² ≤ R²: t in [t0, t1] ∩ [0, 1].
    const A = dx * dx + dy * dy;
    const B = 2 * (px * dx + py * dy);
    const C = px * px + py * py - R * R;
    const disc = B * B - 4 * A * C;
    if (disc <= 0) continue;
    const t0 = Math.max(0, (-B - Math.sqrt(disc)) / (2 * A));
    const t1 = Math.min(1, (-B + Math.sqrt(disc)) / (2 * A));
    if (!(t1 > t0)) continue;
    for (let i = 0; i < 20; i++) {
      const t = 0.5 * (t0 + t1) + 0.5 * (t1 - t0) * g.x[i]!;
      total += 0.5 * (t1 - t0) * g.w[i]! * F(px + t * dx, py + t * dy) * dy;
    }
  }
  // The circle where inside the cell: cut at the angles where it meets the cell's lines.
  const cuts = [0, 2 * Math.PI];
  for (const xl of [cx - half, cx + half]) {
    if (Math.abs(xl) < R) {
      const t = Math.acos(xl / R);
      cuts.push(t, 2 * Math.PI - t);
    }
  }
  for (const yl of [cy - half, cy + half]) {
    if (Math.abs(yl) < R) {
      const t = Math.asin(yl / R);
      cuts.push((t + 2 * Math.PI) % (2 * Math.PI), Math.PI - t);
    }
  }
  cuts.sort((u, v) => u - v);
  for (let c = 0; c + 1 < cuts.length; c++) {
    const lo = cuts[c]!;
    const hi = cuts[c + 1]!;
    if (!(hi > lo)) continue;
    const mid = 0.5 * (lo + hi);
    const mx = R * Math.cos(mid);
    const my = R * Math.sin(mid);
    if (Math.abs(mx - cx) > half || Math.abs(my - cy) > half) continue;
    const pieces = Math.ceil((hi - lo) / 0.2);
    for (let p = 0; p < pieces; p++) {
      const a0 = lo + ((hi - lo) * p) / pieces;
      const a1 = lo + ((hi - lo) * (p + 1)) / pieces;
      for (let i = 0; i < 20; i++) {
        const t = 0.5 * (a0 + a1) + 0.5 * (a1 - a0) * g.x[i]!;
        // dy = R cos t dt
        total += 0.5 * (a1 - a0) * g.w[i]! * F(R * Math.cos(t), R * Math.sin(t)) * R * Math.cos(t);
      }
    }
  }
  return total;
}

describe('edge-cell weights reproduce the open part’s moments', () => {
  // The weights' definition: Σ_pq c_pq u_p^a w_q^b = ∬_{open ∩ cell} u^a w^b for a, b < m.
  const cases: Array<[string, number, number, number, number]> = [
    // [label, R, cx, cy, half]
    ['large disc, edge across the cell', 20, 19.6, 3.1, 0.5],
    ['large disc, corner clipped', 20, 14.4, 13.9, 0.5],
    ['small disc, chord through two sides', 1.3, 1.1, 0.2, 0.5],
    ['disc inside one cell', 0.3, 0.05, -0.1, 0.5],
    ['disc through the cell corner', Math.hypot(2.5, 1.5), 2, 1, 0.5],
  ];
  for (const m of [4, 8, 12]) {
    it.each(cases)(`m = ${m}: %s`, (_label, R, cx, cy, half) => {
      const c = new Float64Array(m * m);
      addDiscCellWeights(R, cx, cy, half, m, 1, c);
      const u = edgeNodes(m).map((t) => t * half);
      let worst = 0;
      for (let a = 0; a < m; a++) {
        for (let b = 0; b < m; b++) {
          let s = 0;
          for (let p = 0; p < m; p++) for (let q = 0; q < m; q++) s += c[p * m + q]! * u[p]! ** a * u[q]! ** b;
          const ref = discCellMoment(R, cx, cy, half, a, b);
          // Relative to the moment of the whole cell's scale, (2·half)²·half^(a+b).
          worst = Math.max(worst, Math.abs(s - ref) / (4 * half * half * half ** (a + b)));
        }
      }
      expect(worst).toBeLessThan(1e-12);
    });
  }

  it('an annulus is the outer disc less the inner one', () => {
    const m = 6;
    const both = new Float64Array(m * m);
    addDiscCellWeights(5, 3.2, 2.1, 0.6, m, 1, both);
    addDiscCellWeights(3.6, 3.2, 2.1, 0.6, m, -1, both);
    let area = 0;
    for (const v of both) area += v;
    expect(Math.abs(area - (discCellMoment(5, 3.2, 2.1, 0.6, 0, 0) - discCellMoment(3.6, 3.2, 2.1, 0.6, 0, 0)))).toBeLessThan(1e-13);
    expect(area).toBeGreaterThan(0.1); // the cell is really cut by both circles
    expect(area).toBeLessThan(1.44 - 0.1);
  });
});

describe('the cells an aperture gives', () => {
  const lam = 633e-9;
  const plane: Illumination = { kind: 'plane', tilt: [0, 0] };

  it.each([
    [{ shape: 'circle', diameter: 17.3 * lam, opaque: false } as Aperture, Math.PI * (8.65 * lam) ** 2],
    [{ shape: 'annulus', outer: 21 * lam, inner: 9.4 * lam, opaque: false } as Aperture, Math.PI * ((10.5 * lam) ** 2 - (4.7 * lam) ** 2)],
    [{ shape: 'rectangle', width: 7.3 * lam, height: 3.9 * lam, opaque: false } as Aperture, 7.3 * 3.9 * lam * lam],
    [{ shape: 'slits', count: 3, width: 1.1 * lam, period: 2.9 * lam, length: 6 * lam, opaque: false } as Aperture, 3 * 1.1 * 6 * lam * lam],
  ])('open area and power equal the exact area at any grid offset (%s)', (a, area) => {
    for (const offset of [[0, 0], [0.5, 0.5], [0.31, -0.17]] as [number, number][]) {
      const c = rsCells2DFromAperture(a, plane, lam, 0.7 * lam, { offset });
      expect(Math.abs(c.openArea - area) / area).toBeLessThan(1e-12);
      expect(Math.abs(c.power - area) / area).toBeLessThan(1e-12);
    }
  });

  it('rectangles, slits and gratings are boxes only, edges on box edges', () => {
    const c = rsCells2DFromAperture({ shape: 'rectangle', width: 3.3 * lam, height: 2 * lam, opaque: false }, plane, lam, lam, { offset: [0.2, 0] });
    expect(c.edge.n).toBe(0);
    let minX = Infinity;
    let maxX = -Infinity;
    for (let j = 0; j < c.box.n; j++) {
      minX = Math.min(minX, c.box.cx[j]! - c.box.hx[j]!);
      maxX = Math.max(maxX, c.box.cx[j]! + c.box.hx[j]!);
      expect(c.box.hx[j]!).toBeLessThanOrEqual(0.5 * lam * (1 + 1e-12));
    }
    expect(Math.abs(minX + 1.65 * lam)).toBeLessThan(1e-12 * lam);
    expect(Math.abs(maxX - 1.65 * lam)).toBeLessThan(1e-12 * lam);
  });

  it('a Gaussian beam’s power through a circle is (πw²/2)(1 − e^{−2R²/w²}) (integral of e^{−2r²/w²})', () => {
    const w = 3 * lam;
    const R = 4 * lam;
    const c = rsCells2DFromAperture({ shape: 'circle', diameter: 2 * R, opaque: false }, { kind: 'gaussian', waist: w, tilt: [0, 0] }, lam, 0.6 * lam, { offset: [0.13, 0.4] });
    const exact = ((Math.PI * w * w) / 2) * (1 - Math.exp((-2 * R * R) / (w * w)));
    expect(Math.abs(c.power - exact) / exact).toBeLessThan(1e-9);
  });

  it('says when the source is even or round, and the counts match the cells', () => {
    const disc: Aperture = { shape: 'circle', diameter: 9 * lam, opaque: false };
    const c0 = rsCells2DFromAperture(disc, plane, lam, 0.8 * lam);
    expect(c0.symmetry).toEqual({ evenX: true, evenY: true, round: { outer: 4.5 * lam, inner: 0, waist: null } });
    const tilted: Illumination = { kind: 'plane', tilt: [0.2, 0] };
    const c1 = rsCells2DFromAperture(disc, tilted, lam, 0.8 * lam);
    expect(c1.symmetry.evenX).toBe(false);
    expect(c1.symmetry.evenY).toBe(true);
    expect(c1.symmetry.round).toBeNull();
    const c2 = rsCells2DFromAperture(disc, plane, lam, 0.8 * lam, { offset: [0.3, 0.5] });
    expect(c2.symmetry.evenX).toBe(false);
    expect(c2.symmetry.evenY).toBe(true);
    for (const [ill, off] of [[plane, [0, 0]], [tilted, [0.3, 0.5]]] as [Illumination, [number, number]][]) {
      const cells = rsCells2DFromAperture(disc, ill, lam, 0.8 * lam, { offset: off });
      const count = rsCellCount2D(disc, ill, lam, 0.8 * lam, { offset: off });
      // Slivers are dropped and nearly full edge cells made boxes when built: counts bound them.
      expect(count.box + count.edge).toBeGreaterThanOrEqual(cells.box.n + cells.edge.n);
      expect(count.box).toBeLessThanOrEqual(cells.box.n);
      expect(count.edge).toBeGreaterThanOrEqual(cells.edge.n);
      expect(count.box + count.edge - (cells.box.n + cells.edge.n)).toBeLessThanOrEqual(4);
    }
  });

  it('refuses 1-D apertures and bad options', () => {
    expect(() => rsCells2DFromAperture({ shape: 'slit', width: lam, opaque: false }, plane, lam, lam)).toThrow(/1-D/);
    expect(() => rsCells2DFromAperture({ shape: 'circle', diameter: lam, opaque: false }, plane, lam, lam, { edgeNodes: 5 })).toThrow(/even/);
    expect(() => rsCells2DFromAperture({ shape: 'circle', diameter: lam, opaque: false }, plane, lam, 0)).toThrow(/pitch/);
  });
});
