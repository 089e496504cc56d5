// Numbers read off a computed intensity map: peak, on-axis value, centroid, widths, first minima,
// power in the window. Positions are in metres in the observation plane, relative to the axis.

import { cellMeasure, isOneD, xAt, yAt } from '../model/grid.js';
import { profileCol, profileRow, type IntensityMap } from '../model/intensity-map.js';

export { profileCol, profileRow, type IntensityMap } from '../model/intensity-map.js';

export interface SpotMetrics {
  peakIntensity: number;
  peakPosition: [number, number | null];
  /** Intensity on the optical axis (interpolated), null when the axis is outside the window. */
  onAxisIntensity: number | null;
  centroid: [number, number | null];
  /**
   * Full width at half maximum of the profile through the peak, per axis: the distance between the
   * outermost half-maximum crossings (the spot's envelope, not one fringe of a near-field pattern);
   * null when the profile does not fall to half within the window.
   */
  fwhm: [number | null, number | null];
  /** Full width where the profile through the peak falls to peak/e², between the outermost crossings likewise. */
  e2Width: [number | null, number | null];
  /** Second-moment (D4σ) widths about the centroid over the window (ISO 11146 definition). */
  d4sigma: [number, number | null];
  /**
   * How much D4σ falls when the window is cut to its central 80 % per axis: 1 − D4σ(80 %)/D4σ.
   * Near 0 for light held well inside the window (a Gaussian beam); hard-edged apertures send
   * wings (sinc², Airy: intensity ∝ 1/x², 1/r³) whose second moment grows with the window, and
   * then it is a few to tens of per cent: their D4σ is a property of the window, not the spot.
   */
  d4sigmaWindowChange: [number | null, number | null];
  /** Distance from the peak to the first minimum of the profile through it (mean of both sides). */
  firstMinimum: [number | null, number | null];
  powerInWindow: number;
}

/** Vertex offset of the parabola through three equally spaced samples, in samples (−0.5..0.5). */
export function parabolicOffset(a: number, b: number, c: number): number {
  const den = a - 2 * b + c;
  if (den === 0) return 0;
  return Math.max(-0.5, Math.min(0.5, (0.5 * (a - c)) / den));
}

/** Linear interpolation of a profile at a fractional index. */
function sampleAt(p: Float64Array, t: number): number {
  const i = Math.floor(t);
  if (i < 0 || i >= p.length - 1) return i === p.length - 1 && t === i ? p[i]! : NaN;
  return p[i]! + (t - i) * (p[i + 1]! - p[i]!);
}

/**
 * Full width at half maximum of the profile through the peak at i0 (in samples): the distance
 * between the outermost half-maximum crossings (see widthAtSamples).
 */
export function fwhmSamples(p: Float64Array, i0: number): number | null {
  return widthAtSamples(p, i0, 0.5);
}

/**
 * Full width (in samples) of the profile where it falls to level × its value at i0, measured
 * between the outermost crossings of that level: the width of the spot's envelope. At Fresnel
 * numbers of a few the profile through the peak has fringes above half the peak, and the crossings
 * next to the peak would give the width of one fringe; in the far field (Airy side lobes 1.75 %,
 * sinc² 4.72 % of the peak) the outermost crossings are the ones next to the peak, so nothing
 * changes there. Null when the profile is still above the level at an end of the window.
 */
export function widthAtSamples(p: Float64Array, i0: number, level: number): number | null {
  const half = p[i0]! * level;
  if (!(half > 0)) return null;
  let l = 0;
  while (l < i0 && !(p[l]! > half)) l++;
  let r = p.length - 1;
  while (r > i0 && !(p[r]! > half)) r--;
  // The first and last samples above the level; the crossings lie just outside them.
  if (l === 0 || r === p.length - 1) return null;
  const left = l - 1 + (half - p[l - 1]!) / (p[l]! - p[l - 1]!);
  const right = r + (p[r]! - half) / (p[r]! - p[r + 1]!);
  return right - left;
}

/**
 * Position (fractional index) of a minimum at sample i. A dark zero (intensity below 2 % of the
 * peak) is where the amplitude changes sign: |A| rises linearly on both sides, so
 * |x₀ − x_i| = 2h·√I_i/(√I_{i−1} + √I_{i+1}), towards the lower neighbour — exact for a linear
 * crossing, where a parabola through the intensities would be biased by the lobes' asymmetry.
 * Shallow minima get the parabola.
 */
export function refineMinimum(p: Float64Array, i: number, peak: number): number {
  const a = p[i - 1]!;
  const b = p[i]!;
  const c = p[i + 1]!;
  if (b < 0.02 * peak) {
    const sa = Math.sqrt(a);
    const sc = Math.sqrt(c);
    if (sa + sc === 0) return i;
    const d = (2 * Math.sqrt(b)) / (sa + sc);
    return i + (c < a ? d : -d);
  }
  return i + parabolicOffset(a, b, c);
}

/**
 * Distance (samples) from i0 to the first local minimum on each side; the mean of both sides, or
 * the one side found. A minimum must be a real dip (below 1/3 of the peak), not a shoulder.
 */
export function firstMinimumSamples(p: Float64Array, i0: number): number | null {
  const peak = p[i0]!;
  const side = (dir: 1 | -1): number | null => {
    for (let i = i0 + dir; i > 0 && i < p.length - 1; i += dir) {
      if (p[i]! <= p[i - 1]! && p[i]! <= p[i + 1]! && p[i]! < peak / 3) {
        return Math.abs(refineMinimum(p, i, peak) - i0);
      }
    }
    return null;
  };
  const a = side(1);
  const b = side(-1);
  if (a !== null && b !== null) return (a + b) / 2;
  return a ?? b;
}

export function spotMetrics(m: IntensityMap): SpotMetrics {
  const { intensity: I, ny: rows, nx: cols } = m;
  const dx = m.dx;
  // null along y for a 1-D map: no profile, width or centroid there.
  const dy = isOneD(m) ? null : m.dy;
  // Positions per column and row, each the same double xAt/yAt give (the sums below are taken in
  // the order they always were, over these tables: the metrics do not change by a bit).
  const xs = new Float64Array(cols);
  for (let c = 0; c < cols; c++) xs[c] = xAt(m, c);
  const ys = new Float64Array(rows);
  for (let r = 0; r < rows; r++) ys[r] = yAt(m, r);
  // The window's central 80 % per axis, for the second moments' change (d4sigmaWindowChange); its
  // sums are taken in the same pass as the whole window's, in their own order.
  const inner = (n: number): [number, number] => (n < 5 ? [0, n - 1] : [Math.round(0.1 * (n - 1)), Math.round(0.9 * (n - 1))]);
  const [c0, c1] = inner(cols);
  const [r0, r1] = dy === null ? [0, rows - 1] : inner(rows);
  let peak = -Infinity;
  let pi = 0;
  let sum = 0;
  let sx = 0;
  let sy = 0;
  let si = 0;
  let sxi = 0;
  let syi = 0;
  for (let r = 0; r < rows; r++) {
    const y = ys[r]!;
    const row = r * cols;
    const innerRow = r >= r0 && r <= r1;
    for (let c = 0; c < cols; c++) {
      const v = I[row + c]!;
      if (v > peak) {
        peak = v;
        pi = row + c;
      }
      sum += v;
      sx += v * xs[c]!;
      sy += v * y;
    }
    if (innerRow) {
      for (let c = c0; c <= c1; c++) {
        const v = I[row + c]!;
        si += v;
        sxi += v * xs[c]!;
        syi += v * y;
      }
    }
  }
  const pr = Math.floor(pi / cols);
  const pc = pi % cols;
  const rowP = profileRow(m, pr);
  const colP = dy === null ? null : profileCol(m, pc);
  const refine = (p: Float64Array, i: number) => (i > 0 && i < p.length - 1 ? parabolicOffset(p[i - 1]!, p[i]!, p[i + 1]!) : 0);
  const peakX = xAt(m, pc + refine(rowP, pc));
  const peakY = colP ? yAt(m, pr + refine(colP, pr)) : null;

  // On-axis: bilinear interpolation at x = y = 0.
  const tc = -m.x0 / dx;
  const tr = dy === null ? 0 : -m.y0 / dy;
  let onAxis: number | null = null;
  if (tc >= 0 && tc <= cols - 1 && tr >= 0 && tr <= rows - 1) {
    const r0 = Math.min(Math.floor(tr), Math.max(0, rows - 2));
    const fr = rows > 1 ? tr - r0 : 0;
    const a = sampleAt(profileRow(m, r0), tc);
    const b = rows > 1 ? sampleAt(profileRow(m, r0 + 1), tc) : a;
    onAxis = a + fr * (b - a);
  }
  const cell = cellMeasure(m);
  const fw = (p: Float64Array | null, i: number, d: number | null) => {
    if (!p || d === null) return null;
    const s = fwhmSamples(p, i);
    return s === null ? null : s * d;
  };
  const fm = (p: Float64Array | null, i: number, d: number | null) => {
    if (!p || d === null) return null;
    const s = firstMinimumSamples(p, i);
    return s === null ? null : s * d;
  };
  const e2 = (p: Float64Array | null, i: number, d: number | null) => {
    if (!p || d === null) return null;
    const s = widthAtSamples(p, i, Math.exp(-2));
    return s === null ? null : s * d;
  };
  const cx = sum > 0 ? sx / sum : 0;
  const cy = sum > 0 ? sy / sum : 0;
  // Second moments about the centroid, over the whole window and over its central part (about that
  // part's own centroid), in one pass; squared offsets per column and row, as they were computed.
  const cxi = si > 0 ? sxi / si : 0;
  const cyi = si > 0 ? syi / si : 0;
  const qx = new Float64Array(cols);
  const qxi = new Float64Array(cols);
  for (let c = 0; c < cols; c++) {
    qx[c] = (xs[c]! - cx) ** 2;
    qxi[c] = (xs[c]! - cxi) ** 2;
  }
  let vx = 0;
  let vy = 0;
  let vxi = 0;
  let vyi = 0;
  for (let r = 0; r < rows; r++) {
    const q = (ys[r]! - cy) ** 2;
    const row = r * cols;
    for (let c = 0; c < cols; c++) {
      const v = I[row + c]!;
      vx += v * qx[c]!;
      vy += v * q;
    }
    if (si > 0 && r >= r0 && r <= r1) {
      const qi = (ys[r]! - cyi) ** 2;
      for (let c = c0; c <= c1; c++) {
        const v = I[row + c]!;
        vxi += v * qxi[c]!;
        vyi += v * qi;
      }
    }
  }
  const change = (full: number, part: number, partSum: number): number | null => (sum > 0 && full > 0 && partSum > 0 ? 1 - Math.sqrt(part / partSum) / Math.sqrt(full / sum) : null);
  return {
    peakIntensity: peak,
    peakPosition: [peakX, peakY],
    onAxisIntensity: onAxis,
    centroid: [sum > 0 ? sx / sum : 0, dy === null ? null : sum > 0 ? sy / sum : 0],
    fwhm: [fw(rowP, pc, dx), fw(colP, pr, dy)],
    e2Width: [e2(rowP, pc, dx), e2(colP, pr, dy)],
    d4sigma: [sum > 0 ? 4 * Math.sqrt(vx / sum) : 0, dy === null ? null : sum > 0 ? 4 * Math.sqrt(vy / sum) : 0],
    d4sigmaWindowChange: [change(vx, vxi, si), dy === null ? null : change(vy, vyi, si)],
    firstMinimum: [fm(rowP, pc, dx), fm(colP, pr, dy)],
    powerInWindow: sum * cell,
  };
}
