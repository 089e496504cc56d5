// The cell integral of the direct Rayleigh–Sommerfeld sums. Over a cell [−h/2, h/2] (u from the
// centre) the integrand is a smooth factor times e^{isu}, s the linear phase slope (source minus
// kernel). With the smooth factor's logarithm expanded to second order, 1 + Bu + (B²/2 + Γ)u²
// (B real: amplitude slope; Γ complex: amplitude curvature and i·phase curvature),
//   ∫ e^{isu}(1 + Bu + (B²/2 + Γ)u²) du = h·[S(v) − iB(h/2)S′(v) − (B²/2 + Γ)(h/2)²S″(v)],
// v = sh/2, S(v) = sin v/v, because ∫u e^{isu} = −i∂_s∫e^{isu} and ∫u² e^{isu} = −∂²_s∫e^{isu}.
// With B = Γ = 0 this is the plain h·sinc of a linear phase.

/**
 * S(v) = sin v/v and its first two derivatives into m[0..2]. Below |v| = 0.5 their Taylor series
 * (to v¹⁰, v⁹, v⁸: truncation under 4e-14, 1e-12, 2e-11, and the last two only scale second-order
 * terms): the closed forms lose digits to cancellation there.
 */
export function sincMoments(v: number, m: Float64Array): void {
  if (Math.abs(v) < 0.5) {
    const v2 = v * v;
    m[0] = 1 + v2 * (-1 / 6 + v2 * (1 / 120 + v2 * (-1 / 5040 + v2 * (1 / 362880 - v2 / 39916800))));
    m[1] = v * (-1 / 3 + v2 * (1 / 30 + v2 * (-1 / 840 + v2 * (1 / 45360 - v2 / 3991680))));
    m[2] = -1 / 3 + v2 * (1 / 10 + v2 * (-1 / 168 + v2 * (1 / 6480 - v2 / 443520)));
    return;
  }
  const s = Math.sin(v);
  const c = Math.cos(v);
  const iv = 1 / v;
  const s0 = s * iv;
  const s1 = (c - s0) * iv;
  m[0] = s0;
  m[1] = s1;
  m[2] = -s0 - 2 * s1 * iv;
}
