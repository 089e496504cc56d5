// Special functions to the accuracy estimates need (not reference values: tests take those from
// @stdlib).

/** erfc(x) by Abramowitz & Stegun 7.1.26 (|error in erf| < 1.5e-7). */
export function erfc(x: number): number {
  if (x < 0) return 2 - erfc(-x);
  const t = 1 / (1 + 0.3275911 * x);
  const y = t * (0.254829592 + t * (-0.284496736 + t * (1.421413741 + t * (-1.453152027 + t * 1.061405429))));
  return y * Math.exp(-x * x);
}

/** erf(x) = 1 − erfc(x), to the same accuracy. */
export function erf(x: number): number {
  return 1 - erfc(x);
}
