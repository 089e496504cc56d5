// The direct 2-D Rayleigh–Sommerfeld sum over cells with exact edges (rs-2d-cells.ts):
// U(x, y, z) = ∬ U₀(ξ, η)·h dξdη, h = (1/2π)(z/r)(1/r − ik)e^{ikr}/r, r = √(Δx² + Δy² + z²)
// (Goodman, Introduction to Fourier Optics, §3.5), exact at any distance and angle.
//
// Per cell and output point (Δ = output − cell centre): the kernel's logarithm ψ(r) about the
// centre, ψ′ = a1 + i·rate, ψ″ = a2 + i·b2 with
//   a1 = −(2 + d)/r, rate = k(1 − d), a2 = (2 + (1 + 3(kr)²)d²)/r², b2 = 2k²·kr·d², d = 1/(1 + (kr)²)
// (the phase of 1/r − ik included), and r_u = −Δx/r, r_uu = (r² − Δx²)/r³, r_uw = −ΔxΔy/r³. Its
// imaginary linear part plus the carrier, s = k(α, β) + rate·(r_u, r_w), is the linear phase
// across the cell; the rest, exp(B·u + ½uᵀΓu) with B = a1·∇r (+ the envelope's slope) and
// Γ = ψ″∇r∇rᵀ + ψ′∇∇r (+ the envelope's curvature), is expanded to second order.
// - A box cell integrates e^{is·u}(1 + B·u + …) exactly: with S(v) = sin v/v and v = s·h/2 per axis,
//   ∬ = area·[SₓS_y − iBₓhₓS′ₓS_y − iB_yh_ySₓS′_y − Qₓₓhₓ²S″ₓS_y − Q_yyh_y²SₓS″_y − Qₓ_yhₓh_yS′ₓS′_y],
//   Qₓₓ = Bₓ²/2 + Γₓₓ/2, Qₓ_y = BₓB_y + Γₓ_y (rs-moments.ts gives the same per axis).
// - An edge cell evaluates the integrand at its m × m nodes: Σ_pq W_pq·X_p·Y_q·(1 + Γₓ_y·u_p·w_q),
//   X_p = e^{isₓu_p}(1 + Bₓu_p + Qₓₓu_p²) (likewise Y_q): the node rule is exact for the open
//   part's moments, so only the interpolation of this integrand limits it (edge-cells.ts).
// Accuracy and cost: rs-2d-rule.ts and rs-cost.ts.
//
// Sines and cosines: the kernel's phase is taken as 2π·frac(r/λ) (Math.cos of a large kr would
// cost a slow argument reduction) and its sine and cosine, like those of the cell factors, come
// from fastSinCos below: polynomials on [−π/4, π/4] after a quadrant reduction, within 2e-16 of
// Math.sin and Math.cos (tested), at about a third of their cost.
import { axisAt, createField, type Axis, type Field } from './field.js';
import type { RsCells2D } from './rs-2d-cells.js';
import { RADIAL_STENCIL, rsSum2DChoice, summarizeCells, type RadialPlan, type RsSum2DOptions, type RsSum2DPath } from './rs-2d-paths.js';

export type { RsSum2DOptions, RsSum2DPath } from './rs-2d-paths.js';

const TWO_PI = 2 * Math.PI;

// Taylor coefficients of sin t / t and cos t in t² (to t¹⁶: the first term left out is below
// 5e-17 for |t| ≤ π/4).
const S1 = -1 / 6;
const S2 = 1 / 120;
const S3 = -1 / 5040;
const S4 = 1 / 362880;
const S5 = -1 / 39916800;
const S6 = 1 / 6227020800;
const S7 = -1 / 1307674368000;
const C1 = -1 / 2;
const C2 = 1 / 24;
const C3 = -1 / 720;
const C4 = 1 / 40320;
const C5 = -1 / 3628800;
const C6 = 1 / 479001600;
const C7 = -1 / 87178291200;
const C8 = 1 / 20922789888000;
// π/2 in two parts (the first with 33 significant bits, so q·PIO2_HI is exact for |q| < 2²⁰).
const PIO2_HI = 1.5707963267341256;
const PIO2_LO = 6.077100506506192e-11;
const TWO_OVER_PI = 2 / Math.PI;
// sin(t + qπ/2) = sin t·QA[q] + cos t·QB[q], cos(t + qπ/2) = cos t·QA[q] − sin t·QB[q].
const QA = new Float64Array([1, 0, -1, 0]);
const QB = new Float64Array([0, 1, 0, -1]);

/** sin x and cos x into out[0], out[1], for |x| < 2²⁰·π/2 (the sums' arguments are far smaller). */
export function fastSinCos(x: number, out: Float64Array): void {
  const q = Math.round(x * TWO_OVER_PI);
  const t = x - q * PIO2_HI - q * PIO2_LO;
  const t2 = t * t;
  const s = t + t * t2 * (S1 + t2 * (S2 + t2 * (S3 + t2 * (S4 + t2 * (S5 + t2 * (S6 + t2 * S7))))));
  const c = 1 + t2 * (C1 + t2 * (C2 + t2 * (C3 + t2 * (C4 + t2 * (C5 + t2 * (C6 + t2 * (C7 + t2 * C8)))))));
  const i = q & 3;
  const a = QA[i]!;
  const b = QB[i]!;
  out[0] = s * a + c * b;
  out[1] = c * a - s * b;
}

/** sin and cos of 2π·f for f in cycles (any finite f; only its fraction matters). */
export function fastSinCosCycles(f: number, out: Float64Array): void {
  const fr = f - Math.floor(f);
  const q = Math.floor(4 * fr + 0.5);
  const t = TWO_PI * (fr - 0.25 * q);
  const t2 = t * t;
  const s = t + t * t2 * (S1 + t2 * (S2 + t2 * (S3 + t2 * (S4 + t2 * (S5 + t2 * (S6 + t2 * S7))))));
  const c = 1 + t2 * (C1 + t2 * (C2 + t2 * (C3 + t2 * (C4 + t2 * (C5 + t2 * (C6 + t2 * (C7 + t2 * C8)))))));
  const i = q & 3;
  const a = QA[i]!;
  const b = QB[i]!;
  out[0] = s * a + c * b;
  out[1] = c * a - s * b;
}

// Taylor series of S(v) = sin v/v, S′ and S″ in v² below |v| = 0.5 (to v¹⁰, v⁹, v⁸: truncation
// under 4e-14, 1e-12, 2e-11; the last two only scale second-order terms), as rs-moments.ts:
// the closed forms lose digits to cancellation there.
const T01 = -1 / 6;
const T02 = 1 / 120;
const T03 = -1 / 5040;
const T04 = 1 / 362880;
const T05 = -1 / 39916800;
const T11 = -1 / 3;
const T12 = 1 / 30;
const T13 = -1 / 840;
const T14 = 1 / 45360;
const T15 = -1 / 3991680;
const T21 = -1 / 3;
const T22 = 1 / 10;
const T23 = -1 / 168;
const T24 = 1 / 6480;
const T25 = -1 / 443520;
// The same coefficients from the second-highest down, for the complex Horner loops.
const SERIES0 = [T04, T03, T02, T01, 1];
const SERIES1 = [T14, T13, T12, T11];
const SERIES2 = [T24, T23, T22, T21];
const SERIES3 = [1 / 1512, -1 / 70, 1 / 5];
const SERIES4 = [5 / 1512, -3 / 70, 1 / 5];

export interface RsSum2DResult {
  field: Field;
  path: RsSum2DPath;
  /** Mirror path: which output axes were mirrored. */
  mirrored: { x: boolean; y: boolean };
  /** Radial path: the radial samples (ρ_j = j·step, j = first … first + n − 1). */
  radial: { first: number; n: number; step: number } | null;
  /** Cell × point pairs summed (box and edge apart). */
  pairs: { box: number; edge: number };
  /** The work the path was costed at (rs-cost.ts units). */
  work: number;
}

/** Work space of the row sums, allocated once per call. */
interface Work {
  bey: Float64Array;
  bq: Float64Array;
  eey: Float64Array;
  eq: Float64Array;
  cmx: Float64Array;
  cmy: Float64Array;
  sc: Float64Array;
  xr: Float64Array;
  xi: Float64Array;
  xur: Float64Array;
  xui: Float64Array;
  /** The sum at one point (of the boxes, then of the edge cells). */
  acc: Float64Array;
}

function workFor(c: RsCells2D): Work {
  const m = c.edge.m;
  return {
    bey: new Float64Array(c.box.n),
    bq: new Float64Array(c.box.n),
    eey: new Float64Array(c.edge.n),
    eq: new Float64Array(c.edge.n),
    cmx: new Float64Array(10),
    cmy: new Float64Array(10),
    sc: new Float64Array(2),
    xr: new Float64Array(m),
    xi: new Float64Array(m),
    xur: new Float64Array(m),
    xui: new Float64Array(m),
    acc: new Float64Array(2),
  };
}

/**
 * The field of the cells at points (x_c, y), c = 0..cols−1 of xs, into dst[at + 2c], dst[at + 2c + 1].
 */
function sumRow(c: RsCells2D, z: number, xs: Axis, cols: number, y: number, dst: Float64Array, at: number, wk: Work): void {
  const z2 = z * z;
  const nb = c.box.n;
  const ne = c.edge.n;
  const { bey, bq, eey, eq, acc } = wk;
  for (let j = 0; j < nb; j++) {
    const ey = y - c.box.cy[j]!;
    bey[j] = ey;
    bq[j] = ey * ey + z2;
  }
  for (let j = 0; j < ne; j++) {
    const ey = y - c.edge.cy[j]!;
    eey[j] = ey;
    eq[j] = ey * ey + z2;
  }
  const gaussian = c.envCurv !== 0;
  for (let col = 0; col < cols; col++) {
    const x = xs.start + col * xs.step;
    let sr = 0;
    let si = 0;
    if (nb > 0) {
      if (gaussian) sumBoxGaussianAt(c, x, z, wk);
      else sumBoxPlaneAt(c, x, z, wk);
      sr += acc[0]!;
      si += acc[1]!;
    }
    if (ne > 0) {
      sumEdgeAt(c, x, z, wk);
      sr += acc[0]!;
      si += acc[1]!;
    }
    dst[at + 2 * col] = sr;
    dst[at + 2 * col + 1] = si;
  }
}

/**
 * The box cells' contribution at (x, y) into wk.acc, the light a plane wave (no envelope). The
 * sines and cosines are fastSinCos written out (V8 inlines little into a loop this long).
 */
function sumBoxPlaneAt(c: RsCells2D, x: number, z: number, wk: Work): void {
  const lam = c.wavelength;
  const k = TWO_PI / lam;
  const invLam = 1 / lam;
  const k2 = k * k;
  const sx0 = c.slope[0];
  const sy0 = c.slope[1];
  const { cx: bcx, hx: bhx, hy: bhy, ar: bar, ai: bai, n: nb } = c.box;
  const { bey, bq, acc } = wk;
  let sr = 0;
  let si = 0;
  acc[0] = 0;
  acc[1] = 0;
  for (let j = 0; j < nb; j++) {
    const ex = x - bcx[j]!;
    const ey = bey[j]!;
    const r2 = ex * ex + bq[j]!;
    const r = Math.sqrt(r2);
    const ir = 1 / r;
    // e^{ikr}: kr as 2π·frac(r/λ), quadrant and polynomials (fastSinCosCycles).
    let sn: number;
    let cs: number;
    {
      const cyc = r * invLam;
      const fr = cyc - Math.floor(cyc);
      const q = Math.floor(4 * fr + 0.5);
      const t = TWO_PI * (fr - 0.25 * q);
      const t2 = t * t;
      const ps = t + t * t2 * (S1 + t2 * (S2 + t2 * (S3 + t2 * (S4 + t2 * (S5 + t2 * (S6 + t2 * S7))))));
      const pc = 1 + t2 * (C1 + t2 * (C2 + t2 * (C3 + t2 * (C4 + t2 * (C5 + t2 * (C6 + t2 * (C7 + t2 * C8)))))));
      const i = q & 3;
      sn = ps * QA[i]! + pc * QB[i]!;
      cs = pc * QA[i]! - ps * QB[i]!;
    }
    const f = z * ir * ir;
    const hr = f * (ir * cs + k * sn);
    const hi = f * (ir * sn - k * cs);
    const kr2 = k2 * r2;
    const d = 1 / (1 + kr2);
    const rate = k * (1 - d);
    const a1 = -ir * (2 + d);
    const a2 = ir * ir * (2 + (1 + 3 * kr2) * d * d);
    const b2 = 2 * k2 * k * r * d * d;
    const ux = -ex * ir;
    const uy = -ey * ir;
    const ir3 = ir * ir * ir;
    const cxx = (r2 - ex * ex) * ir3;
    const cyy = (r2 - ey * ey) * ir3;
    const cxy = -ex * ey * ir3;
    const bx = a1 * ux;
    const by = a1 * uy;
    const qxxr = 0.5 * (a2 * ux * ux + a1 * cxx + bx * bx);
    const qxxi = 0.5 * (b2 * ux * ux + rate * cxx);
    const qyyr = 0.5 * (a2 * uy * uy + a1 * cyy + by * by);
    const qyyi = 0.5 * (b2 * uy * uy + rate * cyy);
    const qxyr = a2 * ux * uy + a1 * cxy + bx * by;
    const qxyi = b2 * ux * uy + rate * cxy;
    const hx = bhx[j]!;
    const hy = bhy[j]!;
    // S, S′, S″ at v = h·s along x and y (sincMomentsFast, written out).
    let m0x: number;
    let m1x: number;
    let m2x: number;
    {
      const v = hx * (sx0 + rate * ux);
      if (Math.abs(v) < 0.5) {
        const v2 = v * v;
        m0x = 1 + v2 * (T01 + v2 * (T02 + v2 * (T03 + v2 * (T04 + v2 * T05))));
        m1x = v * (T11 + v2 * (T12 + v2 * (T13 + v2 * (T14 + v2 * T15))));
        m2x = T21 + v2 * (T22 + v2 * (T23 + v2 * (T24 + v2 * T25)));
      } else {
        const q = Math.round(v * TWO_OVER_PI);
        const t = v - q * PIO2_HI - q * PIO2_LO;
        const t2 = t * t;
        const ps = t + t * t2 * (S1 + t2 * (S2 + t2 * (S3 + t2 * (S4 + t2 * (S5 + t2 * (S6 + t2 * S7))))));
        const pc = 1 + t2 * (C1 + t2 * (C2 + t2 * (C3 + t2 * (C4 + t2 * (C5 + t2 * (C6 + t2 * (C7 + t2 * C8)))))));
        const i = q & 3;
        const iv = 1 / v;
        m0x = (ps * QA[i]! + pc * QB[i]!) * iv;
        m1x = (pc * QA[i]! - ps * QB[i]! - m0x) * iv;
        m2x = -m0x - 2 * m1x * iv;
      }
    }
    let m0y: number;
    let m1y: number;
    let m2y: number;
    {
      const v = hy * (sy0 + rate * uy);
      if (Math.abs(v) < 0.5) {
        const v2 = v * v;
        m0y = 1 + v2 * (T01 + v2 * (T02 + v2 * (T03 + v2 * (T04 + v2 * T05))));
        m1y = v * (T11 + v2 * (T12 + v2 * (T13 + v2 * (T14 + v2 * T15))));
        m2y = T21 + v2 * (T22 + v2 * (T23 + v2 * (T24 + v2 * T25)));
      } else {
        const q = Math.round(v * TWO_OVER_PI);
        const t = v - q * PIO2_HI - q * PIO2_LO;
        const t2 = t * t;
        const ps = t + t * t2 * (S1 + t2 * (S2 + t2 * (S3 + t2 * (S4 + t2 * (S5 + t2 * (S6 + t2 * S7))))));
        const pc = 1 + t2 * (C1 + t2 * (C2 + t2 * (C3 + t2 * (C4 + t2 * (C5 + t2 * (C6 + t2 * (C7 + t2 * C8)))))));
        const i = q & 3;
        const iv = 1 / v;
        m0y = (ps * QA[i]! + pc * QB[i]!) * iv;
        m1y = (pc * QA[i]! - ps * QB[i]! - m0y) * iv;
        m2y = -m0y - 2 * m1y * iv;
      }
    }
    const tx = hx * hx * m2x * m0y;
    const ty = hy * hy * m0x * m2y;
    const txy = hx * hy * m1x * m1y;
    const gr = m0x * m0y - qxxr * tx - qyyr * ty - qxyr * txy;
    const gi = -bx * hx * m1x * m0y - by * hy * m0x * m1y - qxxi * tx - qyyi * ty - qxyi * txy;
    const wr = bar[j]! * gr - bai[j]! * gi;
    const wi = bar[j]! * gi + bai[j]! * gr;
    sr += wr * hr - wi * hi;
    si += wr * hi + wi * hr;
    // Stored in the loop: a store after it would have no type feedback when V8 compiles the loop
    // on stack, and the cached loop code would then deoptimise at every call's end.
    acc[0] = sr;
    acc[1] = si;
  }
}

/**
 * S(v), S′(v), S″(v), S‴(v), S⁗(v) of a complex v = re + i·im into m[0..9] (re, im pairs): sin v/v and its
 * derivatives, the same series and closed forms as for real v, sin and cos of the complex
 * argument from sin, cos of re and cosh, sinh of im.
 */
function sincMomentsComplex(re: number, im: number, m: Float64Array, sc: Float64Array): void {
  if (re * re + im * im < 0.25) {
    // Horner in v² (complex), the coefficients T of the real series.
    const ar = re * re - im * im;
    const ai = 2 * re * im;
    let pr = T05;
    let pi = 0;
    let t: number;
    for (const coef of SERIES0) {
      t = pr * ar - pi * ai + coef;
      pi = pr * ai + pi * ar;
      pr = t;
    }
    m[0] = pr;
    m[1] = pi;
    pr = T15;
    pi = 0;
    for (const coef of SERIES1) {
      t = pr * ar - pi * ai + coef;
      pi = pr * ai + pi * ar;
      pr = t;
    }
    m[2] = pr * re - pi * im;
    m[3] = pr * im + pi * re;
    pr = T25;
    pi = 0;
    for (const coef of SERIES2) {
      t = pr * ar - pi * ai + coef;
      pi = pr * ai + pi * ar;
      pr = t;
    }
    m[4] = pr;
    m[5] = pi;
    // S‴ = v(1/5 − v²/70 + v⁴/1512 − v⁶/79200), S⁗ = 1/5 − 3v²/70 + 5v⁴/1512 − 7v⁶/79200
    // (from the series of S; truncation under 1e-10 for |v| < 0.5, and they only scale the
    // envelope's fourth-order term).
    pr = -1 / 79200;
    pi = 0;
    for (const coef of SERIES3) {
      t = pr * ar - pi * ai + coef;
      pi = pr * ai + pi * ar;
      pr = t;
    }
    m[6] = pr * re - pi * im;
    m[7] = pr * im + pi * re;
    pr = -7 / 79200;
    pi = 0;
    for (const coef of SERIES4) {
      t = pr * ar - pi * ai + coef;
      pi = pr * ai + pi * ar;
      pr = t;
    }
    m[8] = pr;
    m[9] = pi;
    return;
  }
  fastSinCos(re, sc);
  const e = Math.exp(im);
  const ie = 1 / e;
  const ch = 0.5 * (e + ie);
  const sh = 0.5 * (e - ie);
  // sin(re + i·im) = sin re·cosh im + i cos re·sinh im; cos(re + i·im) = cos re·cosh im − i sin re·sinh im.
  const snr = sc[0]! * ch;
  const sni = sc[1]! * sh;
  const csr = sc[1]! * ch;
  const csi = -sc[0]! * sh;
  const d = 1 / (re * re + im * im);
  const ivr = re * d;
  const ivi = -im * d;
  const s0r = snr * ivr - sni * ivi;
  const s0i = snr * ivi + sni * ivr;
  const ur = csr - s0r;
  const ui = csi - s0i;
  const s1r = ur * ivr - ui * ivi;
  const s1i = ur * ivi + ui * ivr;
  m[0] = s0r;
  m[1] = s0i;
  m[2] = s1r;
  m[3] = s1i;
  const s2r = -s0r - 2 * (s1r * ivr - s1i * ivi);
  const s2i = -s0i - 2 * (s1r * ivi + s1i * ivr);
  m[4] = s2r;
  m[5] = s2i;
  // S‴ = −(3S″ + vS′ + S)/v, S⁗ = −(4S‴ + vS″ + 2S′)/v: S satisfies vS″ + 2S′ + vS = 0
  // (sin″ = −sin), differentiated once and twice.
  let ar = 3 * s2r + (re * s1r - im * s1i) + s0r;
  let ai = 3 * s2i + (re * s1i + im * s1r) + s0i;
  const s3r = -(ar * ivr - ai * ivi);
  const s3i = -(ar * ivi + ai * ivr);
  ar = 4 * s3r + (re * s2r - im * s2i) + 2 * s1r;
  ai = 4 * s3i + (re * s2i + im * s2r) + 2 * s1i;
  m[6] = s3r;
  m[7] = s3i;
  m[8] = -(ar * ivr - ai * ivi);
  m[9] = -(ar * ivi + ai * ivr);
}

/**
 * The box cells' contribution at (x, y) into wk.acc under a Gaussian envelope: the envelope's
 * log-slope β (per cell) is integrated exactly with the phase slope, e^{(β + is)u} being
 * e^{is′u} with s′ = s − iβ, so the box factor is the one of sumBoxPlaneAt at the complex argument
 * v = h(s − iβ); only the log-curvature γ = −1/w² goes into the second-order terms. (Expanding
 * e^{βu} to second order as well errs by (βh)³ terms, which are large where the light on the open
 * part is the beam's steep tail: an annulus whose inner edge is at 2–3 waists.)
 */
function sumBoxGaussianAt(c: RsCells2D, x: number, z: number, wk: Work): void {
  const lam = c.wavelength;
  const k = TWO_PI / lam;
  const invLam = 1 / lam;
  const k2 = k * k;
  const sx0 = c.slope[0];
  const sy0 = c.slope[1];
  const g = c.envCurv;
  const { cx: bcx, hx: bhx, hy: bhy, ar: bar, ai: bai, bx: bbx, by: bby, n: nb } = c.box;
  const { bey, bq, acc, cmx, cmy, sc } = wk;
  let sr = 0;
  let si = 0;
  acc[0] = 0;
  acc[1] = 0;
  for (let j = 0; j < nb; j++) {
    const ex = x - bcx[j]!;
    const ey = bey[j]!;
    const r2 = ex * ex + bq[j]!;
    const r = Math.sqrt(r2);
    const ir = 1 / r;
    fastSinCosCycles(r * invLam, sc);
    const sn = sc[0]!;
    const cs = sc[1]!;
    const f = z * ir * ir;
    const hr = f * (ir * cs + k * sn);
    const hi = f * (ir * sn - k * cs);
    const kr2 = k2 * r2;
    const d = 1 / (1 + kr2);
    const rate = k * (1 - d);
    const a1 = -ir * (2 + d);
    const a2 = ir * ir * (2 + (1 + 3 * kr2) * d * d);
    const b2 = 2 * k2 * k * r * d * d;
    const ux = -ex * ir;
    const uy = -ey * ir;
    const ir3 = ir * ir * ir;
    const cxx = (r2 - ex * ex) * ir3;
    const cyy = (r2 - ey * ey) * ir3;
    const cxy = -ex * ey * ir3;
    const bx = a1 * ux;
    const by = a1 * uy;
    const qxxr = 0.5 * (a2 * ux * ux + a1 * cxx + bx * bx) + g;
    const qxxi = 0.5 * (b2 * ux * ux + rate * cxx);
    const qyyr = 0.5 * (a2 * uy * uy + a1 * cyy + by * by) + g;
    const qyyi = 0.5 * (b2 * uy * uy + rate * cyy);
    const qxyr = a2 * ux * uy + a1 * cxy + bx * by;
    const qxyi = b2 * ux * uy + rate * cxy;
    const hx = bhx[j]!;
    const hy = bhy[j]!;
    sincMomentsComplex(hx * (sx0 + rate * ux), -hx * bbx[j]!, cmx, sc);
    sincMomentsComplex(hy * (sy0 + rate * uy), -hy * bby[j]!, cmy, sc);
    // Complex S, S′, S″ per axis.
    const x0r = cmx[0]!;
    const x0i = cmx[1]!;
    const x1r = cmx[2]!;
    const x1i = cmx[3]!;
    const x2r = cmx[4]!;
    const x2i = cmx[5]!;
    const y0r = cmy[0]!;
    const y0i = cmy[1]!;
    const y1r = cmy[2]!;
    const y1i = cmy[3]!;
    const y2r = cmy[4]!;
    const y2i = cmy[5]!;
    // Products of the moments (complex).
    const p00r = x0r * y0r - x0i * y0i;
    const p00i = x0r * y0i + x0i * y0r;
    const p10r = x1r * y0r - x1i * y0i;
    const p10i = x1r * y0i + x1i * y0r;
    const p01r = x0r * y1r - x0i * y1i;
    const p01i = x0r * y1i + x0i * y1r;
    const p20r = hx * hx * (x2r * y0r - x2i * y0i);
    const p20i = hx * hx * (x2r * y0i + x2i * y0r);
    const p02r = hy * hy * (x0r * y2r - x0i * y2i);
    const p02i = hy * hy * (x0r * y2i + x0i * y2r);
    const p11r = hx * hy * (x1r * y1r - x1i * y1i);
    const p11i = hx * hy * (x1r * y1i + x1i * y1r);
    // S S − iBx hx S′S − iBy hy S S′ − Qxx hx² S″S − Qyy hy² S S″ − Qxy hx hy S′S′ (B real, Q complex)
    // The envelope's e^{γ(u² + w²)} to second order: + γ²(u⁴/2 + w⁴/2 + u²w²), with
    // ∬u⁴ → hx⁴S⁗S, ∬u²w² → hx²hy²S″S″ (the moments' (−i)⁴ = 1, (−i)²(−i)² = 1).
    const hx2 = hx * hx;
    const hy2 = hy * hy;
    const e4r = 0.5 * hx2 * hx2 * (cmx[8]! * y0r - cmx[9]! * y0i) + 0.5 * hy2 * hy2 * (x0r * cmy[8]! - x0i * cmy[9]!) + hx2 * hy2 * (x2r * y2r - x2i * y2i);
    const e4i = 0.5 * hx2 * hx2 * (cmx[8]! * y0i + cmx[9]! * y0r) + 0.5 * hy2 * hy2 * (x0r * cmy[9]! + x0i * cmy[8]!) + hx2 * hy2 * (x2r * y2i + x2i * y2r);
    const g2 = g * g;
    const gr = p00r + bx * hx * p10i + by * hy * p01i - (qxxr * p20r - qxxi * p20i) - (qyyr * p02r - qyyi * p02i) - (qxyr * p11r - qxyi * p11i) + g2 * e4r;
    const gi = p00i - bx * hx * p10r - by * hy * p01r - (qxxr * p20i + qxxi * p20r) - (qyyr * p02i + qyyi * p02r) - (qxyr * p11i + qxyi * p11r) + g2 * e4i;
    const wr = bar[j]! * gr - bai[j]! * gi;
    const wi = bar[j]! * gi + bai[j]! * gr;
    sr += wr * hr - wi * hi;
    si += wr * hi + wi * hr;
    acc[0] = sr;
    acc[1] = si;
  }
}

/**
 * The edge cells' contribution at (x, y) (y through wk.eey, wk.eq) into wk.acc:
 * Σ_q Y_q·Σ_p W_qp·X_p·(1 + Γxy·u_p·w_q). The nodes come in pairs ±u (ascending, u[m−1−p] = −u[p]),
 * so X is kept as X⁺ (the positive node) and X⁻ (its mirror) per pair, and rows q come in pairs
 * too: a⁺ = W·X⁺ and a⁻ = W·X⁻ give both Σ W X (a⁺ + a⁻) and Σ W u X (u·(a⁺ − a⁻)).
 */
function sumEdgeAt(c: RsCells2D, x: number, z: number, wk: Work): void {
  const lam = c.wavelength;
  const k = TWO_PI / lam;
  const invLam = 1 / lam;
  const k2 = k * k;
  const sx0 = c.slope[0];
  const sy0 = c.slope[1];
  const { m, u, cx: ecx, ar: ear, ai: eai, w: W, n: ne } = c.edge;
  const { eey, eq, xr, xi, xur, xui, acc } = wk;
  const half = m >> 1;
  const mm = m * m;
  let sr = 0;
  let si = 0;
  acc[0] = 0;
  acc[1] = 0;
  for (let j = 0; j < ne; j++) {
    const ex = x - ecx[j]!;
    const ey = eey[j]!;
    const r2 = ex * ex + eq[j]!;
    const r = Math.sqrt(r2);
    const ir = 1 / r;
    let sn: number;
    let cs: number;
    {
      const cyc = r * invLam;
      const fr = cyc - Math.floor(cyc);
      const q = Math.floor(4 * fr + 0.5);
      const t = TWO_PI * (fr - 0.25 * q);
      const t2 = t * t;
      const ps = t + t * t2 * (S1 + t2 * (S2 + t2 * (S3 + t2 * (S4 + t2 * (S5 + t2 * (S6 + t2 * S7))))));
      const pc = 1 + t2 * (C1 + t2 * (C2 + t2 * (C3 + t2 * (C4 + t2 * (C5 + t2 * (C6 + t2 * (C7 + t2 * C8)))))));
      const i = q & 3;
      sn = ps * QA[i]! + pc * QB[i]!;
      cs = pc * QA[i]! - ps * QB[i]!;
    }
    const f = z * ir * ir;
    const hr = f * (ir * cs + k * sn);
    const hi = f * (ir * sn - k * cs);
    const kr2 = k2 * r2;
    const d = 1 / (1 + kr2);
    const rate = k * (1 - d);
    const a1 = -ir * (2 + d);
    const a2 = ir * ir * (2 + (1 + 3 * kr2) * d * d);
    const b2 = 2 * k2 * k * r * d * d;
    const ux = -ex * ir;
    const uy = -ey * ir;
    const ir3 = ir * ir * ir;
    const cxx = (r2 - ex * ex) * ir3;
    const cyy = (r2 - ey * ey) * ir3;
    const cxy = -ex * ey * ir3;
    const bx = a1 * ux;
    const by = a1 * uy;
    const qxxr = 0.5 * (a2 * ux * ux + a1 * cxx + bx * bx);
    const qxxi = 0.5 * (b2 * ux * ux + rate * cxx);
    const qyyr = 0.5 * (a2 * uy * uy + a1 * cyy + by * by);
    const qyyi = 0.5 * (b2 * uy * uy + rate * cyy);
    const gxyr = a2 * ux * uy + a1 * cxy;
    const gxyi = b2 * ux * uy + rate * cxy;
    const sx = sx0 + rate * ux;
    const sy = sy0 + rate * uy;
    // X⁺ (xr, xi) and X⁻ (xur, xui) of node pair i: u = u[half + i] > 0,
    // X± = e^{±isu}(1 ± Bx·u + Qxx·u²).
    for (let i = 0; i < half; i++) {
      const uu = u[half + i]!;
      const u2 = uu * uu;
      let s: number;
      let co: number;
      {
        const v = sx * uu;
        const q = Math.round(v * TWO_OVER_PI);
        const t = v - q * PIO2_HI - q * PIO2_LO;
        const t2 = t * t;
        const ps = t + t * t2 * (S1 + t2 * (S2 + t2 * (S3 + t2 * (S4 + t2 * (S5 + t2 * (S6 + t2 * S7))))));
        const pc = 1 + t2 * (C1 + t2 * (C2 + t2 * (C3 + t2 * (C4 + t2 * (C5 + t2 * (C6 + t2 * (C7 + t2 * C8)))))));
        const qi = q & 3;
        s = ps * QA[qi]! + pc * QB[qi]!;
        co = pc * QA[qi]! - ps * QB[qi]!;
      }
      const pr = 1 + qxxr * u2;
      const pim = qxxi * u2;
      const bu = bx * uu;
      // (co + i s)(pr + bu + i pim) and (co − i s)(pr − bu + i pim)
      const ap = pr + bu;
      const am = pr - bu;
      xr[i] = co * ap - s * pim;
      xi[i] = co * pim + s * ap;
      xur[i] = co * am + s * pim;
      xui[i] = co * pim - s * am;
    }
    let tr = 0;
    let ti = 0;
    let vr = 0;
    let vi = 0;
    const base = j * mm;
    for (let qq = 0; qq < half; qq++) {
      const w = u[half + qq]!;
      // Y for +w (row half + qq) and −w (row half − 1 − qq).
      let s: number;
      let co: number;
      {
        const v = sy * w;
        const q = Math.round(v * TWO_OVER_PI);
        const t = v - q * PIO2_HI - q * PIO2_LO;
        const t2 = t * t;
        const ps = t + t * t2 * (S1 + t2 * (S2 + t2 * (S3 + t2 * (S4 + t2 * (S5 + t2 * (S6 + t2 * S7))))));
        const pc = 1 + t2 * (C1 + t2 * (C2 + t2 * (C3 + t2 * (C4 + t2 * (C5 + t2 * (C6 + t2 * (C7 + t2 * C8)))))));
        const qi = q & 3;
        s = ps * QA[qi]! + pc * QB[qi]!;
        co = pc * QA[qi]! - ps * QB[qi]!;
      }
      const w2 = w * w;
      const pr = 1 + qyyr * w2;
      const pim = qyyi * w2;
      const bw = by * w;
      const ap = pr + bw;
      const am = pr - bw;
      const y1r = co * ap - s * pim;
      const y1i = co * pim + s * ap;
      const y2r = co * am + s * pim;
      const y2i = co * pim - s * am;
      const row1 = base + (half + qq) * m;
      const row2 = base + (half - 1 - qq) * m;
      let z1r = 0;
      let z1i = 0;
      let z1ur = 0;
      let z1ui = 0;
      let z2r = 0;
      let z2i = 0;
      let z2ur = 0;
      let z2ui = 0;
      for (let i = 0; i < half; i++) {
        const pp = half + i;
        const pm = half - 1 - i;
        const xpr = xr[i]!;
        const xpi = xi[i]!;
        const xmr = xur[i]!;
        const xmi = xui[i]!;
        const uu = u[pp]!;
        let wp = W[row1 + pp]!;
        let wm = W[row1 + pm]!;
        let apr = wp * xpr;
        let api = wp * xpi;
        let amr = wm * xmr;
        let ami = wm * xmi;
        z1r += apr + amr;
        z1i += api + ami;
        z1ur += uu * (apr - amr);
        z1ui += uu * (api - ami);
        wp = W[row2 + pp]!;
        wm = W[row2 + pm]!;
        apr = wp * xpr;
        api = wp * xpi;
        amr = wm * xmr;
        ami = wm * xmi;
        z2r += apr + amr;
        z2i += api + ami;
        z2ur += uu * (apr - amr);
        z2ui += uu * (api - ami);
      }
      tr += y1r * z1r - y1i * z1i + (y2r * z2r - y2i * z2i);
      ti += y1r * z1i + y1i * z1r + (y2r * z2i + y2i * z2r);
      vr += w * (y1r * z1ur - y1i * z1ui - (y2r * z2ur - y2i * z2ui));
      vi += w * (y1r * z1ui + y1i * z1ur - (y2r * z2ui + y2i * z2ur));
    }
    // T + Γxy·V
    const gr = tr + gxyr * vr - gxyi * vi;
    const gi = ti + gxyr * vi + gxyi * vr;
    const wr = ear[j]! * gr - eai[j]! * gi;
    const wi = ear[j]! * gi + eai[j]! * gr;
    sr += wr * hr - wi * hi;
    si += wr * hi + wi * hr;
    // Stored in the loop (see sumBoxPlaneAt).
    acc[0] = sr;
    acc[1] = si;
  }
}

/** The cells folded about y = 0 (rows at ±η summed into η ≥ 0): for points on the line y = 0. */
function foldY(c: RsCells2D): RsCells2D {
  const b = c.box;
  const keepB: number[] = [];
  for (let j = 0; j < b.n; j++) if (b.cy[j]! >= 0) keepB.push(j);
  const pick = (a: Float64Array, idx: number[], scale?: (j: number) => number) => Float64Array.from(idx, (j) => a[j]! * (scale ? scale(j) : 1));
  const twiceB = (j: number) => (b.cy[j]! > 0 ? 2 : 1);
  const e = c.edge;
  const keepE: number[] = [];
  for (let j = 0; j < e.n; j++) if (e.cy[j]! >= 0) keepE.push(j);
  const twiceE = (j: number) => (e.cy[j]! > 0 ? 2 : 1);
  const mm = e.m * e.m;
  const w = new Float64Array(keepE.length * mm);
  keepE.forEach((j, i) => w.set(e.w.subarray(j * mm, (j + 1) * mm), i * mm));
  return {
    ...c,
    box: {
      n: keepB.length,
      cx: pick(b.cx, keepB),
      cy: pick(b.cy, keepB),
      hx: pick(b.hx, keepB),
      hy: pick(b.hy, keepB),
      ar: pick(b.ar, keepB, twiceB),
      ai: pick(b.ai, keepB, twiceB),
      bx: pick(b.bx, keepB),
      by: pick(b.by, keepB),
    },
    edge: { ...e, n: keepE.length, cx: pick(e.cx, keepE), cy: pick(e.cy, keepE), ar: pick(e.ar, keepE, twiceE), ai: pick(e.ai, keepE, twiceE), w },
  };
}

/**
 * The field of the cells at distance z on the points outX × outY (Field: row-major [y][x]).
 * Takes the radial path for a round source (U(ρ) on radial samples, interpolated by a 12-point
 * Lagrange stencil), the mirror path for a source even about an axis on a symmetric window, or
 * sums every point; the result says which.
 */
export function rsSum2D(cells: RsCells2D, wavelength: number, z: number, outX: Axis, outY: Axis, opts: RsSum2DOptions = {}): RsSum2DResult {
  if (!(z > 0)) throw new Error('rsSum2D: the distance must be positive');
  if (Math.abs(wavelength - cells.wavelength) > 1e-12 * cells.wavelength) throw new Error('rsSum2D: the cells were built for another wavelength');
  if (!(outX.n >= 1) || !(outY.n >= 1)) throw new Error('rsSum2D: empty window');
  const choice = rsSum2DChoice(summarizeCells(cells), z, outX, outY, opts);
  const out = createField(outX, outY, cells.wavelength);
  const o = out.data;
  if (choice.path === 'radial') {
    const rp = choice.radial!;
    const src = cells.symmetry.evenY ? foldY(cells) : cells;
    const ring = new Float64Array(2 * rp.n);
    const wk = workFor(src);
    sumRow(src, z, { n: rp.n, start: rp.first * rp.step, step: rp.step }, rp.n, 0, ring, 0, wk);
    interpolateRadial(ring, rp, outX, outY, o);
    return { field: out, path: 'radial', mirrored: { x: false, y: false }, radial: rp, pairs: { box: rp.n * src.box.n, edge: rp.n * src.edge.n }, work: choice.work };
  }
  const { x: mx, y: my } = choice.mirrored;
  const cols = mx ? Math.ceil(outX.n / 2) : outX.n;
  const rows = my ? Math.ceil(outY.n / 2) : outY.n;
  const wk = workFor(cells);
  for (let row = 0; row < rows; row++) sumRow(cells, z, outX, cols, axisAt(outY, row), o, 2 * row * outX.n, wk);
  if (mx || my) {
    for (let row = 0; row < outY.n; row++) {
      const rs = my ? Math.min(row, outY.n - 1 - row) : row;
      for (let col = 0; col < outX.n; col++) {
        const cs = mx ? Math.min(col, outX.n - 1 - col) : col;
        if (rs === row && cs === col) continue;
        o[2 * (row * outX.n + col)] = o[2 * (rs * outX.n + cs)]!;
        o[2 * (row * outX.n + col) + 1] = o[2 * (rs * outX.n + cs) + 1]!;
      }
    }
  }
  return { field: out, path: choice.path, mirrored: { x: mx, y: my }, radial: null, pairs: { box: rows * cols * cells.box.n, edge: rows * cols * cells.edge.n }, work: choice.work };
}

/**
 * U at every point of outX × outY from U(ρ_j), ρ_j = (first + i)·step: a 12-point Lagrange stencil
 * centred on ρ, with U(−ρ) = U(ρ) (the field is even through the axis) for the samples below 0.
 */
function interpolateRadial(ring: Float64Array, rp: RadialPlan, outX: Axis, outY: Axis, o: Float64Array): void {
  const S = RADIAL_STENCIL;
  const h = S / 2;
  // Denominators Π_{j≠i}(i − j) of the equispaced Lagrange basis.
  const den = new Float64Array(S);
  for (let i = 0; i < S; i++) {
    let d = 1;
    for (let j = 0; j < S; j++) if (j !== i) d *= i - j;
    den[i] = 1 / d;
  }
  const pre = new Float64Array(S + 1);
  const suf = new Float64Array(S + 1);
  const inv = 1 / rp.step;
  for (let row = 0; row < outY.n; row++) {
    const y = axisAt(outY, row);
    for (let col = 0; col < outX.n; col++) {
      const x = axisAt(outX, col);
      const t = Math.sqrt(x * x + y * y) * inv;
      // Stencil j0 … j0 + S − 1 around t; θ = t − j0 ∈ [h − 1, h).
      const j0 = Math.floor(t) - h + 1;
      const th = t - j0;
      pre[0] = 1;
      for (let i = 0; i < S; i++) pre[i + 1] = pre[i]! * (th - i);
      suf[S] = 1;
      for (let i = S - 1; i >= 0; i--) suf[i] = suf[i + 1]! * (th - i);
      let ur = 0;
      let ui = 0;
      for (let i = 0; i < S; i++) {
        const wgt = pre[i]! * suf[i + 1]! * den[i]!;
        const jj = Math.abs(j0 + i) - rp.first;
        ur += wgt * ring[2 * jj]!;
        ui += wgt * ring[2 * jj + 1]!;
      }
      const at = 2 * (row * outX.n + col);
      o[at] = ur;
      o[at + 1] = ui;
    }
  }
}
