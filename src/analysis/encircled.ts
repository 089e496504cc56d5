// Encircled energy (2-D, about a centre) and its 1-D counterpart, the power within ±x of a centre
// line, as fractions of a reference power (normally the power through the aperture). Each sample
// stands for its cell, its power spread evenly over it: the curve at radius R is the sum over cells
// of power × the fraction of the cell inside the disc of radius R (2-D), or inside the strip (1-D,
// sub-cells, four per sample: cheap there).
import { isOneD } from '../model/grid.js';
import type { IntensityMap } from '../model/intensity-map.js';

export interface EnergyCurve {
  /** Radii (2-D) or half-widths (1-D), m, increasing. */
  radius: Float64Array;
  /** Fraction of the reference power inside each radius. */
  fraction: Float64Array;
}

/** Sub-cells per sample of a 1-D curve: four, fewer on the longest lines. */
function lineSubdivision(n: number): number {
  return n <= 1 << 20 ? 4 : n <= 1 << 22 ? 2 : 1;
}

/**
 * The curve about `centre`, as fractions of `reference`, on `points` bins out to the farthest corner
 * of the window. One pass over the samples (about 10 ns a sample): a caller that needs it twice (a
 * case's metrics and its verdicts) still computes it once and passes it on (see analysis/verdict.ts
 * spotSize).
 */
export function energyCurve(map: IntensityMap, centre: [number, number], reference: number, points = 400): EnergyCurve {
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
  const radius = new Float64Array(bins + 1);
  const fraction = new Float64Array(bins + 1);
  for (let k = 1; k <= bins; k++) radius[k] = k * binWidth;
  if (oneD) {
    const s = lineSubdivision(map.nx);
    const hist = lineHistogram(map, centre[0], bins, binWidth, dx / s, s);
    let acc = 0;
    for (let k = 0; k < bins; k++) fraction[k + 1] = (acc += hist[k]!) / reference;
  } else {
    const inside = discPowers(map, centre, bins, binWidth);
    for (let k = 1; k <= bins; k++) fraction[k] = inside[k]! / reference;
  }
  return { radius, fraction };
}

/** Cells whose centre is within this many pitches of the curve's centre are cut by the circles exactly. */
const NEAR_PITCHES = 6;

/**
 * The power inside each circle of radius k·binWidth about the centre (k = 0..bins), each cell's
 * power spread evenly over the cell. A cell is wholly inside the circles beyond its farthest point
 * and partly inside a few (the ones that cross it); the whole cells are summed by circle, the
 * partial ones added per circle.
 *
 * A cell's part inside a circle: near the centre (within NEAR_PITCHES pitches) the exact area of
 * the cell within the disc (discRectangleArea). Farther out, a circle crosses the cell nearly
 * straight: with u the distance along the radius from the cell's centre and s across it, a point is
 * inside the circle of radius R = ρ + t where u + s²/(2ρ) ≤ t (to second order in the cell's size
 * over ρ). The share of the cell with u ≤ t is the distribution of a rectangle's projection on a
 * line, a trapezoid, exactly; the s²/(2ρ) term takes off, to first order, the chord at u = t times
 * its mean s²/(2ρ): ∫ s² ds/(2ρ) over the chord = (s₂³ − s₁³)/(6ρ), over the cell's area. Against
 * the exact areas on smooth spots and random maps this is within 1e-4 of the total power (mostly
 * 1e-5), where the 4 × 4 sub-cells a sample it replaced were off by up to 5e-3 (test/physics/energy-curve.test.ts).
 */
function discPowers(map: IntensityMap, centre: [number, number], bins: number, binWidth: number): Float64Array {
  const { nx, ny, dx, dy, intensity } = map;
  const area = dx * dy;
  // whole[k]: power of the cells first wholly inside circle k; part[k]: the parts inside circle k of
  // the cells it crosses.
  const whole = new Float64Array(bins + 1);
  const part = new Float64Array(bins + 1);
  const inv = 1 / binWidth;
  const near = NEAR_PITCHES * Math.max(dx, dy);
  const near2 = near * near;
  const sixthArea = 1 / (6 * area);
  const idx = 1 / dx;
  const idy = 1 / dy;
  for (let r = 0; r < ny; r++) {
    const y = map.y0 + r * dy - centre[1];
    const y2 = y * y;
    const ay = Math.abs(y);
    const row = r * nx;
    for (let c = 0; c < nx; c++) {
      const v = intensity[row + c]! * area;
      if (v === 0) continue;
      const x = map.x0 + c * dx - centre[0];
      const rho2 = x * x + y2;
      if (!(rho2 >= near2)) {
        // (A NaN centre gives no circle anything.)
        if (rho2 < near2) nearCell(x, y, dx, dy, v, bins, binWidth, whole, part);
        continue;
      }
      const rho = Math.sqrt(rho2);
      // The side more nearly along the radius first: `along` and `across` are the offsets along and
      // across it (along ≥ across), pa and pb the pitches of the two sides.
      const ax = Math.abs(x);
      const xFirst = ax >= ay;
      const along = xFirst ? ax : ay;
      const across = xFirst ? ay : ax;
      const pa = xFirst ? dx : dy;
      const ipa = xFirst ? idx : idy;
      const pb = xFirst ? dy : dx;
      const ipb = xFirst ? idy : idx;
      // Half-projections of the two sides on the radius (a = pa·cos/2, b = pb·sin/2): the trapezoid
      // spans ρ ± (a + b). Its first and last circles, as integers (ρ − a − b > 0 here).
      // One division for 1/ρ, 1/cos = ρ/along and 1/sin = ρ/across (across > 0; on an axis, 1/ρ alone).
      const d = across > 0 ? 1 / (rho * along * across) : 1 / (rho * along);
      const ir = across > 0 ? along * across * d : along * d;
      const cs = along * ir;
      const sn = across * ir;
      const a = 0.5 * cs * pa;
      const b = 0.5 * sn * pb;
      const reach = a + b;
      const lo = (rho - reach) * inv;
      let kLo = lo | 0;
      if (kLo < lo) kLo++;
      if (kLo < 1) kLo = 1;
      const hiK = (rho + reach) * inv;
      const kHi = hiK < bins ? hiK | 0 : bins;
      const last = kHi < bins - 1 ? kHi : bins - 1;
      const curve = sixthArea * ir;
      if (b < 1e-6 * a) {
        // On an axis through the centre (or a hair from it): the side along the radius projects
        // evenly, and every chord spans the other side, so the s² term is the same for every circle.
        const bend = 0.25 * pb * pb * pb * curve;
        const inv2a = 0.5 / a;
        for (let k = kLo; k <= last; k++) part[k]! += v * ((k * binWidth - rho + a) * inv2a - bend);
      } else {
        const ics = rho2 * across * d;
        const isn = rho2 * along * d;
        // The trapezoid's scale 1/(8ab).
        const inv8 = 0.5 * ics * isn * ipa * ipb;
        const step = a > b ? a - b : b - a;
        const halfSide = 0.5 * pb;
        for (let k = kLo; k <= last; k++) {
          const t = k * binWidth - rho;
          // The trapezoid's distribution: (P(t + a + b) − P(t + |a − b|) − P(t − |a − b|))/(8ab),
          // P(z) = max(z, 0)², the three pieces of it at once.
          const m1 = t + reach;
          const m2 = t + step > 0 ? t + step : 0;
          const m3 = t - step > 0 ? t - step : 0;
          let f = (m1 * m1 - m2 * m2 - m3 * m3) * inv8;
          // The chord at u = t: q along the side of pitch pb, s = (q − t·sin)/cos across the radius.
          const qLo = (t - a) * isn;
          const qHi = (t + a) * isn;
          const q1 = qLo > -halfSide ? qLo : -halfSide;
          const q2 = qHi < halfSide ? qHi : halfSide;
          const s1 = (q1 - t * sn) * ics;
          const s2 = (q2 - t * sn) * ics;
          f -= (s2 * s2 * s2 - s1 * s1 * s1) * curve;
          part[k]! += v * f;
        }
      }
      whole[kHi < bins ? kHi + 1 : bins]! += v;
    }
  }
  const inside = new Float64Array(bins + 1);
  let acc = 0;
  for (let k = 1; k <= bins; k++) {
    acc += whole[k]!;
    inside[k] = acc + part[k]!;
  }
  return inside;
}

/** A cell near the centre (offset x, y from it, power v): its exact area inside each circle that crosses it. */
function nearCell(x: number, y: number, dx: number, dy: number, v: number, bins: number, binWidth: number, whole: Float64Array, part: Float64Array): void {
  const x0 = x - dx / 2;
  const x1 = x + dx / 2;
  const y0 = y - dy / 2;
  const y1 = y + dy / 2;
  // Nearest and farthest points of the cell from the centre.
  const rMin = Math.hypot(Math.max(0, x0, -x1), Math.max(0, y0, -y1));
  const rMax = Math.hypot(Math.max(-x0, x1), Math.max(-y0, y1));
  const kLo = Math.max(1, Math.ceil(rMin / binWidth));
  const kHi = Math.floor(rMax / binWidth);
  const share = v / (dx * dy);
  for (let k = kLo; k <= Math.min(kHi, bins - 1); k++) part[k]! += share * discRectangleArea(k * binWidth, x0, x1, y0, y1);
  whole[Math.min(bins, kHi + 1)]! += v;
}

/**
 * The area of the disc of radius R about the origin inside the rectangle [x0, x1] × [y0, y1]: the
 * signed areas of the disc within [0, x] × [0, y] at the four corners, each from
 * ∫₀ˣ √(R² − t²) dt = (x√(R² − x²) + R² asin(x/R))/2 (common practice: the area under a circle's arc).
 */
export function discRectangleArea(R: number, x0: number, x1: number, y0: number, y1: number): number {
  const R2 = R * R;
  const under = (x: number) => (x >= R ? (Math.PI * R2) / 4 : 0.5 * (x * Math.sqrt(R2 - x * x) + R2 * Math.asin(x / R)));
  // The disc within [0, x] × [0, y], x, y ≥ 0.
  const corner = (x: number, y: number): number => {
    if (x * x + y * y <= R2) return x * y;
    const xs = Math.min(x, R);
    if (y >= R) return under(xs);
    // Where the arc comes down to height y.
    const t = Math.sqrt(R2 - y * y);
    return t >= xs ? y * xs : y * t + under(xs) - under(t);
  };
  const signed = (x: number, y: number) => Math.sign(x) * Math.sign(y) * corner(Math.abs(x), Math.abs(y));
  // (Rounding can leave a hair below 0 for a rectangle outside the disc.)
  return Math.max(0, signed(x1, y1) - signed(x0, y1) - signed(x1, y0) + signed(x0, y0));
}

/** The 1-D counterpart: power by half-width bin about the centre line x = cx, s sub-cells a sample (the last bin holds everything beyond). */
function lineHistogram(map: IntensityMap, cx: number, bins: number, binWidth: number, cell: number, s: number): Float64Array {
  const { nx, dx, intensity } = map;
  const hist = new Float64Array(bins + 1);
  const offX = Float64Array.from({ length: s }, (_, i) => ((i + 0.5) / s - 0.5) * dx);
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
