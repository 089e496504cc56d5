// The far-field prefactor on a plane against the kernel written out point by point:
// (z/r)·e^{ikr}/(iλr)·(1 + i/(kr)), the Rayleigh–Sommerfeld kernel of the first kind
// (Goodman, Introduction to Fourier Optics, §3.5) with the aperture's own phase left out. The
// program computes it once per mirrored pair of rows and columns on a window centred on the axis;
// here every point is computed on its own, with its phase kr reduced exactly as the program does
// (2π·frac(r/λ), phase.ts), so the two agree to rounding on any window, centred or not. The radial
// spectrum a disc's far field takes is copied across the mirror lines likewise: a centred window
// against the same points computed on their own.
import { describe, expect, it } from 'vitest';
import { applyFarFieldFactor, mirrorIndexSum, propagateFarField } from '../../src/optics/direct.js';
import { createField } from '../../src/optics/field.js';
import { propagationPhase } from '../../src/optics/phase.js';
import { mulberry32 } from '../helpers.js';
import { engine } from '../engine.js';

/** The kernel at (x, y) times the sample (re, im), written out: e^{i(θ − π/2)}·(z/(λr²))·(1 + i/(kr)). */
function byPoint(x: number, y: number, z: number, lam: number, re: number, im: number): [number, number] {
  const r = Math.sqrt(x * x + y * y + z * z);
  const k = (2 * Math.PI) / lam;
  const amp = z / (lam * r * r);
  // e^{ikr}/i = e^{i(θ − π/2)}
  const th = propagationPhase(r, lam) - Math.PI / 2;
  const er = amp * Math.cos(th);
  const ei = amp * Math.sin(th);
  // × (1 + i/(kr))
  const q = 1 / (k * r);
  const kr = er - ei * q;
  const ki = ei + er * q;
  return [re * kr - im * ki, re * ki + im * kr];
}

describe('far-field prefactor on a plane', () => {
  it('matches the kernel point by point on random windows, centred on the axis, shifted and odd-sized (fixed seed)', () => {
    const rand = mulberry32(20261203);
    let worst = 0;
    let mirrored = 0;
    for (let t = 0; t < 60; t++) {
      const nx = 3 + Math.floor(rand() * 60);
      const ny = 3 + Math.floor(rand() * 60);
      const lam = 350e-9 + rand() * 1.2e-6;
      const z = 10 ** (-4 + rand() * 5); // 0.1 mm to 10 m
      const dx = z * 10 ** (-4 + rand() * 3) * (0.5 + rand());
      const dy = t % 3 === 0 ? dx : dx * (0.5 + rand());
      // A third centred, a third shifted by whole samples (partly mirrored), a third anywhere.
      const kind = t % 3;
      const x0 = kind === 0 ? (-(nx - 1) / 2) * dx : kind === 1 ? (-(nx - 1) / 2 + Math.floor(rand() * 9) - 4) * dx : (rand() - 0.7) * nx * dx;
      const y0 = kind === 0 ? (-(ny - 1) / 2) * dy : kind === 1 ? (-(ny - 1) / 2 + Math.floor(rand() * 9) - 4) * dy : (rand() - 0.3) * ny * dy;
      const f = createField({ n: nx, start: x0, step: dx }, { n: ny, start: y0, step: dy }, lam);
      for (let i = 0; i < f.data.length; i++) f.data[i] = rand() * 2 - 1;
      const before = Float64Array.from(f.data);
      applyFarFieldFactor(f, z);
      if (mirrorIndexSum(nx, x0, dx) !== null) mirrored++;
      let peak = 0;
      for (let r = 0; r < ny; r++) {
        for (let c = 0; c < nx; c++) {
          const i = 2 * (r * nx + c);
          const [er, ei] = byPoint(x0 + c * dx, y0 + r * dy, z, lam, before[i]!, before[i + 1]!);
          peak = Math.max(peak, Math.hypot(er, ei));
          // Rounding alone leaves kr uncertain by about k·r·ε (r is known to an ulp), which at metres
          // is 1e-8 rad and more: the bound is that many times a few, plus the arithmetic's 1e-14.
          const x = x0 + c * dx;
          const y = y0 + r * dy;
          const kre = ((2 * Math.PI) / lam) * Math.sqrt(x * x + y * y + z * z) * Number.EPSILON;
          worst = Math.max(worst, Math.hypot(f.data[i]! - er, f.data[i + 1]! - ei) / Math.hypot(er, ei) / (8 * kre + 1e-14));
        }
      }
      expect(peak).toBeGreaterThan(0);
    }
    // The mirrored windows take the factor of the first of each pair: still within rounding.
    expect(mirrored).toBeGreaterThanOrEqual(20);
    expect(worst).toBeLessThan(1);
  });

  it('finds the mirror of a centred window and none of a window off the axis (common practice: x(c) = x0 + c·d)', () => {
    expect(mirrorIndexSum(401, -200 * 1.3e-5, 1.3e-5)).toBe(400);
    expect(mirrorIndexSum(400, -199.5 * 7e-6, 7e-6)).toBe(399);
    // Shifted by whole samples: the pairs that fall inside still mirror.
    expect(mirrorIndexSum(101, -47 * 2e-6, 2e-6)).toBe(94);
    expect(mirrorIndexSum(101, -47.3 * 2e-6, 2e-6)).toBeNull();
    expect(mirrorIndexSum(1, 0, 1e-6)).toBeNull();
  });

  it('the far field of a disc on a centred window equals, point for point, the same points computed on their own (a quadrant window off the axis)', () => {
    // A sampled disc, 24 samples across; its far field by the radial path on a centred 61 × 61
    // window, whose mirror rows and columns are copies, and on the window's lower right quadrant,
    // which mirrors nothing: every point there is interpolated on its own, from the same table.
    const lam = 633e-9;
    const z = 0.5;
    const d = 2e-6;
    const n = 32;
    const src = createField({ n, start: (-(n - 1) / 2) * d, step: d }, { n, start: (-(n - 1) / 2) * d, step: d }, lam);
    for (let r = 0; r < n; r++) for (let c = 0; c < n; c++) if (Math.hypot(c - (n - 1) / 2, r - (n - 1) / 2) <= 12) src.data[2 * (r * n + c)] = 1;
    const step = 0.4e-3;
    const full = propagateFarField(engine, src, z, { n: 61, start: -30 * step, step }, { n: 61, start: -30 * step, step }, [0, 0], { radial: true });
    const quad = propagateFarField(engine, src, z, { n: 31, start: 0, step }, { n: 31, start: 0, step }, [0, 0], { radial: true });
    expect(mirrorIndexSum(61, -30 * step, step)).toBe(60);
    let peak = 0;
    for (let i = 0; i < full.data.length; i++) peak = Math.max(peak, Math.abs(full.data[i]!));
    let worst = 0;
    for (let r = 0; r < 61; r++) {
      for (let c = 0; c < 61; c++) {
        // The quadrant's point with the same |x| and |y| (the same point for r, c ≥ 30).
        const q = (Math.abs(r - 30) * 31 + Math.abs(c - 30)) * 2;
        const i = (r * 61 + c) * 2;
        worst = Math.max(worst, Math.hypot(full.data[i]! - quad.data[q]!, full.data[i + 1]! - quad.data[q + 1]!) / peak);
      }
    }
    expect(peak).toBeGreaterThan(0);
    expect(worst).toBeLessThan(1e-12);
  });
});
