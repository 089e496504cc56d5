// The direct first Rayleigh–Sommerfeld sum over a 2-D area-sampled source: the exact on-axis field
// of a circular aperture, the far field of a square seen off axis (plain and tilted), the kernel's
// cell integral against a brute-force quadrature, and the mirror-symmetry shortcut.
import { describe, expect, it } from 'vitest';
import { createField, type Axis, type Field } from '../../src/optics/field.js';
import { sampleMask2D } from '../../src/optics/mask.js';
import type { Aperture } from '../../src/optics/aperture.js';
import { rsAreaSamplingError, rsDirect2D, rsMaxCell } from '../../src/optics/rayleigh-sommerfeld.js';

const lam = 633e-9;
const k = (2 * Math.PI) / lam;

/** The open fraction of each cell (mask.ts: exact areas) on an n × n grid of pitch h centred on 0. */
function source(a: Aperture, n: number, h: number): Field {
  const ax: Axis = { n, start: -((n - 1) / 2) * h, step: h };
  const f = createField(ax, ax, lam);
  const m = sampleMask2D(a, ax, ax);
  for (let i = 0; i < m.length; i++) f.data[2 * i] = m[i]!;
  return f;
}

const point = (v: number): Axis => ({ n: 1, start: v, step: 1 });

describe('on-axis field of a circular aperture', () => {
  // Exact for the first Rayleigh–Sommerfeld integral with a uniform plane wave (Osterberg & Smith,
  // JOSA 51, 1050 (1961)); derived: with ρdρ = r dr the integrand (1/2π)(z/r)(1/r − ik)e^{ikr}/r·2πρ
  // is z·d/dr[−e^{ikr}/r], so U(0, z) = e^{ikz} − (z/R)e^{ikR}, R = √(z² + a²).
  const a = 3 * lam;
  const exact = (z: number) => {
    const R = Math.hypot(z, a);
    const re = Math.cos(k * z) - (z / R) * Math.cos(k * R);
    const im = Math.sin(k * z) - (z / R) * Math.sin(k * R);
    return re * re + im * im;
  };
  // Pitch λ/8 (finer than rsMaxCell's z/8 at z = 2λ). Budget: the area-sampled edge,
  // rsAreaSamplingError ≤ 0.1·(π/8·a/R)² ≤ 1.1 % at a/R = 0.83 (measured 0.55 %), the kernel's
  // cells ≤ 0.1 %. Without the cell-response division the edge alone costs 2.6 % at z = 2λ.
  const h = lam / 8;
  const disc = source({ shape: 'circle', diameter: 2 * a, opaque: false }, 2 * Math.ceil(a / h) + 3, h);

  it.each([2, 5, 10])('z = %fλ: |U|² within 2 % of |e^{ikz} − (z/R)e^{ikR}|²', (zl) => {
    const z = zl * lam;
    expect(h).toBeLessThanOrEqual(rsMaxCell(lam, z));
    expect(rsAreaSamplingError(h, lam, a / Math.hypot(a, z))).toBeLessThan(0.012);
    const u = rsDirect2D(disc, z, point(0), point(0), [0, 0]).data;
    const ref = exact(z);
    expect(ref).toBeGreaterThan(0.5); // not near an on-axis zero, so 2 % of it is a real bound
    expect(Math.abs(u[0]! ** 2 + u[1]! ** 2 - ref) / ref).toBeLessThan(0.02);
  });

  it.each([200, 2000])('z = %fλ (far away): within 0.5 %', (zl) => {
    const z = zl * lam;
    const u = rsDirect2D(disc, z, point(0), point(0), [0, 0]).data;
    const ref = exact(z);
    expect(Math.abs(u[0]! ** 2 + u[1]! ** 2 - ref) / ref).toBeLessThan(0.005);
  });
});

describe('far field of a square, off axis', () => {
  // Far field of the first Rayleigh–Sommerfeld integral (Goodman, Introduction to Fourier Optics,
  // §4.2 with the obliquity kept): U = (z/r)(1/r − ik)e^{ikr}/(2πr)·Â(x/λr − sin θx/λ, y/λr − sin θy/λ),
  // Â = w²·sinc(w fx)·sinc(w fy) for a square of side w, so
  // I = (z/r)²·(1 + 1/(kr)²)·w⁴ sinc²·sinc²/(λr)². Side 4λ + 0.6 pitch (edges 0.3 of a cell from a
  // boundary, not aligned), z = 4000λ (N_F = 10⁻³), window 6° to 35° off axis in x.
  // Budget: the aperture's quadratic phase across it, π(w/2)²·2/(λz) ≈ 6e-3 rad at the corners,
  // enters the intensity in quadrature (≲ 4e-5 of the peak); area sampling at pitch λ/8 and this
  // distance ~2e-4 (measured ≤ 0.004·(π·pitch·sinθ/λ)² beyond 40λ); 1e-3 of the peak.
  const h = lam / 8;
  const w = 4 * lam + 0.6 * h;
  const z = 4000 * lam;
  const sq = source({ shape: 'rectangle', width: w, height: w, opaque: false }, 2 * Math.ceil(w / 2 / h) + 2, h);
  const outX: Axis = { n: 21, start: 0.1 * z, step: (0.6 * z) / 20 };
  const outY: Axis = { n: 21, start: -0.25 * z, step: (0.6 * z) / 20 };
  const sinc = (x: number) => (x === 0 ? 1 : Math.sin(Math.PI * x) / (Math.PI * x));

  it.each([
    [0, 0],
    [10, -5],
  ])('matches (z/r)²w⁴sinc²sinc²/(λr)² within 1e-3 of the peak, tilt (%f°, %f°)', (tx, ty) => {
    const sx = Math.sin((tx * Math.PI) / 180);
    const sy = Math.sin((ty * Math.PI) / 180);
    const out = rsDirect2D(sq, z, outX, outY, [k * sx, k * sy]).data;
    let worst = 0;
    let peak = 0;
    for (let r = 0; r < outY.n; r++) {
      const y = outY.start + r * outY.step;
      for (let c = 0; c < outX.n; c++) {
        const x = outX.start + c * outX.step;
        const rr = Math.sqrt(x * x + y * y + z * z);
        const ref = ((z / rr) ** 2 * (1 + 1 / (k * rr) ** 2) * w ** 4 * sinc((w * (x / rr - sx)) / lam) ** 2 * sinc((w * (y / rr - sy)) / lam) ** 2) / (lam * rr) ** 2;
        const i = 2 * (r * outX.n + c);
        peak = Math.max(peak, ref);
        worst = Math.max(worst, Math.abs(out[i]! ** 2 + out[i + 1]! ** 2 - ref));
      }
    }
    // The window reaches well into the pattern (the peak seen is not a far side lobe).
    expect(peak).toBeGreaterThan(1e-3 * ((w * w) / (lam * z)) ** 2);
    expect(worst / peak).toBeLessThan(1e-3);
  });
});

describe('the kernel’s cell integral in 2-D against a brute-force quadrature', () => {
  // A square of side 6λ with its edges on cell boundaries (pitch λ/2): the samples are exactly the
  // aperture, so what is tested is the cell integral of the kernel (phase curvature ε = k h²/(8z)
  // = 0.04 at z = 5λ) with the cell-response division off, as for such apertures. Reference: the
  // same integral by 8-point Gauss–Legendre on panels of λ/6 in ξ and η (nodes from the standard
  // 8-point table, A&S Table 25.4, from memory; checked below on a polynomial).
  const GL8 = {
    x: [0.1834346424956498, 0.5255324099163290, 0.7966664774136267, 0.9602898564975363],
    w: [0.3626837833783620, 0.3137066458778873, 0.2223810344533745, 0.1012285362903763],
  };
  const nodes1 = (lo: number, hi: number) => {
    const n = Math.ceil((hi - lo) / (lam / 6));
    const hp = (hi - lo) / n;
    const x: number[] = [];
    const wt: number[] = [];
    for (let p = 0; p < n; p++) {
      for (let i = 0; i < 4; i++) {
        for (const sgn of [-1, 1]) {
          x.push(lo + hp * (p + 0.5 + 0.5 * sgn * GL8.x[i]!));
          wt.push(0.5 * hp * GL8.w[i]!);
        }
      }
    }
    return { x, wt };
  };

  it('uses a correct 8-point rule (∫x¹⁴ over [−1, 1] = 2/15)', () => {
    let s = 0;
    for (let i = 0; i < 4; i++) s += 2 * GL8.w[i]! * GL8.x[i]! ** 14;
    expect(Math.abs(s - 2 / 15)).toBeLessThan(1e-14);
  });

  it('agrees within 2e-3 of the peak over a window out to 45°, z = 5λ', () => {
    const side = 6 * lam;
    const z = 5 * lam;
    const h = lam / 2;
    const sq = source({ shape: 'rectangle', width: side, height: side, opaque: false }, 14, h);
    const { x: px, wt } = nodes1(-side / 2, side / 2);
    let worst = 0;
    let peak = 0;
    for (let i = 0; i < 15; i++) {
      const x = -lam + (i * (side / 2 + z)) / 14;
      const y = 0.3 * x;
      let sr = 0;
      let si = 0;
      for (let b = 0; b < px.length; b++) {
        for (let a = 0; a < px.length; a++) {
          const r = Math.sqrt((x - px[a]!) ** 2 + (y - px[b]!) ** 2 + z * z);
          const f = (wt[a]! * wt[b]! * z) / (2 * Math.PI * r * r);
          // (1/r − ik)·e^{ikr}
          sr += f * (Math.cos(k * r) / r + k * Math.sin(k * r));
          si += f * (Math.sin(k * r) / r - k * Math.cos(k * r));
        }
      }
      const u = rsDirect2D(sq, z, point(x), point(y), [0, 0], { cellResponse: false }).data;
      const ref = sr * sr + si * si;
      peak = Math.max(peak, ref);
      worst = Math.max(worst, Math.abs(u[0]! ** 2 + u[1]! ** 2 - ref));
    }
    expect(worst / peak).toBeLessThan(2e-3);
  });
});

describe('mirror symmetry', () => {
  it('is used on a symmetric window and gives what the points give one by one (where nothing is mirrored)', () => {
    // A disc of 20λ at pitch λ/8: mask.ts's mirror cells differ here by ~2e-12 (its areas come from
    // mirrored coordinates), so sums computed on both sides would differ in their last bits:
    // bit-equal mirror outputs show that the quarter was computed and mirrored.
    const h = lam / 8;
    const disc = source({ shape: 'circle', diameter: 20 * lam, opaque: false }, 163, h);
    const z = 20 * lam;
    const ax: Axis = { n: 7, start: -6 * lam, step: 2 * lam };
    const all = rsDirect2D(disc, z, ax, ax, [0, 0]).data;
    let differing = 0;
    for (let r = 0; r < 7; r++) for (let c = 0; c < 7; c++) if (all[2 * (r * 7 + c)] !== all[2 * (r * 7 + 6 - c)] || all[2 * (r * 7 + c)] !== all[2 * ((6 - r) * 7 + c)]) differing++;
    expect(differing).toBe(0);
    let peak = 0;
    let worst = 0;
    for (let r = 0; r < 7; r++) {
      for (let c = 0; c < 7; c++) {
        const u = rsDirect2D(disc, z, point(ax.start + c * ax.step), point(ax.start + r * ax.step), [0, 0]).data;
        const i = 2 * (r * 7 + c);
        peak = Math.max(peak, Math.hypot(u[0]!, u[1]!));
        worst = Math.max(worst, Math.hypot(all[i]! - u[0]!, all[i + 1]! - u[1]!));
      }
    }
    // The source's asymmetry is ~1e-12 of its samples; so is the change mirroring makes.
    expect(worst / peak).toBeLessThan(1e-10);
  });

  it('is not used with a carrier along the axis', () => {
    const disc = source({ shape: 'circle', diameter: 5 * lam, opaque: false }, 25, lam / 4);
    const ax: Axis = { n: 7, start: -3 * lam, step: lam };
    const u = rsDirect2D(disc, 7 * lam, ax, ax, [0.3 * k, 0]).data;
    const v = rsDirect2D(disc, 7 * lam, point(-3 * lam), point(0), [0.3 * k, 0]).data;
    // Tilted along x: the field at −3λ is not the mirror of +3λ, and the window computed it as such.
    expect(Math.abs(u[2 * (3 * 7)]! - v[0]!)).toBeLessThan(1e-10 * Math.hypot(v[0]!, v[1]!));
    expect(Math.abs(u[2 * (3 * 7)]! - u[2 * (3 * 7 + 6)]!)).toBeGreaterThan(1e-3 * Math.hypot(v[0]!, v[1]!));
  });
});
