// Light of several wavelengths in one case (plan/spectrum.ts, run/spectrum-case.ts): every line on
// one output grid, intensities added with their powers; the doublet answers of a grating; colour.
import { describe, expect, it } from 'vitest';
import { PNG } from 'pngjs';
import { planCase } from '../../src/plan/planner.js';
import { runPlannedCase } from '../../src/run/run-case.js';
import { makeCase, nm, um } from '../helpers.js';
import { testContext } from '../engine.js';
import type { Case } from '../../src/plan/types.js';
import type { SpectrumSource } from '../../src/analysis/spectrum.js';
import { planck, spectrumLines } from '../../src/analysis/spectrum.js';
import { RAYLEIGH_DIP } from '../../src/analysis/resolution.js';
import { renderColourPicture } from '../../src/output/colour-picture.js';
import { orderMarks } from '../../src/output/spectrum-files.js';
import { xAt } from '../../src/model/grid.js';

const slits = (count: number, width: number, period: number) => ({ shape: 'slits' as const, count, width, period, opaque: false });

function spectrumCase(base: Parameters<typeof makeCase>[0], spectrum: SpectrumSource): Case {
  const lines = spectrumLines(spectrum);
  const mean = lines.reduce((t, l) => t + l.wavelength * l.weight, 0);
  return { ...makeCase({ ...base, wavelength: mean }), spectrum };
}

function run(c: Case) {
  const plan = planCase(c);
  expect(plan.error).toBeUndefined();
  return { plan, rec: runPlannedCase(plan, testContext()) };
}

// The sodium doublet: 588.995 and 589.592 nm (NIST Atomic Spectra Database, from memory), written
// 589.0 / 589.6 nm as handbooks round them: λ/Δλ = 589.3/0.6 ≈ 982.
const doublet = (): SpectrumSource => ({ kind: 'lines', lines: [{ wavelength: 589.0 * nm, power: 1 }, { wavelength: 589.6 * nm, power: 1 }] });

describe('a doublet through a grating (resolving power |m|·N; Born & Wolf, Principles of Optics, §8.6.3)', () => {
  // A grating of 2 µm period blazed for the first order (one wave deep: nearly all the light in
  // m = 1, at 17°), 1–4 mm wide, seen 200 m away (its far field) through a 0.2 m window the job
  // gives, which the planner centres on the strongest order: each line is the first order's
  // diffraction-limited peak.
  const runs = new Map<number, ReturnType<typeof run>>();
  const at = (count: number) => runs.get(count) ?? runs.set(count, runAt(count)).get(count)!;
  const runAt = (count: number) =>
    run(spectrumCase({ wavelength: 0, distance: 200, window: [0.2, 0.2], aperture: { shape: 'grating', profile: { kind: 'blazed', depth: 1 }, count, period: 2 * um, opaque: false } }, doublet()));

  it('500 illuminated periods: not resolved in first order (mN = 500 < 982), one peak', () => {
    const { rec } = at(500);
    const pairs = rec.metrics.linePairs!;
    expect(pairs.map((p) => p.order)).toEqual([1]);
    for (const p of pairs) {
      expect(p.resolvingPower).toBe(500);
      expect(p.needed).toBeCloseTo(982.17, 1);
      expect(p.expected).toBe(false);
      expect(p.resolved).toBe(false);
      expect(p.dip).toBeGreaterThan(RAYLEIGH_DIP);
    }
  });

  it('2000 illuminated periods: resolved (mN = 2000 > 982), a deep dip between the lines', () => {
    const { rec } = at(2000);
    for (const p of rec.metrics.linePairs!) {
      expect(p.expected).toBe(true);
      expect(p.resolved).toBe(true);
      // Two resolution elements apart: the lines are fully apart (the sinc² minima overlap the other's peak region only weakly).
      expect(p.dip!).toBeLessThan(0.05);
    }
  });

  it('at the Rayleigh separation (N = 982) the dip is 8/π² ≈ 81 % (two equal sinc² lines one first zero apart)', () => {
    const { rec } = at(982);
    for (const p of rec.metrics.linePairs!) {
      // The two lines' peaks and the valley are samples of the output grid (8 per resolution
      // element) and the N-slit pattern is sinc² only near its order: within 3 %.
      expect(Math.abs(p.dip! - RAYLEIGH_DIP)).toBeLessThan(0.03);
    }
  });

  it('the lines land where the grating equation puts them, one line-order table each', () => {
    const { rec } = at(500);
    const lo = rec.metrics.lineOrders!;
    expect(lo.map((l) => l.wavelength)).toEqual([589.0 * nm, 589.6 * nm]);
    for (const l of lo) {
      const first = l.orders.find((o) => o.m === 1)!;
      const s = l.wavelength / (2 * um); // sin θ₁ = λ/d
      expect(first.position!).toBeCloseTo((200 * s) / Math.sqrt(1 - s * s), 6);
    }
  });
});

describe('a spectrum of one line is the monochromatic case', () => {
  it('a slit in the far field: the same map, bit for bit', () => {
    const base = { wavelength: 633 * nm, distance: 1, aperture: { shape: 'slit' as const, width: 100 * um, opaque: false } };
    const mono = runPlannedCase(planCase(makeCase(base)), testContext()).computed;
    const { rec } = run(spectrumCase(base, { kind: 'lines', lines: [{ wavelength: 633 * nm, power: 3 }] }));
    expect(rec.computed.nx).toBe(mono.nx);
    expect(rec.computed.x0).toBe(mono.x0);
    expect(Array.from(rec.computed.intensity)).toEqual(Array.from(mono.intensity));
  });
});

describe('one output grid: lines whose own plans differ are delivered onto the same points', () => {
  it('a 200 µm disc at 5 mm in 500 and 700 nm by the angular spectrum: lattices through the common grid', () => {
    const { plan, rec } = run(spectrumCase({ wavelength: 0, distance: 5e-3, aperture: { shape: 'circle', diameter: 200 * um, opaque: false } }, { kind: 'lines', lines: [{ wavelength: 500 * nm, power: 1 }, { wavelength: 700 * nm, power: 1 }] }));
    const members = plan.spectrum!.members;
    expect(members).toHaveLength(2);
    for (const m of members) {
      expect(m.x.output).toEqual(plan.x.output);
      expect(m.y!.output).toEqual(plan.y!.output);
      if (m.method === 'angular-spectrum') {
        // The output step is a whole number of lattice steps, and the grid's points are lattice points.
        const k = plan.x.output.step / m.x.inputPitch;
        expect(Math.abs(k - Math.round(k))).toBeLessThan(1e-9);
        expect(Math.abs(plan.x.output.start / m.x.inputPitch - Math.round(plan.x.output.start / m.x.inputPitch))).toBeLessThan(1e-6);
      }
    }
    // On the axis of a disc lit by a plane wave the exact intensity is 2 − 2cos(k(√(z² + a²) − z))
    // (the Rayleigh–Sommerfeld integral's closed form on the axis; Born & Wolf §8.8, common practice),
    // so the sum is Σ wᵢ·that at each wavelength.
    const c = rec.computed;
    const col = Math.round(c.center[0]);
    const row = Math.round(c.center[1]);
    expect(Math.abs(xAt(c, col))).toBeLessThan(1e-12);
    const z = 5e-3;
    const a = 100 * um;
    const exact = [500 * nm, 700 * nm].reduce((t, lam) => {
      const k = (2 * Math.PI) / lam;
      // With the obliquity factor of the first Rayleigh–Sommerfeld solution: |1 − (z/R)e^{ik(R−z)}|².
      const R = Math.hypot(z, a);
      const re = 1 - (z / R) * Math.cos(k * (R - z));
      const im = -(z / R) * Math.sin(k * (R - z));
      return t + 0.5 * (re * re + im * im);
    }, 0);
    expect(Math.abs(c.intensity[row * c.nx + col]! - exact)).toBeLessThan(0.01 * exact);
  });
});

describe('colour (CIE 1931 2° observer; sRGB, IEC 61966-2-1)', () => {
  // Chromaticities of the spectral locus (the CIE 1931 table, from memory): 450 nm (0.1566, 0.0177),
  // 650 nm (0.7260, 0.2740).
  it("a grating's first orders of a blue and a red line carry their lines' chromaticity where the grating equation puts them", () => {
    const { rec } = run(spectrumCase({ wavelength: 0, distance: 1, window: [1.2, 1.2], aperture: slits(20, 2 * um, 4 * um) }, { kind: 'lines', lines: [{ wavelength: 450 * nm, power: 1 }, { wavelength: 650 * nm, power: 1 }] }));
    const { X, Y, Z } = rec.colour!;
    const c = rec.computed;
    const expected: Record<number, [number, number]> = { 450: [0.1566, 0.0177], 650: [0.726, 0.274] };
    for (const line of rec.metrics.lineOrders!) {
      const o = line.orders.find((q) => q.m === 1)!;
      const s = line.wavelength / (4 * um);
      expect(o.position!).toBeCloseTo(s / Math.sqrt(1 - s * s), 6);
      const col = Math.round((o.position! - c.x0) / c.dx);
      const sum = X[col]! + Y[col]! + Z[col]!;
      const [ex, ey] = expected[Math.round(line.wavelength / nm)]!;
      expect(Math.abs(X[col]! / sum - ex)).toBeLessThan(0.015);
      expect(Math.abs(Y[col]! / sum - ey)).toBeLessThan(0.015);
    }
    // In the picture (linear panel, mid-row) the red line's first order is red and the blue line's blue.
    const pic = renderColourPicture({ map: c, ...rec.colour!, logDecades: 5, title: 't', marks: orderMarks(rec.metrics.lineOrders!) });
    const png = PNG.sync.read(pic.png);
    const panel = pic.panels[0]!;
    const pixel = (x: number) => {
      const px = panel.x + Math.floor(((x - (c.x0 - c.dx / 2)) / (c.nx * c.dx)) * panel.w);
      const o = 4 * ((panel.y + (panel.h >> 1)) * png.width + px);
      return [png.data[o]!, png.data[o + 1]!, png.data[o + 2]!];
    };
    for (const line of rec.metrics.lineOrders!) {
      const [r, , b] = pixel(line.orders.find((q) => q.m === 1)!.position!);
      if (line.wavelength < 500 * nm) expect(b).toBeGreaterThan(r + 40);
      else expect(r).toBeGreaterThan(b + 40);
    }
  });

  it('a flat band renders near white: the whole pattern of a slit in 380–780 nm has the equal-energy chromaticity (1/3, 1/3) within 0.01', () => {
    const { rec } = run(spectrumCase({ wavelength: 0, distance: 1, aperture: { shape: 'slit', width: 200 * um, opaque: false } }, { kind: 'band', from: 380 * nm, to: 780 * nm, samples: 41 }));
    const { X, Y, Z } = rec.colour!;
    let sx = 0, sy = 0, sz = 0;
    for (let i = 0; i < X.length; i++) (sx += X[i]!), (sy += Y[i]!), (sz += Z[i]!);
    const s = sx + sy + sz;
    // Equal-energy white E is (1/3, 1/3) by the definition of the CIE system (common practice).
    expect(Math.abs(sx / s - 1 / 3)).toBeLessThan(0.01);
    expect(Math.abs(sy / s - 1 / 3)).toBeLessThan(0.01);
  });
});

describe('spectra as lines', () => {
  it("a blackbody's weights follow Planck's law, peaking at Wien's b/T (b = 2.897771955e-3 m·K, CODATA 2018)", () => {
    const T = 5000;
    const lines = spectrumLines({ kind: 'blackbody', temperature: T, from: 300 * nm, to: 1000 * nm, samples: 140 });
    const best = lines.reduce((b, l) => (l.weight > b.weight ? l : b));
    expect(Math.abs(best.wavelength - 2.897771955e-3 / T)).toBeLessThanOrEqual(5 * nm);
    // Weights are in proportion to B(λ, T) at equal steps.
    const r = lines[10]!.weight / lines[100]!.weight;
    expect(r).toBeCloseTo(planck(lines[10]!.wavelength, T) / planck(lines[100]!.wavelength, T), 10);
    // Planck at 500 nm, 5000 K: 2hc²/λ⁵/(e^{hc/λkT} − 1) ≈ 1.21e13 W·m⁻²·sr⁻¹·m⁻¹ (worked by hand from the CODATA constants).
    expect(planck(500 * nm, 5000)).toBeGreaterThan(1.2e13);
    expect(planck(500 * nm, 5000)).toBeLessThan(1.22e13);
  });

  it('a flat band: equal weights summing to 1 at the midpoints of equal intervals', () => {
    const lines = spectrumLines({ kind: 'band', from: 400 * nm, to: 700 * nm, samples: 3 });
    expect(lines.map((l) => Math.round(l.wavelength / nm))).toEqual([450, 550, 650]);
    for (const l of lines) expect(l.weight).toBeCloseTo(1 / 3, 12);
  });

  it('a table: the trapezoid rule on its rows', () => {
    const lines = spectrumLines({ kind: 'table', file: 't.csv', wavelengths: [500 * nm, 510 * nm, 530 * nm], density: [1, 2, 1] });
    // Widths 5, 15, 10 nm: weights 5, 30, 10 over 45.
    expect(lines.map((l) => l.weight)).toEqual([5 / 45, 30 / 45, 10 / 45].map((w) => expect.closeTo(w, 12)));
  });
});
