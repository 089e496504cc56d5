// Where the paraxial and far-field forms fail — gratings whose orders leave at real angles, light a
// few wavelengths from the aperture — the planner must take an exact method (or say why not), and
// the results must match exact references: the grating equation and thin-grating theory for the
// orders, the closed-form on-axis field of a circular aperture, and an independent quadrature of
// the 1-D Rayleigh–Sommerfeld integral (test/reference/rs1d.ts), all on the planner's own grids.
import { describe, expect, it } from 'vitest';
import type { GratingOrder } from '../../src/analysis/orders.js';
import { mm, nm, runCase, um } from '../helpers.js';
import { intensity, rs1d } from '../reference/rs1d.js';

const deg = Math.PI / 180;

/** Warning codes that say the computed values themselves may be off. */
const ACCURACY = ['paraxial', 'not-far-field', 'coarse-sampling', 'undersampled-feature', 'grid-too-small', 'transfer-undersampled', 'output-undersampled', 'power-excess', 'edge-energy', 'band-limit', 'orders-misplaced', 'orders-power'];

/**
 * Thin binary amplitude grating of duty w/d: order m carries (w/d)²·sinc²(m·w/d) of the incident
 * power, so (w/d)·sinc²(m·w/d) of the power through the slits (Goodman, Introduction to Fourier
 * Optics, §4.4).
 */
function thin(duty: number, m: number): number {
  if (m === 0) return duty;
  const u = Math.PI * m * duty;
  return duty * (Math.sin(u) / u) ** 2;
}

interface GratingJob {
  name: string;
  wavelengths: number[];
  z: number;
  count: number;
  width: number;
  period: number;
  tilt: number;
}

// The three jobs of the trust issue (the tool's own users' scenarios: a sodium-doublet spectrometer
// grating, an oblique mask grating, a white-light grating).
const JOBS: GratingJob[] = [
  { name: 'doublet', wavelengths: [589.0 * nm, 589.6 * nm], z: 1, count: 1000, width: 1 * um, period: 1.667 * um, tilt: 0 },
  { name: 'oblique mask grating', wavelengths: [488 * nm], z: 100 * mm, count: 200, width: 300 * nm, period: 600 * nm, tilt: 30 * deg },
  { name: 'white light', wavelengths: [400, 450, 500, 550, 600, 650, 700].map((l) => l * nm), z: 0.3, count: 50, width: 1.5 * um, period: 3.333 * um, tilt: 0 },
  // A second order at 76° (405 nm): it spreads over decimetres of the screen near grazing.
  { name: 'compact spectrometer (demo job)', wavelengths: [405 * nm, 650 * nm], z: 0.3, count: 600, width: 333 * nm, period: 833.3 * nm, tilt: 0 },
];

describe.each(JOBS)('the $name grating: every order where the grating equation puts it', (job) => {
  const runs = job.wavelengths.map((lam) => ({
    lam,
    ...runCase({
      wavelength: lam,
      distance: job.z,
      aperture: { shape: 'slits', count: job.count, width: job.width, period: job.period, opaque: false },
      illumination: { kind: 'plane', tilt: [job.tilt, 0] },
    }),
  }));

  it('is computed by a method valid here, with no warning that the computed values are off', () => {
    for (const r of runs) {
      expect(r.plan.error).toBeUndefined();
      expect(r.plan.options.find((o) => o.method === r.plan.method && o.form === r.plan.form)!.valid).toBe(true);
      expect(r.codes.filter((c) => ACCURACY.includes(c))).toEqual([]);
    }
  });

  it('lists every propagating order inside the window and none more (d(sin θ_m − sin θ_i) = mλ; Hecht, Optics §10.2.8)', () => {
    for (const r of runs) {
      const orders = r.rec.metrics.orders as GratingOrder[];
      const sinI = Math.sin(job.tilt);
      for (let m = -20; m <= 20; m++) {
        const s = sinI + (m * r.lam) / job.period;
        const o = orders.find((q) => q.m === m);
        if (Math.abs(s) < 1) {
          expect(o?.propagates).toBe(true);
          expect(o!.inWindow).toBe(true);
          expect(o!.position!).toBeCloseTo((job.z * s) / Math.sqrt(1 - s * s), 9);
        } else if (o) {
          expect(o.propagates).toBe(false);
          expect(o.fractionOfTransmitted ?? 0).toBe(0);
        }
      }
    }
  });

  it('has the brightest sample of each order within one sample or 1 % of z·tan θ_m, and no light where the paraxial form would put an evanescent order', () => {
    for (const r of runs) {
      const { c, x } = r;
      const step = c.dx;
      const at = (xx: number) => Math.round((xx - c.x0) / step);
      const orders = (r.rec.metrics.orders as GratingOrder[]).filter((o) => o.propagates);
      let strongest = 0;
      for (const o of orders) {
        if (thin(job.width / job.period, o.m) < 1e-3) continue;
        const [lo, hi] = o.interval!;
        let best = Math.max(0, at(lo));
        for (let i = Math.max(0, at(lo)); i <= Math.min(c.nx - 1, at(hi)); i++) if (c.intensity[i]! > c.intensity[best]!) best = i;
        strongest = Math.max(strongest, c.intensity[best]!);
        // Near grazing an order's diffraction lobe (λ/D in angle) spreads over z·(λ/D)/γ³ of the
        // screen and its intensity peaks on the axis side of z·tan θ (the screen takes in more angle
        // per metre there): a quarter of the lobe is allowed too (common practice: a peak within a
        // fraction of its own width).
        const g = Math.cos(o.angle!);
        const lobe = (job.z * (r.lam / (job.count * job.period))) / g ** 3;
        expect(Math.abs(x(best) - o.position!)).toBeLessThanOrEqual(Math.max(step, 0.01 * Math.abs(o.position!), 0.25 * lobe));
      }
      // Paraxial forms put order m at z·sin θ_m even where |sin θ_m| > 1; nothing may be there.
      for (const m of [-10, -9, -8, -7, -6, -5, -4, -3, -2, -1, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10]) {
        const s = Math.sin(job.tilt) + (m * r.lam) / job.period;
        if (Math.abs(s) < 1) continue;
        const xp = job.z * s;
        const i0 = at(xp);
        if (i0 < 2 || i0 > c.nx - 3) continue;
        const band = Math.max(2, Math.round((0.002 * job.z) / step));
        let worst = 0;
        for (let i = Math.max(0, i0 - band); i <= Math.min(c.nx - 1, i0 + band); i++) worst = Math.max(worst, c.intensity[i]!);
        expect(worst).toBeLessThan(1e-3 * strongest);
      }
    }
  });

  it('gives each order carrying ≥ 1 % the thin-grating power within 1 % (fraction of the power through the slits)', () => {
    for (const r of runs) {
      const duty = job.width / job.period;
      for (const o of r.rec.metrics.orders as GratingOrder[]) {
        if (!o.propagates) continue;
        const ref = thin(duty, o.m);
        if (ref < 0.01) continue;
        expect(Math.abs(o.fractionOfTransmitted! - ref) / ref).toBeLessThan(0.01);
      }
    }
  });
});

describe('close to the aperture (z of a few wavelengths)', () => {
  const lam = 633 * nm;
  const k = (2 * Math.PI) / lam;

  // Exact on-axis field of a circular aperture of radius a, first Rayleigh–Sommerfeld solution:
  // U(0, z) = e^{ikz} − (z/R)·e^{ikR}, R = √(z² + a²) (Osterberg & Smith, JOSA 51, 1050 (1961);
  // Goodman, Introduction to Fourier Optics, §3.10).
  const onAxis = (z: number, a: number) => {
    const R = Math.hypot(z, a);
    const re = Math.cos(k * z) - (z / R) * Math.cos(k * R);
    const im = Math.sin(k * z) - (z / R) * Math.sin(k * R);
    return re * re + im * im;
  };

  it.each([2, 5, 10])('a 25 µm circular aperture at z = %iλ: on-axis intensity within 2 % of the exact value', (n) => {
    const z = n * lam;
    const { c, plan, codes } = runCase({ wavelength: lam, distance: z, aperture: { shape: 'circle', diameter: 25 * um, opaque: false } });
    expect(plan.error).toBeUndefined();
    expect(codes.filter((q) => ACCURACY.includes(q))).toEqual([]);
    const col = Math.round(c.center[0]);
    const row = Math.round(c.center[1]);
    // The planner's grid puts a sample on the axis.
    expect(Math.abs(col - c.center[0])).toBeLessThan(1e-6);
    const I = c.intensity[row * c.nx + col]!;
    const ref = onAxis(z, 12.5 * um);
    expect(Math.abs(I - ref) / ref).toBeLessThan(0.02);
  });

  it.each([
    [1, 0],
    [2, 0],
    [5, 0],
    [10, 0],
    [30, 0],
    [2, 20],
    [5, 20],
    [10, 20],
    [30, 20],
  ])('a 20 µm slit at z = %iλ, tilted %i°: the whole profile within 2 % of the peak of an independent quadrature of the exact integral', (n, tiltDeg) => {
    const z = n * lam;
    const tilt = tiltDeg * deg;
    const { c, plan, x } = runCase({ wavelength: lam, distance: z, aperture: { shape: 'slit', width: 20 * um, opaque: false }, illumination: { kind: 'plane', tilt: [tilt, 0] } });
    expect(plan.error).toBeUndefined();
    const stride = Math.max(1, Math.floor(c.nx / 300));
    const xs: number[] = [];
    const got: number[] = [];
    for (let i = 0; i < c.nx; i += stride) {
      xs.push(x(i));
      got.push(c.intensity[i]!);
    }
    const ref = intensity(rs1d({ wavelength: lam, distance: z, intervals: [[-10 * um, 10 * um]], light: { kind: 'plane', sinTilt: Math.sin(tilt) }, opaque: false }, xs));
    let peak = 0;
    let worst = 0;
    for (let i = 0; i < xs.length; i++) {
      peak = Math.max(peak, ref[i]!);
      worst = Math.max(worst, Math.abs(got[i]! - ref[i]!));
    }
    expect(worst / peak).toBeLessThan(0.02);
  });
});
