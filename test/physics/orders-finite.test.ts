// The order table's measured powers are the finite grating's: orders-finite says so where they
// depart from the infinite grating's efficiencies by more than 0.5 % (of the incident power), and
// orders-window where the window misses enough of each order (along y, for a grating of finite
// length) to make them short by as much. Reference: the far field of N periods of a blazed profile
// of depth 1 wave, |Û(u)|² ∝ sinc²(u − 1)·sin²(πNu)/sin²(πu), u = d·sin θ/λ (Goodman, Introduction to
// Fourier Optics, §4.4: one period's transform times the array factor), integrated over order 1's
// interval here in the test.
import { describe, expect, it } from 'vitest';
import { gaussLegendre } from '../reference/quadrature.js';
import { nm, runCase, um } from '../helpers.js';

const lam = 633 * nm;
const sinc = (u: number) => (u === 0 ? 1 : Math.sin(Math.PI * u) / (Math.PI * u));

/** Fraction of the incident power in [ua, ub] of u = d·sin θ/λ: (1/N)∫ sinc²(u − α)·AF²(u) du. */
function blazedFarFieldPower(N: number, alpha: number, ua: number, ub: number): number {
  const rule = gaussLegendre(8);
  const panels = Math.ceil((ub - ua) * N * 16);
  const h = (ub - ua) / panels;
  let s = 0;
  for (let p = 0; p < panels; p++) {
    const mid = ua + (p + 0.5) * h;
    for (let j = 0; j < rule.x.length; j++) {
      const u = mid + (h / 2) * rule.x[j]!;
      const den = Math.sin(Math.PI * u);
      const af = Math.abs(den) < 1e-14 ? N : Math.sin(Math.PI * N * u) / den;
      s += rule.w[j]! * (h / 2) * sinc(u - alpha) ** 2 * af * af;
    }
  }
  return s / N;
}

const blazed = (count: number) => ({ shape: 'grating' as const, profile: { kind: 'blazed' as const, depth: 1 }, count, period: 10 * um, opaque: false as const });

describe('orders-finite', () => {
  it('a blazed grating of 10 periods in its far field: order 1 holds about 98 %, as its far field does, and the case says why not 100 %', () => {
    const z = 1;
    const { rec, codes } = runCase({ wavelength: lam, distance: z, aperture: blazed(10) });
    expect(codes).toContain('orders-finite');
    const o = rec.metrics.orders!.find((x) => x.m === 1)!;
    const [a, b] = o.interval!;
    const u = (x: number) => ((x / Math.hypot(x, z)) * 10 * um) / lam;
    const ref = blazedFarFieldPower(10, 1, u(a), u(b));
    // The finite grating's own value: about 1 − 4/(π²N) (the sinc² side lobes beyond half the spacing, common practice).
    expect(ref).toBeLessThan(0.985);
    expect(Math.abs(o.fractionOfIncident! - ref)).toBeLessThan(2e-3);
    const w = rec.warnings.find((x) => x.code === 'orders-finite')!;
    expect(w.message).toMatch(/order 1: 9\d\.?\d* % measured/);
    expect(w.message).toContain('efficiency 100 %');
  });
  it('is quiet where the departure is below 0.5 %: a sinusoidal amplitude grating of 10 periods (orders ¼ and m²/16)', () => {
    const { codes, rec } = runCase({ wavelength: lam, distance: 1, aperture: { shape: 'grating', profile: { kind: 'sinusoidal-amplitude', modulation: 1 }, count: 10, period: 10 * um, opaque: false } });
    expect(codes).not.toContain('orders-finite');
    const o0 = rec.metrics.orders!.find((x) => x.m === 0)!;
    expect(Math.abs(o0.fractionOfIncident! - 0.25)).toBeLessThan(0.01);
  });
});

describe('orders-window', () => {
  it('a grating of finite length: each order spreads along y past the window, and the case says its powers are short', () => {
    const { rec, codes } = runCase({
      wavelength: lam,
      distance: 2,
      aperture: { shape: 'grating', profile: { kind: 'sinusoidal-phase', modulation: 0.2 }, count: 100, period: 20 * um, length: 1e-3, opaque: false },
    });
    const o0 = rec.metrics.orders!.find((x) => x.m === 0)!;
    // J₀²(0.1) = 0.99501 (Abramowitz & Stegun 9.1.10, J₀(x) = 1 − x²/4 + x⁴/64 …)
    const eff = (1 - 0.01 / 4 + 1e-4 / 64) ** 2;
    if (eff - o0.fractionOfIncident! > 0.01) expect(codes).toContain('orders-window');
    if (codes.includes('orders-window')) expect(rec.warnings.find((x) => x.code === 'orders-window')!.message).toMatch(/order 0: 9\d\.?\d* % measured/);
    expect(eff - o0.fractionOfIncident!).toBeGreaterThan(0);
  });
});
