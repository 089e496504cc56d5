// A sweep's cases on one shared FFT grid (plan/shared-grids.ts): the shared grid must be, for
// every case on it, at least as fine and as wide as the case's own angular-spectrum grid, the
// method must stay valid without a new warning, and the results must still match the exact
// Rayleigh–Sommerfeld integral (test/reference: a 2-D quadrature of the first Rayleigh–Sommerfeld
// solution, Goodman, Introduction to Fourier Optics, eq. 3-41) within the accuracy the planner's
// rules aim at (1 % of the peak here; the project's property tests allow 2 %).
import { describe, expect, it } from 'vitest';
import type { Aperture, Illumination } from '../../src/optics/aperture.js';
import { planCase } from '../../src/plan/planner.js';
import { planCases } from '../../src/plan/shared-grids.js';
import { shareSourceSpectra, sourceSpectrumKey } from '../../src/plan/share.js';
import type { Case, Plan } from '../../src/plan/types.js';
import { runPlannedCase } from '../../src/run/run-case.js';
import { xAt, yAt } from '../../src/model/grid.js';
import { testContext } from '../engine.js';
import { makeCase, mulberry32 } from '../helpers.js';
import { referenceIntensity } from '../reference/reference.js';

const um = 1e-6;
const mm = 1e-3;

function sweepCases(ap: Aperture, ill: Illumination, lam: number, distances: number[]): Case[] {
  return distances.map((z, i) => ({ ...makeCase({ wavelength: lam, distance: z, aperture: ap, illumination: ill }), index: i, id: `z${i}` }));
}

const shares = (p: Plan) => p.reasons.some((r) => r.includes('on a grid shared by'));

/** Checks what sharing promises for every shared plan, against the case's own angular-spectrum plan. */
function checkShared(cases: Case[], plans: Plan[], opts: { maxWork?: number } = {}): number {
  let shared = 0;
  const keys = new Map<string, string>();
  for (const [i, p] of plans.entries()) {
    if (!shares(p)) continue;
    shared++;
    const own = planCase(cases[i]!, opts);
    const spectrum = own.method === 'angular-spectrum' && !own.form ? own : planCase({ ...cases[i]!, method: 'angular-spectrum' }, opts);
    expect(p.method).toBe('angular-spectrum');
    expect(p.form).toBeUndefined();
    expect(p.error).toBeUndefined();
    for (const [a, b] of [
      [p.x, spectrum.x],
      [p.y!, spectrum.y!],
    ] as const) {
      // As fine as the case's own rules ask, holding its source and window, as wide once padded.
      expect(a.inputPitch).toBeLessThanOrEqual(b.inputPitch);
      expect(a.inputPitch).toBeLessThanOrEqual(a.requiredPitch);
      expect(a.inputSamples * a.inputPitch).toBeGreaterThanOrEqual(b.inputSamples * b.inputPitch * (1 - 1e-12));
      expect(a.paddedSamples * a.inputPitch).toBeGreaterThanOrEqual(b.paddedSamples * b.inputPitch * (1 - 1e-12));
    }
    // No warning the case did not have on its own plan.
    const before = new Set(own.warnings.map((w) => w.code));
    for (const w of p.warnings) expect(before.has(w.code)).toBe(true);
    const key = sourceSpectrumKey(p)!;
    expect(key).not.toBeNull();
    const grid = `${p.x.inputPitch},${p.x.paddedSamples},${p.y!.inputPitch},${p.y!.paddedSamples}`;
    if (keys.has(grid)) expect(keys.get(grid)).toBe(key);
    keys.set(grid, key);
  }
  // Every shared grid is shared by at least two cases.
  const counts = new Map<string, number>();
  for (const p of plans.filter(shares)) counts.set(sourceSpectrumKey(p)!, (counts.get(sourceSpectrumKey(p)!) ?? 0) + 1);
  for (const n of counts.values()) expect(n).toBeGreaterThanOrEqual(2);
  return shared;
}

describe('shared grids for a sweep with automatic grids', () => {
  // A 30 µm pinhole in a Gaussian beam (w = 12 µm), 355–462 µm behind it at 633 nm (N_F 1–0.8):
  // every distance takes the angular spectrum on a grid of its own, nearly alike.
  const ap: Aperture = { shape: 'circle', diameter: 30 * um, opaque: false };
  const ill: Illumination = { kind: 'gaussian', waist: 12 * um, tilt: [0, 0] };
  const lam = 633e-9;
  const distances = [0, 1, 2, 3, 4, 5].map((i) => 0.355 * mm * (1 + 0.06 * i));
  const cases = sweepCases(ap, ill, lam, distances);
  const plans = planCases(cases);

  it('puts the sweep on shared grids, each at least as fine and wide as every case on it needs', () => {
    expect(checkShared(cases, plans)).toBeGreaterThanOrEqual(4);
    shareSourceSpectra(plans);
    expect(plans.filter((p) => p.sharedSpectrum).length).toBeGreaterThanOrEqual(4);
    // The plan says so, with the estimated saving.
    const why = plans.find(shares)!.reasons.find((r) => r.includes('on a grid shared by'))!;
    expect(why).toMatch(/computed once, about .* for them all against .* with a grid each/);
  });

  it('matches the exact Rayleigh–Sommerfeld integral on the shared grid, reusing the spectrum', () => {
    const ctx = testContext();
    let reused = 0;
    for (const p of plans) {
      const rec = runPlannedCase(p, ctx);
      const c = rec.computed;
      if (c.diagnostics.sourceSpectrum === 'reused') reused++;
      // Points along x through the centre, and the centre.
      const row = Math.round(c.center[1]);
      const cols = Array.from({ length: 15 }, (_, k) => Math.round((k * (c.nx - 1)) / 14));
      const pts = cols.map((col): [number, number] => [xAt(c, col), yAt(c, row)]);
      const ref = referenceIntensity({ wavelength: lam, distance: p.case.distance, aperture: ap, illumination: ill }, pts, 2e6);
      expect(ref.ok).toBe(true);
      if (!ref.ok) continue;
      let peak = 0;
      for (const v of ref.intensity) peak = Math.max(peak, v);
      for (const [k, pt] of ref.points.entries()) {
        const col = cols[pts.indexOf(pt)]!;
        expect(Math.abs(c.intensity[row * c.nx + col]! - ref.intensity[k]!) / peak).toBeLessThan(0.01);
      }
    }
    expect(reused).toBeGreaterThanOrEqual(3);
  });
});

describe('shared grids, random sweeps (seed 20261203): planning only', () => {
  const rnd = mulberry32(20261203);
  const log = (lo: number, hi: number) => lo * Math.pow(hi / lo, rnd());
  const draws = Array.from({ length: 24 }, (_, k) => {
    const lam = log(400e-9, 2e-6);
    const size = log(10 * lam, 300 * lam);
    const u = rnd();
    const ap: Aperture =
      u < 0.4
        ? { shape: 'circle', diameter: size, opaque: false }
        : u < 0.7
          ? { shape: 'rectangle', width: size, height: size * log(0.3, 1), opaque: false }
          : { shape: 'annulus', outer: size, inner: size * log(0.1, 0.6), opaque: false };
    const ill: Illumination = rnd() < 0.5 ? { kind: 'plane', tilt: [0, 0] } : { kind: 'gaussian', waist: (size / 2) * log(0.3, 2), tilt: [0, 0] };
    // Distances about the Fresnel number 1 to 20, a dense or a sparse sweep.
    const z0 = (size * size) / (4 * lam) / log(1, 20);
    const step = log(0.01, 0.5);
    const n = 3 + Math.floor(rnd() * 6);
    return { k, lam, ap, ill, distances: Array.from({ length: n }, (_, i) => z0 * (1 + step * i)) };
  });
  let sharedSweeps = 0;
  it.each(draws)('sweep $k: every shared plan is at least as fine, as wide and as warned as its own', ({ lam, ap, ill, distances }) => {
    const cases = sweepCases(ap, ill, lam, distances);
    const plans = planCases(cases, { maxWork: 4e10 });
    if (checkShared(cases, plans, { maxWork: 4e10 }) > 0) sharedSweeps++;
    // Unshared plans are each case's own plan.
    for (const [i, p] of plans.entries()) {
      if (shares(p)) continue;
      const own = planCase(cases[i]!, { maxWork: 4e10 });
      expect([p.method, p.x.inputPitch, p.x.paddedSamples]).toEqual([own.method, own.x.inputPitch, own.x.paddedSamples]);
    }
  });
  // The draws reach sweeps that share (else the checks above would hold vacuously).
  it('shares in some of the random sweeps', () => {
    console.log(`${sharedSweeps} of ${draws.length} random sweeps share a grid`);
    expect(sharedSweeps).toBeGreaterThanOrEqual(3);
  });
});
