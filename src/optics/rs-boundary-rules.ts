// Quadrature and interpolation rules for the boundary form of the Rayleigh–Sommerfeld integral
// (rs-boundary.ts), each with the largest phase change it takes for an accuracy, found once by
// measuring the rule on e^{iωt} rather than from an asymptotic formula.
//
// The integrands of the boundary form are smooth (analytic near the real line, see rs-boundary.ts);
// what limits a panel is the phase of e^{ikR} across it. On [−1, 1], f(t) = e^{iωt} is the model:
// the phase change over a panel is Φ = 2ω. For each rule and accuracy ε we tabulate the largest Φ
// such that the rule's error is ≤ ε·∫|f| for every ω' ≤ ω (errors are not monotonic in ω at small
// ω, so the scan runs from 0 upward and stops at the first ω' that fails).
import { gaussLegendreRule, type GaussRule } from './edge-cells.js';

export type { GaussRule };

/** The n-point Gauss–Legendre rule on [−1, 1] (A&S 25.4.29; edge-cells.ts computes and caches it). */
export function glRule(n: number): GaussRule {
  return gaussLegendreRule(n);
}

/** Largest ω scanned (Φ = 2ω): far beyond any rule used here. */
const OMEGA_SCAN_MAX = 400;
const OMEGA_SCAN_STEP = 0.01;

// Memo of a pure function (by its argument), not state: it never changes a result.
const gaussLimits = new Map<string, number>();

/**
 * The largest phase change Φ over a panel for which the n-point Gauss–Legendre rule integrates
 * e^{iΦt/2} on [−1, 1] with an error ≤ eps·2 (2 = ∫|f|), for every smaller phase change too.
 * Measured values at eps = 1e-8 (rad): n = 4: 1.4, 8: 8.5, 16: 29.9, 32: 81.5.
 */
export function gaussPhaseLimit(n: number, eps: number): number {
  const key = `${n}:${eps}`;
  const hit = gaussLimits.get(key);
  if (hit !== undefined) return hit;
  const r = glRule(n);
  let w = 0;
  for (;;) {
    const next = w + OMEGA_SCAN_STEP;
    let s = 0;
    for (let j = 0; j < n; j++) s += r.w[j]! * Math.cos(next * r.x[j]!);
    const exact = (2 * Math.sin(next)) / next;
    if (Math.abs(s - exact) > 2 * eps || next > OMEGA_SCAN_MAX) break;
    w = next;
  }
  gaussLimits.set(key, 2 * w);
  return 2 * w;
}

// --- Antiderivatives on a panel --------------------------------------------------------------
//
// For tables of G(s) = ∫_0^s f (rs-boundary-lines.ts) the integrand is sampled at the n Gauss–
// Legendre nodes of each panel; the interpolating polynomial P (degree n − 1) is integrated in
// closed form, ∫_{−1}^t P = Σ_m a_m T_m(t) (Chebyshev polynomials, well conditioned on [−1, 1]), so
// that G at any point of the panel costs a Clenshaw sum and no further sines. The coefficients are
// a fixed linear map of the nodal values: a = M·q, M of size (n + 1) × n, built once per n.

interface Antiderivative {
  n: number;
  /** a_m = Σ_j M[m·n + j]·q_j, m = 0..n. */
  M: Float64Array;
}

// Memo of a pure function (by its argument), not state: it never changes a result.
const antiderivatives = new Map<number, Antiderivative>();

/** Solves V·X = I (n × n, row-major) by Gaussian elimination with partial pivoting. */
function invert(V: Float64Array, n: number): Float64Array {
  const a = Float64Array.from(V);
  const inv = new Float64Array(n * n);
  for (let i = 0; i < n; i++) inv[i * n + i] = 1;
  for (let col = 0; col < n; col++) {
    let piv = col;
    for (let r = col + 1; r < n; r++) if (Math.abs(a[r * n + col]!) > Math.abs(a[piv * n + col]!)) piv = r;
    if (piv !== col) {
      for (let c = 0; c < n; c++) {
        let t = a[col * n + c]!;
        a[col * n + c] = a[piv * n + c]!;
        a[piv * n + c] = t;
        t = inv[col * n + c]!;
        inv[col * n + c] = inv[piv * n + c]!;
        inv[piv * n + c] = t;
      }
    }
    const d = a[col * n + col]!;
    for (let c = 0; c < n; c++) {
      a[col * n + c] = a[col * n + c]! / d;
      inv[col * n + c] = inv[col * n + c]! / d;
    }
    for (let r = 0; r < n; r++) {
      if (r === col) continue;
      const f = a[r * n + col]!;
      if (f === 0) continue;
      for (let c = 0; c < n; c++) {
        a[r * n + c] = a[r * n + c]! - f * a[col * n + c]!;
        inv[r * n + c] = inv[r * n + c]! - f * inv[col * n + c]!;
      }
    }
  }
  return inv;
}

// Memo of a pure function (by its argument), not state: it never changes a result.
const interpolants = new Map<number, Float64Array>();

/**
 * The map from values on the n Gauss–Legendre nodes to the interpolant's Chebyshev coefficients:
 * c_m = Σ_j C[m·n + j]·q_j. C = V⁻¹, V[j][m] = T_m(x_j) (the nodes interlace like Chebyshev points:
 * V is well conditioned). Because x_{n−1−j} = −x_j, C[m][n−1−j] = (−1)^m·C[m][j].
 */
export function interpolantMap(n: number): Float64Array {
  const hit = interpolants.get(n);
  if (hit) return hit;
  const x = glRule(n).x;
  const V = new Float64Array(n * n);
  for (let j = 0; j < n; j++) {
    let t0 = 1;
    let t1 = x[j]!;
    V[j * n] = 1;
    if (n > 1) V[j * n + 1] = t1;
    for (let m = 2; m < n; m++) {
      const t2 = 2 * x[j]! * t1 - t0;
      V[j * n + m] = t2;
      t0 = t1;
      t1 = t2;
    }
  }
  const C = invert(V, n);
  interpolants.set(n, C);
  return C;
}

/**
 * Chebyshev coefficients a_0..a_n of A(t) = ∫_{−1}^t Σ c_m T_m (c_0..c_{n−1}), for one part of
 * interleaved complex arrays (c at cOff + 2m, a at aOff + 2m): ∫T_0 = T_1, ∫T_1 = T_2/4,
 * ∫T_m = T_{m+1}/(2(m+1)) − T_{m−1}/(2(m−1)); so a_1 = c_0 − c_2/2, a_m = (c_{m−1} − c_{m+1})/(2m),
 * and a_0 makes A(−1) = 0 (T_m(−1) = (−1)^m).
 */
export function integrateChebyshev(c: Float64Array, cOff: number, n: number, a: Float64Array, aOff: number): void {
  let atMinus1 = 0;
  for (let m = 1; m <= n; m++) {
    const lower = c[cOff + 2 * (m - 1)]!;
    const upper = m + 1 < n ? c[cOff + 2 * (m + 1)]! : 0;
    const v = m === 1 ? lower - upper / 2 : (lower - upper) / (2 * m);
    a[aOff + 2 * m] = v;
    atMinus1 += (m & 1) === 0 ? v : -v;
  }
  a[aOff] = -atMinus1;
}

/** The map from nodal values to the antiderivative's Chebyshev coefficients: a = M·q, (n + 1) × n. */
export function antiderivativeMap(n: number): Float64Array {
  const hit = antiderivatives.get(n);
  if (hit) return hit.M;
  const C = interpolantMap(n);
  const M = new Float64Array((n + 1) * n);
  const c = new Float64Array(2 * n);
  const a = new Float64Array(2 * (n + 1));
  for (let j = 0; j < n; j++) {
    for (let m = 0; m < n; m++) c[2 * m] = C[m * n + j]!;
    integrateChebyshev(c, 0, n, a, 0);
    for (let m = 0; m <= n; m++) M[m * n + j] = a[2 * m]!;
  }
  antiderivatives.set(n, { n, M });
  return M;
}

/** Σ_{m=0}^{deg} a[off + 2m]·T_m(t) for one of the two interleaved parts (re at off, im at off + 1). */
export function clenshaw(a: Float64Array, off: number, deg: number, t: number): number {
  let b1 = 0;
  let b2 = 0;
  const t2 = 2 * t;
  for (let m = deg; m >= 1; m--) {
    const b0 = t2 * b1 - b2 + a[off + 2 * m]!;
    b2 = b1;
    b1 = b0;
  }
  return t * b1 - b2 + a[off]!;
}

// Memo of a pure function (by its argument), not state: it never changes a result.
const partialLimits = new Map<string, number>();

/**
 * The largest phase change Φ over a panel for which the antiderivative of the n-node interpolant
 * of e^{iΦt/2} errs by ≤ eps·2 everywhere on the panel, for every smaller Φ too. Interpolation
 * converges at about half the rate of Gauss quadrature: measured at eps = 1e-8, n = 16: 8.4 rad.
 */
export function partialPhaseLimit(n: number, eps: number): number {
  const key = `${n}:${eps}`;
  const hit = partialLimits.get(key);
  if (hit !== undefined) return hit;
  const x = glRule(n).x;
  const M = antiderivativeMap(n);
  const coef = new Float64Array(2 * (n + 1));
  const ts = 64;
  let w = 0;
  outer: for (;;) {
    const next = w + OMEGA_SCAN_STEP;
    if (next > OMEGA_SCAN_MAX) break;
    coef.fill(0);
    for (let m = 0; m <= n; m++) {
      let re = 0;
      let im = 0;
      for (let j = 0; j < n; j++) {
        re += M[m * n + j]! * Math.cos(next * x[j]!);
        im += M[m * n + j]! * Math.sin(next * x[j]!);
      }
      coef[2 * m] = re;
      coef[2 * m + 1] = im;
    }
    for (let i = 0; i <= ts; i++) {
      const t = -1 + (2 * i) / ts;
      // ∫_{−1}^t e^{iωτ}dτ = (e^{iωt} − e^{−iω})/(iω)
      const er = (Math.sin(next * t) + Math.sin(next)) / next;
      const ei = (-Math.cos(next * t) + Math.cos(next)) / next;
      const gr = clenshaw(coef, 0, n, t);
      const gi = clenshaw(coef, 1, n, t);
      if (Math.hypot(gr - er, gi - ei) > 2 * eps) break outer;
    }
    w = next;
  }
  partialLimits.set(key, 2 * w);
  return 2 * w;
}

// --- Interpolation along a radius -------------------------------------------------------------

// Memo of a pure function (by its argument), not state: it never changes a result.
const lagrangeLimits = new Map<string, number>();

/**
 * The largest ωh (radians per sample of a tone e^{iωx} sampled at pitch h) for which the centred
 * p-point Lagrange interpolant errs by ≤ eps anywhere in its central interval. Measured at
 * eps = 1e-6: p = 12: 0.72 (8.7 samples per period), p = 20: 1.14 (5.5 samples per period).
 */
export function lagrangeStepLimit(p: number, eps: number): number {
  const key = `${p}:${eps}`;
  const hit = lagrangeLimits.get(key);
  if (hit !== undefined) return hit;
  const off = p / 2 - 1;
  const err = (w: number): number => {
    let worst = 0;
    for (let q = 1; q < 32; q++) {
      const x = q / 32;
      let re = 0;
      let im = 0;
      for (let j = 0; j < p; j++) {
        let l = 1;
        for (let m = 0; m < p; m++) if (m !== j) l *= (x - (m - off)) / (j - m);
        re += l * Math.cos(w * (j - off));
        im += l * Math.sin(w * (j - off));
      }
      worst = Math.max(worst, Math.hypot(re - Math.cos(w * x), im - Math.sin(w * x)));
    }
    return worst;
  };
  let w = 0;
  while (w < Math.PI && err(w + 0.005) <= eps) w += 0.005;
  lagrangeLimits.set(key, w);
  return w;
}
