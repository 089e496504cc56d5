// A mask given as an image: a W × H grid of square pixels of pitch p, each of constant complex
// transmittance t = a·e^{iφ} (a the amplitude 0…1, φ the phase), opaque outside the image.
// Pixel column i covers x ∈ [X0 + i·p, X0 + (i+1)·p] with X0 = cx − W·p/2, and pixel row k covers
// y ∈ [Y0 + k·p, Y0 + (k+1)·p] with Y0 = cy − H·p/2: row 0 (the image's top row) at the most
// negative y, as row 0 of intensity.npy and of the pictures, so that the geometric shadow on
// the screen looks like the image as it is shown.
//
// Because t is constant over each pixel, the average of t over a grid cell is exactly the sum of
// the overlapping pixels' values weighted by their overlap area; the overlap of two axis-aligned
// rectangles is (overlap in x)·(overlap in y), so the weights are separable and each grid row
// costs one pass over the image rows it overlaps plus one over its cells (no sub-sampling, no
// thresholding). The same holds for |t|² (the power weight).
import type { CellTransmittance } from '../elements/types.js';
import type { Axis } from './field.js';

export interface ImagePlanes {
  width: number;
  height: number;
  /** Amplitude transmission 0…1, row-major, row 0 at the most negative y. */
  amplitude: Float32Array;
  /** Phase in radians, same layout; null: no phase (real, non-negative transmittance). */
  phase: Float32Array | null;
}

export interface ImagePlacement {
  pitch: number;
  /** Where the image's centre lies in the aperture plane. */
  center: [number, number];
}

/**
 * What the planner's facts need from the pixels, in pixel units (independent of pitch and centre,
 * so computed once when the image is read).
 */
export interface ImageStats {
  /** Columns and rows of the non-zero pixels' bounding box (inclusive); none: all zero. */
  box: { i0: number; i1: number; k0: number; k1: number } | null;
  /** Σ|t|² over the pixels (the open area in pixels, each weighted by the power it passes). */
  power: number;
  /**
   * Σ|t₁ − t₂|² over neighbouring pixels along rows and columns, the frame counted as opaque
   * neighbours: the edge length in pixels, each edge weighted by the power it diffracts relative
   * to an open/closed edge (an edge's spectrum is Δt/(2πi·f)).
   */
  edges: number;
  /**
   * The shortest run of equal pixels along a row or a column, bounded on both sides by a change
   * (the frame is a change where the pixel next to it is not zero): the smallest feature, in pixels.
   */
  minRun: number;
}

function equalAt(p: ImagePlanes, a: number, b: number): boolean {
  const ta = p.amplitude[a]!;
  if (ta !== p.amplitude[b]!) return false;
  return ta === 0 || !p.phase || p.phase[a] === p.phase[b];
}

/** |t_a − t_b|² (b < 0: the opaque outside). */
function jump2(p: ImagePlanes, a: number, b: number): number {
  const aa = p.amplitude[a]!;
  if (b < 0) return aa * aa;
  const ab = p.amplitude[b]!;
  if (!p.phase) return (aa - ab) ** 2;
  const d = p.phase[a]! - p.phase[b]!;
  return aa * aa + ab * ab - 2 * aa * ab * Math.cos(d);
}

export function imageStats(p: ImagePlanes): ImageStats {
  const { width: W, height: H, amplitude } = p;
  let i0 = W;
  let i1 = -1;
  let k0 = H;
  let k1 = -1;
  let power = 0;
  let edges = 0;
  let minRun = Infinity;
  // Runs along one line of n pixels at index(j): a run ends at a change; the first and last runs
  // are bounded by the frame unless they are zero (the outside is zero too: no edge there).
  const runs = (n: number, index: (j: number) => number) => {
    let start = 0;
    for (let j = 1; j <= n; j++) {
      if (j < n && equalAt(p, index(j), index(j - 1))) continue;
      const open = amplitude[index(start)]! !== 0;
      const bounded = (start > 0 || open) && (j < n || open);
      if (bounded) minRun = Math.min(minRun, j - start);
      start = j;
    }
  };
  for (let k = 0; k < H; k++) {
    for (let i = 0; i < W; i++) {
      const at = k * W + i;
      const a = amplitude[at]!;
      if (a !== 0) {
        power += a * a;
        if (i < i0) i0 = i;
        if (i > i1) i1 = i;
        if (k < k0) k0 = k;
        if (k > k1) k1 = k;
      }
      edges += i === 0 ? jump2(p, at, -1) : jump2(p, at, at - 1);
      edges += k === 0 ? jump2(p, at, -1) : jump2(p, at, at - W);
      if (i === W - 1) edges += jump2(p, at, -1);
      if (k === H - 1) edges += jump2(p, at, -1);
    }
    runs(W, (j) => k * W + j);
  }
  for (let i = 0; i < W; i++) runs(H, (j) => j * W + i);
  return { box: i1 < 0 ? null : { i0, i1, k0, k1 }, power, edges, minRun: Number.isFinite(minRun) ? minRun : 1 };
}

/** The image's lower-left corner (X0, Y0). */
function origin(p: ImagePlanes, at: ImagePlacement): [number, number] {
  return [at.center[0] - (p.width * at.pitch) / 2, at.center[1] - (p.height * at.pitch) / 2];
}

/** Half extents about the axis of the non-zero pixels' box: how far the open part reaches. */
export function imageHalfExtent(p: ImagePlanes, s: ImageStats, at: ImagePlacement): [number, number] {
  if (!s.box) return [0, 0];
  const [x0, y0] = origin(p, at);
  const q = at.pitch;
  return [
    Math.max(Math.abs(x0 + s.box.i0 * q), Math.abs(x0 + (s.box.i1 + 1) * q)),
    Math.max(Math.abs(y0 + s.box.k0 * q), Math.abs(y0 + (s.box.k1 + 1) * q)),
  ];
}

/** Distance from the axis to the nearest non-zero pixel (0 when the axis falls on one). */
export function imageNearestOpen(p: ImagePlanes, s: ImageStats, at: ImagePlacement): number {
  if (!s.box) return Infinity;
  const [x0, y0] = origin(p, at);
  const q = at.pitch;
  const gap = (lo: number, hi: number) => (lo > 0 ? lo : hi < 0 ? -hi : 0);
  let best = Infinity;
  for (let k = s.box.k0; k <= s.box.k1; k++) {
    const dy = gap(y0 + k * q, y0 + (k + 1) * q);
    if (dy >= best) continue;
    for (let i = s.box.i0; i <= s.box.i1; i++) {
      if (p.amplitude[k * p.width + i] === 0) continue;
      const d = Math.hypot(gap(x0 + i * q, x0 + (i + 1) * q), dy);
      if (d < best) best = d;
    }
  }
  return best;
}

/**
 * Overlap of each grid cell along one axis with the image's pixels along it, as a fraction of the
 * cell: cell j overlaps pixels first[j] … first[j] + count[j] − 1 with weights w[from[j] + m].
 */
interface Overlaps {
  first: Int32Array;
  count: Int32Array;
  from: Int32Array;
  w: Float64Array;
}

export function axisOverlaps(axis: Axis, pixels: number, start: number, pitch: number): Overlaps {
  const first = new Int32Array(axis.n);
  const count = new Int32Array(axis.n);
  const from = new Int32Array(axis.n);
  const w: number[] = [];
  const end = start + pixels * pitch;
  for (let j = 0; j < axis.n; j++) {
    const lo = axis.start + (j - 0.5) * axis.step;
    const hi = lo + axis.step;
    from[j] = w.length;
    if (hi <= start || lo >= end) continue;
    const a = Math.max(0, Math.floor((lo - start) / pitch));
    const b = Math.min(pixels - 1, Math.ceil((hi - start) / pitch) - 1);
    first[j] = a;
    for (let i = a; i <= b; i++) {
      const o = Math.min(hi, start + (i + 1) * pitch) - Math.max(lo, start + i * pitch);
      w.push(Math.max(0, o) / axis.step);
    }
    count[j] = w.length - from[j]!;
  }
  return { first, count, from, w: Float64Array.from(w) };
}

/**
 * Cell averages of t (interleaved re, im) and of |t|² over the grid xa × ya (row-major, rows
 * along y): exact area-weighted sums of the overlapping pixels.
 */
export function imageCellAverages(p: ImagePlanes, at: ImagePlacement, xa: Axis, ya: Axis): CellTransmittance {
  const { width: W, height: H, amplitude, phase } = p;
  const [x0, y0] = origin(p, at);
  const ox = axisOverlaps(xa, W, x0, at.pitch);
  const oy = axisOverlaps(ya, H, y0, at.pitch);
  // The pixels' t (and |t|²) once, not once per grid row that overlaps them.
  const re = phase ? new Float64Array(W * H) : null;
  const im = phase ? new Float64Array(W * H) : null;
  if (phase) {
    for (let n = 0; n < W * H; n++) {
      const a = amplitude[n]!;
      if (a === 0) continue;
      re![n] = a * Math.cos(phase[n]!);
      im![n] = a * Math.sin(phase[n]!);
    }
  }
  const t = new Float64Array(2 * xa.n * ya.n);
  const weight = new Float64Array(xa.n * ya.n);
  const rowRe = new Float64Array(W);
  const rowIm = new Float64Array(W);
  const rowPow = new Float64Array(W);
  for (let r = 0; r < ya.n; r++) {
    const ny = oy.count[r]!;
    if (ny === 0) continue;
    rowRe.fill(0);
    rowIm.fill(0);
    rowPow.fill(0);
    // The image rows this grid row overlaps, blended with their y-weights.
    for (let m = 0; m < ny; m++) {
      const wy = oy.w[oy.from[r]! + m]!;
      if (wy === 0) continue;
      const base = (oy.first[r]! + m) * W;
      for (let i = 0; i < W; i++) {
        const a = amplitude[base + i]!;
        if (a === 0) continue;
        rowPow[i] = rowPow[i]! + wy * a * a;
        if (re) {
          rowRe[i] = rowRe[i]! + wy * re[base + i]!;
          rowIm[i] = rowIm[i]! + wy * im![base + i]!;
        } else {
          rowRe[i] = rowRe[i]! + wy * a;
        }
      }
    }
    // Then each cell of the row from the columns it overlaps, with their x-weights.
    for (let c = 0; c < xa.n; c++) {
      const nx = ox.count[c]!;
      if (nx === 0) continue;
      let sr = 0;
      let si = 0;
      let sp = 0;
      const f = ox.first[c]!;
      const w0 = ox.from[c]!;
      for (let m = 0; m < nx; m++) {
        const wx = ox.w[w0 + m]!;
        sr += wx * rowRe[f + m]!;
        si += wx * rowIm[f + m]!;
        sp += wx * rowPow[f + m]!;
      }
      const k = r * xa.n + c;
      t[2 * k] = sr;
      t[2 * k + 1] = si;
      weight[k] = sp;
    }
  }
  return { t, weight };
}
