// The order table of binary amplitude gratings against the grating equation (Hecht, Optics,
// §10.2.8; Born & Wolf, Principles of Optics, §8.6.1) and thin-grating theory (Goodman,
// Introduction to Fourier Optics, §4.4), at normal and oblique incidence, with the evanescent
// orders listed and never drawn. Small far-field cases, with a window given around the orders of
// interest so that each stays a fraction of a second.
import { describe, expect, it } from 'vitest';
import type { GratingOrder } from '../../src/analysis/orders.js';
import { postChecks } from '../../src/analysis/validity.js';
import { planCase } from '../../src/plan/planner.js';
import { makeCase, nm, runCase, um } from '../helpers.js';

const lam = 633 * nm;
const deg = Math.PI / 180;

/** Parabolic vertex of the highest sample within ±halfSpan of x0 (m). */
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

/** (w/d)·sinc²(m·w/d): thin-grating theory's share of the power through the slits (Goodman §4.4). */
function thin(duty: number, m: number): number {
  if (m === 0) return duty;
  const u = Math.PI * m * duty;
  return duty * (Math.sin(u) / u) ** 2;
}

function grating(N: number, d: number, duty: number, z: number, tiltDeg: number, halfWindow: number) {
  const tilt = tiltDeg * deg;
  // The planner centres the window where the tilted beam lands.
  return runCase({
    wavelength: lam,
    distance: z,
    method: 'fraunhofer',
    window: [2 * halfWindow, 2 * halfWindow],
    aperture: { shape: 'slits', count: N, width: duty * d, period: d, opaque: false },
    illumination: { kind: 'plane', tilt: [tilt, 0] },
  });
}

describe.each([0, 15, 30])('order positions at %i° incidence (Hecht §10.2.8, Born & Wolf §8.6.1)', (tiltDeg) => {
  const d = 10 * um;
  const z = 1;
  const sinI = Math.sin(tiltDeg * deg);
  // Orders −2…2 around the tilted beam, well inside a window of ±0.7 m. Duty 0.2: the single-slit
  // envelope is nearly flat over these orders, so the finite grating's peaks sit on the
  // grating-equation angles (the envelope's logarithmic slope s per order spacing moves a peak of N
  // slits by about 3s/(2π²N²) of the spacing, derived from sinc² envelope × array factor: 6e-5 here,
  // where a 40 % duty and 20 slits would give 0.17 % for order 2).
  const { rec, c, x } = grating(40, d, 0.2, z, tiltDeg, 0.7);
  const orders = rec.metrics.orders!;
  const order = (m: number) => orders.find((o) => o.m === m)!;

  it('lists each order at z·tan θ_m with d(sin θ_m − sin θ_i) = mλ', () => {
    for (const m of [-2, -1, 0, 1, 2]) {
      const s = sinI + (m * lam) / d;
      const xm = (z * s) / Math.sqrt(1 - s * s);
      expect(order(m).sinAngle).toBeCloseTo(s, 12);
      expect(order(m).angle!).toBeCloseTo(Math.asin(s), 12);
      expect(order(m).position!).toBeCloseTo(xm, 9);
    }
  });
  it('gives each order its dispersion: dθ/dλ = m/(d cos θ_m), dx/dλ = z·m/(d cos³θ_m), free spectral range λ/|m|', () => {
    for (const m of [-2, -1, 1, 2]) {
      const s = sinI + (m * lam) / d;
      const cos = Math.sqrt(1 - s * s);
      // Checked by differencing the grating equation's landing point x(λ) = z·tan θ_m(λ) over ±1 pm.
      const xAtLam = (l: number) => {
        const sl = sinI + (m * l) / d;
        return (z * sl) / Math.sqrt(1 - sl * sl);
      };
      const numeric = (xAtLam(lam + 1e-12) - xAtLam(lam - 1e-12)) / 2e-12;
      expect(order(m).angularDispersion!).toBeCloseTo(m / (d * cos), 6);
      expect(order(m).linearDispersion! / numeric).toBeCloseTo(1, 6);
      expect(order(m).freeSpectralRange!).toBeCloseTo(lam / Math.abs(m), 18);
    }
    expect(order(0).angularDispersion).toBeNull();
  });
  it('finds the computed peak of each order there, within 0.1 % of z·λ/d', () => {
    // Budget: the far-field formula places peaks exactly in direction cosines; the envelope's shift
    // is 6e-5 of the spacing (above) and the parabolic vertex of peaks sampled at λz/(8D) is good
    // to a small fraction of a sample (0.3 % of the spacing here).
    for (const m of [-2, -1, 0, 1, 2]) {
      const xm = order(m).position!;
      expect(Math.abs(peakNear(c, x, xm, (z * lam) / d / 4) - xm)).toBeLessThan(1e-3 * ((z * lam) / d));
    }
  });
  it('lists as evanescent, with zero power, exactly the orders with |sin θ_i + mλ/d| > 1', () => {
    for (const o of orders) {
      const s = sinI + (o.m * lam) / d;
      expect(o.status === 'evanescent').toBe(Math.abs(s) > 1);
      if (o.status === 'evanescent') {
        expect(o.fractionOfTransmitted).toBe(0);
        expect(o.fluxFraction).toBe(0);
        expect(o.position).toBeNull();
      }
    }
    // At least the first evanescent order on each side is listed.
    const lo = Math.ceil((-1 - sinI) * (d / lam));
    const hi = Math.floor((1 - sinI) * (d / lam));
    expect(orders.some((o) => o.m === lo - 1 && o.status === 'evanescent')).toBe(true);
    expect(orders.some((o) => o.m === hi + 1 && o.status === 'evanescent')).toBe(true);
  });
  it('has the consistency checks quiet on this correct computation', () => {
    expect(rec.metrics.orderChecks!.length).toBeGreaterThan(2);
    const codes = rec.warnings.map((w) => w.code);
    expect(codes).not.toContain('orders-misplaced');
    expect(codes).not.toContain('orders-power');
  });
});

describe('thin-grating powers (Goodman §4.4: |c_m|² = (w/d)²·sinc²(m·w/d), Σ|c_m|² = w/d)', () => {
  // A finite grating of N slits leaks about 1/N of an order into its neighbours' intervals (the
  // sinc² side lobes' 1/u tail law, common practice), so an order may differ from its thin-grating
  // value by 1/N of the strongest of it and its neighbours, plus 1e-4 of the transmitted power for
  // the method's own accuracy. The strong orders do far better (measured: 0.06/N of the value for
  // orders 0 and ±1 at 50 % duty, N = 10…1000), so they get 0.5 % at N = 40.
  const N = 40;
  const budget = (orders: GratingOrder[], o: GratingOrder) =>
    Math.max(...orders.filter((k) => Math.abs(k.m - o.m) <= 1).map((k) => k.predictedFraction)) / N + 1e-4;
  it.each([
    [0.5, 0, 10, 1.1],
    [0.25, 0, 10, 1.1],
    [0.5, 30, 10, 2.0],
  ])('duty %f at %i°: measured ∫|U|² per order against (w/d)·sinc²(m·w/d)', (duty, tiltDeg, z, half) => {
    const d = 20 * um;
    const { rec } = grating(N, d, duty, z, tiltDeg, half);
    const orders = rec.metrics.orders!;
    const inWindow = orders.filter((o) => o.status === 'propagating');
    expect(inWindow.length).toBeGreaterThanOrEqual(5);
    for (const o of inWindow) {
      expect(o.predictedFraction).toBeCloseTo(thin(duty, o.m), 12);
      expect(Math.abs(o.fractionOfTransmitted! - thin(duty, o.m))).toBeLessThan(budget(orders, o));
      if (Math.abs(o.m) <= 1) expect(Math.abs(o.fractionOfTransmitted! - thin(duty, o.m))).toBeLessThan(0.005 * thin(duty, o.m));
    }
  });
  it('50 % duty: 25 % of the incident power in order 0, 1/π² in ±1, (nearly) none in ±2 (Goodman §4.4)', () => {
    const { rec } = grating(N, 20 * um, 0.5, 10, 0, 1.1);
    const o = (m: number) => rec.metrics.orders!.find((k) => k.m === m)!;
    expect(Math.abs(o(0).fractionOfIncident! - 0.25)).toBeLessThan(0.005 * 0.25);
    expect(Math.abs(o(1).fractionOfIncident! - 1 / Math.PI ** 2)).toBeLessThan(0.005 / Math.PI ** 2);
    expect(Math.abs(o(-1).fractionOfIncident! - 1 / Math.PI ** 2)).toBeLessThan(0.005 / Math.PI ** 2);
    // Order 2 holds only what leaks from orders 1 and 3 (of incident: half the transmitted scale).
    expect(o(2).fractionOfIncident!).toBeLessThan((0.5 * (1 / Math.PI ** 2)) / N);
  });
  it('the flux through the screen plane is ∫|U|² times cos θ_m / cos θ_i (the obliquity of the thin-element model)', () => {
    const { rec } = grating(20, 10 * um, 0.4, 1, 30, 0.7);
    const cosI = Math.cos(30 * deg);
    for (const o of rec.metrics.orders!.filter((k) => k.status === 'propagating')) {
      const cosM = Math.sqrt(1 - o.sinAngle ** 2);
      expect(o.fluxFraction!).toBeCloseTo((o.fractionOfTransmitted! * cosM) / cosI, 12);
      expect(o.predictedFlux).toBeCloseTo((thin(0.4, o.m) * cosM) / cosI, 12);
    }
  });
});

describe('evanescent orders (Goodman §4.4; common practice: |sin θ_m| > 1 does not propagate)', () => {
  // d = 2.5λ: orders 0, ±1, ±2 land (sin θ = 0, ±0.4, ±0.8); ±3 and beyond are evanescent.
  const d = 2.5 * lam;
  const z = 0.01;
  const N = 20;
  const { rec, c, x } = runCase({
    wavelength: lam,
    distance: z,
    method: 'fraunhofer',
    aperture: { shape: 'slits', count: N, width: d / 2, period: d, opaque: false },
  });
  const orders = rec.metrics.orders!;

  it('lists orders ±3 as evanescent with zero power, and the evanescent total as 1 − Σ over the orders that land', () => {
    for (const m of [-3, 3]) {
      const o = orders.find((k) => k.m === m)!;
      expect(o.status).toBe('evanescent');
      expect(o.fractionOfTransmitted).toBe(0);
      expect(o.predictedFraction).toBeCloseTo(thin(0.5, m), 12);
    }
    // Independently: Σ over |m| ≥ 3 of (w/d)·sinc²(m·w/d) (odd m only at 50 % duty), summed to
    // m = 2·10⁶ plus the tail bound Σ_{m>M} 2/(π²m²) ≈ 2/(π²M) for the rest.
    let tail = 0;
    const M = 2e6;
    for (let m = 3; m <= M; m++) tail += 2 * thin(0.5, m);
    tail += 1 / (Math.PI ** 2 * M);
    expect(rec.metrics.evanescentFraction!).toBeCloseTo(tail, 6);
    expect(rec.metrics.evanescentFraction!).toBeCloseTo(1 - thin(0.5, 0) - 2 * thin(0.5, 1) - 2 * thin(0.5, 2), 12);
  });
  it('lists evanescent orders out to where thin-grating theory gives them 0.1 % of the power', () => {
    const listed = orders.filter((o) => o.status === 'evanescent').map((o) => Math.abs(o.m));
    const farthest = Math.max(...listed);
    expect(thin(0.5, farthest)).toBeGreaterThanOrEqual(1e-3);
    // No order farther out carries 0.1 %.
    for (let m = farthest + 1; m < farthest + 200; m++) expect(thin(0.5, m)).toBeLessThan(1e-3);
  });
  it('never finds an evanescent order as a peak: no light where a paraxial method would put order 3 (z·sin θ = 1.2 z)', () => {
    // Peak of the map within ± one order spacing of 1.2 z, against the peak of order 1.
    const spot = (z * lam) / d;
    let stray = 0;
    for (let i = 0; i < c.nx; i++) if (Math.abs(Math.abs(x(i)) - 1.2 * z) < spot / 2) stray = Math.max(stray, c.intensity[i]!);
    const x1 = orders.find((o) => o.m === 1)!.position!;
    expect(peakNear(c, x, x1, spot / 4)).toBeCloseTo(x1, 4);
    let main = 0;
    for (let i = 0; i < c.nx; i++) if (Math.abs(x(i) - x1) < spot / 4) main = Math.max(main, c.intensity[i]!);
    // Order 3 carries 2.25 % of the power in thin-grating theory: drawn, its peak would be about a
    // tenth of order 1's. What is there is the tail of order 2, far below that.
    expect(stray / main).toBeLessThan(0.01);
    expect(rec.metrics.strayLight ?? []).toEqual([]);
  });
  it('does not blame the window for the evanescent light, and says what it is', () => {
    const codes = rec.warnings.map((w) => w.code);
    expect(rec.metrics.evanescentFraction!).toBeGreaterThan(0.05);
    expect(codes).toContain('evanescent');
    expect(codes).not.toContain('window-loss');
    const msg = rec.warnings.find((w) => w.code === 'evanescent')!.message;
    expect(msg).toMatch(/no power to any screen/);
    expect(msg).toMatch(/not a fault of the window/);
  });
});

describe('an order table of a grating with orders outside the window', () => {
  it('gives each order that lands its status, and says whether part or all of its interval is outside', () => {
    const { rec } = grating(20, 10 * um, 0.4, 1, 0, 0.1);
    const byStatus = (o: GratingOrder) => o.status;
    const orders = rec.metrics.orders!;
    expect(orders.find((o) => o.m === 0)!.status).toBe('propagating');
    const out = orders.filter((o) => o.status === 'outside-window');
    expect(out.length).toBeGreaterThan(0);
    for (const o of out) {
      const [a, b] = o.interval!;
      const [w0, w1] = [rec.computed.x0 - rec.computed.dx / 2, rec.computed.x0 + (rec.computed.nx - 0.5) * rec.computed.dx];
      expect(o.outside).toBe(b < w0 || a > w1 ? 'all' : 'part');
      expect(o.fractionOfTransmitted).toBeNull();
    }
    expect(new Set(orders.map(byStatus))).toEqual(new Set(['propagating', 'outside-window', 'evanescent']));
  });
});

describe('window loss apart from evanescent light (no advice to leave the planner’s own choice to the planner)', () => {
  const aperture = { shape: 'slits' as const, count: 40, width: 10 * um, period: 20 * um, opaque: false };
  it('a window the job gives that cuts orders off: widen it', () => {
    const { rec } = runCase({ wavelength: lam, distance: 10, method: 'fraunhofer', window: [0.4, 0.4], aperture });
    const w = rec.warnings.find((x) => x.code === 'window-loss');
    expect(w).toBeDefined();
    // Measured against the power that reaches the screen: the evanescent part is named apart.
    expect(w!.message).toMatch(/of the power that reaches the screen \(the power through the aperture less the [\d.]+ % that goes into evanescent waves\)/);
    expect(w!.message).toMatch(/widen the window the job gives/);
    const missing = 1 - rec.metrics.evanescentFraction! - rec.metrics.windowFraction!;
    expect(w!.message).toContain(`${Number((100 * (missing / (1 - rec.metrics.evanescentFraction!))).toPrecision(3))} %`);
  });
  it('the planner’s own window: no advice to leave it to the planner; unexpected beyond its own estimate, said as expected within it', () => {
    // postChecks on the planner's plan of a slit, with the window holding 80 % and then the share
    // the planner itself expected to keep (plan.checks.windowLossEstimate).
    const plan = planCase(makeCase({ wavelength: lam, distance: 1, aperture: { shape: 'slit', width: 100 * um, opaque: false } }));
    expect(plan.case.window).toBeUndefined();
    const lost = postChecks(plan, { powerIn: 1, powerInWindow: 0.8 });
    const w = lost.find((x) => x.code === 'window-loss')!;
    // Of the power that reaches the screen: the planner's evanescent estimate for the slit is set apart.
    const ev = plan.checks.evanescentFraction ?? 0;
    expect(w.message.startsWith(`${Number((100 * ((1 - ev - 0.8) / (1 - ev))).toPrecision(3))} % of the power`)).toBe(true);
    expect(w.message).toMatch(/unexpected for the window the planner chose, which it expected to miss about [\d.<]+ %/);
    const expected = Math.max(plan.checks.windowLossEstimate, 0.06);
    const asPlanned = postChecks({ ...plan, checks: { ...plan.checks, windowLossEstimate: expected } }, { powerIn: 1, powerInWindow: (1 - ev) * (1 - expected) });
    expect(asPlanned.find((x) => x.code === 'window-loss')!.message).toMatch(/about what the planner expected when it chose this window/);
    for (const x of [...lost, ...asPlanned]) expect(x.message).not.toMatch(/to the planner/);
  });
});

describe('orders that overlap on the screen (the grating’s near field): no power read off the map for them', () => {
  // 20 slits of 5 µm at 10 µm: the beams of orders 0 and ±1 are each the grating's 195 µm footprint
  // widened by diffraction (common practice: three far-field lobes λz/D, or three Fresnel zones √(λz)
  // near the grating, on each side), and z·λ/d apart (Hecht §10.2.8, small angles).
  const aperture = { shape: 'slits' as const, count: 20, width: 5 * um, period: 10 * um, opaque: false };
  const D = 19 * 10 * um + 5 * um;
  it('at 1 mm (orders 63 µm apart, beams about 300 µm wide) the orders overlap: warned, fractions empty, where they separate said', () => {
    const { rec, codes } = runCase({ wavelength: lam, distance: 1e-3, aperture });
    expect(codes).toContain('orders-unresolved');
    const inside = rec.metrics.orders!.filter((o) => o.status === 'propagating' && Math.abs(o.m) <= 1);
    expect(inside.length).toBe(3);
    for (const o of inside) {
      expect(o.separated).toBe(false);
      expect(o.fractionOfTransmitted).toBeNull();
      expect(o.fluxFraction).toBeNull();
    }
    const msg = rec.warnings.find((w) => w.code === 'orders-unresolved')!.message;
    const beyond = /separate beyond about ([\d.]+) (mm|cm|m)\b/.exec(msg);
    expect(beyond).not.toBeNull();
    // Independently of the table: z·λ/d ≥ D + 6·max(λz/D, √(λz)) solved by bisection.
    const apart = (z: number) => (z * lam) / (10 * um) - D - 6 * Math.max((lam * z) / D, Math.sqrt(lam * z));
    let [a, b] = [1e-3, 10];
    for (let i = 0; i < 200; i++) {
      const m = (a + b) / 2;
      if (apart(m) >= 0) b = m;
      else a = m;
    }
    const scale = { mm: 1e-3, cm: 1e-2, m: 1 }[beyond![2] as 'mm' | 'cm' | 'm'];
    expect(Number(beyond![1]) * scale).toBeCloseTo(b, 4);
  });
  it('beyond that distance the same grating’s orders are separated, read off the map, and carry their thin-grating power within 1/N', () => {
    const apart = (z: number) => (z * lam) / (10 * um) - D - 6 * Math.max((lam * z) / D, Math.sqrt(lam * z));
    let z = 1e-3;
    while (apart(z) < 0) z *= 1.1;
    const { rec, codes } = runCase({ wavelength: lam, distance: z, aperture });
    expect(codes).not.toContain('orders-unresolved');
    for (const o of rec.metrics.orders!.filter((k) => k.status === 'propagating' && Math.abs(k.m) <= 1)) {
      expect(o.separated).toBe(true);
      // Budget as above (1/N of the strongest neighbour: leakage of the finite grating's tails).
      expect(Math.abs(o.fractionOfTransmitted! - thin(0.5, o.m))).toBeLessThan(thin(0.5, 0) / 20 + 1e-4);
    }
  });
});
