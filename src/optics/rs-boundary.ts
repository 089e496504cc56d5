// The first Rayleigh–Sommerfeld integral behind an aperture made of discs and rectangles, lit by a
// unit plane wave at normal incidence, as an integral along the aperture's boundary: exact for the
// scalar problem at any distance, Fresnel number and angle, at the cost of one line integral per
// output point (one per output radius for discs, and per output row and column for rectangles).
//
// Derivation (Goodman, Introduction to Fourier Optics, §3.5, for the integral itself):
//   U(x, y, z) = ∬_A h(r) dξ dη,  h = (1/2π)(z/r)(1/r − ik)e^{ikr}/r,  r² = ρ² + z²,
// ρ the distance in the aperture plane from the foot F = (x, y) of the observation point P. Since
// h = −(1/2π)∂_z(e^{ikr}/r) and ρ dρ = r dr along a ray from F, the ray's segment [ρ₁, ρ₂] gives
// ∫h ρ dρ = −(1/2π)[g(r₂) − g(r₁)], g(r) = (z/r)e^{ikr}; summing over the rays,
//   U(P) = e^{ikz}·χ(F) − (1/2π)∮_∂A g(R) dψ,
// χ = 1 when F is inside A, R the distance from P to the boundary point, dψ the angle a boundary
// element subtends at F (boundary counter-clockwise). The idea goes back to Maggi and Rubinowicz
// (Miyamoto & Wolf, J. Opt. Soc. Am. 52, 615 (1962), from memory); the two lines above are what the
// code relies on.
//
// What the code integrates: since ∮dψ = 2π·χ(F), the constant g(z) = e^{ikz} can be taken under the
// integral, and
//   U(P) = −(1/2π)∮_∂A [g(R) − g(z)] dψ = −(e^{ikz}/2π)∮_∂A K(ρ²)·ρ² dψ,
//   K(ρ²) = [(z/R)(e^{ikδ} − 1) − δ/R]/ρ²,  δ = R − z = ρ²/(R + z).
// This removes the inside test and, more important, the singularity of dψ = (cross/ρ²)·dℓ at a foot
// on or near the boundary: (e^{iq} − 1)/q is entire, so K is analytic in ρ² up to the branch point
// of R at ρ² = −z², and K·ρ² dψ = K·cross·dℓ is a smooth integrand wherever the foot is. A foot on
// the boundary needs no special case, and the field is continuous across it by construction. K is
// evaluated without cancellation: e^{ikδ} − 1 = 2i·sin(kδ/2)e^{ikδ/2} (one sine and one cosine per
// node), δ from ρ²/(R + z).
//
// Each region's integral is linear in the region, so an annulus is a disc less a disc, a grating the
// sum of its lines, and an opaque obstacle in the plane wave the free wave (the 'plane' region,
// U = e^{ikz} exactly) less the hole. Regions are summed with their signs: overlapping ones count
// twice. Discs are centred on the axis; rectangles have edges along x and y, anywhere.
//
// Accuracy target: |U|² within `tolerance` (default 1e-4) of the pattern's peak intensity. The
// budget: quadrature 1e-4 of that (the rules are cheap at high accuracy), the radial interpolation
// of round apertures 1/10 of it (1e-5 of the peak by default). The scale of the peak is taken as
// A² with A = 1 with a 'plane' region, else min(1, |open area|/(λz)): a scale, not a bound (the
// far-field peak on the axis; in the near field the geometrical region's 1).
import { type Aperture } from './aperture.js';
import { elementOf } from '../elements/registry.js';
import { axisAt, createField, type Axis, type Field } from './field.js';
import { DISC_COUNT_WALK, discContour, discContourCount, type DiscRule } from './rs-boundary-disc.js';
import { LineTable, lineTableCount, stretchIntegral, stretchIntegralCount, type LineRule } from './rs-boundary-lines.js';
import { gaussPhaseLimit, lagrangeStepLimit, partialPhaseLimit } from './rs-boundary-rules.js';
import { GAUSS32_PHASE_LIMITS, PARTIAL16_PHASE_LIMITS, TABLE_FIRST_STEP, TABLE_STEPS_PER_DECADE } from './rs-boundary-limit-table.js';

export type BoundaryRegion =
  | { kind: 'disc'; radius: number; sign: 1 | -1 }
  | { kind: 'rect'; x0: number; x1: number; y0: number; y1: number; sign: 1 | -1 }
  /** The whole plane open: the free wave e^{ikz} (for obstacles: plane less the hole). */
  | { kind: 'plane'; sign: 1 | -1 };

export interface RsBoundaryOptions {
  /** Target error of |U|² as a fraction of the peak intensity (default 1e-4). */
  tolerance?: number;
  /**
   * 'auto' (default): round parts on a table along one radius, interpolated, when that needs fewer
   * integrals than the output has points; 'never': every output point integrated.
   */
  radial?: 'auto' | 'never';
  /** Use the mirror symmetries of regions and window (default true). */
  symmetry?: boolean;
}

export interface RsBoundaryStats {
  /** Kernel evaluations (one sine and cosine each). */
  evaluations: number;
  /** Readings of line tables (a binary search and a Clenshaw sum each). */
  readings: number;
  /** Output radii integrated for the round parts (table samples, or points when direct). */
  radii: number;
  /** Output points interpolated from the radial table. */
  interpolated: number;
  /** Whether the round parts came from the radial table. */
  radial: boolean;
  /** Which axes were mirrored. */
  mirrored: [boolean, boolean];
}

// Rules. Discs and stretches of lines integrated per output: 32-node Gauss–Legendre panels (of
// those measured, the most phase per node: 2.3–2.8 rad). Line tables: 16 nodes, read through the
// antiderivative of the interpolant, whose limit is about half the quadrature's. Each panel holds
// 0.9 of the rule's limit at the largest phase rate inside it (the walkers in rs-boundary-disc.ts
// and rs-boundary-lines.ts). Measured against the reference boundaryField (test/reference/rs2d.ts)
// at 43 single points each of 72 random set-ups (discs, annuli, rectangles; N_F 0.01–730, z/λ
// 0.14–3e7), default tolerance: worst 3.4e-9 of the peak intensity (at z < λ), 2.5e-11 for the
// rectangles (their tables). (Stepping a fixed phase instead, at
// the full limit, erred by 5e-4: a panel that starts at a stationary point reaches twice the rate.)
const DISC_NODES = 32;
const LINE_NODES = 16;
const PHASE_SAFETY = 0.9;
const BETA = 0.5;
/** Quadrature error per unit of ∫|integrand|, as a fraction of A·tolerance. */
const QUAD_SHARE = 1e-4;
const EPS_FLOOR = 1e-14;
const EPS_CEIL = 1e-7;
/**
 * eps rounded down to one of TABLE_STEPS_PER_DECADE steps per decade: a stricter accuracy (by at
 * most 10^(1/8) ≈ 1.33), so every bound still holds, and the rules' phase limits at it are
 * tabulated (rs-boundary-limit-table.ts; a step outside the table is measured, and remembered).
 * Measured at every case's own eps, the scans were a third of the planning of a 100-case distance
 * sweep, whose every case has its own (A = area/λz).
 */
function stricterStep(eps: number): { step: number; eps: number } {
  let step = Math.floor(Math.log10(eps) * TABLE_STEPS_PER_DECADE);
  // 10^x may land a rounding above eps: then the step below.
  if (10 ** (step / TABLE_STEPS_PER_DECADE) > eps) step--;
  return { step, eps: 10 ** (step / TABLE_STEPS_PER_DECADE) };
}

/** The two rules' phase limits at an accuracy step (tabulated where the table has it). */
function phaseLimits(at: { step: number; eps: number }): { disc: number; line: number } {
  const i = at.step - TABLE_FIRST_STEP;
  const tabulated = DISC_NODES === 32 && LINE_NODES === 16 && i >= 0 && i < GAUSS32_PHASE_LIMITS.length;
  return {
    disc: tabulated ? GAUSS32_PHASE_LIMITS[i]! : gaussPhaseLimit(DISC_NODES, at.eps),
    line: tabulated ? PARTIAL16_PHASE_LIMITS[i]! : partialPhaseLimit(LINE_NODES, at.eps),
  };
}

/** Radial interpolation: centred Lagrange on this many samples. */
const LAGRANGE_POINTS = 20;
/** Share of A·tolerance for the interpolation of the field's amplitude (|U|² error ≈ 2A·δU). */
const INTERP_SHARE = 1 / 20;
/** Radial pitch at most this fraction of z (the field's structure near the aperture is ≥ z wide). */
const PITCH_OVER_Z = 0.25;

interface Lines {
  /** Line coordinate (y for horizontal lines, x for vertical). */
  at: number;
  /** End coordinates along the line and their weights. */
  ends: Float64Array;
  weights: Float64Array;
  /**
   * The same as open stretches of the line, triples (from, to, weight): with the ends sorted and
   * C_m the sum of the first m weights, Σ_e w_e·G(e − v) = −Σ_m C_m·[G(e_{m+1} − v) − G(e_m − v)]
   * (summation by parts; the weights sum to 0), and each bracket is ∫ over the stretch.
   */
  stretches: Float64Array;
}

interface BoundaryPlan {
  k: number;
  A: number;
  planeSum: number;
  discs: { radius: number; sign: number }[];
  horizontal: Lines[];
  vertical: Lines[];
  discRule: DiscRule;
  lineRule: LineRule;
  directRule: LineRule;
  /** Kept output index ranges [start, end) per axis, and whether mirrored. */
  xs: [number, number];
  ys: [number, number];
  mirrorX: boolean;
  mirrorY: boolean;
  radial: null | { h: number; mLo: number; mHi: number };
  keptPoints: number;
}

function validate(regions: BoundaryRegion[], wavelength: number, z: number, outX: Axis, outY: Axis): void {
  if (!(wavelength > 0) || !Number.isFinite(wavelength)) throw new Error('rsBoundary: the wavelength must be positive');
  if (!(z > 0) || !Number.isFinite(z)) throw new Error('rsBoundary: the distance must be positive');
  for (const a of [outX, outY]) {
    if (!(a.n >= 1) || !Number.isInteger(a.n)) throw new Error('rsBoundary: output axes need at least one sample');
    if (!Number.isFinite(a.start) || !Number.isFinite(a.step)) throw new Error('rsBoundary: output axes must be finite');
  }
  for (const r of regions) {
    if (r.sign !== 1 && r.sign !== -1) throw new Error('rsBoundary: a region sign is 1 or -1');
    if (r.kind === 'disc' && !(r.radius > 0 && Number.isFinite(r.radius))) throw new Error('rsBoundary: a disc radius must be positive');
    if (r.kind === 'rect' && !(r.x1 > r.x0 && r.y1 > r.y0 && [r.x0, r.x1, r.y0, r.y1].every(Number.isFinite)))
      throw new Error('rsBoundary: a rectangle needs x0 < x1 and y0 < y1');
  }
}

/** Whether the axis is symmetric about 0 (x_j = −x_{n−1−j} to rounding). */
function axisSymmetric(a: Axis): boolean {
  if (a.n === 1) return a.start === 0;
  const last = a.start + (a.n - 1) * a.step;
  return Math.abs(a.start + last) <= 1e-9 * Math.abs(a.step);
}

/** Whether the rectangles (with signs) are the same set after x → −x (or y → −y). */
function rectsSymmetric(rects: Extract<BoundaryRegion, { kind: 'rect' }>[], alongX: boolean): boolean {
  const key = (a: number, b: number, c: number, d: number, s: number) => [a, b, c, d, s];
  const scale = Math.max(1e-300, ...rects.map((r) => Math.max(Math.abs(r.x0), Math.abs(r.x1), Math.abs(r.y0), Math.abs(r.y1))));
  const tol = 1e-12 * scale;
  const list = rects.map((r) => key(r.x0, r.x1, r.y0, r.y1, r.sign));
  const mirrored = rects.map((r) => (alongX ? key(-r.x1, -r.x0, r.y0, r.y1, r.sign) : key(r.x0, r.x1, -r.y1, -r.y0, r.sign)));
  const cmp = (p: number[], q: number[]) => {
    for (let i = 0; i < 5; i++) if (Math.abs(p[i]! - q[i]!) > tol) return p[i]! - q[i]!;
    return 0;
  };
  list.sort(cmp);
  mirrored.sort(cmp);
  return list.every((p, i) => cmp(p, mirrored[i]!) === 0);
}

/** Lines of the rectangles' edges along one direction, merged, with the weights derived in the file comment of rs-boundary-lines.ts and here. */
function collectLines(rects: Extract<BoundaryRegion, { kind: 'rect' }>[], horizontal: boolean): Lines[] {
  // Horizontal lines (at y): bottom edge ends x1 → −sign, x0 → +sign; top edge x1 → +sign,
  // x0 → −sign, with G read at c = y_line − y_out. Vertical lines (at x): right edge ends
  // y1 → +sign, y0 → −sign; left edge y1 → −sign, y0 → +sign, with c = x_line − x_out.
  const map = new Map<number, Map<number, number>>();
  const add = (at: number, end: number, w: number) => {
    let m = map.get(at);
    if (!m) map.set(at, (m = new Map()));
    m.set(end, (m.get(end) ?? 0) + w);
  };
  for (const r of rects) {
    const s = r.sign;
    if (horizontal) {
      add(r.y0, r.x1, -s);
      add(r.y0, r.x0, s);
      add(r.y1, r.x1, s);
      add(r.y1, r.x0, -s);
    } else {
      add(r.x1, r.y1, s);
      add(r.x1, r.y0, -s);
      add(r.x0, r.y1, -s);
      add(r.x0, r.y0, s);
    }
  }
  const out: Lines[] = [];
  for (const [at, m] of map) {
    const entries = [...m].filter(([, w]) => w !== 0);
    if (entries.length === 0) continue;
    entries.sort((p, q) => p[0] - q[0]);
    const stretches: number[] = [];
    let cum = 0;
    for (let m = 0; m + 1 < entries.length; m++) {
      cum += entries[m]![1];
      if (cum !== 0) stretches.push(entries[m]![0], entries[m + 1]![0], -cum);
    }
    out.push({
      at,
      ends: Float64Array.from(entries.map((e) => e[0])),
      weights: Float64Array.from(entries.map((e) => e[1])),
      stretches: Float64Array.from(stretches),
    });
  }
  return out;
}

function openArea(regions: BoundaryRegion[]): number {
  let s = 0;
  for (const r of regions) {
    if (r.kind === 'disc') s += r.sign * Math.PI * r.radius * r.radius;
    else if (r.kind === 'rect') s += r.sign * (r.x1 - r.x0) * (r.y1 - r.y0);
  }
  return Math.abs(s);
}

/** The range of |v| over axis samples [i0, i1). */
function absRange(a: Axis, i0: number, i1: number): [number, number] {
  const v0 = Math.min(axisAt(a, i0), axisAt(a, i1 - 1));
  const v1 = Math.max(axisAt(a, i0), axisAt(a, i1 - 1));
  const lo = v0 <= 0 && v1 >= 0 ? 0 : Math.min(Math.abs(v0), Math.abs(v1));
  return [lo, Math.max(Math.abs(v0), Math.abs(v1))];
}

function plan(regions: BoundaryRegion[], wavelength: number, z: number, outX: Axis, outY: Axis, opts: RsBoundaryOptions): BoundaryPlan {
  validate(regions, wavelength, z, outX, outY);
  const tol = opts.tolerance ?? 1e-4;
  if (!(tol > 0)) throw new Error('rsBoundary: the tolerance must be positive');
  const k = (2 * Math.PI) / wavelength;
  const rects = regions.filter((r): r is Extract<BoundaryRegion, { kind: 'rect' }> => r.kind === 'rect');
  const discs = regions.filter((r): r is Extract<BoundaryRegion, { kind: 'disc' }> => r.kind === 'disc').map((r) => ({ radius: r.radius, sign: r.sign }));
  const planeSum = regions.reduce((s, r) => s + (r.kind === 'plane' ? r.sign : 0), 0);
  const A = regions.some((r) => r.kind === 'plane') ? 1 : Math.min(1, openArea(regions) / (wavelength * z));
  const scale = A > 0 ? A : 1;
  const at = stricterStep(Math.min(EPS_CEIL, Math.max(EPS_FLOOR, tol * scale * QUAD_SHARE)));
  const limits = phaseLimits(at);
  const discRule: DiscRule = { n: DISC_NODES, phase: PHASE_SAFETY * limits.disc, beta: BETA };
  const lineRule: LineRule = { n: LINE_NODES, phase: PHASE_SAFETY * limits.line, beta: BETA };
  const directRule: LineRule = { n: DISC_NODES, phase: discRule.phase, beta: BETA };

  const useSym = opts.symmetry ?? true;
  const mirrorX = useSym && outX.n > 1 && axisSymmetric(outX) && rectsSymmetric(rects, true);
  const mirrorY = useSym && outY.n > 1 && axisSymmetric(outY) && rectsSymmetric(rects, false);
  const xs: [number, number] = mirrorX ? [Math.floor(outX.n / 2), outX.n] : [0, outX.n];
  const ys: [number, number] = mirrorY ? [Math.floor(outY.n / 2), outY.n] : [0, outY.n];
  // With a negative step the kept half is the other end: keep the samples at x ≥ 0.
  if (mirrorX && outX.step < 0) xs.splice(0, 2, 0, Math.ceil(outX.n / 2));
  if (mirrorY && outY.step < 0) ys.splice(0, 2, 0, Math.ceil(outY.n / 2));
  const keptPoints = (xs[1] - xs[0]) * (ys[1] - ys[0]);

  let radial: BoundaryPlan['radial'] = null;
  if (discs.length > 0 && (opts.radial ?? 'auto') === 'auto') {
    const [xlo, xhi] = absRange(outX, xs[0], xs[1]);
    const [ylo, yhi] = absRange(outY, ys[0], ys[1]);
    const rhoMin = Math.hypot(xlo, ylo);
    const rhoMax = Math.hypot(xhi, yhi);
    const aMax = Math.max(...discs.map((d) => d.radius));
    // The table holds V(ρ) = U(ρ)·e^{−ik(r − z)}, r = √(ρ² + z²): the field less the spherical phase
    // of a wave from the centre. A boundary point b contributes e^{ikR_b}, so V's local rate along
    // ρ is k times (ρ − b_ρ)/R_b − ρ/r. With s(u) = u/√(u² + z²): at most s(ρ + a) + s(ρ), and, as
    // |s′| ≤ 1/z and the offset of b across the ray changes R_b's height by b²/2z at most, also at
    // most a/z + 0.2(a/z)². In the far field the second is the Airy pattern's own scale.
    const s = (u: number) => u / Math.hypot(u, z);
    const ratio = aMax / z;
    const rate = Math.min(s(rhoMax + aMax) + s(rhoMax), ratio + 0.2 * ratio * ratio);
    const interpEps = Math.max(1e-12, (tol * INTERP_SHARE) / 2);
    const wh = lagrangeStepLimit(LAGRANGE_POINTS, interpEps);
    const h = Math.min(wh / (k * rate), PITCH_OVER_Z * z);
    const half = LAGRANGE_POINTS / 2;
    const mLo = Math.max(0, Math.floor(rhoMin / h) - half);
    const mHi = Math.ceil(rhoMax / h) + half;
    if (mHi - mLo + 1 < keptPoints) radial = { h, mLo, mHi };
  }
  return {
    k,
    A,
    planeSum,
    discs,
    horizontal: collectLines(rects, true),
    vertical: collectLines(rects, false),
    discRule,
    lineRule,
    directRule,
    xs,
    ys,
    mirrorX,
    mirrorY,
    radial,
    keptPoints,
  };
}

/**
 * The project's aperture as boundary regions, centred on the axis as mask.ts places it (a grating's
 * lines at (i − (count − 1)/2)·period); an opaque one as the free wave less the hole. Null for the
 * apertures infinitely long along y (a slit or grating without a length: 1-D problems).
 */
export function boundaryRegionsOf(a: Aperture): BoundaryRegion[] | null {
  const open = elementOf(a).boundary?.(a) ?? null;
  if (!open) return null;
  if (!a.opaque) return open;
  return [{ kind: 'plane', sign: 1 }, ...open.map((r) => ({ ...r, sign: (-r.sign) as 1 | -1 }))];
}

/** Σ over discs of −sign/(2π)·∮K ρ² dψ at foot distance d (relative to e^{ikz}); returns evaluations. */
function discsAt(p: BoundaryPlan, d: number, z: number, tmp: Float64Array, out: Float64Array, off: number): number {
  let ev = 0;
  let re = 0;
  let im = 0;
  for (const disc of p.discs) {
    ev += discContour(disc.radius, d, z, p.k, p.discRule, tmp);
    re -= disc.sign * tmp[0]!;
    im -= disc.sign * tmp[1]!;
  }
  out[off] = re / (2 * Math.PI);
  out[off + 1] = im / (2 * Math.PI);
  return ev;
}

/**
 * The range of |s| that readings s = end − v take for v between first and last (either order):
 * [0, max|s|] when s changes sign, else [min|s|, max|s|]; widened by rounding's worth.
 */
function readingRange(ends: Float64Array, first: number, last: number, out: Float64Array): void {
  let lo = Infinity;
  let hi = -Infinity;
  const vlo = Math.min(first, last);
  const vhi = Math.max(first, last);
  for (let e = 0; e < ends.length; e++) {
    lo = Math.min(lo, ends[e]! - vhi);
    hi = Math.max(hi, ends[e]! - vlo);
  }
  const pad = 1e-12 * Math.max(Math.abs(lo), Math.abs(hi));
  if (lo >= 0) {
    out[0] = Math.max(0, lo - pad);
    out[1] = hi + pad;
  } else if (hi <= 0) {
    out[0] = Math.max(0, -hi - pad);
    out[1] = -lo + pad;
  } else {
    out[0] = 0;
    out[1] = Math.max(-lo, hi) + pad;
  }
}

/** Work of the two ways of doing one line for one output row or column (see linePlan). */
interface LineChoice {
  table: boolean;
  evaluations: number;
  readings: number;
}

/** Outputs sampled to estimate the direct path's work. */
const DIRECT_SAMPLES = 8;

/**
 * Whether a table or direct integration is cheaper for this line at offset c, for the outputs
 * along[a0..a1), and the kernel evaluations and readings that choice makes (the table's exactly,
 * the direct path's estimated from a few outputs).
 */
function linePlan(p: BoundaryPlan, line: Lines, c: number, z: number, along: Axis, a0: number, a1: number, span: Float64Array): LineChoice {
  const nOut = a1 - a0;
  readingRange(line.ends, axisAt(along, a0), axisAt(along, a1 - 1), span);
  const tableEvals = lineTableCount(c, z, p.k, span[0]!, span[1]!, p.lineRule);
  const readings = line.ends.length * nOut;
  const tableWork = RSB_TABLE_EVAL_WORK * tableEvals + RSB_READ_WORK * readings;
  const st = line.stretches;
  const samples = Math.min(nOut, DIRECT_SAMPLES);
  let direct = 0;
  for (let q = 0; q < samples && RSB_STRETCH_EVAL_WORK * direct * (nOut / samples) < tableWork; q++) {
    const v = axisAt(along, a0 + Math.floor(((q + 0.5) * nOut) / samples));
    for (let m = 0; m < st.length; m += 3) direct += stretchIntegralCount(c, z, p.k, st[m]! - v, st[m + 1]! - v, p.directRule);
  }
  const directEvals = (direct * nOut) / samples;
  if (RSB_STRETCH_EVAL_WORK * directEvals < tableWork) return { table: false, evaluations: directEvals, readings: 0 };
  return { table: true, evaluations: tableEvals, readings };
}

/** Adds one line's integral at offset c for the outputs along[a0..a1) to data[base + stride·a], a ∈ [a0, a1). */
function doLine(
  p: BoundaryPlan,
  line: Lines,
  c: number,
  z: number,
  along: Axis,
  a0: number,
  a1: number,
  base: number,
  stride: number,
  table: LineTable,
  span: Float64Array,
  data: Float64Array,
  stats: RsBoundaryStats,
): void {
  const factor = -1 / (2 * Math.PI);
  const choice = linePlan(p, line, c, z, along, a0, a1, span);
  if (choice.table) {
    table.build(c, z, p.k, span[0]!, span[1]!);
    // Ends outermost: the readings of a run move monotonically through the table.
    for (let e = 0; e < line.ends.length; e++) {
      const end = line.ends[e]!;
      const wgt = factor * line.weights[e]!;
      for (let a = a0; a < a1; a++) table.addAt(end - axisAt(along, a), wgt, data, base + stride * a);
    }
    stats.readings += choice.readings;
  } else {
    const st = line.stretches;
    for (let a = a0; a < a1; a++) {
      const v = axisAt(along, a);
      for (let m = 0; m < st.length; m += 3)
        stats.evaluations += stretchIntegral(c, z, p.k, st[m]! - v, st[m + 1]! - v, p.directRule, factor * st[m + 2]!, data, base + stride * a);
    }
  }
}

/** k(r − z), r = √(ρ² + z²), without cancellation. */
function sphericalPhase(rho: number, z: number, k: number): number {
  // (Math.sqrt, not Math.hypot: this runs once per output point, and hypot is several times slower.)
  return (k * rho * rho) / (Math.sqrt(rho * rho + z * z) + z);
}

/** Multiplies the complex value at a[o] by e^{iφ}. */
function rotate(a: Float64Array, o: number, phi: number): void {
  const c = Math.cos(phi);
  const s = Math.sin(phi);
  const re = a[o]!;
  const im = a[o + 1]!;
  a[o] = re * c - im * s;
  a[o + 1] = re * s + im * c;
}

/** 1/Π_{m≠q}(q − m) for the nodes 0..p−1: 1/(q!·(p−1−q)!·(−1)^{p−1−q}). */
function lagrangeDenominators(p: number): Float64Array {
  const f = new Float64Array(p);
  for (let q = 0; q < p; q++) {
    let d = 1;
    for (let m = 0; m < p; m++) if (m !== q) d *= q - m;
    f[q] = 1 / d;
  }
  return f;
}

/**
 * The field on outX × outY (row-major [y][x], interleaved complex) at distance z behind the signed
 * sum of regions lit by a unit plane wave at normal incidence (first Rayleigh–Sommerfeld solution).
 */
export function rsBoundary(regions: BoundaryRegion[], wavelength: number, z: number, outX: Axis, outY: Axis, opts: RsBoundaryOptions = {}): Field {
  return rsBoundaryWithStats(regions, wavelength, z, outX, outY, opts).field;
}

/** rsBoundary, with what it did (for tests and calibration). */
export function rsBoundaryWithStats(
  regions: BoundaryRegion[],
  wavelength: number,
  z: number,
  outX: Axis,
  outY: Axis,
  opts: RsBoundaryOptions = {},
): { field: Field; stats: RsBoundaryStats } {
  const p = plan(regions, wavelength, z, outX, outY, opts);
  const field = createField(outX, outY, wavelength);
  const data = field.data;
  const nx = outX.n;
  const [x0, x1] = p.xs;
  const [y0, y1] = p.ys;
  const stats: RsBoundaryStats = { evaluations: 0, readings: 0, radii: 0, interpolated: 0, radial: p.radial !== null, mirrored: [p.mirrorX, p.mirrorY] };

  // Free wave (relative to e^{ikz}).
  if (p.planeSum !== 0) for (let i = y0; i < y1; i++) for (let j = x0; j < x1; j++) data[2 * (i * nx + j)] = p.planeSum;

  // Round parts.
  if (p.discs.length > 0) {
    const tmp = new Float64Array(2);
    if (p.radial) {
      const { h, mLo, mHi } = p.radial;
      const table = new Float64Array(2 * (mHi - mLo + 1));
      for (let m = mLo; m <= mHi; m++) {
        const o = 2 * (m - mLo);
        stats.evaluations += discsAt(p, m * h, z, tmp, table, o);
        rotate(table, o, -sphericalPhase(m * h, z, p.k));
      }
      stats.radii = mHi - mLo + 1;
      const P = LAGRANGE_POINTS;
      const cq = lagrangeDenominators(P);
      const suf = new Float64Array(P + 1);
      for (let i = y0; i < y1; i++) {
        const y = axisAt(outY, i);
        for (let j = x0; j < x1; j++) {
          const x = axisAt(outX, j);
          const rhoH = Math.sqrt(x * x + y * y);
          const rho = rhoH / h;
          const first = Math.floor(rho) - P / 2 + 1;
          const u = rho - first;
          // L_q(u) = Π_{m≠q}(u − m)·cq[q]: suffix products, then prefix products on the way
          // (no division; exact at the nodes, where every other factor vanishes).
          suf[P] = 1;
          for (let q = P - 1; q >= 0; q--) suf[q] = suf[q + 1]! * (u - q);
          let pre = 1;
          let vr = 0;
          let vi = 0;
          for (let q = 0; q < P; q++) {
            const l = pre * suf[q + 1]! * cq[q]!;
            pre *= u - q;
            const m = first + q;
            const idx = 2 * ((m < 0 ? -m : m) - mLo); // V(−ρ) = V(ρ)
            vr += l * table[idx]!;
            vi += l * table[idx + 1]!;
          }
          const ph = sphericalPhase(rhoH, z, p.k);
          const c = Math.cos(ph);
          const sn = Math.sin(ph);
          const o = 2 * (i * nx + j);
          data[o] = data[o]! + vr * c - vi * sn;
          data[o + 1] = data[o + 1]! + vr * sn + vi * c;
        }
      }
      stats.interpolated = p.keptPoints;
    } else {
      const v = new Float64Array(2);
      for (let i = y0; i < y1; i++) {
        const y = axisAt(outY, i);
        for (let j = x0; j < x1; j++) {
          const x = axisAt(outX, j);
          stats.evaluations += discsAt(p, Math.sqrt(x * x + y * y), z, tmp, v, 0);
          const o = 2 * (i * nx + j);
          data[o] = data[o]! + v[0]!;
          data[o + 1] = data[o + 1]! + v[1]!;
        }
      }
      stats.radii = p.keptPoints;
    }
  }

  // Straight edges, per line and output row (horizontal lines) or column (vertical): a table read
  // at every output, or each open stretch integrated at each output, whichever is cheaper.
  if (p.horizontal.length + p.vertical.length > 0) {
    const table = new LineTable(p.lineRule);
    const span = new Float64Array(2);
    for (const line of p.horizontal) {
      for (let i = y0; i < y1; i++) {
        const c = line.at - axisAt(outY, i);
        if (c === 0) continue; // the foot is on the line: its edges subtend no angle
        doLine(p, line, c, z, outX, x0, x1, 2 * i * nx, 2, table, span, data, stats);
      }
    }
    for (const line of p.vertical) {
      for (let j = x0; j < x1; j++) {
        const c = line.at - axisAt(outX, j);
        if (c === 0) continue;
        doLine(p, line, c, z, outY, y0, y1, 2 * j, 2 * nx, table, span, data, stats);
      }
    }
    stats.evaluations += table.evaluations;
  }

  // Put back e^{ikz}, then mirror.
  const kz = p.k * z;
  const c = Math.cos(kz);
  const s = Math.sin(kz);
  for (let i = y0; i < y1; i++) {
    for (let j = x0; j < x1; j++) {
      const o = 2 * (i * nx + j);
      const re = data[o]!;
      const im = data[o + 1]!;
      data[o] = re * c - im * s;
      data[o + 1] = re * s + im * c;
    }
  }
  if (p.mirrorX) {
    for (let i = y0; i < y1; i++) {
      for (let j = x0; j < x1; j++) {
        const jm = nx - 1 - j;
        if (jm === j) continue;
        data[2 * (i * nx + jm)] = data[2 * (i * nx + j)]!;
        data[2 * (i * nx + jm) + 1] = data[2 * (i * nx + j) + 1]!;
      }
    }
  }
  if (p.mirrorY) {
    const ny = outY.n;
    for (let i = y0; i < y1; i++) {
      const im = ny - 1 - i;
      if (im === i) continue;
      data.copyWithin(2 * im * nx, 2 * i * nx, 2 * (i + 1) * nx);
    }
  }
  return { field, stats };
}

// --- Cost ----------------------------------------------------------------------------------------
//
// In the planner's unit (src/plan/planner.ts: a direct Fourier sum counts 8 per complex
// multiply-add; 2e8 units ≈ 1 s of one core). The counts come from the same panel walks as the
// integrals, without the integrands, on a sample of the radii, rows and columns (within 5 % of what
// the computation does: rs-boundary-properties.test.ts).
//
// Calibrated by hand against dft1 (dft.ts) by CPU time (process.cpuUsage, best of 2–5 runs, Node
// 20, one thread, the development machine's two cores shared with two other jobs): dft1 over
// 2000 × 2000 took 5.3–5.6 ns per complex multiply-add, so one unit ≈ 0.67–0.70 ns here. Then:
// the disc contour 37–40 ns per evaluation alone and 70 units per evaluation over a 1001² annulus
// (its whole time less interpolation and output); a line table 58–64 ns per evaluation with its
// Chebyshev coefficients and 65–77 ns per reading (about 105 and 110 units in a 1001² rectangle);
// a straight stretch per output 32–38 ns per evaluation, 75–110 units with the calls' overhead in a
// far-field grating; 120 ns per interpolated output point (the 20 weights, a square root, a sine
// and a cosine); 30 units per output sample (the output array's first touch, e^{ikz}, mirroring);
// 1000 units per contour set-up (the rate's peak). Checked on the three cases of the report, a
// direct 101² disc and two gratings, three runs each: the estimate was 0.63–1.6 of the measured
// work (median 0.9; the spread is the machine's load, not the counts).

/** Work of one kernel evaluation in a contour. */
export const RSB_EVAL_WORK = 70;
/** Work of one kernel evaluation in a stretch integrated per output (short calls: more overhead). */
export const RSB_STRETCH_EVAL_WORK = 90;
/** Work of one kernel evaluation in a line table (with the panel's Chebyshev coefficients). */
export const RSB_TABLE_EVAL_WORK = 105;
/** Work of one line-table reading (the panel, two Clenshaw sums of 17 terms). */
export const RSB_READ_WORK = 110;
/** Work of one interpolated output point (20-point Lagrange, complex, and the spherical phase). */
export const RSB_INTERP_WORK = 180;
/** Work per output sample (the array's first touch, e^{ikz}, mirroring). */
export const RSB_POINT_WORK = 30;
/** Work of setting up one contour (the peak of its phase rate). */
export const RSB_CONTOUR_WORK = 1000;
/** Memory besides the output field and the radial table (the line table, small arrays). */
const RSB_BASE_MEMORY = 1 << 20;

export interface RsBoundaryCost {
  work: number;
  memory: number;
  evaluations: number;
  readings: number;
  interpolated: number;
}

const COST_SAMPLES = 48;

/** Evenly spread sample indices of [lo, hi) (all of them when few). */
function sampleIndices(lo: number, hi: number, count = COST_SAMPLES): number[] {
  const n = hi - lo;
  if (n <= count) return Array.from({ length: n }, (_, i) => lo + i);
  return Array.from({ length: count }, (_, i) => lo + Math.floor(((i + 0.5) * n) / count));
}

/** Samples per axis of a first, coarse look at the contours' cost (see costRsBoundary). */
const COARSE_SAMPLES = 6;
/**
 * Many discs (a zone plate's edges, up to thousands): their contours are costed on a spread of at
 * most this many, scaled to all (the count varies smoothly with the radius), and on fewer output
 * radii, so that the fine look walks at most about COST_WALKS contours. Walking every disc at 48²
 * radii held the planner for a minute at 10 000 discs. Cases of up to 8 discs are costed as before.
 */
const COST_DISCS = 64;
const COST_WALKS = 20_000;

/** The work and memory rsBoundary will take, from the geometry and the output grid (no integrals). */
export function costRsBoundary(
  regions: BoundaryRegion[],
  wavelength: number,
  z: number,
  outX: Axis,
  outY: Axis,
  opts: RsBoundaryOptions = {},
): RsBoundaryCost {
  const p = plan(regions, wavelength, z, outX, outY, opts);
  const [x0, x1] = p.xs;
  const [y0, y1] = p.ys;
  let evaluations = 0;
  let readings = 0;
  let interpolated = 0;
  if (p.discs.length > 0) {
    const stride = Math.ceil(p.discs.length / COST_DISCS);
    const costed = p.discs.filter((_, i) => i % stride === 0);
    const scale = p.discs.length / costed.length;
    const perRadius = (d: number) => scale * costed.reduce((s, disc) => s + discContourCount(disc.radius, d, z, p.k, p.discRule), 0);
    if (p.radial) {
      const { h, mLo, mHi } = p.radial;
      const ms = sampleIndices(mLo, mHi + 1);
      evaluations += (ms.reduce((s, m) => s + perRadius(m * h), 0) / ms.length) * (mHi - mLo + 1);
      interpolated = p.keptPoints;
    } else {
      const average = (count: number) => {
        const is = sampleIndices(y0, y1, count);
        const js = sampleIndices(x0, x1, count);
        let sum = 0;
        for (const i of is) for (const j of js) sum += perRadius(Math.hypot(axisAt(outX, j), axisAt(outY, i)));
        return sum / (is.length * js.length);
      };
      // A coarse look first: contours whose walk is cut short (discContourCount) belong to a case
      // far beyond any limit, and 48² of them would keep the planner for a second.
      const coarse = average(COARSE_SAMPLES);
      const huge = coarse > DISC_COUNT_WALK * p.discRule.n * p.discs.length;
      const fine = Math.max(COARSE_SAMPLES, Math.min(COST_SAMPLES, Math.floor(Math.sqrt(COST_WALKS / costed.length))));
      evaluations += (huge ? coarse : average(fine)) * p.keptPoints;
    }
  }
  let tableEvaluations = 0;
  let stretchEvaluations = 0;
  let largestTable = 0;
  const lines = (list: Lines[], along: Axis, a0: number, a1: number, across: Axis, b0: number, b1: number) => {
    const span = new Float64Array(2);
    for (const line of list) {
      const bs = sampleIndices(b0, b1);
      let ev = 0;
      let tev = 0;
      let rd = 0;
      for (const b of bs) {
        const c = line.at - axisAt(across, b);
        if (c === 0) continue;
        const choice = linePlan(p, line, c, z, along, a0, a1, span);
        if (choice.table) {
          tev += choice.evaluations;
          largestTable = Math.max(largestTable, choice.evaluations);
        } else ev += choice.evaluations;
        rd += choice.readings;
      }
      const scale = (b1 - b0) / bs.length;
      stretchEvaluations += ev * scale;
      tableEvaluations += tev * scale;
      readings += rd * scale;
    }
  };
  lines(p.horizontal, outX, x0, x1, outY, y0, y1);
  lines(p.vertical, outY, y0, y1, outX, x0, x1);
  const points = outX.n * outY.n;
  const contours = p.discs.length * (p.radial ? p.radial.mHi - p.radial.mLo + 1 : p.keptPoints);
  const work =
    RSB_EVAL_WORK * evaluations +
    RSB_STRETCH_EVAL_WORK * stretchEvaluations +
    RSB_TABLE_EVAL_WORK * tableEvaluations +
    RSB_READ_WORK * readings +
    RSB_INTERP_WORK * interpolated +
    RSB_POINT_WORK * points +
    RSB_CONTOUR_WORK * contours;
  evaluations += tableEvaluations + stretchEvaluations;
  // A line table keeps per panel its end, G there and 2(n + 1) Chebyshev coefficients.
  const tableBytes = (largestTable / LINE_NODES + 1) * (8 + 16 + 16 * (LINE_NODES + 1));
  const memory = RSB_BASE_MEMORY + 16 * points + (p.radial ? 16 * (p.radial.mHi - p.radial.mLo + 1) : 0) + 2 * tableBytes;
  return { work, memory, evaluations, readings, interpolated };
}
