// Wavefront error on a circular pupil as a sum of Zernike polynomials, in Noll's indexing and
// normalisation (R. J. Noll, "Zernike polynomials and atmospheric turbulence", JOSA 66, 207–211
// (1976)):
//   Z_j(ρ, θ) = √(n+1) R_n^m(ρ)                 m = 0
//             = √(2(n+1)) R_n^m(ρ) cos(mθ)      m ≠ 0, j even
//             = √(2(n+1)) R_n^|m|(ρ) sin(|m|θ)  m ≠ 0, j odd
//   R_n^m(ρ) = Σ_{s=0}^{(n−m)/2} (−1)^s (n−s)! / (s! ((n+m)/2 − s)! ((n−m)/2 − s)!) ρ^{n−2s}
// so that the mean of Z_j·Z_k over the unit disc is δ_jk: a term's coefficient is its RMS.
// W is an optical path error in waves; the pupil multiplies the field by exp(+i2πW) (a positive W
// is a longer path, a phase delay under the program's e^{i(kz − ωt)} convention).
import { discCellAverage } from './disc-rim-cells.js';
import { gaussLegendreRule } from './edge-cells.js';
import { axisAt, type Axis } from './field.js';
import { sampleMask2D } from './mask.js';

/** Radial degree n and signed azimuthal order m of Noll's index j (j ≥ 1). */
export function nollToNM(j: number): { n: number; m: number } {
  if (!Number.isInteger(j) || j < 1) throw new Error(`nollToNM: j must be a whole number ≥ 1 (got ${j})`);
  // Row n holds the n + 1 indices n(n+1)/2 < j ≤ (n+1)(n+2)/2.
  let n = Math.max(0, Math.floor((Math.sqrt(8 * j + 1) - 3) / 2));
  while ((n * (n + 1)) / 2 >= j) n--;
  while (((n + 1) * (n + 2)) / 2 < j) n++;
  const k = j - (n * (n + 1)) / 2 - 1;
  // |m| ascends along the row in pairs (cos and sin of the same order): 0,2,2,4,4… or 1,1,3,3…
  const am = n % 2 === 0 ? 2 * Math.floor((k + 1) / 2) : 2 * Math.floor(k / 2) + 1;
  // Noll's rule: an even j carries the cosine (m > 0), an odd j the sine (m < 0).
  return { n, m: am === 0 ? 0 : j % 2 === 0 ? am : -am };
}

/** One term ready to evaluate: its order, normalisation and the radial coefficients in ρ². */
interface PreparedTerm {
  n: number;
  m: number; // signed, as nollToNM
  norm: number;
  /** R_n^|m|(ρ) = ρ^|m| · Σ_i c_i (ρ²)^i, c_i ascending powers of ρ². */
  c: Float64Array;
  weight: number;
}

function prepare(j: number, weight: number): PreparedTerm {
  const { n, m } = nollToNM(j);
  const am = Math.abs(m);
  const a = (n + am) / 2;
  const b = (n - am) / 2;
  // Coefficient of ρ^{n−2s}: c_0 = n!/(a! b!) = binom(n, b), then the ratio
  // c_{s+1}/c_s = −(a − s)(b − s)/((s + 1)(n − s)) — products of small integers, no big factorials.
  const byS = new Float64Array(b + 1);
  let c0 = 1;
  for (let i = 1; i <= b; i++) c0 = (c0 * (n - b + i)) / i;
  byS[0] = c0;
  for (let s = 0; s < b; s++) byS[s + 1] = (-byS[s]! * (a - s) * (b - s)) / ((s + 1) * (n - s));
  // ρ^{n−2s} = ρ^{|m|}·(ρ²)^{b−s}.
  const c = new Float64Array(b + 1);
  for (let s = 0; s <= b; s++) c[b - s] = byS[s]!;
  const norm = m === 0 ? Math.sqrt(n + 1) : Math.sqrt(2 * (n + 1));
  return { n, m, norm, c, weight };
}

/** Z of a prepared term at (ρ, θ), for any ρ ≥ 0 (the polynomial, not cut at the rim). */
function evalPrepared(t: PreparedTerm, rho: number, theta: number): number {
  const r2 = rho * rho;
  let p = 0;
  for (let i = t.c.length - 1; i >= 0; i--) p = p * r2 + t.c[i]!;
  const am = Math.abs(t.m);
  if (am > 0) p *= rho ** am;
  if (t.m > 0) return t.norm * p * Math.cos(am * theta);
  if (t.m < 0) return t.norm * p * Math.sin(am * theta);
  return t.norm * p;
}

/**
 * Noll's Z_j at polar coordinates (ρ, θ) of the unit pupil, RMS 1 over the disc. Outside the pupil
 * (ρ > 1) it is 0: the polynomials are defined on the pupil only, and a value out there would be
 * read as light where there is none.
 */
export function zernike(j: number, rho: number, theta: number): number {
  if (!(rho >= 0)) throw new Error(`zernike: ρ must be ≥ 0 (got ${rho})`);
  if (rho > 1) return 0;
  return evalPrepared(prepare(j, 1), rho, theta);
}

/** One term of a wavefront error: Noll's index and its RMS over the pupil in waves. */
export interface ZernikeTerm {
  j: number;
  rms: number;
}

function prepareAll(terms: readonly ZernikeTerm[]): PreparedTerm[] {
  // Sorted by |m|: waveAt then only advances its powers of (u + iv).
  return terms
    .filter((t) => t.rms !== 0)
    .map((t) => prepare(t.j, t.rms))
    .sort((a, b) => Math.abs(a.m) - Math.abs(b.m));
}

/**
 * Σ rms_j Z_j at (x, y) for a pupil of radius R, any point (the polynomial's continuation). In
 * Cartesian form, without atan2 or trigonometry: ρ^|m|·cos(mθ) and ρ^|m|·sin(|m|θ) are the real and
 * imaginary parts of (u + iv)^|m|, u = x/R, v = y/R, so Z_j = norm·P_j(u² + v²)·Re or Im of that power.
 */
function waveAt(prepared: readonly PreparedTerm[], radius: number, x: number, y: number): number {
  const u = x / radius;
  const v = y / radius;
  const r2 = u * u + v * v;
  let w = 0;
  // (u + iv)^k, advanced as the terms ask for higher k (terms in any order).
  let k = 0;
  let pr = 1;
  let pi = 0;
  for (const t of prepared) {
    let p = 0;
    for (let i = t.c.length - 1; i >= 0; i--) p = p * r2 + t.c[i]!;
    const am = Math.abs(t.m);
    if (am < k) {
      k = 0;
      pr = 1;
      pi = 0;
    }
    while (k < am) {
      const nr = pr * u - pi * v;
      pi = pr * v + pi * u;
      pr = nr;
      k++;
    }
    w += t.weight * t.norm * p * (t.m > 0 ? pr : t.m < 0 ? pi : 1);
  }
  return w;
}

function checkRadius(radius: number, who: string): void {
  if (!(radius > 0) || !Number.isFinite(radius)) throw new Error(`${who}: the pupil radius must be a positive length (got ${radius})`);
}

/** Optical path error in waves at (x, y) for a pupil of radius R centred on 0; 0 outside the pupil. */
export function wavefrontWaves(terms: readonly ZernikeTerm[], radius: number, x: number, y: number): number {
  checkRadius(radius, 'wavefrontWaves');
  if (x * x + y * y > radius * radius) return 0;
  return waveAt(prepareAll(terms), radius, x, y);
}

/**
 * Σ rms_j Z_j as a function of (x, y) for a pupil of radius R, the terms prepared once (for callers
 * that evaluate it at many points, such as a wavefront map's cell averages), or null when every term
 * is zero. The polynomial's continuation: not cut at the rim.
 */
export function zernikeSum(terms: readonly ZernikeTerm[], radius: number): ((x: number, y: number) => number) | null {
  checkRadius(radius, 'zernikeSum');
  const prepared = prepareAll(terms);
  if (prepared.length === 0) return null;
  return (x, y) => waveAt(prepared, radius, x, y);
}

/**
 * RMS of the wavefront over the pupil in waves, piston (j = 1) left out: √Σ rms_j² by
 * orthonormality, after adding up the coefficients of a j given more than once.
 */
export function wavefrontRms(terms: readonly ZernikeTerm[]): number {
  const byJ = new Map<number, number>();
  for (const t of terms) {
    nollToNM(t.j); // validates j
    if (t.j === 1) continue;
    byJ.set(t.j, (byJ.get(t.j) ?? 0) + t.rms);
  }
  let s = 0;
  for (const c of byJ.values()) s += c * c;
  return Math.sqrt(s);
}

/** Maréchal/Mahajan estimate of the Strehl ratio exp(−(2πσ)²), σ in waves (V. N. Mahajan, JOSA 72, 1258 (1982)). */
export function strehlEstimate(rmsWaves: number): number {
  if (!(rmsWaves >= 0)) throw new Error(`strehlEstimate: the RMS must be ≥ 0 waves (got ${rmsWaves})`);
  const p = 2 * Math.PI * rmsWaves;
  return Math.exp(-p * p);
}

/**
 * max over the unit disc of |∇Z_j| for one term, as a guaranteed upper bound. For
 * Z = N·R(ρ)·cos(mθ) (or sin), |∇Z|² = N²(R′² cos² mθ + (mR/ρ)² sin² mθ), whose largest value over θ
 * is N²·max(R′², (mR/ρ)²): the θ-maximum is exact, leaving a 1-D maximum over ρ ∈ [0, 1] of two
 * polynomials of degree d = n − 1 (R′ and mR/ρ; R(0) = 0 when m ≠ 0). They are sampled at K + 1
 * equally spaced radii; both have the parity of d, so their maxima on [0, 1] and [−1, 1] agree, and
 * Markov's inequality on [−1, 1] (|p′| ≤ d²·max|p| for degree d; A. A. Markov, 1889, from memory)
 * bounds what lies between samples: max ≤ sampled / (1 − d²/(2K)). K = 32d² keeps that factor ≤ 1.016.
 */
function termSlopeMax(t: PreparedTerm): number {
  const d = t.n - 1;
  if (d < 0) return 0; // piston
  if (d === 0) return t.norm; // tilt: R = ρ, |∇Z| = N everywhere
  const am = Math.abs(t.m);
  const K = 32 * d * d;
  let best = 0;
  for (let i = 0; i <= K; i++) {
    const rho = i / K;
    const r2 = rho * rho;
    // R = ρ^|m|·P(u), u = ρ²: R′ = ρ^{|m|−1}(|m|P + 2u·P′(u)), R/ρ = ρ^{|m|−1}P.
    let p = 0;
    let q = 0; // P′(u)
    for (let k = t.c.length - 1; k >= 0; k--) {
      q = q * r2 + p;
      p = p * r2 + t.c[k]!;
    }
    const lead = am > 0 ? rho ** (am - 1) : 0;
    const dR = am > 0 ? lead * (am * p + 2 * r2 * q) : 2 * rho * q;
    const rOverRho = am > 0 ? am * lead * p : 0;
    best = Math.max(best, Math.abs(dR), Math.abs(rOverRho));
  }
  return (t.norm * best) / (1 - (d * d) / (2 * K));
}

/**
 * Largest local spatial frequency the wavefront imposes: an upper bound on max |∇W| over the pupil,
 * in waves per metre (W in waves). Each term's largest gradient is bounded by termSlopeMax (exact in
 * θ, sampled in ρ and made a guaranteed bound by Markov's inequality, at most 1.6 % above the true
 * value), then summed with |rms| weights (the triangle inequality: exact when one term dominates,
 * loose when terms steepen in different places) and divided by R.
 */
export function wavefrontSlopeMax(terms: readonly ZernikeTerm[], radius: number): number {
  checkRadius(radius, 'wavefrontSlopeMax');
  let s = 0;
  for (const t of prepareAll(terms)) s += Math.abs(t.weight) * termSlopeMax(t);
  return s / radius;
}

/** Largest admissible accuracy of a cell average from the Gauss–Legendre rule (per cell, absolute). */
const CELL_RULE_EPS = 1e-13;
/** Nodes per axis of one panel at most; wider phase changes are cut into panels. */
const CELL_RULE_MAX_NODES = 8;

/**
 * The remainder bound of the n-point Gauss–Legendre rule on [−1, 1] for e^{iωt} relative to the
 * interval's length (Abramowitz & Stegun 25.4.30: 2^{2n+1}(n!)⁴/((2n+1)((2n)!)³)·max|f^{(2n)}|, and
 * |f^{(2n)}| = ω^{2n}), halved to be a bound on the mean.
 */
function gaussMeanError(n: number, omega: number): number {
  let fact = 1;
  for (let i = 2; i <= n; i++) fact *= i;
  let fact2 = fact;
  for (let i = n + 1; i <= 2 * n; i++) fact2 *= i;
  return (Math.pow(2 * omega, 2 * n) * fact ** 4) / ((2 * n + 1) * fact2 ** 3);
}

/**
 * Panels per cell side and nodes per panel side that average e^{iφ} over a cell to CELL_RULE_EPS,
 * where φ changes by at most 2ω across the cell along either axis (ω = π·slope·step).
 */
export function cellRuleFor(omega: number): { panels: number; nodes: number } {
  // Margin for the curvature of φ within a cell, which the linear model e^{iωt} leaves out.
  const w = 1.25 * omega + 1e-3;
  for (let n = 2; n <= CELL_RULE_MAX_NODES; n++) if (gaussMeanError(n, w) <= CELL_RULE_EPS) return { panels: 1, nodes: n };
  let p = 2;
  while (gaussMeanError(CELL_RULE_MAX_NODES, w / p) > CELL_RULE_EPS) p++;
  return { panels: p, nodes: CELL_RULE_MAX_NODES };
}

/**
 * The pupil's complex transmittance on a grid, as cell averages (interleaved complex, row-major
 * [y][x]): exp(i2πW(x, y)) inside the disc of radius R, 0 outside, W from wavefrontWaves.
 *
 * Within a cell the phase is smooth (a polynomial), so its average is taken by a tensor
 * Gauss–Legendre rule whose size follows from the wavefront's slope bound (wavefrontSlopeMax): with
 * a phase change of at most 2ω across a cell (ω = π·G·Δ, G the bound in waves per metre), the
 * A&S 25.4.30 remainder for e^{iωt} must be below 1e-13 (with a 25 % margin for the phase's
 * curvature). At the planner's four samples per period of the finest frequency (2ω ≤ π/2) that is
 * 7 nodes per axis (49 per cell); at Nyquist (2ω ≤ π) 8; steeper wavefronts cut the cell into
 * panels of 8 × 8 nodes. The bound G can exceed the true slope (terms added by the triangle
 * inequality), which only adds nodes.
 *
 * Rim cells (0 < q < 1, q the disc's exact open fraction from mask.ts): the mean of exp(i2πW) over
 * the open part of the cell only (disc-rim-cells.ts), times q. Averaging the smooth continuation over
 * the whole cell instead would be off by q(1−q)·(mean over the open part − mean over the closed
 * part), first order in the phase step per cell, and behind a strongly aberrated pupil the rim's
 * light is no small part of the field.
 */
export function pupilCellAverages(terms: readonly ZernikeTerm[], radius: number, xa: Axis, ya: Axis, out?: Float64Array): Float64Array {
  checkRadius(radius, 'pupilCellAverages');
  const size = 2 * xa.n * ya.n;
  const res = out ?? new Float64Array(size);
  if (res.length !== size) throw new Error(`pupilCellAverages: out holds ${res.length} numbers, the grid ${size}`);
  res.fill(0);
  const open = sampleMask2D({ shape: 'circle', diameter: 2 * radius, opaque: false }, xa, ya);
  const prepared = prepareAll(terms);
  const slope = wavefrontSlopeMax(terms, radius);
  const omega = Math.PI * slope * Math.max(Math.abs(xa.step), Math.abs(ya.step));
  const { panels, nodes } = cellRuleFor(omega);
  const rule = gaussLegendreRule(nodes);
  // Offsets of the nodes from the cell centre in units of the step, and their weights (sum 1).
  const m = panels * nodes;
  const off = new Float64Array(m);
  const wt = new Float64Array(m);
  for (let p = 0; p < panels; p++) {
    for (let i = 0; i < nodes; i++) {
      off[p * nodes + i] = -0.5 + (p + 0.5 + 0.5 * rule.x[i]!) / panels;
      wt[p * nodes + i] = (0.5 * rule.w[i]!) / panels;
    }
  }
  for (let r = 0; r < ya.n; r++) {
    const yc = axisAt(ya, r);
    for (let c = 0; c < xa.n; c++) {
      const q = open[r * xa.n + c]!;
      if (q === 0) continue;
      const xc = axisAt(xa, c);
      let re = 0;
      let im = 0;
      if (prepared.length === 0) re = 1;
      else if (q < 1) {
        const [ar, ai] = discCellAverage((x, y) => 2 * Math.PI * waveAt(prepared, radius, x, y), radius, xc, yc, xa.step, ya.step, { panels, nodes });
        // discCellAverage is already over the cell's whole area (it carries q).
        const at = 2 * (r * xa.n + c);
        res[at] = ar;
        res[at + 1] = ai;
        continue;
      } else {
        for (let a = 0; a < m; a++) {
          const y = yc + off[a]! * ya.step;
          let rowRe = 0;
          let rowIm = 0;
          for (let b = 0; b < m; b++) {
            const phi = 2 * Math.PI * waveAt(prepared, radius, xc + off[b]! * xa.step, y);
            rowRe += wt[b]! * Math.cos(phi);
            rowIm += wt[b]! * Math.sin(phi);
          }
          re += wt[a]! * rowRe;
          im += wt[a]! * rowIm;
        }
      }
      const at = 2 * (r * xa.n + c);
      res[at] = q * re;
      res[at + 1] = q * im;
    }
  }
  return res;
}
