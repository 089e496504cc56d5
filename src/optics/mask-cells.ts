// Area-sampled openings: each sample gets the exact open fraction of its cell, so that a change of
// a fraction of a pixel in size changes the mask (and moves zeros) smoothly. By geometry, not by
// element (src/optics/geometry.ts): elements sample themselves with these.
import { axisAt, type Axis } from './field.js';
import type { ApertureGeometry, Profile } from './geometry.js';

/** Length of [a0, a1] ∩ [b0, b1]. */
function overlap(a0: number, a1: number, b0: number, b1: number): number {
  return Math.max(0, Math.min(a1, b1) - Math.max(a0, b0));
}

/** Open fraction of each cell along one axis for a 1-D profile centred on 0. */
export function sampleProfile(p: Profile, axis: Axis): Float64Array {
  const out = new Float64Array(axis.n);
  const h = axis.step / 2;
  if (p.kind === 'interval') {
    const e = p.width / 2;
    for (let j = 0; j < axis.n; j++) {
      const x = axisAt(axis, j);
      out[j] = overlap(x - h, x + h, -e, e) / axis.step;
    }
    return out;
  }
  if (p.kind === 'periodic') throw new Error('a grating profile is complex: sample it with gratingCellAverages');
  const first = -((p.count - 1) / 2) * p.period;
  const e = p.width / 2;
  for (let j = 0; j < axis.n; j++) {
    const x = axisAt(axis, j);
    // Only the slits whose centres are within a cell and a half-width can overlap this cell.
    const kLo = Math.max(0, Math.ceil((x - h - e - first) / p.period));
    const kHi = Math.min(p.count - 1, Math.floor((x + h + e - first) / p.period));
    let s = 0;
    for (let k = kLo; k <= kHi; k++) {
      const c = first + k * p.period;
      s += overlap(x - h, x + h, c - e, c + e);
    }
    out[j] = s / axis.step;
  }
  return out;
}

/**
 * Area of the disc of radius R (centre 0) inside [0, x]×[0, y], signed so that the area of the disc
 * inside any rectangle is G(x1,y1) − G(x0,y1) − G(x1,y0) + G(x0,y0). Exact (no sub-sampling).
 */
function quadrantArea(x: number, y: number, R: number): number {
  const sx = Math.sign(x);
  const sy = Math.sign(y);
  const ax = Math.min(Math.abs(x), R);
  const ay = Math.min(Math.abs(y), R);
  if (ax === 0 || ay === 0) return 0;
  if (ax * ax + ay * ay <= R * R) return sx * sy * ax * ay;
  // The corner is outside: full height ay up to where the circle crosses y = ay, then the arc.
  const xc = Math.sqrt(R * R - ay * ay);
  const P = (t: number) => 0.5 * (t * Math.sqrt(Math.max(0, R * R - t * t)) + R * R * Math.asin(Math.min(1, t / R)));
  return sx * sy * (ay * xc + P(ax) - P(xc));
}

/** Exact open fraction of the cell centred at (x, y), half-sides hx, hy, inside the disc of radius R. */
export function discCellFraction(x: number, y: number, hx: number, hy: number, R: number): number {
  // Quick exits for cells wholly inside or outside, which are nearly all of them.
  const nx = Math.max(0, Math.abs(x) - hx);
  const ny = Math.max(0, Math.abs(y) - hy);
  if (nx * nx + ny * ny >= R * R) return 0;
  const fx = Math.abs(x) + hx;
  const fy = Math.abs(y) + hy;
  if (fx * fx + fy * fy <= R * R) return 1;
  const a =
    quadrantArea(x + hx, y + hy, R) -
    quadrantArea(x - hx, y + hy, R) -
    quadrantArea(x + hx, y - hy, R) +
    quadrantArea(x - hx, y - hy, R);
  return Math.min(1, Math.max(0, a / (4 * hx * hy)));
}

/** Open fraction of each cell of a 2-D grid (row-major, rows along y) for a geometry. */
export function sampleGeometry(g: ApertureGeometry, xa: Axis, ya: Axis): Float64Array {
  const out = new Float64Array(xa.n * ya.n);
  if (g.kind === 'separable') {
    const px = sampleProfile(g.x, xa);
    const py = g.y ? sampleProfile(g.y, ya) : new Float64Array(ya.n).fill(1);
    for (let r = 0; r < ya.n; r++) for (let c = 0; c < xa.n; c++) out[r * xa.n + c] = py[r]! * px[c]!;
    return out;
  }
  if (g.kind === 'sampled') throw new Error('a sampled element samples itself');
  const hx = xa.step / 2;
  const hy = ya.step / 2;
  const ro = g.outer;
  const ri = g.inner;
  for (let r = 0; r < ya.n; r++) {
    const y = axisAt(ya, r);
    if (Math.abs(y) - hy >= ro) continue;
    for (let c = 0; c < xa.n; c++) {
      const x = axisAt(xa, c);
      let f = discCellFraction(x, y, hx, hy, ro);
      if (ri > 0 && f > 0) f -= discCellFraction(x, y, hx, hy, ri);
      out[r * xa.n + c] = Math.max(0, f);
    }
  }
  return out;
}
