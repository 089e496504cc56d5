// The tabulated spectrum (src/optics/spectrum-table.ts) against code and facts outside it:
//
// - the direct Fourier sums of dft.ts (dft2AtPoints: one sum over every source sample per point,
//   independent code) for the spectrum itself, and propagateFarField (direct.ts, the same sums with
//   the kernel factor) for the far field, on small sources: tilted and not, round and rectangular,
//   Gaussian and plane light;
// - the interpolation error law the module states, measured at coarse steps: the Lagrange remainder
//   (Abramowitz & Stegun, Handbook of Mathematical Functions, 25.2.2 ff.) applied tone by tone;
// - Parseval's theorem: the spectrum's power over a band that holds all of it equals the source's
//   power (Goodman, Introduction to Fourier Optics, §2.1.3, Rayleigh's theorem), for a Gaussian
//   beam against its closed-form power πw²/2 (Siegman, Lasers, ch. 17: ∫ e^{−2ρ²/w²} dA = πw²/2),
//   and in its discrete form over one period of the sampled sum (Oppenheim & Schafer, Discrete-Time
//   Signal Processing, the DFT's Parseval relation) for a square.
//
// Error budget against the direct sums. The table's interpolation errs by at most
// errorBound·Σ|U|ΔξΔη in the spectrum before the cell response is divided out (derived in the
// module: (ωh)^p/p!·max|Π(s − t_j)| per axis, ω = 2πR); dividing by sinc(fxΔξ)·sinc(fyΔη) scales it
// by at most (π/2)². The FFTs and phase tables add rounding, about 1e-13 of Σ|U|ΔξΔη. The default
// accuracy is 2e-5, so the bound is at most 5e-5 of Σ|U|ΔξΔη, which is |Â| at its peak for a real
// positive source; the brief's aim is 1e-4 of the peak. Measured: 1e-6 and below.
import { engine } from '../engine.js';
import { describe, expect, it } from 'vitest';
import type { Aperture, Illumination } from '../../src/optics/aperture.js';
import { dft2AtPoints } from '../../src/optics/dft.js';
import { propagateFarField } from '../../src/optics/direct.js';
import { axisAt, centredAxis, fftAxis, xAxisOf, yAxisOf, type Axis, type Field } from '../../src/optics/field.js';
import { sourceField2D } from '../../src/optics/source.js';
import { cellResponse } from '../../src/optics/spectral.js';
import {
  costFarFieldTable,
  farFieldBand,
  farFieldByTable,
  interpolateSpectrum2D,
  interpolationErrorPerAxis,
  planTableTiles,
  spectrumTableError,
  tabulateSpectrum2D,
  tableStepFor,
  type AxisMode,
  type SpectrumBand,
  type TableOrder,
} from '../../src/optics/spectrum-table.js';


const lam = 0.5e-6;
const deg = Math.PI / 180;

function source(ap: Aperture, ill: Illumination, n: number, pitch: number, ny = n, pitchY = pitch): { field: Field; power: number } {
  return sourceField2D(ap, ill, fftAxis(n, pitch), fftAxis(ny, pitchY), lam, { sampleCarrier: false });
}

function carrierOf(ill: Illumination): [number, number] {
  return [Math.sin(ill.tilt[0]) / lam, Math.sin(ill.tilt[1]) / lam];
}

/** A fixed pseudo-random sequence in [0, 1) (Park–Miller), so the points are the same every run. */
function randoms(seed: number): () => number {
  let s = seed;
  return () => (s = (s * 16807) % 2147483647) / 2147483647;
}

function pointsIn(band: SpectrumBand, n: number, seed: number): [Float64Array, Float64Array] {
  const rnd = randoms(seed);
  const fx = new Float64Array(n);
  const fy = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    fx[i] = band.fx[0] + rnd() * (band.fx[1] - band.fx[0]);
    fy[i] = band.fy[0] + rnd() * (band.fy[1] - band.fy[0]);
  }
  return [fx, fy];
}

/** Columns and rows between the first and last non-zero sample (inclusive). */
function nonZeroSpan(f: Field): [number, number] {
  const cols: number[] = [];
  const rows: number[] = [];
  for (let r = 0; r < f.ny; r++) {
    for (let c = 0; c < f.nx; c++) {
      if (f.data[2 * (r * f.nx + c)] !== 0 || f.data[2 * (r * f.nx + c) + 1] !== 0) {
        cols.push(c);
        rows.push(r);
      }
    }
  }
  return [Math.max(...cols) - Math.min(...cols) + 1, Math.max(...rows) - Math.min(...rows) + 1];
}

/** Largest |a − b| over complex samples, and the peak of |b|. */
function worstDifference(a: Float64Array, b: Float64Array): { diff: number; peak: number } {
  let diff = 0;
  let peak = 0;
  for (let i = 0; i < b.length; i += 2) {
    diff = Math.max(diff, Math.hypot(a[i]! - b[i]!, a[i + 1]! - b[i + 1]!));
    peak = Math.max(peak, Math.hypot(b[i]!, b[i + 1]!));
  }
  return { diff, peak };
}

const CASES: { name: string; ap: Aperture; ill: Illumination; n: number; pitch: number }[] = [
  { name: 'square, plane wave, untilted', ap: { shape: 'rectangle', width: 12e-6, height: 12e-6, opaque: false }, ill: { kind: 'plane', tilt: [0, 0] }, n: 48, pitch: 0.3e-6 },
  { name: 'rectangle, plane wave, 25° in x', ap: { shape: 'rectangle', width: 12e-6, height: 6e-6, opaque: false }, ill: { kind: 'plane', tilt: [25 * deg, 0] }, n: 48, pitch: 0.3e-6 },
  { name: 'disc, plane wave, 30° in x and 10° in y', ap: { shape: 'circle', diameter: 10e-6, opaque: false }, ill: { kind: 'plane', tilt: [30 * deg, 10 * deg] }, n: 40, pitch: 0.3e-6 },
  { name: 'disc, Gaussian beam, untilted', ap: { shape: 'circle', diameter: 12e-6, opaque: false }, ill: { kind: 'gaussian', waist: 4e-6, tilt: [0, 0] }, n: 48, pitch: 0.3e-6 },
  { name: 'annulus, Gaussian beam, 20° in y', ap: { shape: 'annulus', outer: 12e-6, inner: 5e-6, opaque: false }, ill: { kind: 'gaussian', waist: 5e-6, tilt: [0, 20 * deg] }, n: 48, pitch: 0.3e-6 },
  { name: 'rectangle, Gaussian beam, 40° in x', ap: { shape: 'rectangle', width: 14e-6, height: 5e-6, opaque: false }, ill: { kind: 'gaussian', waist: 5e-6, tilt: [40 * deg, 0] }, n: 56, pitch: 0.25e-6 },
];

describe('the far field by the table = propagateFarField (direct sums) on small sources', () => {
  // A wide window (±35° about the beam's direction in x, ±25° in y) at z = 5 mm (N_F ≤ 0.01), so
  // that x/(λr) differs from x/(λz) and propagateFarField takes its sum per point (mappingTolerance
  // −1 forces it). Budget: the head of this file, 1e-4 of the peak.
  const z = 5e-3;
  for (const c of CASES) {
    it(`${c.name}: within 1e-4 of the peak |U| and within the stated bound at every point`, () => {
      const { field: src } = source(c.ap, c.ill, c.n, c.pitch);
      const carrier = carrierOf(c.ill);
      const outX = centredAxis(37, (2 * z * Math.tan(35 * deg)) / 36, z * Math.tan(c.ill.tilt[0]));
      const outY = centredAxis(29, (2 * z * Math.tan(25 * deg)) / 28, z * Math.tan(c.ill.tilt[1]));
      const ref = propagateFarField(engine, src, z, outX, outY, carrier, { mappingTolerance: -1, pointByPoint: true });
      const got = farFieldByTable(engine, src, z, outX, outY, carrier);
      const { diff, peak } = worstDifference(got.data, ref.data);
      expect(diff / peak).toBeLessThan(1e-4);
      // Point by point, the bound in Â times the kernel factor's size (z/r)/(λr)·√(1 + 1/(kr)²).
      const table = tabulateSpectrum2D(engine, src, farFieldBand(outX, outY, z, lam, carrier));
      const k = (2 * Math.PI) / lam;
      let worstRatio = 0;
      for (let r = 0; r < outY.n; r++) {
        const y = axisAt(outY, r);
        for (let col = 0; col < outX.n; col++) {
          const x = axisAt(outX, col);
          const rr = Math.hypot(x, y, z);
          const fx = x / (lam * rr) - carrier[0];
          const fy = y / (lam * rr) - carrier[1];
          const kernel = ((z / rr) / (lam * rr)) * Math.sqrt(1 + 1 / (k * rr) ** 2);
          const bound = (kernel * table.errorBound * table.sumAbs) / (cellResponse(fx, src.dx) * cellResponse(fy, src.dy)) + 1e-12 * peak;
          const i = 2 * (r * outX.n + col);
          worstRatio = Math.max(worstRatio, Math.hypot(got.data[i]! - ref.data[i]!, got.data[i + 1]! - ref.data[i + 1]!) / bound);
        }
      }
      expect(worstRatio).toBeLessThanOrEqual(1);
    });
  }

  it('every pairing of the axis transforms (FFT of the whole period, chirp-z of the band) gives the same far field within the bound', () => {
    const c = CASES[5]!;
    const { field: src } = source(c.ap, c.ill, c.n, c.pitch);
    const carrier = carrierOf(c.ill);
    const outX = centredAxis(25, (2 * z * Math.tan(30 * deg)) / 24, z * Math.tan(c.ill.tilt[0]));
    const outY = centredAxis(21, (2 * z * Math.tan(30 * deg)) / 20);
    const ref = propagateFarField(engine, src, z, outX, outY, carrier, { mappingTolerance: -1, pointByPoint: true });
    const modes: [AxisMode, AxisMode][] = [['fft', 'fft'], ['fft', 'chirp'], ['chirp', 'fft'], ['chirp', 'chirp']];
    for (const mode of modes) {
      const got = farFieldByTable(engine, src, z, outX, outY, carrier, { mode });
      const { diff, peak } = worstDifference(got.data, ref.data);
      expect(diff / peak, mode.join('/')).toBeLessThan(1e-4);
    }
  });

  it('cut into tiles by a memory limit: the same far field within the bound, and the tiles the estimate said', () => {
    const c = CASES[2]!;
    const { field: src } = source(c.ap, c.ill, c.n, c.pitch);
    const carrier = carrierOf(c.ill);
    const outX = centredAxis(41, (2 * z * Math.tan(35 * deg)) / 40, z * Math.tan(c.ill.tilt[0]));
    const outY = centredAxis(33, (2 * z * Math.tan(35 * deg)) / 32, z * Math.tan(c.ill.tilt[1]));
    const ref = propagateFarField(engine, src, z, outX, outY, carrier, { mappingTolerance: -1, pointByPoint: true });
    const band = farFieldBand(outX, outY, z, lam, carrier);
    const [nx, ny] = nonZeroSpan(src);
    const shape = { nx, ny, dx: c.pitch, dy: c.pitch };
    const whole = planTableTiles(shape, band);
    expect(whole.tiles).toEqual([1, 1]);
    for (const maxMemory of [whole.memory / 3, whole.memory / 10]) {
      const tiling = planTableTiles(shape, band, { maxMemory });
      expect(tiling.tiles[0] * tiling.tiles[1]).toBeGreaterThan(1);
      expect(tiling.memory).toBeLessThanOrEqual(maxMemory);
      expect(costFarFieldTable(shape, band, outX.n * outY.n, { maxMemory }).tiles).toEqual(tiling.tiles);
      const got = farFieldByTable(engine, src, z, outX, outY, carrier, { maxMemory });
      const { diff, peak } = worstDifference(got.data, ref.data);
      expect(diff / peak).toBeLessThan(1e-4);
    }
  });
});

describe('the interpolation error law (Lagrange remainder, tone by tone)', () => {
  // At coarse steps, where the interpolation error is far above rounding: the largest error over
  // 2000 random points of the band, against dft2AtPoints, as a fraction of Σ|U|ΔξΔη (no cell
  // response, so the law is seen bare). It must stay under the bound; and the bound must not be
  // loose by more than 30 (a uniformly lit square weights the tones evenly over [−R, R], whose
  // mean of |ξ/R|^p is 1/(p+1), so the measured error sits about 5–15 below the bound).
  const ap: Aperture = { shape: 'rectangle', width: 15e-6, height: 9e-6, opaque: false };
  const ill: Illumination = { kind: 'plane', tilt: [0, 0] };
  const band: SpectrumBand = { fx: [-0.9e6, 1.3e6], fy: [-1.0e6, 0.4e6] };
  for (const order of [4, 6, 8] as TableOrder[]) {
    for (const c of [8, 16]) {
      it(`order ${order}, steps 1/(${c}·R): measured under the bound and within 30 of it`, () => {
        const { field: src } = source(ap, ill, 64, 0.25e-6);
        const R: [number, number] = [(60 / 2) * 0.25e-6, (36 / 2) * 0.25e-6]; // half-widths of the 61 × 37 open cells' centres
        const step: [number, number] = [1 / (c * R[0]), 1 / (c * R[1])];
        const table = tabulateSpectrum2D(engine, src, band, { order, step, mode: ['chirp', 'chirp'], divideCellResponse: false });
        expect(table.halfWidth[0]).toBeCloseTo(R[0], 15);
        expect(table.halfWidth[1]).toBeCloseTo(R[1], 15);
        const [fx, fy] = pointsIn(band, 2000, 7);
        const ref = dft2AtPoints(src.data, xAxisOf(src), yAxisOf(src)!, fx, fy);
        const out = new Float64Array(2 * fx.length);
        for (let i = 0; i < fx.length; i++) interpolateSpectrum2D(table, fx[i]!, fy[i]!, out, i);
        const { diff } = worstDifference(out, ref);
        const bound = spectrumTableError(order, step, R);
        expect(table.errorBound).toBeCloseTo(bound, 12);
        expect(diff / table.sumAbs).toBeLessThan(bound);
        expect(diff / table.sumAbs).toBeGreaterThan(bound / 30);
      });
    }
  }

  it('the step for an accuracy gives that accuracy back (tableStepFor inverts the law)', () => {
    for (const order of [4, 6, 8] as TableOrder[]) {
      for (const eps of [1e-3, 1e-5, 1e-8]) {
        const R = 37e-6;
        const h = tableStepFor(order, eps, R);
        expect(interpolationErrorPerAxis(order, 2 * Math.PI * R * h) / eps).toBeCloseTo(1, 10);
      }
    }
  });

  it('the bound per axis is (ωh)^p/p!·max|Π(s − t_j)| with the product at s = ½: 9/16, 225/64, 11025/256 (derived)', () => {
    expect(interpolationErrorPerAxis(4, 1)).toBeCloseTo(9 / 16 / 24, 15);
    expect(interpolationErrorPerAxis(6, 1)).toBeCloseTo(225 / 64 / 720, 15);
    expect(interpolationErrorPerAxis(8, 1)).toBeCloseTo(11025 / 256 / 40320, 15);
  });
});

describe('Parseval (Rayleigh) theorem', () => {
  it('a Gaussian beam: ∫∫|Â|² over ±3/w = πw²/2 (Siegman) within 1e-6, from points between the table entries', () => {
    // w = 3 µm on a grid of 0.25 µm reaching ±4.3w: the sampled beam's power differs from πw²/2 by
    // its truncation, e^{−2·4.3²} ≈ 1e-16, and its aliasing, e^{−π²w²/(2Δ²)} ≈ 0. The spectrum,
    // πw²e^{−π²w²f²}, holds all but e^{−2π²·9} of its power inside ±3/w. The Riemann sum over a
    // regular grid of points (not on table nodes) of a smooth Gaussian is exact to far below 1e-6
    // at 12 points per 1/w. The envelope is sampled at cell centres, not averaged over cells, so
    // its sum needs no cell-response division: without it the power is πw²/2.
    const w = 3e-6;
    const pitch = 0.25e-6;
    const { field: src } = source({ shape: 'rectangle', width: 1, height: 1, opaque: false }, { kind: 'gaussian', waist: w, tilt: [0, 0] }, 104, pitch);
    const F = 3 / w;
    const band: SpectrumBand = { fx: [-F, F], fy: [-F, F] };
    const n = 73;
    const h = (2 * F) / n;
    const out = new Float64Array(2);
    const powerOf = (divideCellResponse: boolean) => {
      const table = tabulateSpectrum2D(engine, src, band, { divideCellResponse });
      let sum = 0;
      for (let j = 0; j < n; j++) {
        for (let i = 0; i < n; i++) {
          interpolateSpectrum2D(table, -F + (i + 0.5) * h, -F + (j + 0.5) * h, out, 0);
          sum += out[0]! ** 2 + out[1]! ** 2;
        }
      }
      return sum * h * h;
    };
    const exact = (Math.PI * w * w) / 2;
    expect(Math.abs(powerOf(false) / exact - 1)).toBeLessThan(1e-6);
    // With the cell response divided out (as propagateFarField does, right for the area-sampled
    // mask's edges) a point-sampled envelope gains 1/sinc²(fΔ) ≈ 1 + (πfΔ)²/3 per axis; averaged over
    // |Â|², whose ⟨f²⟩ per axis is 1/(4π²w²), the power gains Δ²/(6w²) (derived here): 1.16e-3 at
    // Δ = w/12, to 2 % of itself (the next term is O(Δ⁴/w⁴) relative).
    const excess = powerOf(true) / exact - 1;
    expect(Math.abs(excess / (pitch ** 2 / (6 * w * w)) - 1)).toBeLessThan(0.02);
  });

  it('a square, plane wave: Σ|Â|²·δf² over one period of the sampled sum = the source power (discrete Parseval) within 1e-5', () => {
    // The sampled sum S(f) = Σ U e^{−i2πf·ξ}ΔξΔη repeats every 1/Δ; over one period ∫|S|² = ΣU²ΔξΔη
    // (= the source power: every cell of a square with edges on cell boundaries is open 0 or 1).
    // |S|² holds "frequencies" up to the span's width 2R, so a Riemann sum with more than 2R/Δ + 1
    // points per period, at any offset, is exact (the DFT's Parseval relation); the interpolation's
    // bound (1e-5 of Σ|U|ΔξΔη in S at the FFT's step here) shows as 2e-6 measured; tolerance 1e-5.
    // 39 × 23 cells of 0.25 µm: odd counts put the edges on cell boundaries of the centred grid.
    const pitch = 0.25e-6;
    const { field: src, power } = source({ shape: 'rectangle', width: 39 * pitch, height: 23 * pitch, opaque: false }, { kind: 'plane', tilt: [0, 0] }, 48, pitch);
    const P = 1 / pitch;
    const band: SpectrumBand = { fx: [-P / 2, P / 2], fy: [-P / 2, P / 2] };
    const table = tabulateSpectrum2D(engine, src, band, { divideCellResponse: false });
    const n = 61;
    const h = P / n;
    const out = new Float64Array(2);
    let sum = 0;
    for (let j = 0; j < n; j++) {
      for (let i = 0; i < n; i++) {
        interpolateSpectrum2D(table, -P / 2 + (i + 0.37) * h, -P / 2 + (j + 0.61) * h, out, 0);
        sum += out[0]! ** 2 + out[1]! ** 2;
      }
    }
    expect(power / (39 * 23 * pitch * pitch)).toBeCloseTo(1, 12);
    expect(Math.abs((sum * h * h) / power - 1)).toBeLessThan(1e-5);
  });
});

describe('the band and the estimates', () => {
  it('farFieldBand holds the frequencies of every point of windows on and off the axis', () => {
    const z = 0.02;
    const windows: [Axis, Axis, [number, number]][] = [
      [centredAxis(31, 1e-3, 0), centredAxis(21, 1e-3, 0), [0, 0]],
      [centredAxis(31, 1e-3, 0.03), centredAxis(21, 2e-3, -0.01), [Math.sin(0.9) / lam, 0]],
      [centredAxis(30, 1e-3, -0.004), centredAxis(20, 1e-3, 0.009), [0, Math.sin(0.3) / lam]],
    ];
    for (const [outX, outY, carrier] of windows) {
      const band = farFieldBand(outX, outY, z, lam, carrier);
      let lo = [Infinity, Infinity];
      let hi = [-Infinity, -Infinity];
      for (let r = 0; r < outY.n; r++) {
        for (let c = 0; c < outX.n; c++) {
          const x = axisAt(outX, c);
          const y = axisAt(outY, r);
          const rr = Math.hypot(x, y, z);
          const f = [x / (lam * rr) - carrier[0], y / (lam * rr) - carrier[1]];
          lo = [Math.min(lo[0]!, f[0]!), Math.min(lo[1]!, f[1]!)];
          hi = [Math.max(hi[0]!, f[0]!), Math.max(hi[1]!, f[1]!)];
        }
      }
      const tol = 1e-9 / lam;
      expect(band.fx[0]).toBeLessThanOrEqual(lo[0]! + tol);
      expect(band.fy[0]).toBeLessThanOrEqual(lo[1]! + tol);
      expect(band.fx[1]).toBeGreaterThanOrEqual(hi[0]! - tol);
      expect(band.fy[1]).toBeGreaterThanOrEqual(hi[1]! - tol);
      // Not wider than the box's own extremes (which the corner and mid-edge samples reach here).
      expect(band.fx[1] - band.fx[0]).toBeLessThan(hi[0]! - lo[0]! + 0.01 * (hi[0]! - lo[0]!));
    }
  });

  it('costFarFieldTable describes the table tabulateSpectrum2D makes (entries, transforms, bound)', () => {
    const c = CASES[1]!;
    const { field: src } = source(c.ap, c.ill, c.n, c.pitch);
    const z = 5e-3;
    const carrier = carrierOf(c.ill);
    const outX = centredAxis(101, (2 * z * Math.tan(40 * deg)) / 100, z * Math.tan(c.ill.tilt[0]));
    const outY = centredAxis(81, (2 * z * Math.tan(40 * deg)) / 80);
    const band = farFieldBand(outX, outY, z, lam, carrier);
    const table = tabulateSpectrum2D(engine, src, band);
    // The rectangle's non-zero span, counted here: its edges fall on cell centres, so 41 × 21 cells.
    const [nx, ny] = nonZeroSpan(src);
    expect([nx, ny]).toEqual([41, 21]);
    const cost = costFarFieldTable({ nx, ny, dx: c.pitch, dy: c.pitch }, band, outX.n * outY.n);
    expect(cost.entries).toEqual([table.nx, table.ny]);
    expect(cost.mode).toEqual(table.mode);
    expect(cost.errorBound).toBeCloseTo(table.errorBound, 15);
    expect(cost.memory).toBeGreaterThan(16 * (table.nx * table.ny + outX.n * outY.n));
    // Far less work than the sum per point the planner costs at 8 per multiply-add.
    expect(cost.work).toBeLessThan(8 * nx * ny * outX.n * outY.n);
  });

  it('refuses what it cannot do: a 1-D source, an empty band, an order it has no stencil for', () => {
    const one: Field = { data: new Float64Array(8), nx: 4, ny: 1, dx: 1e-6, dy: 0, x0: 0, y0: 0, wavelength: lam };
    expect(() => tabulateSpectrum2D(engine, one, { fx: [0, 1], fy: [0, 1] })).toThrow(/2-D/);
    const { field: src } = source(CASES[0]!.ap, CASES[0]!.ill, 48, 0.3e-6);
    expect(() => tabulateSpectrum2D(engine, src, { fx: [1, 0], fy: [0, 1] })).toThrow(/empty band/);
    expect(() => tabulateSpectrum2D(engine, src, { fx: [0, 1], fy: [0, 1] }, { order: 5 as TableOrder })).toThrow(/order/);
  });
});
