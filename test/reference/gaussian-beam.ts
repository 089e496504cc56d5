// A Gaussian beam (waist w₁ at the start, amplitude 1) through gaps and thin lenses by its complex
// parameter q (Kogelnik & Li, Appl. Opt. 5, 1550 (1966); Siegman, Lasers, ch. 17 and 20): a gap z
// adds z to q, a thin lens of focal length f maps 1/q to 1/q − 1/f, and 1/q = 1/R − iλ/(πw²). A
// beam of radius w₁ and unit amplitude at a waist carries P = πw₁²/2, so its axis holds
// 2P/(πw²) = (w₁/w)², and I(r) = (w₁/w)²·e^{−2r²/w²}. Test code only.
export type BeamStep = { gap: number } | { lens: number };

/** The beam after the steps: its on-axis intensity (w₁/w)² and radius w. */
export function gaussianThrough(lam: number, w1: number, steps: readonly BeamStep[]): { onAxis: number; radius: number } {
  // q as [re, im]; at the waist q = i·πw₁²/λ.
  let q: [number, number] = [0, (Math.PI * w1 * w1) / lam];
  for (const s of steps) {
    if ('gap' in s) q = [q[0] + s.gap, q[1]];
    else {
      const m = q[0] * q[0] + q[1] * q[1];
      const inv: [number, number] = [q[0] / m - 1 / s.lens, -q[1] / m];
      const mi = inv[0] * inv[0] + inv[1] * inv[1];
      q = [inv[0] / mi, -inv[1] / mi];
    }
  }
  const m = q[0] * q[0] + q[1] * q[1];
  const w2 = -lam / (Math.PI * (-q[1] / m));
  return { onAxis: (w1 * w1) / w2, radius: Math.sqrt(w2) };
}
