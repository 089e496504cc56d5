// The first Rayleigh–Sommerfeld solution evaluated directly: exact for the scalar problem at any
// distance and angle (no paraxial or far-field step), with any output window and pitch.
//
// 1-D (aperture invariant along y): U(x, z) = ∫ U₀(ξ)·h₁(x − ξ) dξ, h₁(Δx) = (ikz/2r)·H₁⁽¹⁾(kr),
// r = √(Δx² + z²). It is −2∂G/∂z of the 2-D Green's function G = (i/4)H₀⁽¹⁾(kr) (∂H₀/∂z = −H₁·kz/r).
// For kr → ∞, H₁⁽¹⁾(kr) → √(2/(πkr))·e^{i(kr − 3π/4)} and h₁ → (z/r)·e^{ikr}/√(iλr), the 1-D
// far-field prefactor of direct.ts. Writing H₁⁽¹⁾ = √(2/(πkr))(P + iQ)e^{i(kr−3π/4)} (hankel.ts),
// h₁ = (z/r)·(P + iQ)·e^{ikr}·e^{−iπ/4}/√(λr) exactly.
//
// Sums over cells (rs-cells.ts): the contribution of cell j at output x is
// a_j·h₁(x − c_j)·h_j·F, F the cell integral of rs-moments.ts: the linear phase across the cell,
// s = t_j − φ′(r_j)·(x − c_j)/r_j, integrated exactly (F = sinc(h_j·s/2π) if nothing else varied),
// and the kernel's and the envelope's amplitude slope and curvature and the kernel's phase
// curvature to second order. φ′, the rate of the kernel's phase along r, comes from the Wronskian
// (hankel1PhaseRate): k/|P + iQ|², k up to O(1/(kr)²). Edges are cell edges, so they are exact.
// Accuracy and the cell rule: rs-cells.ts (rsMaxCell).
import besselj1 from '@stdlib/math-base-special-besselj1';
import bessely1 from '@stdlib/math-base-special-bessely1';
import type { Axis } from './field.js';
import { asymptoticP, asymptoticQ, hankel1PhaseRate, HANKEL_ASYMPTOTIC_FROM } from './hankel.js';
import { cellsFromIntervals, type Interval, type RsCells } from './rs-cells.js';
import { sincMoments } from './rs-moments.js';

export { cellsFromIntervals, rsMaxCell, rsAreaSamplingError, RS_PHASE_BUDGET, RS_DEFAULT_PHASE_BUDGET } from './rs-cells.js';
export type { Interval, Light1D, RsCells } from './rs-cells.js';
export { rsDirect2D, type RsDirect2DOptions } from './rs-2d.js';
export { costRsDirect1D, costRsPerPeriod1D, costRsDirect2D, RS1D_PAIR_WORK, RS2D_PAIR_WORK } from './rs-cost.js';
export { rsCells2DFromAperture, rsCellCount2D, RS_DEFAULT_EDGE_NODES, type RsCells2D, type RsCells2DOptions, type RsBoxCells, type RsEdgeCells, type RoundSource } from './rs-2d-cells.js';
export { rsSum2D, type RsSum2DResult } from './rs-2d-sum.js';
export { rsSum2DChoice, summarizeCells, radialPlan, type RsCellSummary, type RsSum2DChoice, type RsSum2DOptions, type RsSum2DPath } from './rs-2d-paths.js';
export { rs2DPitch, rs2DCurvatureError, rs2DEdgeError, rs2DEnvelopeError, rs2DEdgeNodesFor, type Rs2DPitch, type Rs2DPitchOptions } from './rs-2d-rule.js';
export { rs2DSampling, rs2DSinMax, type Rs2DSampling } from './rs-2d-plan.js';
export { costRsSum2D, memoryRsSum2D, rs2DEdgePairWork, RS2D_BOX_PAIR_WORK, RS2D_GAUSSIAN_BOX_PAIR_WORK, RS2D_RADIAL_POINT_WORK } from './rs-cost.js';

const TWO_PI = 2 * Math.PI;

/**
 * The field at the output points `out` (interleaved complex, out.n values) of the cells at
 * distance z. Per cell and output point: the kernel (a square root pair, a sine and cosine of kr)
 * and the cell integral (a sine and cosine), see rs-moments.ts.
 *
 * The kernel's logarithm about a cell centre (Δ = x − c, r = √(Δ² + z²), u = ξ − c): r_u = −Δ/r,
 * r_uu = z²/r³; ln|h₁| = −(3/2)ln r + const (+ ln|P + iQ|, whose slope is O((kr)⁻³)·k and dropped);
 * the phase rate φ′ along r from the Wronskian. So the linear coefficient is 3Δ/(2r²) − iφ′Δ/r and
 * the quadratic one (½ the second derivative) 3(Δ² − z²)/(4r⁴) + iφ′z²/(2r³) (the phase rate's own
 * change, O(1/(k r³)), dropped). The cell's envelope adds its β, γ.
 */
export function rsDirect1D(cells: RsCells, wavelength: number, z: number, out: Axis): Float64Array {
  if (!(z > 0)) throw new Error('rsDirect1D: the distance must be positive');
  const k = (2 * Math.PI) / wavelength;
  const invLam = 1 / wavelength;
  const z2 = z * z;
  const n = cells.n;
  const c = cells.centre;
  const t = cells.slope;
  const lb = cells.logSlope;
  const lg = cells.logCurv;
  const half = new Float64Array(n);
  // a_j·h_j, the cell's weight before the cell integral's factor.
  const wr = new Float64Array(n);
  const wi = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    half[j] = cells.width[j]! / 2;
    wr[j] = cells.amp[2 * j]! * cells.width[j]!;
    wi[j] = cells.amp[2 * j + 1]! * cells.width[j]!;
  }
  const m = new Float64Array(3);
  const res = new Float64Array(2 * out.n);
  // Near-kernel pairs (kr < HANKEL_ASYMPTOTIC_FROM) multiply by e^{+iπ/4} so that the one rotation
  // by e^{−iπ/4} at the end suits both branches.
  const f0 = (k * z) / 2;
  for (let o = 0; o < out.n; o++) {
    const x = out.start + o * out.step;
    let sr = 0;
    let si = 0;
    for (let j = 0; j < n; j++) {
      const dx = x - c[j]!;
      const r = Math.sqrt(dx * dx + z2);
      const ir = 1 / r;
      const kr = k * r;
      let hr: number;
      let hi: number;
      let rate: number;
      if (kr >= HANKEL_ASYMPTOTIC_FROM) {
        const p = asymptoticP(kr);
        const q = asymptoticQ(kr);
        const amp = (z * ir) / Math.sqrt(wavelength * r);
        // kr reduced to [0, 2π) as 2π·frac(r/λ): Math.cos and Math.sin take a slow argument
        // reduction above about 2²⁰·π/2 (kr is 10⁷ at a metre), 4–8 times the cost here. The
        // rounding is that of forming k·r itself (relative 2⁻⁵³).
        const cyc = r * invLam;
        const ph = TWO_PI * (cyc - Math.floor(cyc));
        const cs = Math.cos(ph);
        const sn = Math.sin(ph);
        hr = amp * (p * cs - q * sn);
        hi = amp * (p * sn + q * cs);
        rate = k / (p * p + q * q);
      } else {
        // (ikz/2r)(J + iY)·e^{iπ/4}
        const jv = besselj1(kr);
        const yv = bessely1(kr);
        const f = f0 * ir;
        const ar = -f * yv;
        const ai = f * jv;
        hr = (ar - ai) * Math.SQRT1_2;
        hi = (ar + ai) * Math.SQRT1_2;
        rate = k * hankel1PhaseRate(kr, jv * jv + yv * yv);
      }
      const hh = half[j]!;
      const ir2 = ir * ir;
      const b = lb[j]! + 1.5 * dx * ir2;
      const gr = lg[j]! + 0.75 * (dx * dx - z2) * ir2 * ir2;
      const gi = 0.5 * rate * z2 * ir2 * ir;
      sincMoments(hh * (t[j]! - rate * dx * ir), m);
      const h2s2 = hh * hh * m[2]!;
      const fr = m[0]! - (0.5 * b * b + gr) * h2s2;
      const fi = -b * hh * m[1]! - gi * h2s2;
      // (a_j h_j)·factor·kernel
      const ur = wr[j]! * fr - wi[j]! * fi;
      const ui = wr[j]! * fi + wi[j]! * fr;
      sr += ur * hr - ui * hi;
      si += ur * hi + ui * hr;
    }
    // × e^{−iπ/4}
    res[2 * o] = (sr + si) * Math.SQRT1_2;
    res[2 * o + 1] = (si - sr) * Math.SQRT1_2;
  }
  return res;
}

/**
 * An output axis whose pitch is s·g, g = period/p (p, s whole numbers), covering [lo, hi]: the
 * form the per-period sums need. Of the axes with step ≤ wantedStep it takes the smallest p (the
 * lattice of pitch g, where one period's field is evaluated, is the cost) and then the largest s.
 * The start is a whole number of steps from 0, so a window symmetric about the axis has a sample
 * on it. Steps are compared with a relative allowance of 1e-9 (a wanted step of exactly s periods,
 * as computed, gives s).
 */
export function periodicAxis(period: number, wantedStep: number, lo: number, hi: number): { axis: Axis; p: number; s: number } {
  if (!(period > 0) || !(wantedStep > 0) || !(hi >= lo)) throw new Error('periodicAxis: needs period > 0, wantedStep > 0, hi ≥ lo');
  const ratio = wantedStep / period;
  const p = ratio >= 1 - 1e-9 ? 1 : Math.ceil(1 / ratio - 1e-9);
  const s = Math.max(1, Math.floor(ratio * p + 1e-9));
  const step = (s * period) / p;
  const first = Math.floor(lo / step + 1e-9);
  const last = Math.ceil(hi / step - 1e-9);
  return { axis: { n: last - first + 1, start: first * step, step }, p, s };
}

/** A grating of `count` identical periods; `open` holds one period's open intervals relative to its origin. */
export interface PeriodicAperture {
  period: number;
  count: number;
  /** Origin of the first period (m); period n starts at firstOrigin + n·period. */
  firstOrigin: number;
  open: Interval[];
}

/**
 * The field of a grating lit by a (tilted) plane wave on an axis from periodicAxis:
 * U(x) = Σ_{n<N} wⁿ·V(x − n·d), w = e^{ik·sinθ·d}, V the field of the first period (rsDirect1D on
 * its cells). With x_j = x₀ + j·s·g and g = d/p, x_j − n·d = L_{(N−1)p + js − np} on the lattice
 * L_i = x₀ − (N−1)d + i·g, so V is evaluated once per lattice point and the sum over n is the
 * strided recurrence T_i = V_i + w·T_{i−p}, U_j = T_i − w^N·T_{i−Np} (i = (N−1)p + js).
 *
 * Rounding: T_i carries all earlier terms of its chain, but whatever rounding went into
 * T_{i−Np} reaches T_i multiplied by the same w^N (to N roundings) that the subtraction removes;
 * what stays is the rounding of the last N steps, about N·2⁻⁵³·max|T|. w^N is formed from the
 * rounded w by squaring, as the recurrence applies it, and w is not renormalised: its modulus is
 * 1 to one rounding, which over a million steps changes |T| by 1e-10 relative at most and cancels
 * in the difference as above.
 */
export function rsPerPeriod1D(
  grating: PeriodicAperture,
  light: { sinTilt: number },
  wavelength: number,
  z: number,
  out: { axis: Axis; p: number; s: number },
  maxCell: number,
): Float64Array {
  const { period: d, count: N, firstOrigin } = grating;
  const { axis, p, s } = out;
  if (!(N >= 1) || !Number.isInteger(N)) throw new Error('rsPerPeriod1D: count must be a whole number ≥ 1');
  if (!Number.isInteger(p) || !Number.isInteger(s) || p < 1 || s < 1) throw new Error('rsPerPeriod1D: p and s must be whole numbers ≥ 1');
  const g = d / p;
  if (Math.abs(axis.step - s * g) > 1e-9 * axis.step) {
    throw new Error(`rsPerPeriod1D: the output step ${axis.step} is not s·period/p = ${s * g}`);
  }
  const m = (N - 1) * p + (axis.n - 1) * s + 1;
  const lattice: Axis = { n: m, start: axis.start - (N - 1) * d, step: g };
  const shifted = grating.open.map((iv) => ({ lo: firstOrigin + iv.lo, hi: firstOrigin + iv.hi }));
  const cells = cellsFromIntervals(shifted, { sinTilt: light.sinTilt }, wavelength, maxCell);
  const tr = rsDirect1D(cells, wavelength, z, lattice);
  const phi = ((2 * Math.PI) / wavelength) * light.sinTilt * d;
  const w0 = Math.cos(phi);
  const w1 = Math.sin(phi);
  // In place: T_i = V_i + w·T_{i−p}.
  for (let i = p; i < m; i++) {
    const a = 2 * (i - p);
    const pr = tr[a]!;
    const pi = tr[a + 1]!;
    tr[2 * i] = tr[2 * i]! + w0 * pr - w1 * pi;
    tr[2 * i + 1] = tr[2 * i + 1]! + w0 * pi + w1 * pr;
  }
  const [wn0, wn1] = complexPower(w0, w1, N);
  const res = new Float64Array(2 * axis.n);
  for (let j = 0; j < axis.n; j++) {
    const i = (N - 1) * p + j * s;
    let ur = tr[2 * i]!;
    let ui = tr[2 * i + 1]!;
    const b = i - N * p;
    if (b >= 0) {
      const br = tr[2 * b]!;
      const bi = tr[2 * b + 1]!;
      ur -= wn0 * br - wn1 * bi;
      ui -= wn0 * bi + wn1 * br;
    }
    res[2 * j] = ur;
    res[2 * j + 1] = ui;
  }
  return res;
}

/** (a + ib)^n by repeated squaring. */
function complexPower(a: number, b: number, n: number): [number, number] {
  let rr = 1;
  let ri = 0;
  let br = a;
  let bi = b;
  let e = n;
  while (e > 0) {
    if (e & 1) {
      const t = rr * br - ri * bi;
      ri = rr * bi + ri * br;
      rr = t;
    }
    const t = br * br - bi * bi;
    bi = 2 * br * bi;
    br = t;
    e = Math.floor(e / 2);
  }
  return [rr, ri];
}
