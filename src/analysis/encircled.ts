// Encircled energy (2-D, about a centre) and its 1-D counterpart, the power within ±x of a centre
// line, as fractions of a reference power (normally the power through the aperture). Each sample
// is split into sub-cells so that the curve is smooth at radii of a few samples.
import { isOneD } from '../model/grid.js';
import type { IntensityMap } from '../model/intensity-map.js';

export interface EnergyCurve {
  /** Radii (2-D) or half-widths (1-D), m, increasing. */
  radius: Float64Array;
  /** Fraction of the reference power inside each radius. */
  fraction: Float64Array;
}

/** Sub-cells per sample side: 4×4 keeps binning errors near 1e-4 for spots of tens of samples. */
function subdivision(map: IntensityMap): number {
  const n = map.ny * map.nx;
  return n <= 1 << 20 ? 4 : n <= 1 << 22 ? 2 : 1;
}

/**
 * The curve about `centre`, as fractions of `reference`, on `points` bins out to the farthest corner
 * of the window. It takes 16 square roots a sample: a caller that needs it twice (a case's
 * metrics and its verdicts) computes it once and passes it on (see analysis/verdict.ts spotSize).
 */
export function energyCurve(map: IntensityMap, centre: [number, number], reference: number, points = 400): EnergyCurve {
  const s = subdivision(map);
  const dx = map.dx;
  const oneD = isOneD(map);
  const dy = map.dy;
  // Farthest distance from the centre to the window's corners sets the curve's range.
  const xs = [map.x0 - dx / 2, map.x0 + (map.nx - 0.5) * dx];
  const ys = oneD ? [0] : [map.y0 - dy / 2, map.y0 + (map.ny - 0.5) * dy];
  let rMax = 0;
  for (const x of xs) for (const y of ys) rMax = Math.max(rMax, Math.hypot(x - centre[0], oneD ? 0 : y - centre[1]));
  const bins = Math.max(points, 16);
  const binWidth = rMax / bins;
  const cell = (oneD ? dx : dx * dy) / (oneD ? s : s * s);
  const hist = oneD ? lineHistogram(map, centre[0], bins, binWidth, cell, s) : discHistogram(map, centre, bins, binWidth, cell, s);
  const radius = new Float64Array(bins + 1);
  const fraction = new Float64Array(bins + 1);
  let acc = 0;
  radius[0] = 0;
  fraction[0] = 0;
  for (let k = 0; k < bins; k++) {
    acc += hist[k]!;
    radius[k + 1] = (k + 1) * binWidth;
    fraction[k + 1] = acc / reference;
  }
  return { radius, fraction };
}

/** Sub-cell offsets from a sample's centre, for s sub-cells across a pitch. */
function subOffsets(s: number, pitch: number): Float64Array {
  return Float64Array.from({ length: s }, (_, i) => ((i + 0.5) / s - 0.5) * pitch);
}

/**
 * The power of the sub-cells by radius bin (the last bin holds everything beyond). Hot: the
 * sub-cells are visited sample by sample, x then y, and every sum is taken in that order, so the
 * curve does not depend on how the loop is written; y² is taken once per row, x² once per column.
 * A sub-cell's bin is min(bins, floor(√(x² + y²)/binWidth)), taken as b < bins ? b | 0 : bins for
 * b = √(x² + y²)·(1/binWidth) ≥ 0 (the same bin, without the floor and min calls: half the time),
 * and no bin for a NaN, as before.
 */
function discHistogram(map: IntensityMap, centre: [number, number], bins: number, binWidth: number, cell: number, s: number): Float64Array {
  const { nx, ny, dx, dy, intensity } = map;
  const hist = new Float64Array(bins + 1);
  const offX = subOffsets(s, dx);
  const offY = subOffsets(s, dy);
  const xx = new Float64Array(nx * s);
  for (let c = 0; c < nx; c++) {
    const x0 = map.x0 + c * dx - centre[0];
    for (let i = 0; i < s; i++) {
      const x = x0 + offX[i]!;
      xx[c * s + i] = x * x;
    }
  }
  const yy = new Float64Array(s);
  const inv = 1 / binWidth;
  for (let r = 0; r < ny; r++) {
    const y0 = map.y0 + r * dy - centre[1];
    for (let j = 0; j < s; j++) {
      const y = y0 + offY[j]!;
      yy[j] = y * y;
    }
    const row = r * nx;
    for (let c = 0; c < nx; c++) {
      const v = intensity[row + c]! * cell;
      if (v === 0) continue;
      for (let q = c * s, end = q + s; q < end; q++) {
        const x2 = xx[q]!;
        for (let j = 0; j < s; j++) {
          const b = Math.sqrt(x2 + yy[j]!) * inv;
          if (b < bins) hist[b | 0]! += v;
          else if (b >= bins) hist[bins]! += v;
        }
      }
    }
  }
  return hist;
}

/** The 1-D counterpart of discHistogram: power by half-width bin about the centre line x = cx. */
function lineHistogram(map: IntensityMap, cx: number, bins: number, binWidth: number, cell: number, s: number): Float64Array {
  const { nx, dx, intensity } = map;
  const hist = new Float64Array(bins + 1);
  const offX = subOffsets(s, dx);
  const inv = 1 / binWidth;
  for (let c = 0; c < nx; c++) {
    const v = intensity[c]! * cell;
    if (v === 0) continue;
    const x0 = map.x0 + c * dx - cx;
    for (let i = 0; i < s; i++) hist[Math.min(bins, Math.floor(Math.abs(x0 + offX[i]!) * inv))]! += v;
  }
  return hist;
}

/** Smallest radius holding the given fraction (linear interpolation), null if never reached. */
export function radiusHolding(curve: EnergyCurve, level: number): number | null {
  const { radius, fraction } = curve;
  for (let k = 1; k < fraction.length; k++) {
    if (fraction[k]! >= level) {
      const f0 = fraction[k - 1]!;
      const f1 = fraction[k]!;
      const t = f1 > f0 ? (level - f0) / (f1 - f0) : 0;
      return radius[k - 1]! + t * (radius[k]! - radius[k - 1]!);
    }
  }
  return null;
}

/** Fraction inside a radius (linear interpolation on the curve). */
export function fractionWithin(curve: EnergyCurve, r: number): number {
  const { radius, fraction } = curve;
  if (r <= 0) return 0;
  const last = radius.length - 1;
  if (r >= radius[last]!) return fraction[last]!;
  const step = radius[1]!;
  const k = Math.floor(r / step);
  const t = r / step - k;
  return fraction[k]! + t * (fraction[k + 1]! - fraction[k]!);
}

export interface DetectorSpec {
  kind: 'pinhole' | 'square';
  /** Diameter (pinhole) or side (square), m. */
  size: number;
  /** Centre; null means the spot's centroid. */
  at: [number, number] | null;
}

/** Sub-cells per sample side for detector coverage. */
const DETECTOR_SUBDIVISION = 8;

function insideDetector(d: DetectorSpec, x: number, y: number, oneD: boolean): boolean {
  const half = d.size / 2;
  if (oneD) return Math.abs(x) <= half;
  return d.kind === 'pinhole' ? x * x + y * y <= half * half : Math.abs(x) <= half && Math.abs(y) <= half;
}

/**
 * Power (∫ intensity) falling on a pinhole (disc) or a square pixel, over the part of it inside
 * the map, by sub-cell coverage. In 1-D both are a strip of that width (the pattern is invariant
 * along y), and the power is per unit length along y.
 */
export function detectorPower(map: IntensityMap, d: DetectorSpec, centre: [number, number]): number {
  const dx = map.dx;
  const oneD = isOneD(map);
  const dy = map.dy;
  const half = d.size / 2;
  // Sub-samples: at least DETECTOR_SUBDIVISION per map cell and 64 across the detector, so that its
  // rim is resolved however few map samples it spans; the intensity between samples is bilinear
  // (a detector a few samples wide read cell by cell was off by about 1 % in area and in power).
  const s = Math.max(DETECTOR_SUBDIVISION, Math.ceil((64 * Math.max(dx, dy ?? 0)) / d.size));
  const at = (x: number, y: number): number => {
    const u = (x - map.x0) / dx;
    const c = Math.min(Math.max(0, Math.floor(u)), map.nx - 2);
    const tx = Math.min(1, Math.max(0, u - c));
    if (map.nx < 2) return map.intensity[0]!;
    if (oneD) return map.intensity[c]! * (1 - tx) + map.intensity[c + 1]! * tx;
    const v = (y - map.y0) / dy!;
    const r = Math.min(Math.max(0, Math.floor(v)), map.ny - 2);
    const ty = Math.min(1, Math.max(0, v - r));
    if (map.ny < 2) return map.intensity[c]! * (1 - tx) + map.intensity[c + 1]! * tx;
    const i = r * map.nx + c;
    const a = map.intensity[i]! * (1 - tx) + map.intensity[i + 1]! * tx;
    const b = map.intensity[i + map.nx]! * (1 - tx) + map.intensity[i + map.nx + 1]! * tx;
    return a * (1 - ty) + b * ty;
  };
  const [x0, x1, y0, y1] = mapExtent(map);
  const cell = (oneD ? dx : dx * dy) / (oneD ? s : s * s);
  // Only cells within reach of the detector matter; sub-samples outside the map count nothing.
  const c0 = Math.max(0, Math.floor((centre[0] - half - map.x0) / dx) - 1);
  const c1 = Math.min(map.nx - 1, Math.ceil((centre[0] + half - map.x0) / dx) + 1);
  const r0 = oneD ? 0 : Math.max(0, Math.floor((centre[1] - half - map.y0) / dy) - 1);
  const r1 = oneD ? 0 : Math.min(map.ny - 1, Math.ceil((centre[1] + half - map.y0) / dy) + 1);
  let acc = 0;
  for (let r = r0; r <= r1; r++) {
    for (let c = c0; c <= c1; c++) {
      for (let i = 0; i < s; i++) {
        const xa = map.x0 + (c + (i + 0.5) / s - 0.5) * dx;
        if (xa < x0 || xa > x1) continue;
        if (oneD) {
          if (insideDetector(d, xa - centre[0], 0, true)) acc += at(xa, 0) * cell;
          continue;
        }
        for (let j = 0; j < s; j++) {
          const ya = map.y0 + (r + (j + 0.5) / s - 0.5) * dy;
          if (ya < y0 || ya > y1) continue;
          if (insideDetector(d, xa - centre[0], ya - centre[1], false)) acc += at(xa, ya) * cell;
        }
      }
    }
  }
  return acc;
}

/** Fraction of the reference power falling on the detector (see detectorPower). */
export function detectorFraction(map: IntensityMap, d: DetectorSpec, centre: [number, number], reference: number): number {
  return detectorPower(map, d, centre) / reference;
}

/** The map's extent: its outer samples' cells included. [x0, x1, y0, y1]; y is unbounded in 1-D. */
export function mapExtent(map: IntensityMap): [number, number, number, number] {
  const dx = map.dx;
  const dy = map.dy;
  const x0 = map.x0 - dx / 2;
  const x1 = map.x0 + (map.nx - 0.5) * dx;
  if (isOneD(map)) return [x0, x1, -Infinity, Infinity];
  return [x0, x1, map.y0 - dy / 2, map.y0 + (map.ny - 0.5) * dy];
}

/**
 * Fraction of the detector's area (in 1-D: of its width) that lies inside the map's window:
 * exact for squares and strips (overlap of intervals), by a 200 × 200 point rule over the disc's
 * bounding square for pinholes (error about 1/200 of the area at a partly covered edge).
 */
export function detectorAreaInWindow(map: IntensityMap, d: DetectorSpec, centre: [number, number]): number {
  const [x0, x1, y0, y1] = mapExtent(map);
  const half = d.size / 2;
  const overlap = (a: number, b: number, lo: number, hi: number) => Math.max(0, Math.min(b, hi) - Math.max(a, lo)) / (b - a);
  const fx = overlap(centre[0] - half, centre[0] + half, x0, x1);
  if (isOneD(map)) return fx;
  const fy = overlap(centre[1] - half, centre[1] + half, y0, y1);
  if (d.kind === 'square') return fx * fy;
  if (fx === 0 || fy === 0) return 0;
  if (fx === 1 && fy === 1) return 1;
  const n = 200;
  let inside = 0;
  let total = 0;
  for (let i = 0; i < n; i++) {
    const x = ((i + 0.5) / n - 0.5) * d.size;
    for (let j = 0; j < n; j++) {
      const y = ((j + 0.5) / n - 0.5) * d.size;
      if (x * x + y * y > half * half) continue;
      total++;
      const X = centre[0] + x;
      const Y = centre[1] + y;
      if (X >= x0 && X <= x1 && Y >= y0 && Y <= y1) inside++;
    }
  }
  return total > 0 ? inside / total : 0;
}
