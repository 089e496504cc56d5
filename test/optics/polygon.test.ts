// Polygon apertures (src/optics/polygon.ts): the mask against an independent per-cell clip, the
// shoelace area, mask.ts's rectangles, the regular N-gon's area; the checks and the facts.
import { describe, expect, it } from 'vitest';
import {
  MAX_POLYGON_VERTICES,
  polygonCellFractions,
  polygonFacts,
  polygonProblem,
  type Vertex,
} from '../../src/optics/polygon.js';
import { sampleProfile } from '../../src/optics/mask.js';
import { centredAxis, type Axis } from '../../src/optics/field.js';
import { mulberry32, um } from '../helpers.js';
import { polygonTransform } from '../reference/polygon-transform.js';

/** Shoelace area, signed (common practice / any geometry handbook). */
function shoelace(v: readonly (readonly [number, number])[]): number {
  let s = 0;
  for (let i = 0; i < v.length; i++) {
    const [ax, ay] = v[i]!;
    const [bx, by] = v[(i + 1) % v.length]!;
    s += ax * by - bx * ay;
  }
  return s / 2;
}

/**
 * The slow reference: the polygon clipped to one cell by Sutherland–Hodgman (Sutherland & Hodgman,
 * Commun. ACM 17, 32 (1974)), four half-planes of the cell in turn. The clip window is convex (a
 * cell), so the output's shoelace area is the area of the intersection whatever the polygon
 * (a concave one may leave zero-width bridges along the window's sides, which add no area).
 */
function clippedArea(v: readonly Vertex[], a: number, b: number, c: number, d: number): number {
  let poly: [number, number][] = v.map((p) => [p[0], p[1]]);
  const planes: [number, number, number][] = [
    [0, 1, a], // x ≥ a
    [0, -1, b], // x ≤ b
    [1, 1, c], // y ≥ c
    [1, -1, d], // y ≤ d
  ];
  for (const [axis, dir, bound] of planes) {
    const inside = (p: [number, number]) => dir * (p[axis]! - bound) >= 0;
    const cut = (p: [number, number], q: [number, number]): [number, number] => {
      const t = (bound - p[axis]!) / (q[axis]! - p[axis]!);
      const r: [number, number] = [p[0] + t * (q[0] - p[0]), p[1] + t * (q[1] - p[1])];
      r[axis] = bound;
      return r;
    };
    const outPoly: [number, number][] = [];
    for (let i = 0; i < poly.length; i++) {
      const p = poly[i]!;
      const q = poly[(i + 1) % poly.length]!;
      if (inside(q)) {
        if (!inside(p)) outPoly.push(cut(p, q));
        outPoly.push(q);
      } else if (inside(p)) outPoly.push(cut(p, q));
    }
    poly = outPoly;
    if (poly.length === 0) return 0;
  }
  return Math.abs(shoelace(poly));
}

function referenceFractions(v: readonly Vertex[], xa: Axis, ya: Axis): Float64Array {
  const out = new Float64Array(xa.n * ya.n);
  for (let r = 0; r < ya.n; r++) {
    const y = ya.start + r * ya.step;
    for (let c = 0; c < xa.n; c++) {
      const x = xa.start + c * xa.step;
      out[r * xa.n + c] = clippedArea(v, x - xa.step / 2, x + xa.step / 2, y - ya.step / 2, y + ya.step / 2) / (xa.step * ya.step);
    }
  }
  return out;
}

function maxAbsDiff(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i]! - b[i]!));
  return m;
}

function sum(a: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i]!;
  return s;
}

/** A random star-shaped polygon about (cx, cy): sorted random angles, radii in [0.25R, R]. */
function starPolygon(rand: () => number, n: number, R: number, cx: number, cy: number): Vertex[] {
  const angles = Array.from({ length: n }, () => rand() * 2 * Math.PI).sort((p, q) => p - q);
  return angles.map((t) => {
    const r = R * (0.25 + 0.75 * rand());
    return [cx + r * Math.cos(t), cy + r * Math.sin(t)];
  });
}

/** minFeature by brute force over all pairs of non-adjacent edges (the edges of a simple polygon do not cross, so each pair's distance is the least of its four end-to-edge distances). */
function bruteMinFeature(v: readonly Vertex[]): number {
  const n = v.length;
  const d = (p: Vertex, a: Vertex, b: Vertex) => {
    const ex = b[0] - a[0], ey = b[1] - a[1];
    const t = Math.min(1, Math.max(0, ((p[0] - a[0]) * ex + (p[1] - a[1]) * ey) / (ex * ex + ey * ey)));
    return Math.hypot(p[0] - a[0] - t * ex, p[1] - a[1] - t * ey);
  };
  let best = Infinity;
  for (let i = 0; i < n; i++) {
    const a = v[i]!, b = v[(i + 1) % n]!;
    best = Math.min(best, Math.hypot(b[0] - a[0], b[1] - a[1]));
    for (let j = i + 2; j < n; j++) {
      if (i === 0 && j === n - 1) continue;
      const c = v[j]!, e = v[(j + 1) % n]!;
      best = Math.min(best, d(a, c, e), d(b, c, e), d(c, a, b), d(e, a, b));
    }
  }
  return best;
}

/** A burst of thin spikes converging on a point: edges that crowd together (the quadtree's hard case). */
function burst(spikes: number, outer: number, inner: number): Vertex[] {
  const v: Vertex[] = [];
  for (let k = 0; k < spikes; k++) {
    const a = (2 * Math.PI * k) / spikes;
    const b = a + Math.PI / spikes;
    v.push([outer * Math.cos(a), outer * Math.sin(a)], [inner * Math.cos(b), inner * Math.sin(b)]);
  }
  return v;
}

const L: Vertex[] = [
  [0, 0],
  [30 * um, 0],
  [30 * um, 10 * um],
  [10 * um, 10 * um],
  [10 * um, 40 * um],
  [0, 40 * um],
];

describe('polygonCellFractions: every cell against a Sutherland–Hodgman clip of the polygon to the cell', () => {
  it('random star-shaped polygons (fixed seed), either orientation, grids that cut them: to 1e-12 per cell', () => {
    const rand = mulberry32(20261202);
    for (let trial = 0; trial < 12; trial++) {
      const n = 3 + Math.floor(rand() * 40);
      const step = (1 + 4 * rand()) * um;
      const R = step * (2 + 12 * rand());
      let v = starPolygon(rand, n, R, (rand() - 0.5) * 6 * step, (rand() - 0.5) * 6 * step);
      if (rand() < 0.5) v = v.reverse();
      expect(polygonProblem(v)).toBeNull();
      // Grids of different pitch in x and y, offset by a fraction of a cell, some cutting the polygon.
      const nx = 8 + Math.floor(rand() * 30);
      const ny = 8 + Math.floor(rand() * 30);
      const xa: Axis = { n: nx, start: -R * (0.6 + 0.6 * rand()), step: step * (0.7 + 0.6 * rand()) };
      const ya: Axis = { n: ny, start: -R * (0.6 + 0.6 * rand()), step: step * (0.7 + 0.6 * rand()) };
      const got = polygonCellFractions(v, xa, ya);
      const ref = referenceFractions(v, xa, ya);
      expect(maxAbsDiff(got, ref)).toBeLessThan(1e-12);
    }
  });

  it('vertices and edges on the cell boundaries (vertical and horizontal edges on grid lines, a diamond through cell corners)', () => {
    const xa: Axis = { n: 12, start: 0.5 * um, step: 1 * um }; // boundaries at whole µm
    const ya: Axis = { n: 10, start: -4.5 * um, step: 1 * um };
    const shapes: Vertex[][] = [
      [[2 * um, -3 * um], [7 * um, -3 * um], [7 * um, 2 * um], [2 * um, 2 * um]],
      [[6 * um, -4 * um], [10 * um, 0], [6 * um, 4 * um], [2 * um, 0]],
      L.map(([x, y]) => [x / 5 + 1 * um, y / 5 - 4 * um] as Vertex),
    ];
    for (const v of shapes) {
      for (const w of [v, [...v].reverse()]) {
        expect(maxAbsDiff(polygonCellFractions(w, xa, ya), referenceFractions(w, xa, ya))).toBeLessThan(1e-13);
      }
    }
  });

  it('a comb (deep notches, many edges crossing a row) and a thin sliver spanning many cells', () => {
    // A base 3.7 µm high with ten teeth 1 µm wide and 13.6 µm long, 1 µm apart.
    const comb: Vertex[] = [[0, 0], [21 * um, 0], [21 * um, 3.7 * um]];
    for (let k = 9; k >= 0; k--) {
      const x0 = (2 * k + 0.2) * um;
      const x1 = (2 * k + 1.2) * um;
      comb.push([x1, 3.7 * um], [x1, 17.3 * um], [x0, 17.3 * um], [x0, 3.7 * um]);
    }
    comb.push([0, 3.7 * um]);
    const sliver: Vertex[] = [[-20 * um, -1.1 * um], [19 * um, 0.7 * um], [18.5 * um, 0.9 * um]];
    const xa = centredAxis(48, 0.93 * um, 2 * um);
    const ya = centredAxis(24, 0.87 * um, 8 * um);
    for (const v of [comb, sliver]) {
      expect(polygonProblem(v)).toBeNull();
      expect(maxAbsDiff(polygonCellFractions(v, xa, ya), referenceFractions(v, xa, ya))).toBeLessThan(1e-12);
    }
  });

  it('a triangle inside one cell, one over a cell corner, one far off the grid', () => {
    const xa: Axis = { n: 6, start: 0, step: 2 * um };
    const ya: Axis = { n: 5, start: 1 * um, step: 3 * um };
    const inCell: Vertex[] = [[3.1 * um, 4.2 * um], [4.6 * um, 4.4 * um], [3.5 * um, 5.3 * um]];
    const onCorner: Vertex[] = [[4.2 * um, 1.7 * um], [5.9 * um, 3.3 * um], [4.4 * um, 3.9 * um]];
    const far: Vertex[] = [[1, 1], [1.1, 1], [1, 1.1]];
    for (const v of [inCell, onCorner]) {
      expect(maxAbsDiff(polygonCellFractions(v, xa, ya), referenceFractions(v, xa, ya))).toBeLessThan(1e-13);
    }
    // Cells the triangle does not reach hold 0 to rounding (a few 1e-17 at most: nothing is snapped).
    expect(polygonCellFractions(inCell, xa, ya).filter((f) => f > 1e-15).length).toBe(1);
    expect(polygonCellFractions(onCorner, xa, ya).filter((f) => f > 1e-15).length).toBe(4);
    expect(polygonCellFractions(far, xa, ya).every((f) => f === 0)).toBe(true);
  });

  it('reuses an output array (cells the polygon left are zeroed) and refuses one of the wrong size', () => {
    const xa = centredAxis(20, 1 * um);
    const ya = centredAxis(16, 1 * um);
    const out = polygonCellFractions([[-8 * um, -6 * um], [8 * um, -6 * um], [0, 7 * um]], xa, ya);
    const small: Vertex[] = [[0, 0], [3 * um, 0], [0, 3 * um]];
    const again = polygonCellFractions(small, xa, ya, out);
    expect(again).toBe(out);
    expect(maxAbsDiff(again, referenceFractions(small, xa, ya))).toBeLessThan(1e-13);
    expect(() => polygonCellFractions(small, xa, ya, new Float64Array(5))).toThrow(/5 values/);
  });
});

describe('polygonCellFractions: areas', () => {
  it('Σ fraction × cell area = shoelace area to 1e-12 (shoelace formula: common practice), convex or not, either orientation', () => {
    const rand = mulberry32(7);
    const shapes: Vertex[][] = [L, [...L].reverse()];
    for (let t = 0; t < 6; t++) shapes.push(starPolygon(rand, 5 + Math.floor(rand() * 200), 40 * um, rand() * um, -rand() * um));
    for (const v of shapes) {
      // The grid holds the whole polygon (±50 µm about (0, 1 µm)).
      const xa = centredAxis(131, 0.77 * um);
      const ya = centredAxis(125, 0.81 * um, 1 * um);
      const area = sum(polygonCellFractions(v, xa, ya)) * xa.step * ya.step;
      expect(Math.abs(area - Math.abs(shoelace(v))) / Math.abs(shoelace(v))).toBeLessThan(1e-12);
    }
  });

  it('an axis-aligned rectangle equals the product of mask.ts sampleProfile intervals to 1e-14', () => {
    const w = 13.7 * um;
    const h = 6.1 * um;
    const rect: Vertex[] = [[-w / 2, -h / 2], [w / 2, -h / 2], [w / 2, h / 2], [-w / 2, h / 2]];
    for (const [xa, ya] of [
      [centredAxis(32, 0.9 * um), centredAxis(17, 0.7 * um)],
      [{ n: 40, start: -11.3 * um, step: 0.61 * um }, { n: 12, start: -3.95 * um, step: 0.73 * um }],
    ] as [Axis, Axis][]) {
      const px = sampleProfile({ kind: 'interval', width: w }, xa);
      const py = sampleProfile({ kind: 'interval', width: h }, ya);
      const want = new Float64Array(xa.n * ya.n);
      for (let r = 0; r < ya.n; r++) for (let c = 0; c < xa.n; c++) want[r * xa.n + c] = py[r]! * px[c]!;
      expect(maxAbsDiff(polygonCellFractions(rect, xa, ya), want)).toBeLessThan(1e-14);
      expect(maxAbsDiff(polygonCellFractions([...rect].reverse(), xa, ya), want)).toBeLessThan(1e-14);
    }
  });

  it('a regular N-gon: mask area and polygonFacts.area = ½ N R² sin(2π/N) (elementary geometry)', () => {
    const R = 25 * um;
    for (const N of [3, 5, 8, 64, 1000]) {
      const v: Vertex[] = Array.from({ length: N }, (_, k) => [R * Math.cos((2 * Math.PI * k) / N + 0.3), R * Math.sin((2 * Math.PI * k) / N + 0.3)]);
      const want = 0.5 * N * R * R * Math.sin((2 * Math.PI) / N);
      const xa = centredAxis(64, 0.83 * um);
      const ya = centredAxis(64, 0.83 * um, 0.2 * um);
      const area = sum(polygonCellFractions(v, xa, ya)) * xa.step * ya.step;
      expect(Math.abs(area - want) / want).toBeLessThan(1e-12);
      expect(Math.abs(polygonFacts(v).area - want) / want).toBeLessThan(1e-13);
    }
  });
});

describe('polygonProblem (a simple polygon: common practice)', () => {
  it('accepts a concave L-shape, in either orientation, and a triangle', () => {
    expect(polygonProblem(L)).toBeNull();
    expect(polygonProblem([...L].reverse())).toBeNull();
    expect(polygonProblem([[0, 0], [1, 0], [0, 1]])).toBeNull();
  });

  it('refuses a bow-tie, naming the crossing edges', () => {
    expect(polygonProblem([[0, 0], [3, 2], [3, 0], [0, 1]])).toMatch(/edges 1–2 and 3–4 cross/);
    // A symmetric bow-tie's two lobes cancel: refused for its zero (signed) area.
    expect(polygonProblem([[0, 0], [1, 1], [1, 0], [0, 1]])).toMatch(/zero area/);
  });

  it('refuses 2 vertices, NaN, infinite coordinates, repeated vertices, zero area, a fold-back, a touching vertex, too many vertices', () => {
    expect(polygonProblem([[0, 0], [1, 0]])).toMatch(/at least 3 vertices; this one has 2/);
    expect(polygonProblem([[0, 0], [1, NaN], [0, 1]])).toMatch(/vertex 2 .*not a finite number/);
    expect(polygonProblem([[0, 0], [1, 0], [Infinity, 1]])).toMatch(/vertex 3 /);
    expect(polygonProblem([[0, 0], [1, 0], [1, 0], [0, 1]])).toMatch(/vertices 2 and 3 are the same point/);
    expect(polygonProblem([[0, 0], [1, 0], [0, 1], [0, 0]])).toMatch(/vertices 4 and 1 .*first vertex is not repeated/);
    expect(polygonProblem([[0, 0], [1, 1], [2, 2]])).toMatch(/zero area/);
    expect(polygonProblem([[0, 0], [2, 0], [1, 0], [1, 1]])).toMatch(/edges 1–2 and 2–3 fold back .* at vertex 2/);
    // Vertex 4 lies on edge 1–2: the outline touches itself.
    expect(polygonProblem([[0, 0], [4, 0], [4, 2], [2, 0], [0, 2]])).toMatch(/edges 1–2 and (3–4|4–5) cross or touch/);
    const many: Vertex[] = Array.from({ length: MAX_POLYGON_VERTICES + 1 }, (_, k) => [Math.cos(k), Math.sin(k)]);
    expect(polygonProblem(many)).toMatch(/at most 10000 vertices/);
  });

  it('a burst of 300 thin spikes is simple; moving one tip across its neighbour is found', () => {
    const v = burst(300, 1, 0.01);
    expect(polygonProblem(v)).toBeNull();
    const w = v.slice();
    // Vertex 2k+2 is spike k's inner tip: move tip 101 (vertex 202) to halfway out along spike 105,
    // so that its two edges cut through spikes 101–105.
    const th = (2 * Math.PI * 105) / 300;
    w[201] = [0.5 * Math.cos(th), 0.5 * Math.sin(th)];
    expect(polygonProblem(w)).toMatch(/cross or touch/);
  });

  it('finds a crossing between far-apart edges of a long outline (the pair search does not skip it)', () => {
    const rand = mulberry32(99);
    const v = starPolygon(rand, 500, 1, 0, 0);
    expect(polygonProblem(v)).toBeNull();
    // Swap two vertices far apart in the list: edges next to them now cross the outline.
    const w = v.slice();
    [w[10], w[260]] = [w[260]!, w[10]!];
    expect(polygonProblem(w)).toMatch(/cross or touch/);
  });
});

describe('polygonFacts', () => {
  it('an L-shape: area, perimeter, box, half extent, centroid (by hand: two rectangles), minFeature = the narrower arm', () => {
    const f = polygonFacts(L);
    const close = (a: number, b: number) => expect(Math.abs(a - b)).toBeLessThan(1e-18);
    close(f.area, 30 * 10 * um * um + 10 * 30 * um * um);
    close(f.perimeter, 140 * um);
    expect(f.box).toEqual({ x0: 0, x1: 30 * um, y0: 0, y1: 40 * um });
    expect(f.halfExtent).toEqual([30 * um, 40 * um]);
    // Rectangles [0,30]×[0,10] (area 300, centre (15, 5)) and [0,10]×[10,40] (area 300, centre (5, 25)).
    close(f.centroid[0], 10 * um);
    close(f.centroid[1], 15 * um);
    close(f.minFeature, 10 * um);
    const r = polygonFacts([...L].reverse());
    close(r.area, f.area);
    close(r.centroid[0], f.centroid[0]);
    close(r.centroid[1], f.centroid[1]);
  });

  it('a notch narrower than every edge sets minFeature; a random outline\'s minFeature equals the brute-force least distance', () => {
    // A U-shape whose slot is 0.4 µm wide between arms 3 µm wide.
    const U: Vertex[] = [[0, 0], [6.4 * um, 0], [6.4 * um, 8 * um], [3.4 * um, 8 * um], [3.4 * um, 2 * um], [3 * um, 2 * um], [3 * um, 8 * um], [0, 8 * um]];
    expect(polygonProblem(U)).toBeNull();
    const f = polygonFacts(U);
    expect(Math.abs(f.minFeature - 0.4 * um)).toBeLessThan(1e-18);
    const rand = mulberry32(3);
    const v = starPolygon(rand, 30, 20 * um, 2 * um, -1 * um);
    const g = polygonFacts(v);
    const brute = bruteMinFeature(v);
    expect(Math.abs(g.minFeature - brute) / brute).toBeLessThan(1e-14);
    // Crowded edges (a burst of spikes), a comb and a smooth many-sided polygon.
    const comb: Vertex[] = [];
    for (let k = 0; k < 40; k++) comb.push([0, 2 * k], [1, 2 * k], [1, 2 * k + 0.7], [0, 2 * k + 0.7]);
    comb.push([-0.05, 79.7], [-0.05, 0]);
    for (const w of [burst(200, 1, 0.01), burst(37, 3, 0.2), comb, starPolygon(mulberry32(11), 400, 1, 0, 0)]) {
      expect(polygonProblem(w)).toBeNull();
      // The two compute each distance by different rounding: agree to rounding of the coordinates.
      const want = bruteMinFeature(w);
      const size = Math.max(...w.map((p) => Math.hypot(p[0], p[1])));
      expect(Math.abs(polygonFacts(w).minFeature - want) / size).toBeLessThan(1e-14);
    }
  });
});

describe('the mask against the exact transform (test/reference/polygon-transform.ts)', () => {
  // Area sampling is the polygon's indicator χ convolved with the cell, sampled at the cell centres.
  // Its sum over a grid that holds the polygon is F(0) = the area exactly (the cells tile the
  // plane). Its first moment is not the polygon's: Σ_c x_c·(area in column c) = ∫ x_c(x)·h(x) dx,
  // h(x) the polygon's chord, and x_c(x) = x − ρ(x), ρ the sawtooth of period dx (zero mean)
  // whose Fourier series is ρ = dx·Σ_{k≥1} (−1)^{k+1} sin(2πk(x − x₀)/dx)/(πk) (the sawtooth
  // series: any handbook of Fourier series). So
  //   Σ x_c m_c dx dy = A·c_x − dx·Σ_{k≥1} (−1)^{k+1}/(πk) · Im[e^{−i2πk x₀/dx}·F(−k/dx, 0)],
  // the alias terms of the cell's sinc response at the sampling frequencies. F along the axis
  // falls as 1/f² for an outline with no edge parallel to the other axis (h is continuous), so the
  // terms fall as 1/k³ (oscillating). Measured on these outlines, the largest gap between the two
  // sides over A·R after K terms: 4e-11 (K = 500), 3.6e-12 (1000), 8.6e-13 (2000), 1.6e-13 (4000),
  // 1.3e-14 (8000), 1.7e-15 (16 000): it goes to rounding as the series converges. 8000 terms are
  // summed (a test of a second) and the sides held to 5e-14.
  function aliasTerm(v: Vertex[], axis: Axis, along: 'x' | 'y', K: number): number {
    let s = 0;
    for (let k = 1; k <= K; k++) {
      const f = -k / axis.step;
      const F = along === 'x' ? polygonTransform(v, f, 0) : polygonTransform(v, 0, f);
      const phi = (-2 * Math.PI * k * axis.start) / axis.step;
      const im = F.re * Math.sin(phi) + F.im * Math.cos(phi);
      s += ((k % 2 === 1 ? 1 : -1) / (Math.PI * k)) * im;
    }
    return axis.step * s;
  }

  it('sum = area to 1e-12; first moments = A·centroid less the alias terms, to 5e-14 of A·R (random outlines, fixed seed)', () => {
    const rand = mulberry32(424242);
    for (let t = 0; t < 4; t++) {
      const step = 1 * um;
      const R = (3 + 10 * rand()) * step;
      const v = starPolygon(rand, 3 + Math.floor(rand() * 25), R, (rand() - 0.5) * 4 * step, (rand() - 0.5) * 4 * step);
      const xa: Axis = { n: 40, start: -19.6 * step + rand() * step, step };
      const ya: Axis = { n: 44, start: -21.3 * step + rand() * step, step: 0.9 * step };
      const m = polygonCellFractions(v, xa, ya);
      const facts = polygonFacts(v);
      const A = facts.area;
      let S = 0, Sx = 0, Sy = 0;
      for (let r = 0; r < ya.n; r++) {
        for (let c = 0; c < xa.n; c++) {
          const a = m[r * xa.n + c]! * xa.step * ya.step;
          S += a;
          Sx += a * (xa.start + c * xa.step);
          Sy += a * (ya.start + r * ya.step);
        }
      }
      const F0 = polygonTransform(v, 0, 0);
      expect(Math.abs(S - F0.re) / A).toBeLessThan(1e-12);
      const Cx = aliasTerm(v, xa, 'x', 8000);
      const Cy = aliasTerm(v, ya, 'y', 8000);
      // The alias terms are not negligible: the naive "mask centroid = polygon centroid" is wrong.
      expect(Math.abs(Cx) + Math.abs(Cy)).toBeGreaterThan(1e-6 * A * step);
      expect(Math.abs(Sx - (A * facts.centroid[0] - Cx)) / (A * R)).toBeLessThan(5e-14);
      expect(Math.abs(Sy - (A * facts.centroid[1] - Cy)) / (A * R)).toBeLessThan(5e-14);
    }
  });

  it('polygonFacts centroid = the first moment of the exact transform, ∫x dA = (i/2π)∂F/∂fx at 0 (Fourier moment theorem: Goodman)', () => {
    const rand = mulberry32(77);
    for (let t = 0; t < 5; t++) {
      const R = 20 * um;
      let v = starPolygon(rand, 3 + Math.floor(rand() * 40), R, (rand() - 0.5) * 30 * um, (rand() - 0.5) * 30 * um);
      if (t % 2) v = v.reverse();
      const f = polygonFacts(v);
      // Im F(h, 0) = −2πh·A·c_x + O(h³): with 2πhR = 1e-6 the cubic term is 1e-13 of A·R.
      const h = 1e-6 / (2 * Math.PI * R);
      const cx = -polygonTransform(v, h, 0).im / (2 * Math.PI * h * f.area);
      const cy = -polygonTransform(v, 0, h).im / (2 * Math.PI * h * f.area);
      expect(Math.abs(cx - f.centroid[0]) / R).toBeLessThan(1e-11);
      expect(Math.abs(cy - f.centroid[1]) / R).toBeLessThan(1e-11);
    }
  });
});
