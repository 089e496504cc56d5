// A tilted Gaussian beam by the shifted angular spectrum (src/optics/shifted-spectrum.ts): where it
// lands and how wide it is, against
// - Siegman, Lasers, ch. 17: w(d) = w_p·√(1 + (d/z_R)²), z_R = π·w_p²/λ, along the beam's own axis
//   (d = z/cos θ from the waist), the width measured perpendicular to the beam and projected onto
//   the screen (w/cos θ along x, the tilt plane; unchanged along y). The envelope exp(−r²/w₀²) in
//   the aperture plane is the oblique cut through a waist of w_p = w₀·cos θ along x (its spectrum
//   spreads sin θ by λ/(πw₀), i.e. θ by λ/(πw₀ cos θ)) and w₀ along y;
// - the exact moment theorem for scalar fields, derived here from Parseval's theorem and the
//   derivative theorem of the Fourier transform (Goodman, Introduction to Fourier Optics, ch. 2):
//   with A(f) the angular spectrum, ∫x|U|² = (i/2π)∫A*∂A + z∫|A|²·λf_x/√(1 − λ²|f|²), so the
//   intensity centroid moves along z·⟨tan θ_x⟩ exactly, and for a real spectrum (a real, even
//   envelope) ⟨x²⟩(z) = ⟨x²⟩(0) + z²⟨tan² θ_x⟩, averages over |A|². Nothing paraxial.
// The spot's centroid at z·tan θ is Hecht's statement (Optics: a tilted beam travels along its
// direction); the exact theorem says by how much the spread of directions moves it.
//
// Error budget: the exact moments are limited by the grid (the beam's tails beyond the window are
// below e^{−32}), the band limit (cut fraction under 1e-6, measured about 1e-23) and rounding: the
// centroid to 1e-9 of w, the variances to 1e-8 (measured: 1e-13). Siegman's
// formula is paraxial about the beam's axis and the projection is first order: relative errors of
// order (θ_d·tan θ)² and θ_d² in the width (θ_d = λ/(πw_p), 0.016–0.025 here; the budget taken is
// 4(θ_d tan θ)² + θ_d², a judgement: 4e-3 at 50°), and of order θ_d·tan θ·w in the centroid (the
// beam is wider on its far side; 3e-2·w at 50°).
import { engine } from '../engine.js';
import { describe, expect, it } from 'vitest';
import { fftAxis } from '../../src/optics/field.js';
import { padField } from '../../src/optics/spectral.js';
import { sourceField2D } from '../../src/optics/source.js';
import { gaussianSpectrumTail, landingCentre, propagateShiftedSpectrum, shiftedGridFor } from '../../src/optics/shifted-spectrum.js';


const deg = (d: number) => (d * Math.PI) / 180;

/**
 * ⟨tan θ_x⟩, ⟨tan² θ_x⟩, ⟨tan θ_y⟩, ⟨tan² θ_y⟩ over the power spectrum exp(−2π²w₀²|g|²) of the
 * envelope, f = g + f_c, tan θ_x = λf_x/√(1 − λ²|f|²): a 2-D trapezoidal sum over ±7σ (σ = 1/(2πw₀))
 * in steps of σ/16 (spectrally accurate for a Gaussian weight).
 */
function tanMoments(lam: number, w0: number, carrier: [number, number]) {
  const sigma = 1 / (2 * Math.PI * w0);
  const h = sigma / 16;
  const n = Math.ceil((7 * sigma) / h);
  let m0 = 0;
  let tx = 0;
  let tx2 = 0;
  let ty = 0;
  let ty2 = 0;
  for (let j = -n; j <= n; j++) {
    const gy = j * h;
    for (let i = -n; i <= n; i++) {
      const gx = i * h;
      const w = Math.exp(-2 * Math.PI * Math.PI * w0 * w0 * (gx * gx + gy * gy));
      const fx = gx + carrier[0];
      const fy = gy + carrier[1];
      const root = Math.sqrt(1 - lam * lam * (fx * fx + fy * fy));
      const a = (lam * fx) / root;
      const b = (lam * fy) / root;
      m0 += w;
      tx += w * a;
      tx2 += w * a * a;
      ty += w * b;
      ty2 += w * b * b;
    }
  }
  return { tx: tx / m0, tx2: tx2 / m0, ty: ty / m0, ty2: ty2 / m0 };
}

describe('tilted Gaussian beam, w₀ = 20λ in the aperture plane, screen 1 mm away', () => {
  const lam = 0.5e-6;
  const w0 = 10e-6;
  const z = 1e-3;
  for (const t of [10, 30, 50]) {
    it(`${t}°: centroid and second-moment widths against the exact moment theorem and Siegman's w(z), projected`, () => {
      const s = Math.sin(deg(t));
      const c = Math.cos(deg(t));
      const carrier: [number, number] = [s / lam, 0];
      const centre = landingCentre(carrier, lam, z);
      expect(centre[0]).toBeCloseTo(z * Math.tan(deg(t)), 12);
      // Siegman, along the beam: d = z/cos θ; w_p = w₀cos θ (x), w₀ (y).
      const d = z / c;
      const siegman = (wp: number) => wp * Math.sqrt(1 + (d / ((Math.PI * wp * wp) / lam)) ** 2);
      const wxScreen = siegman(w0 * c) / c;
      const wyScreen = siegman(w0);
      // Window ±4 w (e^{−32} of the peak at its edge); the envelope sampled to 4 w₀ (e^{−16}).
      const grid = shiftedGridFor({
        wavelength: lam,
        z,
        carrier,
        footprint: [4 * w0, 4 * w0],
        window: [4 * wxScreen, 4 * wyScreen],
        maxPitch: [w0 / 8, w0 / 8],
        tail: gaussianSpectrumTail(w0),
        target: 1e-6,
      });
      expect(grid.windowClear).toBe(true);
      expect(grid.targetMet).toBe(true);
      const [dx, dy] = grid.pitch;
      const nSrc = (a: number, p: number) => 2 * Math.ceil((5 * a) / p);
      // A square far wider than the beam: the mask is 1 wherever the light is, so the envelope is
      // the Gaussian's point samples, and there is no cell response to divide out.
      const src = sourceField2D(
        { shape: 'rectangle', width: 10 * w0, height: 10 * w0, opaque: false },
        { kind: 'gaussian', waist: w0, tilt: [0, 0] },
        fftAxis(nSrc(w0, dx), dx),
        fftAxis(nSrc(w0, dy), dy),
        lam,
        { sampleCarrier: false },
      ).field;
      const env = padField(src, grid.samples[0], grid.samples[1]);
      const { field: psi, report } = propagateShiftedSpectrum(engine, env, z, carrier, centre, {
        cellResponse: false,
        taper: grid.taper,
        bandTaper: grid.bandTaper,
        inPlace: true,
      });
      expect(report.bandLimitLoss).toBeLessThan(1e-6);
      let m0 = 0;
      let mx = 0;
      let my = 0;
      let mxx = 0;
      let myy = 0;
      for (let r = 0; r < psi.ny; r++) {
        const y = psi.y0 + r * dy;
        for (let col = 0; col < psi.nx; col++) {
          const x = psi.x0 + col * dx;
          const i = 2 * (r * psi.nx + col);
          const I = psi.data[i]! ** 2 + psi.data[i + 1]! ** 2;
          m0 += I;
          mx += I * x;
          my += I * y;
          mxx += I * x * x;
          myy += I * y * y;
        }
      }
      const xBar = mx / m0;
      const yBar = my / m0;
      const varX = mxx / m0 - xBar * xBar;
      const varY = myy / m0 - yBar * yBar;
      // Exact: x̄ = z⟨tan θx⟩, var x = w₀²/4 + z²(⟨tan²θx⟩ − ⟨tan θx⟩²); likewise y.
      const m = tanMoments(lam, w0, carrier);
      const wExact = 2 * Math.sqrt(varX);
      expect(Math.abs(xBar - z * m.tx)).toBeLessThan(1e-9 * wExact);
      expect(Math.abs(yBar)).toBeLessThan(1e-9 * wExact);
      expect(Math.abs(varX - (w0 * w0) / 4 - z * z * (m.tx2 - m.tx * m.tx)) / varX).toBeLessThan(1e-8);
      expect(Math.abs(varY - (w0 * w0) / 4 - z * z * (m.ty2 - m.ty * m.ty)) / varY).toBeLessThan(1e-8);
      // Siegman, projected: the D4σ width 2σ is w; centroid on the ray z·tan θ.
      const thetaD = lam / (Math.PI * w0 * c);
      const widthBudget = 4 * (thetaD * Math.tan(deg(t))) ** 2 + thetaD ** 2;
      expect(Math.abs(2 * Math.sqrt(varX) / wxScreen - 1)).toBeLessThan(widthBudget);
      expect(Math.abs(2 * Math.sqrt(varY) / wyScreen - 1)).toBeLessThan(widthBudget);
      expect(Math.abs(xBar - z * Math.tan(deg(t)))).toBeLessThan(thetaD * Math.tan(deg(t)) * wxScreen);
    });
  }
});
