// Brute-force Rayleigh–Sommerfeld quadrature of a tilted square, for the shifted-spectrum tests
// (test code, shares nothing with src/; checked in shifted-spectrum-tilted.test.ts against the
// two evaluations of test/reference/rs2d.ts). The Gauss–Legendre rule is test/reference's.
import { gaussLegendre } from '../reference/quadrature.js';

const GL16 = gaussLegendre(16);

/** Nodes over [a, b] in equal panels of 16 points, each spanning at most `maxPhase` rad at `rate` rad/m. */
function panels(a: number, b: number, rate: number, maxPhase: number): { x: number[]; w: number[] } {
  const n = Math.max(2, Math.ceil(((b - a) * rate) / maxPhase));
  const h = (b - a) / n;
  const x: number[] = [];
  const w: number[] = [];
  for (let p = 0; p < n; p++) {
    const c = a + (p + 0.5) * h;
    for (let i = 0; i < 16; i++) {
      x.push(c + 0.5 * h * GL16.x[i]!);
      w.push(0.5 * h * GL16.w[i]!);
    }
  }
  return { x, w };
}

/**
 * U(x, y, z) = ∬_square e^{ik(sin θx ξ + sin θy η)}·(1/2π)(z/r)(1/r − ik)e^{ikr}/r dξdη over
 * |ξ|, |η| ≤ a: the integrand's phase changes at most k(|sin θx| + 1) per metre along ξ and
 * k(|sin θy| + 1) along η; panels of 10 rad (a 16-point panel integrates e^{iφ} over 10 rad to
 * about 1e-12).
 */
export function rsSquare(lam: number, z: number, a: number, sinT: number, x: number, y: number, sinTy = 0): [number, number] {
  const k = (2 * Math.PI) / lam;
  const X = panels(-a, a, k * (Math.abs(sinT) + 1), 10);
  const Y = panels(-a, a, k * (Math.abs(sinTy) + 1), 10);
  let re = 0;
  let im = 0;
  for (let j = 0; j < Y.x.length; j++) {
    const eta = Y.x[j]!;
    const dy = y - eta;
    for (let i = 0; i < X.x.length; i++) {
      const xi = X.x[i]!;
      const dx = x - xi;
      const r2 = dx * dx + dy * dy + z * z;
      const r = Math.sqrt(r2);
      const ph = k * (r + sinT * xi + sinTy * eta);
      const s = (Y.w[j]! * X.w[i]! * z) / (2 * Math.PI * r2);
      const c = Math.cos(ph);
      const sn = Math.sin(ph);
      re += s * (c / r + k * sn);
      im += s * (sn / r - k * c);
    }
  }
  return [re, im];
}
