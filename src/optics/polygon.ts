// Polygon apertures: the checks that make a vertex list a usable outline, its facts for the
// planner, and its area-sampled mask (each cell gets the exact open fraction of its area).
//
// The mask, row by row. Inside a row strip [y₀, y₁] the polygon's indicator is, at height y, the
// signed count of edges to the right of x: χ(x, y) = Σ_e s_e·H(x_e(y) − x), s_e = ±1 for an edge
// going up or down (counter-clockwise outline; a clockwise one flips every sign). So the open area
// of cell [a, b] × [y₀, y₁] is Σ_e s_e ∫ clamp(x_e(y) − a, 0, b − a) dy over the part of the edge
// inside the strip. Along that part x_e is linear in y, so the integral is h·(mean over x uniform on
// [x_l, x_r] of clamp(x − a, 0, b − a)), h the part's height: a closed form, exact to rounding
// (cellShare). A cell wholly left of the part gets h·(b − a), wholly right of it nothing; the
// constants are spread by a difference array, so a cell no edge crosses costs O(1) and a row costs
// O(cells + edge parts + cells the edges cross). Edges enter and leave an active list sorted by
// their lowest y, so a row looks only at the edges that reach it.
import type { Axis } from './field.js';

export type Vertex = [number, number];

/**
 * Largest vertex count accepted. The simplicity check and minFeature compare the pairs of edges
 * that are near each other (a quadtree finds them); crowded edges cost more. Measured at 10 000
 * vertices on this project's 2-core machine (one run each, a hand script): a smooth polygon, a
 * comb of long teeth and a jagged random star take 0.1–0.5 s for both; the hardest outline tried,
 * 5000 thin spikes converging on a point, about 1 s for the check and 2 s for the facts. Beyond
 * that a job file's outline could stall a sweep on its checks alone. Outlines drawn by hand or
 * exported from a layout are far smaller; a finer one adds nothing a grid of a few thousand cells
 * across could show.
 */
export const MAX_POLYGON_VERTICES = 10_000;

/** Twice the signed area (positive counter-clockwise), summed about vertex 0 to keep rounding small. */
function twiceSignedArea(v: readonly Vertex[]): number {
  const n = v.length;
  const [ox, oy] = v[0]!;
  let s = 0;
  for (let i = 1; i < n - 1; i++) {
    const ax = v[i]![0] - ox;
    const ay = v[i]![1] - oy;
    const bx = v[i + 1]![0] - ox;
    const by = v[i + 1]![1] - oy;
    s += ax * by - bx * ay;
  }
  return s;
}

function orient(ax: number, ay: number, bx: number, by: number, cx: number, cy: number): number {
  return (bx - ax) * (cy - ay) - (by - ay) * (cx - ax);
}

/** Whether closed segments pq and rs share a point (touching counts). */
function segmentsMeet(
  px: number, py: number, qx: number, qy: number,
  rx: number, ry: number, sx: number, sy: number,
): boolean {
  const o1 = orient(px, py, qx, qy, rx, ry);
  const o2 = orient(px, py, qx, qy, sx, sy);
  const o3 = orient(rx, ry, sx, sy, px, py);
  const o4 = orient(rx, ry, sx, sy, qx, qy);
  if (o1 === 0 && o2 === 0) {
    // Collinear: they meet if their extents overlap on both axes.
    return (
      Math.max(Math.min(px, qx), Math.min(rx, sx)) <= Math.min(Math.max(px, qx), Math.max(rx, sx)) &&
      Math.max(Math.min(py, qy), Math.min(ry, sy)) <= Math.min(Math.max(py, qy), Math.max(ry, sy))
    );
  }
  return ((o1 <= 0 && o2 >= 0) || (o1 >= 0 && o2 <= 0)) && ((o3 <= 0 && o4 >= 0) || (o3 >= 0 && o4 <= 0));
}

function pointSegmentDistance(px: number, py: number, ax: number, ay: number, bx: number, by: number): number {
  const ex = bx - ax;
  const ey = by - ay;
  const L2 = ex * ex + ey * ey;
  let t = L2 > 0 ? ((px - ax) * ex + (py - ay) * ey) / L2 : 0;
  t = Math.min(1, Math.max(0, t));
  return Math.hypot(px - (ax + t * ex), py - (ay + t * ey));
}

function segmentDistance(v: readonly Vertex[], i: number, j: number): number {
  const n = v.length;
  const [ax, ay] = v[i]!;
  const [bx, by] = v[(i + 1) % n]!;
  const [cx, cy] = v[j]!;
  const [dx, dy] = v[(j + 1) % n]!;
  if (segmentsMeet(ax, ay, bx, by, cx, cy, dx, dy)) return 0;
  return Math.min(
    pointSegmentDistance(ax, ay, cx, cy, dx, dy),
    pointSegmentDistance(bx, by, cx, cy, dx, dy),
    pointSegmentDistance(cx, cy, ax, ay, bx, by),
    pointSegmentDistance(dx, dy, ax, ay, bx, by),
  );
}

/**
 * Calls visit(i, j) at least once for each pair of non-adjacent edges (edge i runs from vertex i to
 * i + 1, mod n) that come within pad of each other (and for some pairs a little farther apart);
 * stops when visit returns true. The edges are sorted into a quadtree: a cell that more than 8
 * edges pass near is split in four, so that only edges in the same small cell are paired. An
 * ordinary outline costs about O(n log n); edges crowding together (a burst of spikes) only
 * deepen the tree where they crowd.
 */
function forNearEdgePairs(v: readonly Vertex[], pad: number, visit: (i: number, j: number) => boolean): void {
  const n = v.length;
  const ax = new Float64Array(n), ay = new Float64Array(n), bx = new Float64Array(n), by = new Float64Array(n);
  const x0 = new Float64Array(n), x1 = new Float64Array(n), y0 = new Float64Array(n), y1 = new Float64Array(n);
  let X0 = Infinity, X1 = -Infinity, Y0 = Infinity, Y1 = -Infinity;
  for (let i = 0; i < n; i++) {
    const a = v[i]!;
    const b = v[(i + 1) % n]!;
    ax[i] = a[0]; ay[i] = a[1]; bx[i] = b[0]; by[i] = b[1];
    x0[i] = Math.min(a[0], b[0]) - pad;
    x1[i] = Math.max(a[0], b[0]) + pad;
    y0[i] = Math.min(a[1], b[1]) - pad;
    y1[i] = Math.max(a[1], b[1]) + pad;
    X0 = Math.min(X0, x0[i]!); X1 = Math.max(X1, x1[i]!);
    Y0 = Math.min(Y0, y0[i]!); Y1 = Math.max(Y1, y1[i]!);
  }
  // An edge goes to every cell it passes within pad of; the cell is grown by pad (a superset of that
  // region) and by a little more, so that rounding never drops an edge that touches a cell.
  const grow = pad + 1e-9 * Math.max(X1 - X0, Y1 - Y0);
  const near = (e: number, c0: number, c1: number, d0: number, d1: number): boolean => {
    c0 -= grow; c1 += grow; d0 -= grow; d1 += grow;
    if (Math.max(ax[e]!, bx[e]!) < c0 || Math.min(ax[e]!, bx[e]!) > c1) return false;
    if (Math.max(ay[e]!, by[e]!) < d0 || Math.min(ay[e]!, by[e]!) > d1) return false;
    // The cell's corners all on one side of the edge's line: the edge misses it.
    const ex = bx[e]! - ax[e]!, ey = by[e]! - ay[e]!;
    const o1 = ex * (d0 - ay[e]!) - ey * (c0 - ax[e]!);
    const o2 = ex * (d0 - ay[e]!) - ey * (c1 - ax[e]!);
    const o3 = ex * (d1 - ay[e]!) - ey * (c0 - ax[e]!);
    const o4 = ex * (d1 - ay[e]!) - ey * (c1 - ax[e]!);
    return !((o1 > 0 && o2 > 0 && o3 > 0 && o4 > 0) || (o1 < 0 && o2 < 0 && o3 < 0 && o4 < 0));
  };
  let stopped = false;
  const leaf = (list: Int32Array): void => {
    for (let s = 0; s < list.length && !stopped; s++) {
      const i = list[s]!;
      for (let t = s + 1; t < list.length; t++) {
        const j = list[t]!;
        if (x0[j]! > x1[i]! || x0[i]! > x1[j]! || y0[j]! > y1[i]! || y0[i]! > y1[j]! || adjacent(i, j, n)) continue;
        if (visit(i, j)) {
          stopped = true;
          return;
        }
      }
    }
  };
  // Edges that stay together along their length (closer than the cells can get) would be copied
  // into every cell along them: past a budget of copies, or in cells no wider than the growth
  // (which cannot part edges), a cell's edges are paired as they are.
  let budget = 64 * n + 100_000;
  const cell = (list: Int32Array, c0: number, c1: number, d0: number, d1: number, depth: number): void => {
    if (stopped) return;
    if (list.length <= 8 || depth >= 48 || c1 - c0 <= 4 * grow || budget <= 0) {
      leaf(list);
      return;
    }
    budget -= list.length;
    const cm = (c0 + c1) / 2;
    const dm = (d0 + d1) / 2;
    const quads: [number, number, number, number][] = [[c0, cm, d0, dm], [cm, c1, d0, dm], [c0, cm, dm, d1], [cm, c1, dm, d1]];
    for (const [q0, q1, r0, r1] of quads) {
      const sub = list.filter((e) => near(e, q0, q1, r0, r1));
      if (sub.length > 1) cell(sub, q0, q1, r0, r1, depth + 1);
      if (stopped) return;
    }
  };
  // A square root cell: halving keeps cells square, so a long edge crosses few of each size.
  const side = Math.max(X1 - X0, Y1 - Y0);
  cell(Int32Array.from({ length: n }, (_, i) => i), X0, X0 + side, Y0, Y0 + side, 0);
}

function adjacent(i: number, j: number, n: number): boolean {
  const d = Math.abs(i - j);
  return d === 1 || d === n - 1;
}

/** 1-based vertex numbers of edge i, as a user counts them. */
function edgeName(i: number, n: number): string {
  return `${i + 1}–${((i + 1) % n) + 1}`;
}

function fmt(x: number): string {
  return Number.isFinite(x) ? x.toPrecision(6) : String(x);
}

/**
 * null for a usable simple polygon; else a plain reason naming vertex indices (1-based). Touching
 * counts as crossing (a vertex on another edge makes the outline not simple). The tests use plain
 * floating-point orientation: outlines that touch to within rounding may go either way.
 */
export function polygonProblem(v: readonly Vertex[]): string | null {
  const n = v.length;
  if (n < 3) return `a polygon needs at least 3 vertices; this one has ${n}`;
  if (n > MAX_POLYGON_VERTICES) return `a polygon may have at most ${MAX_POLYGON_VERTICES} vertices; this one has ${n}`;
  for (let i = 0; i < n; i++) {
    const p = v[i]!;
    if (!Number.isFinite(p[0]) || !Number.isFinite(p[1])) {
      return `vertex ${i + 1} has a coordinate that is not a finite number (${fmt(p[0])}, ${fmt(p[1])})`;
    }
  }
  for (let i = 0; i < n; i++) {
    const a = v[i]!;
    const b = v[(i + 1) % n]!;
    if (a[0] === b[0] && a[1] === b[1]) {
      return i === n - 1
        ? `vertices ${n} and 1 are the same point (${fmt(a[0])}, ${fmt(a[1])}): the outline closes by itself, so the first vertex is not repeated at the end`
        : `vertices ${i + 1} and ${i + 2} are the same point (${fmt(a[0])}, ${fmt(a[1])})`;
    }
  }
  let xMin = Infinity, xMax = -Infinity, yMin = Infinity, yMax = -Infinity;
  for (const [x, y] of v) {
    xMin = Math.min(xMin, x); xMax = Math.max(xMax, x);
    yMin = Math.min(yMin, y); yMax = Math.max(yMax, y);
  }
  const scale = Math.max(xMax - xMin, yMax - yMin);
  // Rounding leaves a collinear outline an area of a few ulps of scale²; no real shape is 1e12 times
  // longer than it is wide.
  if (Math.abs(twiceSignedArea(v)) <= 2e-12 * scale * scale) {
    return 'the polygon has zero area (its vertices lie on one line, or parts of it cancel)';
  }
  // An edge that doubles back along the one before it overlaps it: a spike of no width.
  for (let i = 0; i < n; i++) {
    const a = v[(i + n - 1) % n]!;
    const b = v[i]!;
    const c = v[(i + 1) % n]!;
    const ex = b[0] - a[0], ey = b[1] - a[1], fx = c[0] - b[0], fy = c[1] - b[1];
    if (ex * fy - ey * fx === 0 && ex * fx + ey * fy < 0) {
      return `edges ${edgeName((i + n - 1) % n, n)} and ${edgeName(i, n)} fold back on each other at vertex ${i + 1} (the outline overlaps itself)`;
    }
  }
  let crossing: string | null = null;
  forNearEdgePairs(v, 0, (i, j) => {
    const a = v[i]!, b = v[(i + 1) % n]!, c = v[j]!, d = v[(j + 1) % n]!;
    if (!segmentsMeet(a[0], a[1], b[0], b[1], c[0], c[1], d[0], d[1])) return false;
    const [first, second] = i < j ? [i, j] : [j, i];
    crossing = `edges ${edgeName(first, n)} and ${edgeName(second, n)} cross or touch (the outline intersects itself)`;
    return true;
  });
  if (crossing) return crossing;
  return null;
}

export interface PolygonFacts {
  area: number;
  perimeter: number;
  box: { x0: number; x1: number; y0: number; y1: number };
  /** max |x|, max |y| over the vertices: the extent about the optical axis. */
  halfExtent: [number, number];
  /** Smallest width of the shape or of a notch in it: the shortest edge or the least distance between non-adjacent edges. */
  minFeature: number;
  centroid: [number, number];
}

/** Facts of a polygon that polygonProblem accepts (either orientation). */
export function polygonFacts(v: readonly Vertex[]): PolygonFacts {
  const n = v.length;
  let perimeter = 0;
  let shortest = Infinity;
  let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity;
  let hx = 0, hy = 0;
  for (let i = 0; i < n; i++) {
    const [ax, ay] = v[i]!;
    const [bx, by] = v[(i + 1) % n]!;
    const L = Math.hypot(bx - ax, by - ay);
    perimeter += L;
    shortest = Math.min(shortest, L);
    x0 = Math.min(x0, ax); x1 = Math.max(x1, ax);
    y0 = Math.min(y0, ay); y1 = Math.max(y1, ay);
    hx = Math.max(hx, Math.abs(ax)); hy = Math.max(hy, Math.abs(ay));
  }
  // Centroid of the fan of triangles from vertex 0 (coordinates about it keep rounding small).
  const [ox, oy] = v[0]!;
  let a2 = 0, mx = 0, my = 0;
  for (let i = 1; i < n - 1; i++) {
    const ax = v[i]![0] - ox, ay = v[i]![1] - oy;
    const bx = v[i + 1]![0] - ox, by = v[i + 1]![1] - oy;
    const c = ax * by - bx * ay;
    a2 += c;
    mx += c * (ax + bx);
    my += c * (ay + by);
  }
  // Least distance between non-adjacent edges: only pairs whose boxes come within the shortest
  // edge of each other can lower the minimum.
  let minFeature = shortest;
  if (n > 3) {
    // A first bound from each edge and the next but one (non-adjacent for n ≥ 4): only pairs closer
    // than the bound are sought, so the quadtree's cells can part the rest.
    for (let i = 0; i < n; i++) minFeature = Math.min(minFeature, segmentDistance(v, i, (i + 2) % n));
    forNearEdgePairs(v, minFeature / 2, (i, j) => {
      const a = v[i]!, b = v[(i + 1) % n]!, c = v[j]!, d = v[(j + 1) % n]!;
      // Boxes already farther apart than the best so far cannot lower it.
      const gap = Math.max(
        Math.min(c[0], d[0]) - Math.max(a[0], b[0]), Math.min(a[0], b[0]) - Math.max(c[0], d[0]),
        Math.min(c[1], d[1]) - Math.max(a[1], b[1]), Math.min(a[1], b[1]) - Math.max(c[1], d[1]),
      );
      if (gap >= minFeature) return false;
      // Both ends of one edge on the same side of the other's line and at least the best so far
      // from it: the whole edge is that far from the line, so from the other edge.
      const ex = b[0] - a[0], ey = b[1] - a[1];
      const oc = ex * (c[1] - a[1]) - ey * (c[0] - a[0]);
      const od = ex * (d[1] - a[1]) - ey * (d[0] - a[0]);
      const reach = minFeature * Math.hypot(ex, ey);
      if ((oc >= reach && od >= reach) || (oc <= -reach && od <= -reach)) return false;
      minFeature = Math.min(minFeature, segmentDistance(v, i, j));
      return false;
    });
  }
  return {
    area: Math.abs(a2) / 2,
    perimeter,
    box: { x0, x1, y0, y1 },
    halfExtent: [hx, hy],
    minFeature,
    centroid: [ox + mx / (3 * a2), oy + my / (3 * a2)],
  };
}

/**
 * ∫ clamp(x − a, 0, b − a) over x uniform on [xl, xr], times the length of that range when it is
 * not 0: the part of cell [a, b] left of an edge part whose x runs over [xl, xr] (linearly in y),
 * per unit of its height. Every term is bounded by the cell width, so a nearly vertical edge loses
 * nothing to the division by w.
 */
function cellShare(xl: number, xr: number, w: number, a: number, b: number): number {
  if (xl >= b) return b - a;
  if (xr <= a) return 0;
  if (w === 0) return xl - a;
  const right = Math.max(0, xr - Math.max(b, xl));
  const lo = Math.max(a, xl);
  const hi = Math.min(b, xr);
  const inner = hi > lo ? ((hi - lo) * (hi - a + (lo - a))) / 2 : 0;
  return (right * (b - a) + inner) / w;
}

/**
 * Exact open fraction of every cell of the grid xa × ya (row-major, rows along y) for a polygon in
 * either orientation, convex or not. Cell j along an axis is [x_j − step/2, x_j + step/2]. Parts of
 * the polygon outside the grid are cut off. The polygon should pass polygonProblem; a
 * self-intersecting outline gives its winding number clamped to [0, 1], not its union. Values are
 * exact to rounding: a cell beside the outline that it does not reach may hold a few 1e-17 instead
 * of 0 (never less than 0: values are clamped to [0, 1]); nothing is snapped or thresholded.
 */
export function polygonCellFractions(v: readonly Vertex[], xa: Axis, ya: Axis, out?: Float64Array): Float64Array {
  const nx = xa.n;
  const ny = ya.n;
  if (out && out.length !== nx * ny) throw new Error(`output has ${out.length} values, the grid ${nx * ny}`);
  const res = out ?? new Float64Array(nx * ny);
  res.fill(0);
  const n = v.length;
  if (n < 3 || nx === 0 || ny === 0) return res;
  if (!(xa.step > 0) || !(ya.step > 0)) throw new Error('polygon masks need axes with a positive step');
  const a2 = twiceSignedArea(v);
  if (a2 === 0) return res;
  const sense = a2 > 0 ? 1 : -1;

  // Non-horizontal edges (a horizontal one bounds no height), lowest end first.
  const eyLo = new Float64Array(n), eyHi = new Float64Array(n);
  const exLo = new Float64Array(n), exHi = new Float64Array(n);
  const eSlope = new Float64Array(n), eSign = new Float64Array(n);
  let m = 0;
  for (let i = 0; i < n; i++) {
    const [ax, ay] = v[i]!;
    const [bx, by] = v[(i + 1) % n]!;
    if (ay === by) continue;
    const up = by > ay;
    eyLo[m] = up ? ay : by;
    eyHi[m] = up ? by : ay;
    exLo[m] = up ? ax : bx;
    exHi[m] = up ? bx : ax;
    eSlope[m] = (exHi[m]! - exLo[m]!) / (eyHi[m]! - eyLo[m]!);
    eSign[m] = up ? sense : -sense;
    m++;
  }
  const byLowY = Int32Array.from({ length: m }, (_, i) => i).sort((p, q) => eyLo[p]! - eyLo[q]!);

  const active = new Int32Array(m);
  let nActive = 0;
  let next = 0;
  // The current row's edge parts: x range, signed height, first and last column they cross.
  const pXl = new Float64Array(m), pXr = new Float64Array(m), pH = new Float64Array(m);
  const pCl = new Int32Array(m), pCh = new Int32Array(m);
  const diff = new Float64Array(nx + 1);
  const part = new Float64Array(nx);
  const dx = xa.step;
  const xEdge0 = xa.start - dx / 2;

  const xOn = (e: number, y: number): number =>
    y === eyLo[e] ? exLo[e]! : y === eyHi[e] ? exHi[e]! : exLo[e]! + (y - eyLo[e]!) * eSlope[e]!;

  for (let r = 0; r < ny; r++) {
    const ylo = ya.start + (r - 0.5) * ya.step;
    const yhi = ya.start + (r + 0.5) * ya.step;
    while (next < m && eyLo[byLowY[next]!]! < yhi) active[nActive++] = byLowY[next++]!;
    if (nActive === 0) {
      if (next === m) break;
      continue;
    }
    // Pass 1: clip the active edges to the strip; drop those wholly below it (rows only go up).
    let k = 0;
    let parts = 0;
    let cMin = nx;
    let cMax = -1;
    for (let t = 0; t < nActive; t++) {
      const e = active[t]!;
      if (eyHi[e]! <= ylo) continue;
      active[k++] = e;
      const y0 = Math.max(ylo, eyLo[e]!);
      const y1 = Math.min(yhi, eyHi[e]!);
      if (y1 <= y0) continue;
      const xa0 = xOn(e, y0);
      const xa1 = xOn(e, y1);
      const xl = Math.min(xa0, xa1);
      const xr = Math.max(xa0, xa1);
      // One column more on each side than the floors say: a floor that rounds the wrong way then
      // only moves a cell from the constant part to the exact formula, which holds for any cell.
      const cl = Math.max(-1, Math.min(nx, Math.floor((xl - xEdge0) / dx) - 1));
      const ch = Math.max(-1, Math.min(nx, Math.floor((xr - xEdge0) / dx) + 1));
      pXl[parts] = xl;
      pXr[parts] = xr;
      pH[parts] = (y1 - y0) * eSign[e]!;
      pCl[parts] = cl;
      pCh[parts] = ch;
      parts++;
      cMin = Math.min(cMin, Math.max(0, cl));
      cMax = Math.max(cMax, Math.min(nx - 1, ch));
    }
    nActive = k;
    if (parts === 0 || cMin > cMax) continue;
    // Pass 2: cells wholly left of a part get its height times the cell width (from the row's
    // first touched column: left of every part the constants cancel exactly in exact arithmetic);
    // cells it crosses get the exact share.
    for (let p = 0; p < parts; p++) {
      const h = pH[p]!;
      const stop = Math.max(0, pCl[p]!);
      if (stop > cMin) {
        diff[cMin]! += h * dx;
        diff[stop]! -= h * dx;
      }
      const xl = pXl[p]!, xr = pXr[p]!, w = xr - xl;
      const cEnd = Math.min(nx - 1, pCh[p]!);
      for (let c = Math.max(0, pCl[p]!); c <= cEnd; c++) {
        const a = xa.start + (c - 0.5) * dx;
        const b = xa.start + (c + 0.5) * dx;
        part[c]! += h * cellShare(xl, xr, w, a, b);
      }
    }
    const inv = 1 / ((yhi - ylo) * dx);
    const row = r * nx;
    let run = 0;
    for (let c = cMin; c <= cMax; c++) {
      run += diff[c]!;
      const f = (run + part[c]!) * inv;
      res[row + c] = f <= 0 ? 0 : f >= 1 ? 1 : f;
      diff[c] = 0;
      part[c] = 0;
    }
    // A part's constants stop at a column ≤ cMax + 1 (nx when the strip runs past the grid's right side).
    diff[cMax + 1] = 0;
  }
  return res;
}
