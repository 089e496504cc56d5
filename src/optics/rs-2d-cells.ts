// The source of the direct 2-D Rayleigh–Sommerfeld sums as cells with exact edges.
//
// Two kinds of cells:
// - box cells: a rectangle wholly open, centre (cx, cy), half-widths (hx, hy), the light's
//   amplitude at the centre and the slope of its logarithm (a Gaussian envelope exp(−r²/w²) has
//   ∂ln/∂x = −2cx/w² and ½∂²ln/∂x² = −1/w², exactly). The sums integrate the linear phase across
//   the box exactly and the rest to second order (rs-2d-sum.ts). Rectangles, slits of finite
//   length and gratings of such slits are split on the grid into boxes only: every edge is a box
//   edge, so nothing is area-sampled. Discs and annuli get a box for every grid cell wholly open.
// - edge cells: a grid cell that the edge of a disc or annulus crosses, with the interpolatory
//   weights of its open part on an m × m Gauss–Legendre grid (edge-cells.ts) times the envelope
//   at each node. The sums evaluate the integrand at the nodes.
// The tilt carrier e^{ik(αξ + βη)} is applied analytically: its value at the cell centre is in the
// amplitude and its slope k(α, β) is added to the linear phase of every pair.
import type { Aperture, Illumination, Profile } from './aperture.js';
import { describe, geometryOf, isOneDAperture, separableProfiles } from '../elements/registry.js';
import { addDiscCellWeights, edgeNodes, gaussLegendreRule } from './edge-cells.js';
import type { RsCellSummary } from './rs-2d-paths.js';
import { directionCosines } from './source.js';

/** Wholly open rectangles, structure of arrays. */
export interface RsBoxCells {
  n: number;
  cx: Float64Array;
  cy: Float64Array;
  /** Half-widths. */
  hx: Float64Array;
  hy: Float64Array;
  /** Amplitude × area / 2π (the kernel's 1/2π folded in), carrier at the centre included. */
  ar: Float64Array;
  ai: Float64Array;
  /** ∂ ln|envelope| / ∂x and ∂y at the centre (0 for a plane wave). */
  bx: Float64Array;
  by: Float64Array;
}

/** Grid cells that an edge crosses: nodal weights of their open part. */
export interface RsEdgeCells {
  n: number;
  /** Nodes per axis (even). */
  m: number;
  /** Node offsets from the centre (m), ascending: half-width × the Gauss–Legendre nodes. */
  u: Float64Array;
  cx: Float64Array;
  cy: Float64Array;
  /** Carrier at the centre / 2π. */
  ar: Float64Array;
  ai: Float64Array;
  /** n·m² weights, cell-major, then q (along y), then p (along x): c_pq × envelope at the node (m²). */
  w: Float64Array;
}

/** A source whose field depends on the distance from the axis only. */
export interface RoundSource {
  outer: number;
  inner: number;
  /** Gaussian waist, or null for a plane wave. */
  waist: number | null;
}

export interface RsCells2D {
  wavelength: number;
  /** Grid pitch (m): the widest box and the side of an edge cell. */
  pitch: number;
  /** Carrier slope k·(α, β) (rad/m). */
  slope: [number, number];
  /** ½ ∂² ln|envelope| / ∂x² (= the same along y): −1/w², or 0 for a plane wave. */
  envCurv: number;
  box: RsBoxCells;
  edge: RsEdgeCells;
  /**
   * evenX: the cells are even about x = 0 (mirror cells have mirror weights) and there is no
   * carrier along x; likewise evenY. round: the light and aperture are round (an untilted circle
   * or annulus), so the field depends on the distance from the axis only.
   */
  symmetry: { evenX: boolean; evenY: boolean; round: RoundSource | null };
  /** ∬ |U₀|² over the open area (incident irradiance 1). */
  power: number;
  /** Open area (m²), within the Gaussian's reach. */
  openArea: number;
}

export interface RsCells2DOptions {
  /** Gauss–Legendre nodes per axis in an edge cell (even, 2–16; default 8). */
  edgeNodes?: number;
  /**
   * Where the grid sits: cell centres at ((i + offset[0])·pitch, (j + offset[1])·pitch). Default
   * [0, 0] (a cell centred on the axis). Offsets of 0 or ½ keep the grid symmetric.
   */
  offset?: [number, number];
}

/** Default nodes per axis in an edge cell. */
export const RS_DEFAULT_EDGE_NODES = 8;

/**
 * A Gaussian envelope is cut where it is below e^{−37} ≈ 9e-17 of its peak (r > √37·w): beyond
 * that the field is under double rounding of the peak (as for the 1-D cells).
 */
export const GAUSSIAN_REACH_2D = Math.sqrt(37);

/** Edge cells whose open part is below this fraction of the cell are dropped, above 1 − it made boxes. */
const SLIVER = 1e-9;

function checkInputs(a: Aperture, wavelength: number, pitch: number, opts: RsCells2DOptions): { m: number; off: [number, number] } {
  if (!(wavelength > 0)) throw new Error('rsCells2D: the wavelength must be positive');
  if (!(pitch > 0) || !Number.isFinite(pitch)) throw new Error('rsCells2D: the pitch must be positive');
  const m = opts.edgeNodes ?? RS_DEFAULT_EDGE_NODES;
  if (!Number.isInteger(m) || m < 2 || m > 16 || m % 2 !== 0) throw new Error('rsCells2D: edgeNodes must be an even whole number from 2 to 16');
  const off = opts.offset ?? [0, 0];
  if (!off.every((o) => Number.isFinite(o))) throw new Error('rsCells2D: the offset must be finite');
  if (isOneDAperture(a)) throw new Error('rsCells2D: the aperture is 1-D (no length); use the 1-D cells');
  return { m, off: [off[0] - Math.round(off[0]), off[1] - Math.round(off[1])] };
}

function symmetricOffset(o: number): boolean {
  return o === 0 || Math.abs(o) === 0.5;
}

interface Light {
  waist: number | null;
  alpha: number;
  beta: number;
  k: number;
  reach: number;
}

function lightOf(ill: Illumination, wavelength: number): Light {
  const [alpha, beta] = directionCosines(ill);
  const waist = ill.kind === 'gaussian' ? ill.waist : null;
  if (waist !== null && !(waist > 0)) throw new Error('rsCells2D: the waist must be positive');
  return { waist, alpha, beta, k: (2 * Math.PI) / wavelength, reach: waist === null ? Infinity : GAUSSIAN_REACH_2D * waist };
}

/** Growable structure-of-arrays builder. */
class BoxBuilder {
  n = 0;
  private cap = 64;
  cx = new Float64Array(this.cap);
  cy = new Float64Array(this.cap);
  hx = new Float64Array(this.cap);
  hy = new Float64Array(this.cap);
  ar = new Float64Array(this.cap);
  ai = new Float64Array(this.cap);
  bx = new Float64Array(this.cap);
  by = new Float64Array(this.cap);
  power = 0;
  area = 0;

  constructor(private readonly light: Light) {}

  private grow(): void {
    this.cap *= 2;
    for (const key of ['cx', 'cy', 'hx', 'hy', 'ar', 'ai', 'bx', 'by'] as const) {
      const next = new Float64Array(this.cap);
      next.set(this[key]);
      this[key] = next;
    }
  }

  add(cx: number, cy: number, hx: number, hy: number): void {
    if (this.n === this.cap) this.grow();
    const { waist, alpha, beta, k } = this.light;
    const j = this.n++;
    const area = 4 * hx * hy;
    let env = 1;
    if (waist !== null) {
      env = Math.exp(-(cx * cx + cy * cy) / (waist * waist));
      this.bx[j] = (-2 * cx) / (waist * waist);
      this.by[j] = (-2 * cy) / (waist * waist);
      this.power += envelopePower1D(cx, hx, waist) * envelopePower1D(cy, hy, waist);
    } else {
      this.power += area;
    }
    this.area += area;
    const ph = k * (alpha * cx + beta * cy);
    const amp = (env * area) / (2 * Math.PI);
    this.cx[j] = cx;
    this.cy[j] = cy;
    this.hx[j] = hx;
    this.hy[j] = hy;
    this.ar[j] = amp * Math.cos(ph);
    this.ai[j] = amp * Math.sin(ph);
  }

  done(): RsBoxCells {
    const n = this.n;
    return {
      n,
      cx: this.cx.slice(0, n),
      cy: this.cy.slice(0, n),
      hx: this.hx.slice(0, n),
      hy: this.hy.slice(0, n),
      ar: this.ar.slice(0, n),
      ai: this.ai.slice(0, n),
      bx: this.bx.slice(0, n),
      by: this.by.slice(0, n),
    };
  }
}

/** ∫ exp(−2x²/w²) over [c − h, c + h] by 8-point Gauss–Legendre (h ≤ w·√37, the integrand smooth). */
function envelopePower1D(c: number, h: number, w: number): number {
  const g = gaussLegendreRule(8);
  // Panels of at most w/2 keep the rule at rounding.
  const panels = Math.max(1, Math.ceil((2 * h) / (0.5 * w)));
  const step = (2 * h) / panels;
  let s = 0;
  for (let p = 0; p < panels; p++) {
    const mid = c - h + (p + 0.5) * step;
    for (let i = 0; i < 8; i++) {
      const x = mid + 0.5 * step * g.x[i]!;
      s += 0.5 * step * g.w[i]! * Math.exp((-2 * x * x) / (w * w));
    }
  }
  return s;
}

/** The open intervals of a profile centred on 0 (as the masks centre them). */
function profileIntervals(p: Profile): Array<[number, number]> {
  if (p.kind === 'interval') return [[-p.width / 2, p.width / 2]];
  if (p.kind === 'periodic') throw new Error('rsCells2D: a grating profile has no open intervals (it is not binary)');
  const first = -((p.count - 1) / 2) * p.period;
  const out: Array<[number, number]> = [];
  for (let n = 0; n < p.count; n++) out.push([first + n * p.period - p.width / 2, first + n * p.period + p.width / 2]);
  return out;
}

/**
 * Pieces of the intervals cut at the grid lines (i + off + ½)·pitch, as [centre, half-width];
 * pieces thinner than 1e-9 of the pitch (an edge on a grid line, to rounding) are dropped.
 */
function gridPieces(intervals: Array<[number, number]>, pitch: number, off: number, reach: number): Array<[number, number]> {
  const out: Array<[number, number]> = [];
  for (const [lo0, hi0] of intervals) {
    const lo = Math.max(lo0, -reach);
    const hi = Math.min(hi0, reach);
    if (!(hi > lo)) continue;
    // Grid lines strictly inside (lo, hi).
    let i = Math.floor(lo / pitch - off - 0.5) + 1;
    let a = lo;
    for (; ; i++) {
      const line = (i + off + 0.5) * pitch;
      const b = Math.min(line, hi);
      if (b - a > SLIVER * pitch) out.push([0.5 * (a + b), 0.5 * (b - a)]);
      if (line >= hi) break;
      a = Math.max(a, line);
    }
  }
  return out;
}

/** Pieces counted one by one up to this many per interval; beyond, from the interval's length. */
const COUNT_PIECES = 1 << 20;

/**
 * How many pieces gridPieces gives, and how many of them have their centre at or above 0, without
 * building them: the planner costs sources of any size with it, and a source of 1e15 pieces is
 * refused for its cost, not built to be counted. Exact up to COUNT_PIECES per interval (as
 * gridPieces walks), from the interval's length beyond (within a piece or two).
 */
export function countGridPieces(intervals: Array<[number, number]>, pitch: number, off: number, reach: number): { n: number; upper: number } {
  let n = 0;
  let upper = 0;
  for (const [lo0, hi0] of intervals) {
    const lo = Math.max(lo0, -reach);
    const hi = Math.min(hi0, reach);
    if (!(hi > lo)) continue;
    if ((hi - lo) / pitch > COUNT_PIECES) {
      const all = Math.ceil((hi - lo) / pitch) + 1;
      n += all;
      upper += Math.ceil((all * Math.max(0, hi - Math.max(lo, 0))) / (hi - lo));
      continue;
    }
    let i = Math.floor(lo / pitch - off - 0.5) + 1;
    let a = lo;
    for (; ; i++) {
      const line = (i + off + 0.5) * pitch;
      const b = Math.min(line, hi);
      if (b - a > SLIVER * pitch) {
        n++;
        if (a + b >= 0) upper++;
      }
      if (line >= hi) break;
      a = Math.max(a, line);
    }
  }
  return { n, upper };
}

function emptyEdge(m: number, pitch: number): RsEdgeCells {
  const e = new Float64Array(0);
  return { n: 0, m, u: edgeNodes(m).map((t) => 0.5 * pitch * t), cx: e, cy: e, ar: e, ai: e, w: e };
}

/**
 * The cells of an aperture under the given light at the given pitch (m). Opaque apertures give the
 * cells of their complement, the hole, as the masks do (the caller computes the obstacle as the
 * free beam less the hole). 1-D apertures (slits without length) are refused: use the 1-D cells.
 */
export function rsCells2DFromAperture(a: Aperture, ill: Illumination, wavelength: number, pitch: number, opts: RsCells2DOptions = {}): RsCells2D {
  const { m, off } = checkInputs(a, wavelength, pitch, opts);
  const light = lightOf(ill, wavelength);
  const boxes = new BoxBuilder(light);
  const slope: [number, number] = [light.k * light.alpha, light.k * light.beta];
  const envCurv = light.waist === null ? 0 : -1 / (light.waist * light.waist);
  const evenX = symmetricOffset(off[0]) && light.alpha === 0;
  const evenY = symmetricOffset(off[1]) && light.beta === 0;
  const sep = separableProfiles(a);
  if (sep) {
    const xs = gridPieces(profileIntervals(sep.x), pitch, off[0], light.reach);
    const ys = gridPieces(profileIntervals(sep.y!), pitch, off[1], light.reach);
    for (const [cy, hy] of ys) for (const [cx, hx] of xs) boxes.add(cx, cy, hx, hy);
    return {
      wavelength,
      pitch,
      slope,
      envCurv,
      box: boxes.done(),
      edge: emptyEdge(m, pitch),
      symmetry: { evenX, evenY, round: null },
      power: boxes.power,
      openArea: boxes.area,
    };
  }
  const g = geometryOf(a);
  if (g.kind !== 'rings') throw new Error(`rsCells2D: no cells for ${describe(a)}`);
  const ro = g.outer;
  const ri = g.inner;
  if (!(ro > 0) || !(ri >= 0) || !(ri < ro)) throw new Error('rsCells2D: needs 0 ≤ inner < outer');
  const half = pitch / 2;
  const u = edgeNodes(m).map((t) => half * t);
  const extent = Math.min(ro, light.reach);
  const edge = { cx: [] as number[], cy: [] as number[], ar: [] as number[], ai: [] as number[], w: [] as Float64Array[] };
  let edgePower = 0;
  let edgeArea = 0;
  const c = new Float64Array(m * m);
  const iLo = Math.floor(-extent / pitch - off[0]) - 1;
  const iHi = Math.ceil(extent / pitch - off[0]) + 1;
  const jLo = Math.floor(-extent / pitch - off[1]) - 1;
  const jHi = Math.ceil(extent / pitch - off[1]) + 1;
  for (let j = jLo; j <= jHi; j++) {
    const cy = (j + off[1]) * pitch;
    for (let i = iLo; i <= iHi; i++) {
      const cx = (i + off[0]) * pitch;
      const nx = Math.max(0, Math.abs(cx) - half);
      const ny = Math.max(0, Math.abs(cy) - half);
      const near = Math.hypot(nx, ny);
      const far = Math.hypot(Math.abs(cx) + half, Math.abs(cy) + half);
      if (near >= ro || far <= ri || near >= light.reach) continue;
      if (far <= ro && near >= ri) {
        boxes.add(cx, cy, half, half);
        continue;
      }
      c.fill(0);
      addDiscCellWeights(ro, cx, cy, half, m, 1, c);
      if (ri > 0) addDiscCellWeights(ri, cx, cy, half, m, -1, c);
      let area = 0;
      for (let t = 0; t < m * m; t++) area += c[t]!;
      if (area < SLIVER * pitch * pitch) continue;
      if (area > (1 - SLIVER) * pitch * pitch) {
        boxes.add(cx, cy, half, half);
        continue;
      }
      // Weights × envelope at the nodes, stored q-major (q along y, p along x).
      const w = new Float64Array(m * m);
      for (let q = 0; q < m; q++) {
        for (let p = 0; p < m; p++) {
          let env = 1;
          if (light.waist !== null) {
            const x = cx + u[p]!;
            const y = cy + u[q]!;
            env = Math.exp(-(x * x + y * y) / (light.waist * light.waist));
          }
          const cw = c[p * m + q]!;
          w[q * m + p] = cw * env;
          edgePower += cw * env * env;
          edgeArea += cw;
        }
      }
      const ph = light.k * (light.alpha * cx + light.beta * cy);
      edge.cx.push(cx);
      edge.cy.push(cy);
      edge.ar.push(Math.cos(ph) / (2 * Math.PI));
      edge.ai.push(Math.sin(ph) / (2 * Math.PI));
      edge.w.push(w);
    }
  }
  const ne = edge.cx.length;
  const weights = new Float64Array(ne * m * m);
  edge.w.forEach((w, i) => weights.set(w, i * m * m));
  const round = light.alpha === 0 && light.beta === 0 ? { outer: ro, inner: ri, waist: light.waist } : null;
  return {
    wavelength,
    pitch,
    slope,
    envCurv,
    box: boxes.done(),
    edge: { n: ne, m, u, cx: Float64Array.from(edge.cx), cy: Float64Array.from(edge.cy), ar: Float64Array.from(edge.ar), ai: Float64Array.from(edge.ai), w: weights },
    symmetry: { evenX, evenY, round },
    power: boxes.power + edgePower,
    openArea: boxes.area + edgeArea,
  };
}

/**
 * The counts rsCells2DFromAperture would give (edge cells: at most, slivers and nearly full ones
 * included), by the same classification without the weights: O(cells), for the planner's costs
 * (rs-2d-paths.ts rsSum2DChoice).
 */
export function rsCellCount2D(a: Aperture, ill: Illumination, wavelength: number, pitch: number, opts: RsCells2DOptions = {}): RsCellSummary {
  const { m, off } = checkInputs(a, wavelength, pitch, opts);
  const light = lightOf(ill, wavelength);
  const evenX = symmetricOffset(off[0]) && light.alpha === 0;
  const evenY = symmetricOffset(off[1]) && light.beta === 0;
  const base = { wavelength, edgeNodes: m, gaussian: light.waist !== null, evenX, evenY };
  const sep = separableProfiles(a);
  if (sep) {
    const xs = countGridPieces(profileIntervals(sep.x), pitch, off[0], light.reach);
    const ys = countGridPieces(profileIntervals(sep.y!), pitch, off[1], light.reach);
    return { ...base, box: xs.n * ys.n, edge: 0, round: false, radius: 0, boxUpperHalf: xs.n * ys.upper, edgeUpperHalf: 0 };
  }
  const g = geometryOf(a);
  if (g.kind !== 'rings') throw new Error(`rsCells2D: no cells for ${describe(a)}`);
  const ro = g.outer;
  const ri = g.inner;
  const half = pitch / 2;
  const extent = Math.min(ro, light.reach);
  const round = light.alpha === 0 && light.beta === 0;
  // Counting cell by cell costs as much as building them; where that is millions, the counts
  // follow from the area and the rim (each rim cell is an edge cell; the rest of the area is boxes),
  // which is what the planner's cost needs. (Such a source is far beyond the work limit anyway.)
  const approxCells = (Math.PI * (extent * extent - Math.min(ri, extent) ** 2)) / (pitch * pitch);
  if (approxCells > 4e6) {
    const rim = (2 * Math.PI * (extent + (ri < extent ? ri : 0))) / pitch;
    const edgeN = Math.ceil(1.3 * rim);
    const boxN = Math.max(0, Math.ceil(approxCells - rim / 2));
    return { ...base, box: boxN, edge: edgeN, round, radius: round ? extent : 0, boxUpperHalf: Math.ceil(boxN / 2), edgeUpperHalf: Math.ceil(edgeN / 2) };
  }
  let box = 0;
  let edge = 0;
  let boxUpper = 0;
  let edgeUpper = 0;
  const iLo = Math.floor(-extent / pitch - off[0]) - 1;
  const iHi = Math.ceil(extent / pitch - off[0]) + 1;
  for (let j = Math.floor(-extent / pitch - off[1]) - 1; j <= Math.ceil(extent / pitch - off[1]) + 1; j++) {
    const cy = (j + off[1]) * pitch;
    for (let i = iLo; i <= iHi; i++) {
      const cx = (i + off[0]) * pitch;
      const near = Math.hypot(Math.max(0, Math.abs(cx) - half), Math.max(0, Math.abs(cy) - half));
      const far = Math.hypot(Math.abs(cx) + half, Math.abs(cy) + half);
      if (near >= ro || far <= ri || near >= light.reach) continue;
      if (far <= ro && near >= ri) {
        box++;
        if (cy >= 0) boxUpper++;
      } else {
        edge++;
        if (cy >= 0) edgeUpper++;
      }
    }
  }
  return { ...base, box, edge, round, radius: round ? extent : 0, boxUpperHalf: boxUpper, edgeUpperHalf: edgeUpper };
}
