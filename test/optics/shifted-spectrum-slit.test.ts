// 1-D: a tilted slit (invariant along y) by the shifted angular spectrum on a 1-D grid
// (src/optics/shifted-spectrum.ts), against an independent quadrature of the exact 1-D
// Rayleigh–Sommerfeld integral written here:
//   U(x, z) = ∫_{−a}^{a} e^{ik sin θ ξ}·(ikz/2r)·H₁⁽¹⁾(kr) dξ,   r = √((x − ξ)² + z²),
// the kernel −2∂G/∂z of the 2-D Green's function G = (i/4)H₀⁽¹⁾(kr) (Goodman, Introduction to
// Fourier Optics, §3.5, in two dimensions), with J₁ and Y₁ from @stdlib (a well-kept library, full
// double precision). Its constant is checked here against the far-field limit
// H₁⁽¹⁾(x) → √(2/(πx))·e^{i(x − 3π/4)} (Abramowitz & Stegun 9.2.3), which gives the 1-D Fraunhofer
// prefactor (z/r)·e^{ikr}/√(iλr).
//
// Error budget: the area-sampled slit's own aliasing, about (πgΔ)²/3 relative at frequency g
// (1-D grids are cheap: Δ = b/201 keeps it near 1e-5 of the peak), the band limit's taper (a few
// 1e-5, measured); the quadrature to about 1e-12. Tolerance 2e-4 of the peak.
import { engine } from '../engine.js';
import besselj1 from '@stdlib/math-base-special-besselj1';
import bessely1 from '@stdlib/math-base-special-bessely1';
import { describe, expect, it } from 'vitest';
import { fftAxis } from '../../src/optics/field.js';
import { padField } from '../../src/optics/spectral.js';
import { sourceField1D } from '../../src/optics/source.js';
import { landingCentre, propagateShiftedSpectrum, shiftedGridFor } from '../../src/optics/shifted-spectrum.js';
import { gaussLegendre } from '../reference/quadrature.js';


const deg = (d: number) => (d * Math.PI) / 180;

const GL = gaussLegendre(16);

/** The exact 1-D field of the tilted slit |ξ| ≤ a at (x, z): 16-point panels of at most 8 rad of phase. */
function rsSlit(lam: number, z: number, a: number, sinT: number, x: number): [number, number] {
  const k = (2 * Math.PI) / lam;
  const panels = Math.max(2, Math.ceil((2 * a * k * (Math.abs(sinT) + 1)) / 8));
  const h = (2 * a) / panels;
  let re = 0;
  let im = 0;
  for (let p = 0; p < panels; p++) {
    const mid = -a + (p + 0.5) * h;
    for (let i = 0; i < 16; i++) {
      const xi = mid + 0.5 * h * GL.x[i]!;
      const w = 0.5 * h * GL.w[i]!;
      const r = Math.hypot(x - xi, z);
      const kr = k * r;
      // (ikz/2r)(J₁ + iY₁) = (kz/2r)(−Y₁ + iJ₁), times e^{ik sin θ ξ}.
      const s = (w * k * z) / (2 * r);
      const hr = -bessely1(kr) * s;
      const hi = besselj1(kr) * s;
      const c = Math.cos(k * sinT * xi);
      const sn = Math.sin(k * sinT * xi);
      re += hr * c - hi * sn;
      im += hr * sn + hi * c;
    }
  }
  return [re, im];
}

describe('tilted slit, 1-D: the exact integral with the Hankel kernel', () => {
  const lam = 0.5e-6;
  const a = 5e-6; // slit width 2a = 20λ

  it("the kernel's constant: far away the quadrature is the 1-D Fraunhofer formula (A&S 9.2.3)", () => {
    // z = 50 mm: N_F = a²/(λz) = 1e-3. U → (z/r)e^{ikr}/√(iλr)·2a·sinc(2a(x/(λr) − sin θ/λ)).
    const z = 50e-3;
    const s = Math.sin(deg(20));
    for (const x of [z * Math.tan(deg(20)), z * Math.tan(deg(20)) + 1e-3]) {
      const r = Math.hypot(x, z);
      const u = (2 * a * (x / r - s)) / lam;
      const amp = ((z / r) * 2 * a * (u === 0 ? 1 : Math.sin(Math.PI * u) / (Math.PI * u))) / Math.sqrt(lam * r);
      const [re, im] = rsSlit(lam, z, a, s, x);
      expect(Math.abs(Math.hypot(re, im) - Math.abs(amp)) / Math.abs((z / r) * 2 * a / Math.sqrt(lam * r))).toBeLessThan(2e-3);
    }
  });

  for (const zOverZf of [1, 10]) {
    for (const t of [10, 30, 50]) {
      it(`${t}°, N_F = ${1 / zOverZf}: within 2e-4 of the peak across the spot; the centroid near z·tan θ`, () => {
        const z = (zOverZf * a * a) / lam;
        const s = Math.sin(deg(t));
        const carrier: [number, number] = [s / lam, 0];
        const centre = landingCentre(carrier, lam, z);
        const W = 3 * a + 2 * Math.sqrt(lam * z) / Math.cos(deg(t)) ** 1.5;
        const pitch = (2 * a) / 201; // the slit's edges on cell boundaries
        const grid = shiftedGridFor({ wavelength: lam, z, carrier, footprint: [a, 0], window: [W, 0], oneD: true, pitch: [pitch, 0] });
        expect(grid.samples[1]).toBe(1);
        expect(grid.windowClear).toBe(true);
        const src = sourceField1D({ kind: 'interval', width: 2 * a }, { kind: 'plane', tilt: [0, 0] }, fftAxis(2 * (101 + 4), pitch), lam, 0, { sampleCarrier: false }).field;
        const { field: psi } = propagateShiftedSpectrum(engine, padField(src, grid.samples[0], 1), z, carrier, centre, {
          taper: grid.taper,
          bandTaper: grid.bandTaper,
          inPlace: true,
        });
        expect(psi.ny).toBe(1);
        expect(psi.dy).toBe(0);
        let peak = 0;
        let diff = 0;
        let m0 = 0;
        let m1 = 0;
        let r0 = 0;
        let r1 = 0;
        for (let c = 0; c < psi.nx; c += 8) {
          const x = psi.x0 + c * pitch;
          if (Math.abs(x - centre[0]) > W) continue;
          const [re, im] = rsSlit(lam, z, a, s, x);
          const want = re * re + im * im;
          const got = psi.data[2 * c]! ** 2 + psi.data[2 * c + 1]! ** 2;
          peak = Math.max(peak, want);
          diff = Math.max(diff, Math.abs(got - want));
          m0 += got;
          m1 += got * x;
          r0 += want;
          r1 += want * x;
        }
        expect(diff / peak).toBeLessThan(2e-4);
        // The centroid over the window: the exact integral's to 1e-4 of W; and on the ray along the
        // beam, z·tan θ (Hecht), but for the stretching of tan θ across the spot and the window's cut
        // of the tails, which move it by under 1 % of W here (measured 0.85 % at 50°, N_F = 0.1);
        // tolerance 2 % of W, a judgement.
        expect(Math.abs(m1 / m0 - r1 / r0)).toBeLessThan(1e-4 * W);
        expect(Math.abs(m1 / m0 - z * Math.tan(deg(t)))).toBeLessThan(0.02 * W);
      });
    }
  }
});
