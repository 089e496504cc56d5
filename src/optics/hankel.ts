// The Hankel function of the first kind and order one, H₁⁽¹⁾(x) = J₁(x) + iY₁(x), x > 0: the
// 1-D (line-source) Rayleigh–Sommerfeld kernel is (ikz/2r)·H₁⁽¹⁾(kr).
//
// Below HANKEL_ASYMPTOTIC_FROM it is J₁ and Y₁ from @stdlib (full double precision, well kept);
// from there on the Hankel asymptotic expansion (Abramowitz & Stegun 9.2.5–9.2.10, μ = 4ν² = 4):
//   H₁⁽¹⁾(x) = √(2/(πx))·(P + iQ)·e^{i(x − 3π/4)},
//   P = Σ_m (−1)^m a_{2m}/x^{2m},  Q = Σ_m (−1)^m a_{2m+1}/x^{2m+1},
//   a_k = (μ−1)(μ−9)…(μ−(2k−1)²)/(k!·8^k)  (so P = 1 − (μ−1)(μ−9)/(2!(8x)²) + …, Q = (μ−1)/(8x) − …).
// It costs one square root, one sine and one cosine (J₁ and Y₁ each need their own), and it gives
// the kernel's phase derivative for free (see hankel1PhaseRate).
import besselj1 from '@stdlib/math-base-special-besselj1';
import bessely1 from '@stdlib/math-base-special-bessely1';

/**
 * Where the expansion takes over. The series is asymptotic (terms shrink until k ≈ 2x, then
 * grow), so accuracy comes from x, not from more terms. With the 16 terms below (a₀ … a₁₅) the
 * truncation error, measured against 40-digit values while choosing these numbers, is 9e-15
 * (relative to |H₁|) at x = 20, 3e-16 at 25 and below 1e-17 from 30 on; at x = 15 it would be
 * 3e-11, too much. In the Rayleigh–Sommerfeld sums x = kr ≥ kz, which is ≥ 20 from z = 3.2λ on,
 * so the expansion serves almost every pair.
 */
export const HANKEL_ASYMPTOTIC_FROM = 20;

/** a_k for ν = 1, k = 0..15, computed exactly from the product formula (k!·8^k in the denominator). */
function coefficients(): Float64Array {
  const a = new Float64Array(16);
  let v = 1;
  a[0] = 1;
  for (let k = 1; k < 16; k++) {
    v *= (4 - (2 * k - 1) ** 2) / (8 * k);
    a[k] = v;
  }
  return a;
}
const A = coefficients();
// Horner coefficients in y = 1/x² for P and for Q·x, with the alternating signs folded in.
const P0 = A[0]!, P1 = -A[2]!, P2 = A[4]!, P3 = -A[6]!, P4 = A[8]!, P5 = -A[10]!, P6 = A[12]!, P7 = -A[14]!;
const Q0 = A[1]!, Q1 = -A[3]!, Q2 = A[5]!, Q3 = -A[7]!, Q4 = A[9]!, Q5 = -A[11]!, Q6 = A[13]!, Q7 = -A[15]!;

/** P(x) of the expansion (x ≥ HANKEL_ASYMPTOTIC_FROM). */
export function asymptoticP(x: number): number {
  const y = 1 / (x * x);
  return P0 + y * (P1 + y * (P2 + y * (P3 + y * (P4 + y * (P5 + y * (P6 + y * P7))))));
}

/** Q(x) of the expansion (x ≥ HANKEL_ASYMPTOTIC_FROM). */
export function asymptoticQ(x: number): number {
  const y = 1 / (x * x);
  return (Q0 + y * (Q1 + y * (Q2 + y * (Q3 + y * (Q4 + y * (Q5 + y * (Q6 + y * Q7))))))) / x;
}

/**
 * Writes H₁⁽¹⁾(x) = J₁(x) + iY₁(x) into out[at], out[at+1] (no allocation: the sums call it per
 * pair). x must be > 0.
 */
export function hankel1Into(x: number, out: Float64Array, at = 0): void {
  if (x < HANKEL_ASYMPTOTIC_FROM) {
    out[at] = besselj1(x);
    out[at + 1] = bessely1(x);
    return;
  }
  const p = asymptoticP(x);
  const q = asymptoticQ(x);
  // e^{i(x − 3π/4)} = e^{ix}·e^{−3iπ/4}, e^{−3iπ/4} = −(1 + i)/√2. Subtracting 3π/4 from a large x
  // would round the phase by ulp(x)/2 (1e-10 rad at x = 10⁶); rotating by the constant does not.
  const c = Math.cos(x);
  const s = Math.sin(x);
  const er = -(c - s) * Math.SQRT1_2;
  const ei = -(c + s) * Math.SQRT1_2;
  const amp = Math.sqrt(2 / (Math.PI * x));
  out[at] = amp * (p * er - q * ei);
  out[at + 1] = amp * (p * ei + q * er);
}

/** H₁⁽¹⁾(x) as [re, im] (convenience; the sums use hankel1Into). */
export function hankel1(x: number): [number, number] {
  const out = new Float64Array(2);
  hankel1Into(x, out, 0);
  return [out[0]!, out[1]!];
}

/**
 * d/dx arg H₁⁽¹⁾(x) = 2/(πx·|H₁⁽¹⁾(x)|²), from the Wronskian J₁Y₁′ − J₁′Y₁ = 2/(πx) (A&S 9.1.16).
 * It tends to 1 (the phase is x − 3π/4 + 3/(8x) + …); the sums expand the kernel's phase with this
 * rate rather than with 1, which is exact to first order however close the source is.
 * |H|² is passed in because the caller has it.
 */
export function hankel1PhaseRate(x: number, modulusSquared: number): number {
  return 2 / (Math.PI * x * modulusSquared);
}
