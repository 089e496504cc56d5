// Bessel functions of the first kind of integer order, J_0(x) … J_n(x) all at once, for the
// Jacobi–Anger expansion of a sinusoidal phase grating (its order amplitudes are J_q(m/2)).
//
// Why our own: the project's @stdlib packages give J_0 and J_1 only, and the grating needs every
// order up to where J_q has fallen below 1e-17. Upward recurrence from J_0, J_1 is unstable past
// q ≈ x (J is the minimal solution), so we use Miller's backward recurrence
// J_{k−1} = (2k/x)·J_k − J_{k+1} from a high start order with arbitrary values, normalised by
// J_0 + 2·Σ_{k≥1} J_{2k} = 1 (Abramowitz & Stegun, Handbook of Mathematical Functions, 9.1.27 and
// 9.12; Press et al., Numerical Recipes, §6.5).
//
// Start order: the relative error that the arbitrary start leaves in J_n is about (J_N/J_n)². With
// N ≥ max(n, |x|) + 30 + 15·|x|^{1/3} (even), J_N sits well inside the exponentially decaying tail
// (past the turning point n = x the tail falls like the Airy function of (n − x)/(x/2)^{1/3}), so
// J_N/J_n < 1e-15 for every n we return and the error is at rounding level; the tests check that a
// much higher start changes nothing.

/** Above this the recurrence's values are scaled down, to stay far from overflow. */
const RESCALE_ABOVE = 1e200;

/** Start order of the backward recurrence for orders up to nMax at argument |x| = ax (even). */
function startOrder(nMax: number, ax: number): number {
  const n = Math.max(nMax, Math.ceil(ax)) + 30 + Math.ceil(15 * Math.cbrt(ax));
  return n + (n % 2);
}

/**
 * J_0(x) … J_nMax(x) (integer orders ≥ 0) by Miller's backward recurrence. Values that underflow
 * the double range come out as 0. Cost O(nMax + |x|).
 */
export function besselJnOrders(nMax: number, x: number): Float64Array {
  if (!Number.isInteger(nMax) || nMax < 0) throw new RangeError(`Bessel order range must be a whole number ≥ 0, got ${nMax}`);
  if (!Number.isFinite(x)) throw new RangeError(`Bessel argument must be finite, got ${x}`);
  const out = new Float64Array(nMax + 1);
  if (x === 0) {
    out[0] = 1;
    return out;
  }
  const ax = Math.abs(x);
  const start = startOrder(nMax, ax);
  // All orders from 0 to start are kept: the normalisation needs the even ones.
  const v = new Float64Array(start + 1);
  const twoOverX = 2 / ax;
  let above = 0; // J_{k+1}
  v[start] = 1e-30; // J_start: any small value; only ratios matter
  for (let k = start; k >= 1; k--) {
    const below = k * twoOverX * v[k]! - above;
    above = v[k]!;
    v[k - 1] = below;
    if (Math.abs(below) > RESCALE_ABOVE) {
      // The higher orders shrink with it; those that underflow are far below anything returned.
      const s = 1 / RESCALE_ABOVE;
      for (let i = k - 1; i <= start; i++) v[i]! *= s;
      above *= s;
    }
  }
  // J_0 + 2 Σ J_2k = 1 (A&S 9.1.46 with t = 1, the generating function at θ = 0).
  let norm = 0;
  for (let k = start - (start % 2); k >= 2; k -= 2) norm += v[k]!;
  norm = v[0]! + 2 * norm;
  const flipOdd = x < 0; // J_n(−x) = (−1)^n J_n(x) (A&S 9.1.35)
  for (let n = 0; n <= nMax; n++) {
    const j = v[n]! / norm;
    out[n] = flipOdd && n % 2 === 1 ? -j : j;
  }
  return out;
}

/** J_n(x) for one integer order n of either sign (J_{−n} = (−1)^n J_n, A&S 9.1.5). */
export function besselJn(n: number, x: number): number {
  if (!Number.isInteger(n)) throw new RangeError(`Bessel order must be a whole number, got ${n}`);
  const an = Math.abs(n);
  const j = besselJnOrders(an, x)[an]!;
  return n < 0 && an % 2 === 1 ? -j : j;
}

/**
 * J_0(x) … J_Q(x) with Q the first order past |x| whose |J_Q| is below `tol` (then every higher
 * order is smaller still: past the turning point |J_n| decreases with n, A&S 9.3). For summing a
 * Jacobi–Anger series to the accuracy `tol`.
 */
export function besselJnSignificant(x: number, tol: number): Float64Array {
  const ax = Math.abs(x);
  // Enough orders for any tol ≥ 1e-300: past the turning point by 15·|x|^{1/3} + 30 the terms are
  // below e^{−40}·…; we look further if they are not yet below tol.
  let nMax = Math.ceil(ax) + 30 + Math.ceil(15 * Math.cbrt(ax));
  for (;;) {
    const j = besselJnOrders(nMax, x);
    for (let q = Math.ceil(ax); q <= nMax; q++) {
      if (Math.abs(j[q]!) < tol) return j.subarray(0, q + 1);
    }
    nMax *= 2;
  }
}
