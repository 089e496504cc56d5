// The polygon transform reference (polygon-transform.ts) against closed forms and brute-force
// quadrature; its two branches against each other where they meet.
import { describe, expect, it } from 'vitest';
import { polygonTransform, polygonTransformBranches, shoelaceArea, type Complex, type Point } from './polygon-transform.js';
import { gaussLegendre } from './quadrature.js';
import { mulberry32 } from '../helpers.js';

const um = 1e-6;

function absDiff(a: Complex, b: Complex): number {
  return Math.hypot(a.re - b.re, a.im - b.im);
}

/** Normalised sinc, sin(πx)/(πx), as in Goodman's table of transform pairs. */
function sincN(x: number): number {
  return x === 0 ? 1 : Math.sin(Math.PI * x) / (Math.PI * x);
}

function star(rand: () => number, n: number, R: number): Point[] {
  const t = Array.from({ length: n }, () => rand() * 2 * Math.PI).sort((a, b) => a - b);
  return t.map((a) => {
    const r = R * (0.3 + 0.7 * rand());
    return [r * Math.cos(a) + 3 * um, r * Math.sin(a) - 2 * um] as Point;
  });
}

const L: Point[] = [[0, 0], [30 * um, 0], [30 * um, 10 * um], [10 * um, 10 * um], [10 * um, 40 * um], [0, 40 * um]];

describe('polygonTransform', () => {
  it('F(0) = the shoelace area (common practice), either orientation; F(−f) = conj F(f) for a real function (common practice)', () => {
    for (const v of [L, [...L].reverse(), star(mulberry32(1), 17, 20 * um)]) {
      const A = shoelaceArea(v);
      const f0 = polygonTransform(v, 0, 0);
      expect(Math.abs(f0.re - A) / A).toBeLessThan(1e-14);
      expect(Math.abs(f0.im)).toBe(0);
      for (const [fx, fy] of [[1e3, 2e3], [3.1e4, -1.7e4], [2e5, 1e5]]) {
        const p = polygonTransform(v, fx!, fy!);
        const m = polygonTransform(v, -fx!, -fy!);
        expect(Math.hypot(p.re - m.re, p.im + m.im) / A).toBeLessThan(1e-13);
      }
    }
  });

  it('a rectangle: F = w h sinc(w fx) sinc(h fy) e^{−i2π(fx xc + fy yc)} (Goodman, Introduction to Fourier Optics, table of transform pairs, with the shift theorem), on and off the axes', () => {
    const [x0, x1, y0, y1] = [-3 * um, 11 * um, 2 * um, 7.5 * um];
    const w = x1 - x0;
    const h = y1 - y0;
    const xc = (x0 + x1) / 2;
    const yc = (y0 + y1) / 2;
    const rect: Point[] = [[x0, y0], [x1, y0], [x1, y1], [x0, y1]];
    const freqs: [number, number][] = [[0, 0], [1e2, 0], [0, 3e3], [5e4, 0], [0, 5e4], [1.3e5, -2.2e5], [1 / w, 0], [2 / w, 1 / h], [7e5, 3e5], [1e4, 1e4]];
    // q nearly perpendicular to two edges (q·e ≈ 1e-4 rad: sinc's series branch) and nearly parallel to the others.
    freqs.push([5e4, 3], [20, 8e4]);
    // Near the switch between the series and the edge sum (|q|·R = 1) as well.
    const R = Math.hypot(w, h) / 2;
    for (const s of [0.999, 1.001]) freqs.push([(s / (2 * Math.PI * R)) * 0.6, (s / (2 * Math.PI * R)) * 0.8]);
    for (const v of [rect, [...rect].reverse()]) {
      for (const [fx, fy] of freqs) {
        const a = w * h * sincN(w * fx) * sincN(h * fy);
        const phi = -2 * Math.PI * (fx * xc + fy * yc);
        const want = { re: a * Math.cos(phi), im: a * Math.sin(phi) };
        expect(absDiff(polygonTransform(v, fx, fy), want) / (w * h)).toBeLessThan(1e-13);
      }
    }
  });

  it('a right triangle against direct 2-D Gauss–Legendre quadrature (Abramowitz & Stegun 25.4.29; rule in quadrature.ts)', () => {
    const a = 12 * um;
    const b = 7 * um;
    const tri: Point[] = [[0, 0], [a, 0], [0, b]];
    const g = gaussLegendre(48);
    const quad = (fx: number, fy: number): Complex => {
      // x over [0, a], y over [0, b(1 − x/a)]: the integrand is smooth on both, so one panel each.
      let re = 0;
      let im = 0;
      for (let i = 0; i < g.x.length; i++) {
        const x = (a / 2) * (g.x[i]! + 1);
        const top = b * (1 - x / a);
        for (let j = 0; j < g.x.length; j++) {
          const y = (top / 2) * (g.x[j]! + 1);
          const wgt = (a / 2) * (top / 2) * g.w[i]! * g.w[j]!;
          const phi = -2 * Math.PI * (fx * x + fy * y);
          re += wgt * Math.cos(phi);
          im += wgt * Math.sin(phi);
        }
      }
      return { re, im };
    };
    const A = (a * b) / 2;
    // Up to about 60 rad of phase across the triangle: 48 nodes resolve it to rounding.
    for (const [fx, fy] of [[0, 0], [1e3, 0], [0, 2e4], [4e4, 3e4], [-2e5, 1e5], [5e5, 7e5], [8e5, -8e5], [1 / a, 0], [1 / b, 1 / a]] as [number, number][]) {
      for (const v of [tri, [...tri].reverse()]) {
        expect(absDiff(polygonTransform(v, fx, fy), quad(fx, fy)) / A).toBeLessThan(1e-13);
      }
    }
  });

  it('the moment series and the edge sum agree where the branch switches (|q|·R = 1) and a little either side: to 1e-14 of the area (internal consistency)', () => {
    const rand = mulberry32(5);
    for (let t = 0; t < 8; t++) {
      const v = star(rand, 3 + Math.floor(rand() * 30), 15 * um);
      const A = shoelaceArea(v);
      let cx = 0;
      let cy = 0;
      for (const p of v) {
        cx += p[0] / v.length;
        cy += p[1] / v.length;
      }
      const R = Math.max(...v.map((p) => Math.hypot(p[0] - cx, p[1] - cy)));
      for (const s of [0.5, 1, 2]) {
        const dir = rand() * 2 * Math.PI;
        const f = s / (2 * Math.PI * R);
        const b = polygonTransformBranches(v, f * Math.cos(dir), f * Math.sin(dir));
        expect(absDiff(b.series, b.edges) / A).toBeLessThan(1e-14);
      }
    }
  });

  it('shift theorem (Goodman): translating the polygon multiplies F by e^{−i2π f·d}; reversing the vertex list changes nothing', () => {
    const v = star(mulberry32(8), 11, 25 * um);
    const d: [number, number] = [40 * um, -13 * um];
    const moved = v.map((p) => [p[0] + d[0], p[1] + d[1]] as Point);
    const A = shoelaceArea(v);
    for (const [fx, fy] of [[2e3, -1e3], [3e4, 5e4], [-4e5, 1e5]] as [number, number][]) {
      const F = polygonTransform(v, fx, fy);
      const phi = -2 * Math.PI * (fx * d[0] + fy * d[1]);
      const want = { re: F.re * Math.cos(phi) - F.im * Math.sin(phi), im: F.re * Math.sin(phi) + F.im * Math.cos(phi) };
      expect(absDiff(polygonTransform(moved, fx, fy), want) / A).toBeLessThan(1e-12);
      expect(absDiff(polygonTransform([...v].reverse(), fx, fy), F) / A).toBeLessThan(1e-14);
    }
  });
});
