// The thin lens t = exp(−iπ(x² + y²)/(λf)) (Goodman, Introduction to Fourier Optics, §5.1): its
// cell averages against quadrature, and what it does to light, by short direct Fresnel sums written
// here: a slit focuses to the sinc of its Fourier transform (Goodman §5.2), a Gaussian beam to a
// waist λf/(πw) (Siegman, Lasers, ch. 17). Gauss–Legendre rules from test/reference/quadrature.ts
// (Abramowitz & Stegun 25.4.29), which shares no code with src/.
import { describe, expect, it } from 'vitest';
import besselj1 from '@stdlib/math-base-special-besselj1';
import { gaussLegendre } from '../reference/quadrature.js';
import { mulberry32 } from '../helpers.js';
import { polarReference } from '../reference/disc-cell.js';
import {
  airyRadius,
  focusedWaist,
  lensAxisAverages,
  lensCellAverages,
  lensLocalFrequency,
} from '../../src/optics/thin-lens.js';
import type { Axis } from '../../src/optics/field.js';

const GL16 = gaussLegendre(16);

/**
 * (1/(b − a))∫_a^b exp(−iπx²/(λf)) dx by 16-point Gauss–Legendre panels of at most 4 rad of phase
 * each (remainder below 1e-30 by A&S 25.4.30). What limits it is the rounding of the phase πx²/(λf)
 * itself, about 1e-16 of it: 1e-13 at the 1000 rad the random cells keep to.
 */
function lensMean(f: number, lam: number, a: number, b: number): [number, number] {
  const k = Math.PI / (lam * f);
  const range = Math.abs(k) * Math.abs(b * b - a * a) + Math.abs(k) * (b - a) * (b - a);
  const panels = Math.max(1, Math.ceil(range / 4));
  const h = (b - a) / panels;
  let re = 0;
  let im = 0;
  for (let p = 0; p < panels; p++) {
    const mid = a + (p + 0.5) * h;
    for (let i = 0; i < 16; i++) {
      const x = mid + 0.5 * h * GL16.x[i]!;
      re += 0.5 * GL16.w[i]! * Math.cos(k * x * x);
      im -= 0.5 * GL16.w[i]! * Math.sin(k * x * x);
    }
  }
  return [re / panels, im / panels];
}

const um = 1e-6;
const mm = 1e-3;

describe('lensAxisAverages against Gauss–Legendre quadrature', () => {
  it('400 random cells (fixed seed) agree to 1e-12, from Δt = 1e-5 to 30 in the Fresnel variable and chirps up to hundreds of rad per cell', () => {
    const rnd = mulberry32(20260512);
    let worst = 0;
    let fast = 0;
    let slow = 0;
    let wide = 0;
    for (let i = 0; i < 400; i++) {
      const lam = (0.4 + 0.7 * rnd()) * um;
      const f = (rnd() < 0.5 ? -1 : 1) * 0.02 * Math.pow(50, rnd());
      const scale = Math.sqrt(2 / (lam * Math.abs(f)));
      // Keep the phase within 1000 rad, where the reference's own rounding is 1e-13.
      const xmax = Math.sqrt((1000 * lam * Math.abs(f)) / Math.PI);
      const dt = 1e-5 * Math.pow(3e6, rnd());
      const step = Math.min(dt / scale, xmax / 2);
      const xc = (2 * rnd() - 1) * (xmax - 1.5 * step);
      const axis: Axis = { n: 3, start: xc - step, step };
      const got = lensAxisAverages(f, lam, axis);
      for (let j = 0; j < 3; j++) {
        const x = xc + (j - 1) * step;
        const [re, im] = lensMean(f, lam, x - step / 2, x + step / 2);
        worst = Math.max(worst, Math.hypot(got[2 * j]! - re, got[2 * j + 1]! - im));
        const range = (Math.PI / (lam * Math.abs(f))) * (2 * Math.abs(x) * step + (step * step) / 4);
        if (range > 8) fast++;
        else slow++;
        if (step * scale >= 0.5) wide++;
      }
    }
    // Both branches of the implementation (Gauss–Legendre below 8 rad per cell, Fresnel integrals above) were hit.
    expect(fast).toBeGreaterThan(100);
    expect(slow).toBeGreaterThan(100);
    expect(wide).toBeGreaterThan(100);
    expect(worst).toBeLessThan(1e-12);
  });

  it('a long axis across the chirp, through both branches, agrees to 1e-12 in every cell', () => {
    // 0.6 µm, f = 20 mm, 2 µm cells out to ±1.9 mm: up to 950 rad at the ends, 2 µm·2π·x/(λf) per cell.
    const lam = 0.6 * um;
    const f = 20 * mm;
    const axis: Axis = { n: 1901, start: -1.9 * mm, step: 2 * um };
    const got = lensAxisAverages(f, lam, axis);
    let worst = 0;
    for (let j = 0; j < axis.n; j++) {
      const x = axis.start + j * axis.step;
      const [re, im] = lensMean(f, lam, x - axis.step / 2, x + axis.step / 2);
      worst = Math.max(worst, Math.hypot(got[2 * j]! - re, got[2 * j + 1]! - im));
    }
    expect(worst).toBeLessThan(1e-12);
  });

  it('a diverging lens is the conjugate of the converging one (t(−f) = t(f)*), and |mean| ≤ 1', () => {
    const axis: Axis = { n: 500, start: -2 * mm, step: 8 * um };
    const a = lensAxisAverages(0.1, 0.5 * um, axis);
    const b = lensAxisAverages(-0.1, 0.5 * um, axis);
    for (let j = 0; j < axis.n; j++) {
      expect(b[2 * j]).toBe(a[2 * j]);
      expect(b[2 * j + 1]).toBe(-a[2 * j + 1]!);
      expect(Math.hypot(a[2 * j]!, a[2 * j + 1]!)).toBeLessThanOrEqual(1 + 1e-15);
    }
  });
});

describe('lensCellAverages', () => {
  const lam = 0.55 * um;
  const f = 40 * mm;
  const xa: Axis = { n: 61, start: -1.2 * mm, step: 40 * um };
  const ya: Axis = { n: 57, start: -1.1 * mm, step: 39 * um };

  it('without a stop: equals the 2-D average by quadrature (a product of 1-D Gauss–Legendre averages, Fubini) to 1e-12 on 30 random cells', () => {
    const u = lensCellAverages(f, lam, null, xa, ya);
    const rnd = mulberry32(5);
    let worst = 0;
    for (let i = 0; i < 30; i++) {
      const r = Math.floor(rnd() * ya.n);
      const c = Math.floor(rnd() * xa.n);
      const x = xa.start + c * xa.step;
      const y = ya.start + r * ya.step;
      // The 2-D average of a product over a rectangle is the product of the 1-D averages (Fubini);
      // the reference takes each from quadrature.
      const [xr, xi] = lensMean(f, lam, x - xa.step / 2, x + xa.step / 2);
      const [yr, yi] = lensMean(f, lam, y - ya.step / 2, y + ya.step / 2);
      const k = 2 * (r * xa.n + c);
      worst = Math.max(worst, Math.hypot(u[k]! - (xr * yr - xi * yi), u[k + 1]! - (xr * yi + xi * yr)));
    }
    expect(worst).toBeLessThan(1e-12);
  });

  it('with a stop: unchanged inside, 0 outside, and rim cells equal to the exact average over cell ∩ disc (to 1e-10)', () => {
    // A grid at about four samples per local period at the rim (1.5 rad of lens phase per cell).
    const D = 1.7 * mm;
    const R = D / 2;
    const xa: Axis = { n: 301, start: -0.9 * mm, step: 6 * um };
    const ya: Axis = { n: 291, start: -0.87 * mm, step: 6.1 * um };
    const bare = lensCellAverages(f, lam, null, xa, ya);
    const u = lensCellAverages(f, lam, D, xa, ya, new Float64Array(2 * xa.n * ya.n));
    const k = Math.PI / (lam * f);
    let rim = 0;
    let changedInside = 0;
    let openOutside = 0;
    let worstRatio = 0;
    let worstAbs = 0;
    for (let r = 0; r < ya.n; r++) {
      for (let c = 0; c < xa.n; c++) {
        const xc = xa.start + c * xa.step;
        const yc = ya.start + r * ya.step;
        const hx = xa.step / 2;
        const hy = ya.step / 2;
        const i = 2 * (r * xa.n + c);
        const near = Math.hypot(Math.max(0, Math.abs(xc) - hx), Math.max(0, Math.abs(yc) - hy));
        const far = Math.hypot(Math.abs(xc) + hx, Math.abs(yc) + hy);
        if (far <= R) {
          if (!(u[i] === bare[i] && u[i + 1] === bare[i + 1])) changedInside++;
          continue;
        }
        if (near >= R) {
          if (!(Object.is(u[i], 0) && Object.is(u[i + 1], 0))) openOutside++;
          continue;
        }
        if (rim++ % 8 !== 0) continue; // every eighth rim cell against quadrature
        // Exact average over cell ∩ disc: the polar quadrature of test/reference/disc-cell.ts.
        const [re, im] = polarReference((x, y) => -k * (x * x + y * y), R, xc, yc, xa.step, ya.step);
        const q = polarReference(() => 0, R, xc, yc, xa.step, ya.step)[0];
        const sq = (lo: number, hi: number) => (lo <= 0 && hi >= 0 ? 0 : Math.min(lo * lo, hi * hi));
        const range = k * (Math.max((xc - hx) ** 2, (xc + hx) ** 2) - sq(xc - hx, xc + hx) + Math.max((yc - hy) ** 2, (yc + hy) ** 2) - sq(yc - hy, yc + hy));
        const err = Math.hypot(u[i]! - re, u[i + 1]! - im);
        // The reference's own error: below 1e-10 (test/optics/disc-rim-cells.test.ts).
        // (Averaged over the whole cell times q, as before the rim cells took their open part
        // only, this was up to 0.18 off here, about half of q(1−q)·range.)
        expect(err).toBeLessThanOrEqual(1e-10);
        worstRatio = Math.max(worstRatio, q * (1 - q) * range);
        worstAbs = Math.max(worstAbs, err);
      }
    }
    expect(changedInside).toBe(0);
    expect(openOutside).toBe(0);
    expect(rim).toBeGreaterThan(1000);
    // The grid is coarse enough that the whole-cell mean would be far off (the bound's scale).
    expect(worstRatio).toBeGreaterThan(0.1);
    expect(worstAbs).toBeLessThanOrEqual(1e-10);
  });
});

describe('the lens in light (direct Fresnel sums, 1-D: U(x) = (1/√(iλz))∫U₀(ξ)e^{iπ(x−ξ)²/(λz)}dξ, Goodman §4.2)', () => {
  /** The 1-D Fresnel sum over cells of pitch d centred at xs, input u (interleaved), at x. */
  function fresnelAt(u: Float64Array, xs: Axis, lam: number, z: number, x: number): [number, number] {
    let re = 0;
    let im = 0;
    for (let j = 0; j < xs.n; j++) {
      const xi = xs.start + j * xs.step;
      const p = (Math.PI * (x - xi) ** 2) / (lam * z);
      const c = Math.cos(p);
      const s = Math.sin(p);
      re += u[2 * j]! * c - u[2 * j + 1]! * s;
      im += u[2 * j]! * s + u[2 * j + 1]! * c;
    }
    // 1/√(iλz) = e^{−iπ/4}/√(λz)
    const g = xs.step / Math.sqrt(lam * z);
    return [(g * (re + im)) / Math.SQRT2, (g * (im - re)) / Math.SQRT2];
  }

  it('Goodman §5.2: a slit of width a behind the lens gives (a²/λf)·sinc²(ax/λf) at z = f, first zero at λf/a', () => {
    // An invented bench: 0.5 µm, f = 50 mm, a 1 mm slit filled with 4000 cells of 0.25 µm.
    const lam = 0.5 * um;
    const f = 50 * mm;
    const a = 1 * mm;
    const n = 4000;
    const xs: Axis = { n, start: -a / 2 + a / (2 * n), step: a / n };
    const u = lensAxisAverages(f, lam, xs);
    const zero = (lam * f) / a;
    let worst = 0;
    const peak = (a * a) / (lam * f);
    for (let i = -150; i <= 150; i++) {
      const x = (i / 50) * zero;
      const [re, im] = fresnelAt(u, xs, lam, f, x);
      const v = (Math.PI * a * x) / (lam * f);
      const expected = peak * (v === 0 ? 1 : (Math.sin(v) / v) ** 2);
      worst = Math.max(worst, Math.abs(re * re + im * im - expected) / peak);
    }
    // Error budget: the cell averages stand for the lens where the sum takes point values (relative
    // (2πΔ·x/(λf))²/24 ≈ 4e-5 at the slit's edge); the kernel's phase over a cell is below 1e-2 rad.
    expect(worst).toBeLessThan(1e-4);
    // The first zero: the least intensity between 0.9 and 1.1 λf/a, by golden section.
    const I = (x: number) => {
      const [re, im] = fresnelAt(u, xs, lam, f, x);
      return re * re + im * im;
    };
    let lo = 0.9 * zero;
    let hi = 1.1 * zero;
    for (let it = 0; it < 60; it++) {
      const m1 = hi - (hi - lo) * 0.618;
      const m2 = lo + (hi - lo) * 0.618;
      if (I(m1) < I(m2)) hi = m2;
      else lo = m1;
    }
    const xz = (lo + hi) / 2;
    expect(Math.abs(xz / zero - 1)).toBeLessThan(1e-4);
    expect(I(xz) / peak).toBeLessThan(1e-8);
  });

  it('Siegman ch. 17: an elliptical Gaussian (w = 1.2 mm × 0.7 mm) through the lens has 1/e² radii λf/(πw) at z = f within 1 % (measured 1.7e-4)', () => {
    // An invented bench: 0.8 µm, f = 100 mm; amplitude exp(−x²/w_x² − y²/w_y²) times the lens, each
    // axis propagated by its own 1-D Fresnel sum (the input and the paraxial kernel are separable).
    const lam = 0.8 * um;
    const f = 100 * mm;
    const beams = [
      { w: 1.2 * mm, axis: { n: 7201, start: -3.6 * mm, step: 1 * um } as Axis },
      { w: 0.7 * mm, axis: { n: 3501, start: -2.1 * mm, step: 1.2 * um } as Axis },
    ];
    // The 2-D lens is the product of its axes' averages (checked on a 300 × 200 corner of the grid):
    // that is what lets each axis be propagated alone.
    const [bx, by] = beams;
    const cx: Axis = { ...bx!.axis, n: 300 };
    const cy: Axis = { ...by!.axis, n: 200 };
    const lens2D = lensCellAverages(f, lam, null, cx, cy);
    const ax = lensAxisAverages(f, lam, bx!.axis);
    const ay = lensAxisAverages(f, lam, by!.axis);
    for (const [r, c] of [[0, 0], [150, 299], [199, 10]] as const) {
      const k = 2 * (r * cx.n + c);
      expect(lens2D[k]).toBeCloseTo(ax[2 * c]! * ay[2 * r]! - ax[2 * c + 1]! * ay[2 * r + 1]!, 15);
      expect(lens2D[k + 1]).toBeCloseTo(ax[2 * c]! * ay[2 * r + 1]! + ax[2 * c + 1]! * ay[2 * r]!, 15);
    }
    for (const { w, axis } of beams) {
      const t = lensAxisAverages(f, lam, axis);
      const u = new Float64Array(2 * axis.n);
      for (let j = 0; j < axis.n; j++) {
        const x = axis.start + j * axis.step;
        const g = Math.exp(-(x * x) / (w * w));
        u[2 * j] = g * t[2 * j]!;
        u[2 * j + 1] = g * t[2 * j + 1]!;
      }
      const I = (x: number) => {
        const [re, im] = fresnelAt(u, axis, lam, f, x);
        return re * re + im * im;
      };
      const i0 = I(0);
      const expected = focusedWaist(f, lam, w);
      // The 1/e² radius by bisection between 0.5 and 2 times the expected one.
      let lo = 0.5 * expected;
      let hi = 2 * expected;
      for (let it = 0; it < 50; it++) {
        const mid = (lo + hi) / 2;
        if (I(mid) > i0 * Math.exp(-2)) lo = mid;
        else hi = mid;
      }
      const radius = (lo + hi) / 2;
      expect(Math.abs(radius / expected - 1)).toBeLessThan(1e-2);
      // Measured 1.7e-4 and 0.6e-4: the sum takes the lens' cell averages as point values, which
      // tapers the beam by 1 − (2πxΔ/(λf))²/24 and so widens the focus by about that (1.9e-4 here).
      expect(Math.abs(radius / expected - 1)).toBeLessThan(3e-4);
    }
  });
});

describe('formulas', () => {
  it('airyRadius: J₁(πD r/(λf)) = 0 at r (Born & Wolf §8.5.2, J₁ from @stdlib), and 1.22 λf/D to 0.03 % (the usual rounding)', () => {
    const f = 75 * mm;
    const lam = 0.633 * um;
    const D = 4 * mm;
    const r = airyRadius(f, lam, D);
    expect(Math.abs(besselj1((Math.PI * D * r) / (lam * f)))).toBeLessThan(1e-15);
    expect(Math.abs(r / ((1.22 * lam * f) / D) - 1)).toBeLessThan(3e-4);
    expect(airyRadius(-f, lam, D)).toBe(r);
  });

  it('focusedWaist is λ|f|/(πw) (Siegman ch. 17)', () => {
    expect(focusedWaist(0.2, 1.064 * um, 2 * mm)).toBeCloseTo((1.064 * um * 0.2) / (Math.PI * 2 * mm), 18);
    expect(focusedWaist(-0.2, 1.064 * um, 2 * mm)).toBe(focusedWaist(0.2, 1.064 * um, 2 * mm));
  });

  it('lensLocalFrequency is (1/2π)|dφ/dx| of the lens phase φ = −πx²/(λf) (central differences, 1e-9)', () => {
    const lam = 0.5 * um;
    const f = 0.05;
    for (const x of [0, 0.1 * mm, 1.3 * mm, -2 * mm]) {
      const h = 1e-9;
      const phi = (s: number) => (-Math.PI * s * s) / (lam * f);
      const numeric = Math.abs((phi(x + h) - phi(x - h)) / (2 * h)) / (2 * Math.PI);
      expect(Math.abs(lensLocalFrequency(f, lam, x) - numeric)).toBeLessThanOrEqual(1e-9 * Math.max(1, numeric));
    }
  });

  it('refuses a zero focal length, a non-positive wavelength or stop', () => {
    const axis: Axis = { n: 4, start: 0, step: 1 * um };
    expect(() => lensAxisAverages(0, 0.5 * um, axis)).toThrow(/focal length/);
    expect(() => lensAxisAverages(0.1, 0, axis)).toThrow(/wavelength/);
    expect(() => lensCellAverages(0.1, 0.5 * um, 0, axis, axis)).toThrow(/stop/);
  });
});
