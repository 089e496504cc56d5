// The post-computation consistency checks of grating cases (analysis/order-checks.ts): they fire
// where the computation is off — a paraxial method at wide angles puts order m at z·sin θ_m instead
// of z·tan θ_m (Hecht, Optics, §10.2.8) and lands evanescent orders on the screen; an aliased
// source gives orders the wrong power (Goodman, Introduction to Fourier Optics, §4.4) — and stay
// quiet on correct computations: the far-field formula in its far field (exact in direction
// cosines), and whatever valid method the planner picks nearer the grating.
import { describe, expect, it } from 'vitest';
import { columnPower, integrateColumns } from '../../src/analysis/orders.js';
import type { CaseSpec } from '../helpers.js';
import { nm, runCase, um } from '../helpers.js';

const lam = 633 * nm;
const deg = Math.PI / 180;

function grating(N: number, d: number, z: number, tiltDeg: number, method: CaseSpec['method'], extra: Partial<CaseSpec> = {}) {
  return runCase({
    wavelength: lam,
    distance: z,
    method,
    aperture: { shape: 'slits', count: N, width: d / 2, period: d, opaque: false },
    illumination: { kind: 'plane', tilt: [tiltDeg * deg, 0] },
    ...extra,
  });
}

const warning = (r: ReturnType<typeof runCase>, code: string) => r.rec.warnings.find((w) => w.code === code);

describe('orders-misplaced and orders-power on the paraxial (Fresnel) method forced at wide angles', () => {
  it.each([
    [0, 20, 3.5 * lam, 0.01],
    [15, 12, 8 * lam, 0.005],
    [30, 12, 8 * lam, 0.005],
  ])('at %i° incidence: orders found at z·sin θ, not z·tan θ, and the warning says where they should be', (tiltDeg, N, d, z) => {
    const r = grating(N, d, z, tiltDeg, 'fresnel');
    expect(r.plan.method).toBe('fresnel');
    const w = warning(r, 'orders-misplaced');
    expect(w).toBeDefined();
    expect(w!.message).toMatch(/z·tan θ = /);
    expect(w!.message).toMatch(/the larger of one output sample, .*, and 1 % of the order's distance from the axis/);
    expect(w!.message).toMatch(/The computation itself is off/);
    // Independently of the checks: some order that lands at 1 % or more off the axis has its light
    // (centroid over the part of its interval symmetric about z·tan θ_m) nearer z·sin θ_m than
    // z·tan θ_m, off by more than 1 % of its position. The two differ by a factor cos θ_m (Hecht §10.2.8).
    const cp = columnPower(r.c);
    let paraxialOrders = 0;
    for (const o of r.rec.metrics.orders!) {
      if (o.status !== 'propagating' || o.predictedFraction < 1e-2) continue;
      const x = o.position!;
      const [a, b] = o.interval!;
      const half = Math.min(x - a, b - x);
      const { power, moment } = integrateColumns(cp, r.c, x - half, x + half);
      const centroid = moment / power;
      const parax = z * o.sinAngle;
      if (Math.abs(centroid - x) > 0.01 * Math.abs(x) && Math.abs(centroid - parax) < Math.abs(centroid - x)) paraxialOrders++;
    }
    expect(paraxialOrders).toBeGreaterThan(0);
  });

  it('names the evanescent orders a paraxial method lands on the screen (|sin θ_m| > 1), as light where no order lands', () => {
    // d = 3.5λ: orders beyond ±3 are evanescent; paraxially they land at z·sin θ_m, beyond z.
    const r = grating(20, 3.5 * lam, 0.01, 0, 'fresnel', { window: [0.05, 0.05] });
    const stray = r.rec.metrics.strayLight ?? [];
    const evanescent = stray.filter((s) => s.evanescent);
    expect(evanescent.length).toBeGreaterThan(0);
    for (const s of evanescent) {
      const sin = (s.paraxialOrder! * lam) / (3.5 * lam);
      expect(Math.abs(sin)).toBeGreaterThan(1);
      expect(Math.abs(s.position)).toBeGreaterThan(0.01 * 0.95);
    }
    expect(warning(r, 'orders-misplaced')!.message).toMatch(/lands the evanescent order -?\d+ .*it should reach no screen at all/);
  });

  it('orders-power: the paraxial method at 30° gives orders 0 and ±1 the wrong share', () => {
    const r = grating(12, 8 * lam, 0.005, 30, 'fresnel');
    const w = warning(r, 'orders-power');
    expect(w).toBeDefined();
    expect(w!.message).toMatch(/order 0: [\d.]+ % of the transmitted power measured, 50 % predicted/);
  });

  it('advises a method the plan offers: valid here, fitting, not the one that failed, and one a job can ask for', () => {
    const r = grating(12, 8 * lam, 0.005, 30, 'fresnel');
    const offered = (r.plan.options ?? []).filter((o) => o.valid && o.fits !== false && o.method !== 'fresnel').map((o) => o.method);
    expect(offered.length).toBeGreaterThan(0);
    const msg = warning(r, 'orders-misplaced')!.message;
    expect(msg).toMatch(/this case forces method: fresnel/);
    // Forced: method auto, naming what the planner would pick here.
    const m = /use method: auto, with which the planner picks ([a-z-]+) here \(valid, and it fits\)/.exec(msg);
    expect(m).not.toBeNull();
    expect(offered).toContain(m![1]);
  });
});

describe('quiet on correct computations', () => {
  it.each([
    [0, 20 * um, 10, 10, 0.35],
    [15, 20 * um, 10, 20, 0.35],
    [30, 20 * um, 10, 20, 0.35],
    [0, 8 * lam, 0.02, 12, 1],
  ])('the far-field formula in its far field, %i° incidence (d = %s m, z = %s m, N = %i)', (tiltDeg, d, z, N, window) => {
    const r = grating(N, d, z, tiltDeg, 'fraunhofer', { window: [window * z, window * z] });
    expect(r.plan.checks.farFieldDistance).toBeLessThan(z);
    expect(r.rec.metrics.orderChecks!.length).toBeGreaterThanOrEqual(3);
    expect(r.codes).not.toContain('orders-misplaced');
    expect(r.codes).not.toContain('orders-power');
  });
  it.each([
    [30, 12, 8 * lam, 0.005],
    [10, 40, 20 * um, 0.3],
    [0, 100, 20 * um, 0.1],
  ])('the method the planner picks nearer the grating, %i° incidence (N = %i)', (tiltDeg, N, d, z) => {
    const r = grating(N, d, z, tiltDeg, 'auto');
    expect(r.rec.metrics.orderChecks!.length).toBeGreaterThanOrEqual(3);
    expect(r.codes).not.toContain('orders-misplaced');
    expect(r.codes).not.toContain('orders-power');
  });

  it('allows for the finite grating pulling an order’s light toward the brighter side of the single-slit envelope', () => {
    // N = 10, 50 % duty: the envelope sinc²(m/2) falls steeply across order 1, whose side lobes'
    // light leans toward order 0 by about slope/(2π²N) of the spacing (derived from envelope ×
    // array factor): more than the 1 % tolerance. The far-field formula is exact here (z ≫ 2D²/λ),
    // so the raw centroid's miss is physics, and the check (which takes the shift from its model of
    // this grating) must stay quiet.
    const r = grating(10, 20 * um, 10, 0, 'fraunhofer', { window: [2, 2] });
    const c1 = r.rec.metrics.orderChecks!.find((c) => c.m === 1)!;
    const rawCentroid = c1.centroid! + c1.modelShift;
    expect(Math.abs(rawCentroid - c1.position)).toBeGreaterThan(c1.centroidTolerance);
    expect(Math.abs(c1.centroid! - c1.position)).toBeLessThan(0.01 * c1.centroidTolerance);
    expect(r.codes).not.toContain('orders-misplaced');
  });
});

describe('orders-power on an aliased computation', () => {
  it('fires when the slits are sampled at 4 µm on a 10 µm period (the power-excess case)', () => {
    const r = grating(20, 10 * um, 1, 0, 'auto', { grid: { pitch: 4 * um } });
    expect(r.codes).toContain('power-excess');
    expect(r.codes).toContain('orders-power');
    expect(warning(r, 'orders-power')!.message).toMatch(/predicted \(allowed ±/);
  });
});
