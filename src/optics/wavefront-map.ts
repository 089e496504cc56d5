// A wavefront error on a circular pupil given as a map: a square of N × N samples whose side is the
// pupil's diameter, each a level 0…1 (a grey level) that is so many waves (the caller's scale,
// wavesPerLevel). Sample (i, k) sits at the centre of pixel column i, row k:
//   x_i = −R + (i + ½)p,  y_k = −R + (k + ½)p,  p = 2R/N,
// row 0 at the most negative y, as an image mask's row 0 (optics/image-cells.ts).
//
// Between the samples the wavefront is the bilinear interpolant of the four around a point (constant
// beyond the outermost samples, within half a pixel of the square's edge). A map is the sampling of
// a smooth surface, and the bilinear interpolant keeps it continuous: taking each pixel as constant
// instead would put a phase step of slope × pitch at every pixel edge, a grating of the pixel pitch
// that scatters light no surface scatters, and would leave no finite slope for the planner to
// sample. The interpolant's slope is bounded by the largest difference between neighbouring samples
// over the pitch (mapStats), which is what the planner samples.
//
// The map is defined on the pupil only: samples whose centre lies outside the disc are not read
// (a map saved with black, or anything, outside the pupil means the same as one extended smoothly).
// Those the interpolation inside the disc reaches are extrapolated from the samples inside, ring
// after ring: the mean over the directions to the known 8-neighbours of the line through the
// neighbour and the sample beyond it (2v₁ − v₂), so that the last half pixel inside the rim carries
// on the rim's slope (a plain mean of the neighbours would bend the surface there and steepen it
// along the rim, which the slope bound would then report).
//
// W is an optical path error in waves; the pupil multiplies the field by exp(+i2πW), as the Zernike
// terms (optics/zernike.ts), to which a map adds.
import { gaussLegendreRule } from './edge-cells.js';
import { axisAt, type Axis } from './field.js';
import { sampleMask2D } from './mask.js';
import { cellRuleFor, wavefrontSlopeMax, zernikeSum, type ZernikeTerm } from './zernike.js';

/** What a map's levels say, independent of the pupil's size and of the scale in waves. */
export interface WavefrontMapStats {
  /** Samples a side. */
  size: number;
  /** Upper bound of |∇L| of the interpolant over the disc, in levels per pixel. */
  slope: number;
  /**
   * Weighted least-squares fits over the disc (weights: each pixel's open fraction), in levels, in
   * coordinates u = x/R, v = y/R: the piston alone [a], and piston and tilts [a, b, c] (a + bu + cv).
   */
  pistonFit: [number];
  tiltFit: [number, number, number];
  /** RMS over the disc of the levels less each fit. */
  rmsPiston: number;
  rmsTilt: number;
}

export interface PreparedWavefrontMap extends WavefrontMapStats {
  /** The levels, row-major from row 0, with the samples outside the disc that interpolation reaches filled. */
  levels: Float32Array;
}

/** Pixel centre along an axis in units of R (the disc's radius is 1), pixel units N/2 = R. */
function centreU(i: number, n: number): number {
  return (i + 0.5 - n / 2) / (n / 2);
}

/** Open fraction of each pixel within the inscribed disc (exact areas, mask.ts), row-major. */
function pixelOpen(n: number): Float64Array {
  const axis: Axis = { n, start: 0.5 - n / 2, step: 1 };
  return sampleMask2D({ shape: 'circle', diameter: n, opaque: false }, axis, axis);
}

/**
 * The samples outside the disc that bilinear interpolation at points inside it reaches (centres
 * within R + 2 pixels: a point's four samples lie within √2 pixels of it), extrapolated ring by ring
 * from the samples known before the ring (linearly along each direction where two are known, else
 * the neighbour's value). The rest are left as they were (never read).
 */
function fillOutside(levels: Float32Array, n: number): Float32Array {
  const out = Float32Array.from(levels);
  const r = n / 2;
  const known = new Uint8Array(n * n);
  const wanted: number[] = [];
  for (let k = 0; k < n; k++) {
    const y = k + 0.5 - r;
    for (let i = 0; i < n; i++) {
      const x = i + 0.5 - r;
      const d2 = x * x + y * y;
      if (d2 <= r * r) known[k * n + i] = 1;
      else if (d2 <= (r + 2) * (r + 2)) wanted.push(k * n + i);
    }
  }
  const knownAt = (i: number, k: number): number | null => (i < 0 || k < 0 || i >= n || k >= n || !known[k * n + i] ? null : out[k * n + i]!);
  let left = wanted;
  while (left.length > 0) {
    const filled: [number, number][] = [];
    const still: number[] = [];
    for (const at of left) {
      const i = at % n;
      const k = (at - i) / n;
      // From each known neighbour, the line through it and the next known sample beyond it carried
      // one step on (2v₁ − v₂); the neighbour's own value where nothing is known beyond it.
      let s2 = 0;
      let c2 = 0;
      let s1 = 0;
      let c1 = 0;
      for (let dk = -1; dk <= 1; dk++) {
        for (let di = -1; di <= 1; di++) {
          if (di === 0 && dk === 0) continue;
          const v1 = knownAt(i + di, k + dk);
          if (v1 === null) continue;
          const v2 = knownAt(i + 2 * di, k + 2 * dk);
          if (v2 === null) {
            s1 += v1;
            c1++;
          } else {
            s2 += 2 * v1 - v2;
            c2++;
          }
        }
      }
      const c = c2 > 0 ? c2 : c1;
      const s = c2 > 0 ? s2 : s1;
      if (c > 0) filled.push([at, s / c]);
      else still.push(at);
    }
    // A ring is filled from the samples known before it (not from each other in scan order).
    for (const [at, v] of filled) {
      out[at] = v;
      known[at] = 1;
    }
    if (filled.length === 0) break;
    left = still;
  }
  return out;
}

/** Solves the symmetric 3 × 3 system m·x = b (Gaussian elimination with partial pivoting). */
function solve3(m: number[][], b: number[]): [number, number, number] {
  const a = m.map((row, i) => [...row, b[i]!]);
  for (let c = 0; c < 3; c++) {
    let piv = c;
    for (let r = c + 1; r < 3; r++) if (Math.abs(a[r]![c]!) > Math.abs(a[piv]![c]!)) piv = r;
    [a[c], a[piv]] = [a[piv]!, a[c]!];
    for (let r = c + 1; r < 3; r++) {
      const f = a[r]![c]! / a[c]![c]!;
      for (let k = c; k < 4; k++) a[r]![k] = a[r]![k]! - f * a[c]![k]!;
    }
  }
  const x = [0, 0, 0];
  for (let r = 2; r >= 0; r--) {
    let s = a[r]![3]!;
    for (let k = r + 1; k < 3; k++) s -= a[r]![k]! * x[k]!;
    x[r] = s / a[r]![r]!;
  }
  return [x[0]!, x[1]!, x[2]!];
}

/**
 * The map's levels prepared for the pupil: the samples outside the disc filled, the slope bound,
 * and the piston and tilt fits with the RMS left by each. Everything here is in pixel units and
 * levels, so a map is prepared once whatever the stop's size and the wavelength.
 *
 * The fits are least squares over the disc with each pixel weighted by its open fraction (the
 * midpoint rule on the pixels, the rim pixels cut exactly): the continuous fit over the disc to
 * second order in the pitch. Removing a + bu + cv removes exactly what Noll's Z1, Z2, Z3 describe.
 */
export function prepareWavefrontMap(levels: Float32Array, size: number): PreparedWavefrontMap {
  const n = size;
  if (!Number.isInteger(n) || n < 1 || levels.length !== n * n) throw new Error(`prepareWavefrontMap: expected ${n} × ${n} levels (got ${levels.length})`);
  const filled = fillOutside(levels, n);
  const q = pixelOpen(n);
  // Normal equations for (1, u, v).
  let s = 0;
  let su = 0;
  let sv = 0;
  let suu = 0;
  let svv = 0;
  let suv = 0;
  let sl = 0;
  let sul = 0;
  let svl = 0;
  for (let k = 0; k < n; k++) {
    const v = centreU(k, n);
    for (let i = 0; i < n; i++) {
      const w = q[k * n + i]!;
      if (w === 0) continue;
      const u = centreU(i, n);
      const l = filled[k * n + i]!;
      s += w;
      su += w * u;
      sv += w * v;
      suu += w * u * u;
      svv += w * v * v;
      suv += w * u * v;
      sl += w * l;
      sul += w * u * l;
      svl += w * v * l;
    }
  }
  const piston = sl / s;
  // One pixel (N = 1) cannot show a tilt: the fit is the piston.
  const tilt: [number, number, number] =
    n === 1
      ? [piston, 0, 0]
      : solve3(
          [
            [s, su, sv],
            [su, suu, suv],
            [sv, suv, svv],
          ],
          [sl, sul, svl],
        );
  let e1 = 0;
  let e3 = 0;
  for (let k = 0; k < n; k++) {
    const v = centreU(k, n);
    for (let i = 0; i < n; i++) {
      const w = q[k * n + i]!;
      if (w === 0) continue;
      const u = centreU(i, n);
      const l = filled[k * n + i]!;
      e1 += w * (l - piston) ** 2;
      e3 += w * (l - tilt[0] - tilt[1] * u - tilt[2] * v) ** 2;
    }
  }
  return { size: n, levels: filled, slope: slopeBound(filled, n), pistonFit: [piston], tiltFit: tilt, rmsPiston: Math.sqrt(e1 / s), rmsTilt: Math.sqrt(e3 / s) };
}

/**
 * max |∇L| of the interpolant over the disc, in levels per pixel. On the square between samples
 * (i, k) … (i+1, k+1), ∂L/∂x is the blend of the differences along its two x edges, so |∂L/∂x| is
 * at most the larger of them (likewise y), and |∇L| ≤ √(gx² + gy²): exact for a plane, and for any
 * map a bound. Only the squares that meet the disc count; beyond the outermost samples the
 * interpolant is constant across the edge and its slope along it is that of the edge squares.
 */
function slopeBound(levels: Float32Array, n: number): number {
  if (n < 2) return 0;
  const r = n / 2;
  let best = 0;
  for (let k = 0; k + 1 < n; k++) {
    const y0 = k + 0.5 - r;
    const dy = y0 > 0 ? y0 : y0 + 1 < 0 ? -(y0 + 1) : 0;
    for (let i = 0; i + 1 < n; i++) {
      const x0 = i + 0.5 - r;
      const dx = x0 > 0 ? x0 : x0 + 1 < 0 ? -(x0 + 1) : 0;
      if (dx * dx + dy * dy > r * r) continue;
      const a = levels[k * n + i]!;
      const b = levels[k * n + i + 1]!;
      const c = levels[(k + 1) * n + i]!;
      const d = levels[(k + 1) * n + i + 1]!;
      const gx = Math.max(Math.abs(b - a), Math.abs(d - c));
      const gy = Math.max(Math.abs(c - a), Math.abs(d - b));
      best = Math.max(best, Math.hypot(gx, gy));
    }
  }
  return best;
}

/** Largest |∇W| of the map over a pupil of radius R, in waves per metre. */
export function mapSlopeMax(map: WavefrontMapStats, wavesPerLevel: number, radius: number): number {
  if (!(radius > 0) || !Number.isFinite(radius)) throw new Error(`mapSlopeMax: the pupil radius must be a positive length (got ${radius})`);
  return (Math.abs(wavesPerLevel) * map.slope * map.size) / (2 * radius);
}

/**
 * RMS over the pupil in waves of the map (times wavesPerLevel) plus the Zernike terms, piston left
 * out, and the tilts too when asked (a least-squares plane a + bu + cv removed: it moves the focus
 * without lowering its peak). The terms' own part is exact (√Σ rms_j² of the terms left, by Noll's
 * orthonormality, optics/zernike.ts wavefrontRms); the map's and the cross term ⟨Z, map⟩ are the
 * pixel sums of prepareWavefrontMap, so a map that cancels a term leaves nearly nothing.
 */
export function mapWavefrontRms(map: PreparedWavefrontMap, wavesPerLevel: number, terms: readonly ZernikeTerm[], withoutTilt: boolean): number {
  const removed = withoutTilt ? 3 : 1;
  const byJ = new Map<number, number>();
  for (const t of terms) if (t.j > removed && t.rms !== 0) byJ.set(t.j, (byJ.get(t.j) ?? 0) + t.rms);
  let zz = 0;
  for (const c of byJ.values()) zz += c * c;
  const mapRms = wavesPerLevel * (withoutTilt ? map.rmsTilt : map.rmsPiston);
  const kept = [...byJ].map(([j, rms]) => ({ j, rms }));
  const z = zernikeSum(kept, 1);
  let cross = 0;
  if (z && wavesPerLevel !== 0) {
    const n = map.size;
    const q = pixelOpen(n);
    const [a, b, c] = withoutTilt ? map.tiltFit : [map.pistonFit[0], 0, 0];
    let s = 0;
    for (let k = 0; k < n; k++) {
      const v = centreU(k, n);
      for (let i = 0; i < n; i++) {
        const w = q[k * n + i]!;
        if (w === 0) continue;
        const u = centreU(i, n);
        s += w;
        cross += w * z(u, v) * (map.levels[k * n + i]! - a - b * u - c * v);
      }
    }
    cross *= wavesPerLevel / s;
  }
  return Math.sqrt(Math.max(0, zz + mapRms * mapRms + 2 * cross));
}

/** Nodes of the cell rule along one axis: for each cell, positions, interpolation indices and weights. */
interface AxisNodes {
  /** Nodes of cell j: from[j] … from[j + 1] − 1. */
  from: Int32Array;
  pos: Float64Array;
  /** Lower and upper sample index of the interpolation, and the fraction between them. */
  lo: Int32Array;
  hi: Int32Array;
  t: Float64Array;
  /** Weight of the node as a fraction of the cell's length (a cell's weights sum to 1). */
  w: Float64Array;
}

function axisNodes(axis: Axis, radius: number, n: number, panels: number, rule: { x: Float64Array; w: Float64Array }): AxisNodes {
  const p = (2 * radius) / n;
  const step = Math.abs(axis.step);
  const from = new Int32Array(axis.n + 1);
  const pos: number[] = [];
  const lo: number[] = [];
  const hi: number[] = [];
  const t: number[] = [];
  const w: number[] = [];
  for (let j = 0; j < axis.n; j++) {
    from[j] = pos.length;
    const a = axisAt(axis, j) - step / 2;
    const b = a + step;
    // Cut the cell at the samples' positions: between them the interpolant is linear along the axis.
    const cuts = [a];
    const first = Math.max(0, Math.ceil((a + radius) / p - 0.5));
    for (let i = first; i < n; i++) {
      const c = -radius + (i + 0.5) * p;
      if (c >= b) break;
      if (c > a) cuts.push(c);
    }
    cuts.push(b);
    for (let m = 0; m + 1 < cuts.length; m++) {
      const len = (cuts[m + 1]! - cuts[m]!) / panels;
      for (let pn = 0; pn < panels; pn++) {
        const start = cuts[m]! + pn * len;
        // The piece's sample interval from its midpoint (nodes never cross a sample line).
        const sMid = (start + len / 2 + radius) / p - 0.5;
        const i0 = Math.min(Math.max(Math.floor(sMid), 0), Math.max(n - 2, 0));
        for (let g = 0; g < rule.x.length; g++) {
          const x = start + len * 0.5 * (1 + rule.x[g]!);
          pos.push(x);
          lo.push(i0);
          hi.push(Math.min(i0 + 1, n - 1));
          t.push(n === 1 ? 0 : Math.min(Math.max((x + radius) / p - 0.5 - i0, 0), 1));
          w.push((len * 0.5 * rule.w[g]!) / step);
        }
      }
    }
  }
  from[axis.n] = pos.length;
  return { from, pos: Float64Array.from(pos), lo: Int32Array.from(lo), hi: Int32Array.from(hi), t: Float64Array.from(t), w: Float64Array.from(w) };
}

/**
 * The pupil's complex transmittance on a grid as cell averages (interleaved complex, row-major
 * [y][x]): exp(i2πW) inside the disc of radius R, 0 outside, W = wavesPerLevel × the map's
 * interpolant + the Zernike terms.
 *
 * Each cell is cut at the samples' positions, so that on every piece the map is one bilinear patch
 * (linear along each axis); each piece takes a tensor Gauss–Legendre rule sized as the Zernike
 * cells' (zernike.ts cellRuleFor, 1e-13 a cell for a linear phase) from the slope bound of map and
 * terms together and the piece's length (at most the cell, and at most a pixel).
 *
 * Rim cells: the mean of exp(i2πW) over the rule's nodes inside the disc, times the disc's exact
 * open fraction (mask.ts); the map says nothing outside the disc, so nothing there is read. A cell
 * whose nodes all fall outside takes the value at its point nearest the axis.
 */
export function mapPupilCellAverages(map: PreparedWavefrontMap, wavesPerLevel: number, terms: readonly ZernikeTerm[], radius: number, xa: Axis, ya: Axis, out?: Float64Array): Float64Array {
  if (!(radius > 0) || !Number.isFinite(radius)) throw new Error(`mapPupilCellAverages: the pupil radius must be a positive length (got ${radius})`);
  const size = 2 * xa.n * ya.n;
  const res = out ?? new Float64Array(size);
  if (res.length !== size) throw new Error(`mapPupilCellAverages: out holds ${res.length} numbers, the grid ${size}`);
  res.fill(0);
  const n = map.size;
  const L = map.levels;
  const open = sampleMask2D({ shape: 'circle', diameter: 2 * radius, opaque: false }, xa, ya);
  const z = zernikeSum(terms, radius);
  const slope = mapSlopeMax(map, wavesPerLevel, radius) + (z ? wavefrontSlopeMax(terms, radius) : 0);
  const p = (2 * radius) / n;
  const piece = Math.max(Math.min(Math.abs(xa.step), p), Math.min(Math.abs(ya.step), p));
  const { panels, nodes } = cellRuleFor(Math.PI * slope * piece);
  const rule = gaussLegendreRule(nodes);
  const nx = axisNodes(xa, radius, n, panels, rule);
  const ny = axisNodes(ya, radius, n, panels, rule);
  const r2 = radius * radius;
  const twoPi = 2 * Math.PI;
  const waveAt = (x: number, y: number, xlo: number, xhi: number, tx: number, ylo: number, yhi: number, ty: number): number => {
    const a = L[ylo * n + xlo]!;
    const b = L[ylo * n + xhi]!;
    const c = L[yhi * n + xlo]!;
    const d = L[yhi * n + xhi]!;
    const m = (a + (b - a) * tx) * (1 - ty) + (c + (d - c) * tx) * ty;
    return wavesPerLevel * m + (z ? z(x, y) : 0);
  };
  for (let r = 0; r < ya.n; r++) {
    for (let c = 0; c < xa.n; c++) {
      const q = open[r * xa.n + c]!;
      if (q === 0) continue;
      let re = 0;
      let im = 0;
      let wsum = 0;
      for (let a = ny.from[r]!; a < ny.from[r + 1]!; a++) {
        const y = ny.pos[a]!;
        const wy = ny.w[a]!;
        for (let b = nx.from[c]!; b < nx.from[c + 1]!; b++) {
          const x = nx.pos[b]!;
          if (q < 1 && x * x + y * y > r2) continue;
          const wt = wy * nx.w[b]!;
          const phi = twoPi * waveAt(x, y, nx.lo[b]!, nx.hi[b]!, nx.t[b]!, ny.lo[a]!, ny.hi[a]!, ny.t[a]!);
          re += wt * Math.cos(phi);
          im += wt * Math.sin(phi);
          wsum += wt;
        }
      }
      if (wsum === 0) {
        // A sliver of the rim between the nodes: the cell's point nearest the axis (inside the disc).
        const xc = axisAt(xa, c);
        const yc = axisAt(ya, r);
        const hx = Math.abs(xa.step) / 2;
        const hy = Math.abs(ya.step) / 2;
        const x = Math.min(Math.max(0, xc - hx), xc + hx);
        const y = Math.min(Math.max(0, yc - hy), yc + hy);
        const sx = Math.min(Math.max((x + radius) / p - 0.5, 0), n - 1);
        const sy = Math.min(Math.max((y + radius) / p - 0.5, 0), n - 1);
        const xlo = Math.min(Math.floor(sx), Math.max(n - 2, 0));
        const ylo = Math.min(Math.floor(sy), Math.max(n - 2, 0));
        const phi = twoPi * waveAt(x, y, xlo, Math.min(xlo + 1, n - 1), n === 1 ? 0 : sx - xlo, ylo, Math.min(ylo + 1, n - 1), n === 1 ? 0 : sy - ylo);
        re = Math.cos(phi);
        im = Math.sin(phi);
        wsum = 1;
      }
      const at = 2 * (r * xa.n + c);
      res[at] = (q * re) / wsum;
      res[at + 1] = (q * im) / wsum;
    }
  }
  return res;
}
