// Binary amplitude gratings (`slits`) in the far field, against the grating equation and the
// published order efficiencies.
import { describe, expect, it } from 'vitest';
import { planCase } from '../../src/plan/planner.js';
import { makeCase, nm, runCase, um } from '../helpers.js';

const lam = 633 * nm;
const d = 20 * um;

// Left to itself the planner holds every propagating order (|m| ≤ 31 here) out to grazing, a window
// of ±72 m at 10 m and 1.4·10⁵ output samples: about 20 s a case. The checks below read orders up to
// |m| = 5 (at 1.6 m), so most cases give a window of 4.4 m (orders up to ±6, at 1.93 m, inside): the
// planner still picks its own pitch and output step for it, and each order's power is integrated
// over the same interval (midpoints to its neighbours), so the values checked are those of the full
// window. The orders beyond are then warned as outside (orders-outside), which is what a job's
// narrow window should get.
const orderWindow: [number, number] = [4.4, 4.4];
const binary = { shape: 'slits' as const, count: 40, width: d / 2, period: d, opaque: false };

function peakNear(c: { intensity: Float64Array; nx: number }, x: (i: number) => number, x0: number, halfSpan: number): number {
  let best = -1;
  for (let i = 1; i < c.nx - 1; i++) {
    if (Math.abs(x(i) - x0) > halfSpan) continue;
    if (best < 0 || c.intensity[i]! > c.intensity[best]!) best = i;
  }
  const [a, b, e] = [c.intensity[best - 1]!, c.intensity[best]!, c.intensity[best + 1]!];
  const den = a - 2 * b + e;
  return x(best) + (den === 0 ? 0 : (0.5 * (a - e)) / den) * (x(best + 1) - x(best));
}

// The normal-incidence case, run once: read by the first block and by the finite-length lines' one.
const normal = runCase({ wavelength: lam, distance: 10, window: orderWindow, aperture: binary });

describe('50 % duty binary grating, normal incidence', () => {
  const { plan, rec, c, x } = normal;
  const orders = rec.metrics.orders!;
  const order = (m: number) => orders.find((o) => o.m === m)!;

  it('is a far-field 1-D case', () => {
    // The plan the grating gets with no window given (planned only: the plan is cheap, the run is not).
    const own = planCase(makeCase({ wavelength: lam, distance: 10, aperture: binary }));
    expect(own.regime).toBe('far-field');
    expect(own.method).toBe('fraunhofer');
    expect(own.layout).toBe('one-d');
    expect(own.warnings).toEqual([]);
    // The run in the narrower window: the same method, and nothing warned but the orders beyond it.
    expect(plan.regime).toBe('far-field');
    expect(plan.method).toBe('fraunhofer');
    expect(plan.layout).toBe('one-d');
    expect(rec.warnings.map((w) => w.code)).toEqual(['orders-outside']);
  });

  // Goodman, Introduction to Fourier Optics, §4.4 (amplitude grating) and its square-wave form:
  // efficiency of order m = duty²·sinc²(m·duty): 25 % in the zeroth order, 1/π² in each first order,
  // 1/(9π²) in each third, none in the even orders. A finite grating of N = 40 slits spreads about
  // 1/N of each order's power into side lobes over a range where the envelope changes, so the budget
  // is 1 % of the value for orders 0 and ±1 and 3 % for ±3.
  it('puts 25 % of the incident power in the zeroth order', () => {
    expect(order(0).fractionOfIncident!).toBeGreaterThan(0.25 * 0.99);
    expect(order(0).fractionOfIncident!).toBeLessThan(0.25 * 1.01);
  });
  it.each([1, -1])('puts 1/π² of the incident power in order %i', (m) => {
    expect(Math.abs(order(m).fractionOfIncident! - 1 / Math.PI ** 2) / (1 / Math.PI ** 2)).toBeLessThan(0.01);
  });
  it.each([3, -3])('puts 1/(9π²) in order %i', (m) => {
    const ref = 1 / (9 * Math.PI ** 2);
    expect(Math.abs(order(m).fractionOfIncident! - ref) / ref).toBeLessThan(0.03);
  });
  it.each([2, -2, 4])('leaves order %i (nearly) empty', (m) => {
    expect(order(m).fractionOfIncident!).toBeLessThan(1e-3);
  });

  it('puts each order where the grating equation d sin θ = mλ does (within 0.1 % of the position)', () => {
    for (const m of [1, 2, 3, 5]) {
      const xm = 10 * Math.tan(Math.asin((m * lam) / d));
      const spacing = 10 * (lam / d);
      // Even orders are absent: test their position only where there is a peak to find.
      if (m % 2 === 0) continue;
      expect(Math.abs(peakNear(c, x, xm, spacing / 4) - xm) / xm).toBeLessThan(1e-3);
      expect(order(m).position!).toBeCloseTo(xm, 9);
    }
  });
});

describe('grating under oblique incidence', () => {
  // The planner's own window here (the one full-window case of this file): Parseval needs every order.
  const tilt = (10 * Math.PI) / 180;
  const z = 10;
  const { rec, c, x } = runCase({
    wavelength: lam,
    distance: z,
    aperture: { shape: 'slits', count: 40, width: d / 2, period: d, opaque: false },
    illumination: { kind: 'plane', tilt: [tilt, 0] },
  });
  it('follows d(sin θ_m − sin θ_i) = mλ (Hecht, Optics, §10.2.8)', () => {
    for (const m of [-3, -1, 0, 1, 3]) {
      const s = Math.sin(tilt) + (m * lam) / d;
      const xm = z * Math.tan(Math.asin(s));
      const o = rec.metrics.orders!.find((k) => k.m === m)!;
      expect(o.position!).toBeCloseTo(xm, 9);
      expect(Math.abs(peakNear(c, x, xm, (z * lam) / d / 4) - xm)).toBeLessThan(1e-3 * z * (lam / d));
    }
  });
  it('conserves the power through the slits in the window (Parseval)', () => {
    expect(rec.metrics.windowFraction!).toBeGreaterThan(0.95);
    expect(rec.metrics.windowFraction!).toBeLessThan(1.001);
  });
});

describe('orders of equal mλ overlap', () => {
  // The grating equation depends on mλ only (common practice: the free spectral range problem).
  // 40 % duty, so that neither order 2 nor order 3 is a missing order.
  it('puts order 3 of 400 nm and order 2 of 600 nm at the same computed peak', () => {
    // Both orders land at 0.60 m: a 2 m window holds them (see orderWindow above).
    const run = (wl: number) =>
      runCase({ wavelength: wl, distance: 10, window: [2, 2], aperture: { shape: 'slits', count: 40, width: 0.4 * d, period: d, opaque: false } });
    const a = run(400 * nm);
    const b = run(600 * nm);
    const xm = 10 * Math.tan(Math.asin((1200 * nm) / d));
    const pa = peakNear(a.c, a.x, xm, (10 * 400 * nm) / d / 4);
    const pb = peakNear(b.c, b.x, xm, (10 * 600 * nm) / d / 4);
    expect(Math.abs(pa - pb)).toBeLessThan(1e-3 * xm);
  });
});

describe('a grating of finite-length lines (separable 2-D)', () => {
  it('has the order efficiencies of the infinitely long one, less what falls outside the window (3 % budget)', () => {
    // The infinitely long lines are the normal-incidence case above (orders 0, ±1, 3 integrated over
    // the same intervals as in a full window); the short ones in the planner's own window.
    const long = normal;
    const short = runCase({ wavelength: lam, distance: 10, aperture: { ...binary, length: 0.5e-3 } });
    expect(short.plan.layout).toBe('separable');
    for (const m of [0, 1, -1, 3]) {
      const a = long.rec.metrics.orders!.find((o) => o.m === m)!.fractionOfIncident!;
      const b = short.rec.metrics.orders!.find((o) => o.m === m)!.fractionOfIncident!;
      // The short lines spread each order along y; the window holds all but the planned ≈2 % margin
      // of that spread, hence a 3 % budget.
      expect(Math.abs(b - a) / a).toBeLessThan(0.03);
      expect(b).toBeLessThanOrEqual(a * 1.001);
    }
  });
});
