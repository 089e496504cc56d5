// Which way the exact 2-D sums go (rs-2d-sum.ts) and what that costs, in one place so that the
// planner and the sums decide alike: every point of the window; half or a quarter of it when the
// cells are even about an axis and the window symmetric about it (the mirror path); or, for a
// round source, the field on radial samples interpolated onto the window (the radial path).
import type { Axis } from './field.js';
import type { RsCells2D } from './rs-2d-cells.js';
import { costRsSum2D, memoryRsSum2D } from './rs-cost.js';

/** Samples at ±x about 0: start = −(n−1)·step/2 to rounding. */
export function isSymmetricAxis(a: Axis): boolean {
  return Math.abs(a.start + ((a.n - 1) / 2) * a.step) <= 1e-9 * Math.abs(a.step);
}

/** The radial samples ρ_j = j·step, j = first … first + n − 1. */
export interface RadialPlan {
  first: number;
  n: number;
  step: number;
}

/** Points of the Lagrange stencil of the radial interpolation. */
export const RADIAL_STENCIL = 12;

/**
 * The radial step is RADIAL_STEP_PHASE / q, q = k·sin θ the largest rate at which the field's
 * phase can change along ρ (sin θ of the steepest ray from the source to the window's farthest
 * point). A 12-point Lagrange stencil then interpolates e^{iqρ} within 5.5e-5·(qΔ)¹² ≈ 1.3e-8 of
 * its amplitude (the remainder Π(θ − j)/12!·(qΔ)¹² at the stencil's centre, Abramowitz & Stegun
 * 25.2.2). Measured against the sums point by point along the sampled direction, where only the
 * interpolation differs: within 1e-8 of the peak (rs-2d-sum tests).
 */
export const RADIAL_STEP_PHASE = 0.5;

/** Smallest and largest distance from the axis of the points outX × outY. */
function radialRange(outX: Axis, outY: Axis): { lo: number; hi: number } {
  const span = (a: Axis): [number, number] => {
    const e0 = a.start;
    const e1 = a.start + (a.n - 1) * a.step;
    const lo = Math.min(e0, e1);
    const hi = Math.max(e0, e1);
    const near = lo <= 0 && hi >= 0 ? 0 : Math.min(Math.abs(lo), Math.abs(hi));
    return [near, Math.max(Math.abs(lo), Math.abs(hi))];
  };
  const [xn, xf] = span(outX);
  const [yn, yf] = span(outY);
  return { lo: Math.hypot(xn, yn), hi: Math.hypot(xf, yf) };
}

/**
 * Radial samples for a round source of radius `radius` covering the window's distances from the
 * axis, with the stencil's reach on both sides (below ρ = 0 the stencil reads U(−ρ) = U(ρ)).
 */
export function radialPlan(wavelength: number, z: number, radius: number, outX: Axis, outY: Axis): RadialPlan {
  const { lo, hi } = radialRange(outX, outY);
  const reach = hi + radius;
  const sinMax = reach / Math.hypot(reach, z);
  const q = ((2 * Math.PI) / wavelength) * Math.max(sinMax, 1e-3);
  let step = RADIAL_STEP_PHASE / q;
  // A window a few steps across still gets six samples over it.
  if (hi > 0) step = Math.min(step, hi / 6);
  const s = RADIAL_STENCIL / 2;
  const first = Math.max(0, Math.floor(lo / step) - s);
  const last = Math.ceil(hi / step) + s;
  return { first, n: last - first + 1, step };
}

/** What the path choice and the costs need to know of a cell set. */
export interface RsCellSummary {
  wavelength: number;
  box: number;
  edge: number;
  edgeNodes: number;
  gaussian: boolean;
  /** The source is round (circle or annulus, untilted): the radial path applies. */
  round: boolean;
  /** Round sources: the largest distance of a lit open point from the axis (m). */
  radius: number;
  evenX: boolean;
  evenY: boolean;
  /** Cells with centre y ≥ 0 (what the radial path sums when evenY), or an estimate. */
  boxUpperHalf: number;
  edgeUpperHalf: number;
}

/** The summary of built cells. */
export function summarizeCells(c: RsCells2D): RsCellSummary {
  const round = c.symmetry.round;
  let bu = 0;
  for (let j = 0; j < c.box.n; j++) if (c.box.cy[j]! >= 0) bu++;
  let eu = 0;
  for (let j = 0; j < c.edge.n; j++) if (c.edge.cy[j]! >= 0) eu++;
  return {
    wavelength: c.wavelength,
    box: c.box.n,
    edge: c.edge.n,
    edgeNodes: c.edge.m,
    gaussian: c.envCurv !== 0,
    round: round !== null,
    radius: round ? Math.min(round.outer, round.waist === null ? Infinity : Math.sqrt(37) * round.waist) : 0,
    evenX: c.symmetry.evenX,
    evenY: c.symmetry.evenY,
    boxUpperHalf: bu,
    edgeUpperHalf: eu,
  };
}

export type RsSum2DPath = 'direct' | 'mirror' | 'radial';

export interface RsSum2DOptions {
  /** 'auto' (default): the cheapest path the cells allow; 'direct' sums every point; 'mirror' never takes the radial path. */
  path?: 'auto' | 'direct' | 'mirror';
}

export interface RsSum2DChoice {
  path: RsSum2DPath;
  mirrored: { x: boolean; y: boolean };
  radial: RadialPlan | null;
  /** Points summed over the cells (the window's, its half or quarter, or the radial samples). */
  points: number;
  /** Cells summed (the radial path folds the cells about y = 0 when they are even in y). */
  cells: { box: number; edge: number };
  /** Work in the planner's units (rs-cost.ts) and memory (bytes). */
  work: number;
  memory: number;
}

/**
 * The path rsSum2D takes: the mirror path wherever the cells and the window allow it, and the
 * radial path for a round source when it costs less than that.
 */
export function rsSum2DChoice(cells: RsCellSummary, z: number, outX: Axis, outY: Axis, opts: RsSum2DOptions = {}): RsSum2DChoice {
  const want = opts.path ?? 'auto';
  const mx = want !== 'direct' && cells.evenX && isSymmetricAxis(outX);
  const my = want !== 'direct' && cells.evenY && isSymmetricAxis(outY);
  const cols = mx ? Math.ceil(outX.n / 2) : outX.n;
  const rows = my ? Math.ceil(outY.n / 2) : outY.n;
  const outputs = outX.n * outY.n;
  const all = { box: cells.box, edge: cells.edge };
  const costOf = (box: number, edge: number, points: number, sumRows: number, interpolated: number) =>
    costRsSum2D({ box, edge, edgeNodes: cells.edgeNodes, gaussian: cells.gaussian, points, rows: sumRows, interpolated, outputs });
  const direct: RsSum2DChoice = {
    path: mx || my ? 'mirror' : 'direct',
    mirrored: { x: mx, y: my },
    radial: null,
    points: cols * rows,
    cells: all,
    work: costOf(all.box, all.edge, cols * rows, rows, 0),
    memory: memoryRsSum2D({ box: all.box, edge: all.edge, edgeNodes: cells.edgeNodes, outputs, radial: 0 }),
  };
  if (want !== 'auto' || !cells.round) return direct;
  const rp = radialPlan(cells.wavelength, z, cells.radius, outX, outY);
  const folded = cells.evenY ? { box: cells.boxUpperHalf, edge: cells.edgeUpperHalf } : all;
  const work = costOf(folded.box, folded.edge, rp.n, 1, outputs);
  if (work >= direct.work) return direct;
  return {
    path: 'radial',
    mirrored: { x: false, y: false },
    radial: rp,
    points: rp.n,
    cells: folded,
    work,
    memory: memoryRsSum2D({ box: all.box + folded.box, edge: all.edge + folded.edge, edgeNodes: cells.edgeNodes, outputs, radial: rp.n }),
  };
}
