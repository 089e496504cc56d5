// Paraxial (Fresnel) references, for cross-checks of the exact ones and for cases where the
// paraxial error is provably below what the comparison needs (test code only).
//
// What it computes, unit incident irradiance:
// - 1-D, plane wave tilted by sin θ = α: U(x) = e^{ikz}/√(iλz) ∫_open e^{ikαξ} e^{iπ(x−ξ)²/(λz)} dξ
//   = e^{ikz} e^{ik(αx − α²z/2)} · ½(1 − i)·[(C + iS)(t₂) − (C + iS)(t₁)] (completing the square),
//   with the Fresnel integrals C, S at t = √(2/λz)(ξ − x + αz) (Born & Wolf, Principles of Optics, §8.7;
//   Hecht, Optics, §10.3; Fresnel integrals from @stdlib, Abramowitz & Stegun ch. 7).
// - 2-D rectangles and sets of rectangles: the paraxial kernel factorises, U = e^{−ikz}U_x(x)U_y(y).
// - Circles and annuli, plane wave or Gaussian amplitude exp(−ρ²/w²), no tilt (Hankel form of the
//   Fresnel integral, Goodman, Introduction to Fourier Optics, §4.2):
//   U(ρ) = (2π/(iλz)) e^{ikz} e^{ikρ²/(2z)} ∫ A(s) e^{iks²/(2z)} J₀(kρs/z) s ds,
//   J₀ from @stdlib, the s-integral by 16-point Gauss–Legendre panels of at most 8 rad of phase.
// Accuracy: the paraxial integrals themselves to about 1e-12 (Fresnel integrals to double
// precision; the radial quadrature checked by refinement in fresnel.test.ts). How far they are from
// the exact field is bounded by paraxialBound below.
import fresnel from '@stdlib/math-base-special-fresnel';
import besselj0 from '@stdlib/math-base-special-besselj0';
import { gaussLegendre, walkPanels } from './quadrature.js';

export interface C2 {
  re: number;
  im: number;
}

/**
 * The 1-D paraxial field of open intervals (plane wave, tilt α), with the factor e^{ikz} left out
 * (callers combine factors). `opaque`: the free tilted wave less the intervals.
 */
export function fresnel1D(wavelength: number, z: number, intervals: [number, number][], alpha: number, x: number, opaque: boolean): C2 {
  const s = Math.sqrt(2 / (wavelength * z));
  let dc = 0;
  let ds = 0;
  for (const [a, b] of intervals) {
    const [s1, c1] = fresnel(s * (a - x + alpha * z));
    const [s2, c2] = fresnel(s * (b - x + alpha * z));
    dc += c2 - c1;
    ds += s2 - s1;
  }
  // (1/√(iλz))·√(λz/2)·(ΔC + iΔS) = (ΔC + iΔS)/(√2·e^{iπ/4}) = (ΔC + iΔS)(1 − i)/2
  let re = (dc + ds) / 2;
  let im = (ds - dc) / 2;
  // The tilt's phase e^{i2πf₀x − iπλz f₀²} = e^{ik(αx − α²z/2)}.
  const k = (2 * Math.PI) / wavelength;
  const ph = k * (alpha * x - (alpha * alpha * z) / 2);
  const c = Math.cos(ph);
  const sn = Math.sin(ph);
  [re, im] = [re * c - im * sn, re * sn + im * c];
  if (opaque) {
    re = c - re;
    im = sn - im;
  }
  return { re, im };
}

/** |U|² of a separable aperture: 1-D fields along x and y (each without e^{ikz}). */
export function fresnelSeparableIntensity(
  wavelength: number,
  z: number,
  xIntervals: [number, number][],
  yIntervals: [number, number][],
  alpha: number,
  x: number,
  y: number,
  opaque: boolean,
): number {
  const ux = fresnel1D(wavelength, z, xIntervals, alpha, x, false);
  const uy = fresnel1D(wavelength, z, yIntervals, 0, y, false);
  let re = ux.re * uy.re - ux.im * uy.im;
  let im = ux.re * uy.im + ux.im * uy.re;
  if (opaque) {
    const k = (2 * Math.PI) / wavelength;
    const ph = k * (alpha * x - (alpha * alpha * z) / 2);
    re = Math.cos(ph) - re;
    im = Math.sin(ph) - im;
  }
  return re * re + im * im;
}

/**
 * The paraxial field of a centred annulus (inner 0: a disc) at radius ρ, plane wave (w = ∞) or
 * Gaussian, no tilt, without e^{ikz}. `opaque`: the free beam less the annulus (plane wave only:
 * the free Gaussian needs its own integral, which this does not do).
 */
export function fresnelRadial(wavelength: number, z: number, inner: number, outer: number, w: number, rho: number, opaque: boolean): C2 {
  const k = (2 * Math.PI) / wavelength;
  const rule = gaussLegendre(16);
  let sr = 0;
  let si = 0;
  const top = Number.isFinite(w) ? Math.min(outer, 6.5 * w) : outer;
  const scale = (s: number) => {
    // Phase ks²/2z changes at ks/z per metre; J₀(kρs/z) oscillates at kρ/z; the beam on w/2.
    const rate = (k * s) / z + (k * rho) / z;
    return Math.min(8 / rate, 0.5 * w, 0.5 * Math.max(outer - inner, 1e-300));
  };
  if (top > inner) {
    walkPanels(inner, top, scale, (p0, p1) => {
      const half = (p1 - p0) / 2;
      const mid = (p1 + p0) / 2;
      for (let j = 0; j < 16; j++) {
        const s = mid + half * rule.x[j]!;
        const a = (Number.isFinite(w) ? Math.exp(-(s * s) / (w * w)) : 1) * besselj0((k * rho * s) / z) * s * rule.w[j]! * half;
        const ph = (k * s * s) / (2 * z);
        sr += a * Math.cos(ph);
        si += a * Math.sin(ph);
      }
    });
  }
  // (2π/(iλz)) e^{ikρ²/2z} (sr + i si)
  const f = (2 * Math.PI) / (wavelength * z);
  const ph = (k * rho * rho) / (2 * z);
  // (sr + i si)/i = si − i sr
  let re = f * (si * Math.cos(ph) + sr * Math.sin(ph));
  let im = f * (si * Math.sin(ph) - sr * Math.cos(ph));
  if (opaque) {
    if (Number.isFinite(w)) throw new Error('fresnelRadial: no free Gaussian beam here');
    re = 1 - re;
    im = -im;
  }
  return { re, im };
}

/**
 * A bound on |U_paraxial − U_exact| (both with unit incident irradiance), from the kernels:
 * 2-D: |h − h_F| ≤ (1/λz)(ρ²/z² + 1/(kz) + kρ⁴/(8z³)), since z²/r² ≥ 1 − ρ²/z², |i/(kr)| ≤ 1/(kz), and
 * √(z² + ρ²) = z + ρ²/2z − ε with 0 ≤ ε ≤ ρ⁴/(8z³) (Taylor with remainder; the last term is
 * Goodman's, Introduction to Fourier Optics, eq. 4-18). A tilt changes nothing here (the
 * illumination is integrated exactly; ρ includes the beam's walk-off αz); only the free wave of an
 * obstacle differs, by the phase kz(cos θ − 1 + sin²θ/2), which callers add.
 * 1-D: |K − K_F| ≤ (1/√(λz))(ρ²/z² + 1/(kz) + kρ⁴/(8z³)) for kz ≥ 10 (the large-argument form of
 * H₁ with its first correction 3/(8kr), Abramowitz & Stegun 9.2.7, from memory; (z/r)^{3/2} ≥ 1 − 3ρ²/(4z²)).
 * `open` is ∫|U₀| over the aperture (area, or length in 1-D), `rhoMax` the largest distance between
 * an observation foot and an aperture point.
 */
export function paraxialBound(wavelength: number, z: number, open: number, rhoMax: number, oneD: boolean): number {
  const k = (2 * Math.PI) / wavelength;
  if (oneD && k * z < 10) return Infinity;
  const t = (rhoMax * rhoMax) / (z * z) + 1 / (k * z) + (k * rhoMax ** 4) / (8 * z ** 3);
  return (oneD ? open / Math.sqrt(wavelength * z) : open / (wavelength * z)) * t;
}
