// The textbook far-field pattern of the simple apertures, to draw beside a computed profile: the
// Fraunhofer formula in direction sines, I = |F(x/(λr), y/(λr))|²·(z/r)²/(λr)² on a flat screen
// (Goodman, Introduction to Fourier Optics, §4.2), F the aperture's transform: the rect pair for
// slits and rectangles (Goodman §2.2), the Airy amplitude for discs and annuli (Born & Wolf §8.5.2),
// N slits the single slit's times the array factor sin(Nπpf)/sin(πpf) (Hecht, Optics, §10.2.3).
// For a 1-D aperture (infinitely long along y) the cylindrical far field, |F(x/(λr))|²·(z/r)²/(λr).
// Intensities relative to the incident irradiance of a unit plane wave at normal incidence; other
// light and other elements have no textbook curve here (null). It is the far-field pattern: beside
// a near-field result it differs, which is the point of drawing it.
import besselj1 from '@stdlib/math-base-special-besselj1';
import type { Aperture, Illumination } from '../optics/aperture.js';

export interface TextbookPattern {
  /** What it is, for a legend: 'Airy pattern (far field)'. */
  label: string;
  /** Intensity at screen point (x, y) (y ignored for 1-D apertures). */
  at(x: number, y: number): number;
}

const sinc = (u: number) => (u === 0 ? 1 : Math.sin(Math.PI * u) / (Math.PI * u));

/** |Σ_n e^{i2πf·x_n}| for N equally spaced points of period p: |sin(Nπpf)/sin(πpf)|, N where the denominator vanishes. */
function arrayFactor(n: number, p: number, f: number): number {
  const s = Math.sin(Math.PI * p * f);
  if (Math.abs(s) < 1e-12) return n;
  return Math.abs(Math.sin(n * Math.PI * p * f) / s);
}

/** The disc's transform at radial frequency q: πa²·2J₁(2πaq)/(2πaq). */
function disc(a: number, q: number): number {
  const v = 2 * Math.PI * a * q;
  return Math.PI * a * a * (v === 0 ? 1 : (2 * besselj1(v)) / v);
}

export function textbookFarField(aperture: Aperture, light: Illumination, wavelength: number, z: number): TextbookPattern | null {
  if (light.kind !== 'plane' || light.tilt[0] !== 0 || light.tilt[1] !== 0 || aperture.opaque) return null;
  const lam = wavelength;
  const flat2D = (F: (fx: number, fy: number) => number) => (x: number, y: number) => {
    const r = Math.hypot(x, y, z);
    const f = F(x / (lam * r), y / (lam * r));
    return (f * f * (z / r) ** 2) / (lam * r) ** 2;
  };
  const flat1D = (F: (fx: number) => number) => (x: number) => {
    const r = Math.hypot(x, z);
    const f = F(x / (lam * r));
    return (f * f * (z / r) ** 2) / (lam * r);
  };
  switch (aperture.shape) {
    case 'circle':
      return { label: 'Airy pattern (far field)', at: flat2D((fx, fy) => disc(aperture.diameter / 2, Math.hypot(fx, fy))) };
    case 'annulus':
      return { label: 'annular Airy pattern (far field)', at: flat2D((fx, fy) => disc(aperture.outer / 2, Math.hypot(fx, fy)) - disc(aperture.inner / 2, Math.hypot(fx, fy))) };
    case 'rectangle':
      return { label: 'sinc² × sinc² (far field)', at: flat2D((fx, fy) => aperture.width * aperture.height * sinc(aperture.width * fx) * sinc(aperture.height * fy)) };
    case 'slit': {
      const w = aperture.width;
      if (aperture.length) {
        const h = aperture.length;
        return { label: 'sinc² × sinc² (far field)', at: flat2D((fx, fy) => w * h * sinc(w * fx) * sinc(h * fy)) };
      }
      const at = flat1D((fx) => w * sinc(w * fx));
      return { label: 'sinc² (far field)', at: (x) => at(x) };
    }
    case 'slits': {
      const { width: w, period: p, count: n } = aperture;
      if (aperture.length) {
        const h = aperture.length;
        return { label: `${n}-slit pattern (far field)`, at: flat2D((fx, fy) => w * h * sinc(w * fx) * sinc(h * fy) * arrayFactor(n, p, fx)) };
      }
      const at = flat1D((fx) => w * sinc(w * fx) * arrayFactor(n, p, fx));
      return { label: `${n}-slit pattern (far field)`, at: (x) => at(x) };
    }
    default:
      return null;
  }
}
