// Exact references for thin gratings of every profile (test code only; nothing from src/ beyond
// types): the order efficiencies of the infinite grating in closed form, and the exact 1-D
// Rayleigh–Sommerfeld field of the finite grating, written as a sum of problems rs1d.ts solves
// exactly (open intervals lit by a plane or Gaussian wave of any tilt), by linearity.
//
// The profile's definition is the job's (src/elements/grating.ts, written out here): count periods
// of d centred on x = 0, period k centred on c_k = (k − (count−1)/2)·d, and in s = x − c_k:
//   binary amplitude      1 for |s| < duty·d/2, else 0
//   binary phase          e^{iφ} for |s| < duty·d/2, else 1
//   sinusoidal amplitude  ½ + (m/2)·cos(2πs/d)
//   sinusoidal phase      exp(i·(m/2)·sin(2πs/d))            (m: the peak-to-peak phase)
//   blazed                exp(2πi·α·(s/d + ½))                (α waves; 0 at each period's left edge)
//
// Efficiencies |c_q|² (Goodman, Introduction to Fourier Optics, §4.4 and ch. 7):
//   sinusoidal amplitude  ¼ (q = 0), m²/16 (q = ±1), 0 else
//   sinusoidal phase      J_q²(m/2)
//   blazed                sinc²(q − α)
//   binary amplitude      D²·sinc²(qD)
//   binary phase          q = 0: |1 + (e^{iφ} − 1)D|² = 1 − 2D(1 − D)(1 − cos φ);
//                         q ≠ 0: 2(1 − cos φ)·sin²(πqD)/(πq)²
// J_n from Bessel's integral J_n(x) = (1/π)∫₀^π cos(nτ − x sin τ) dτ (Abramowitz & Stegun 9.1.21),
// by Gauss–Legendre panels of at most 4 rad of phase: about 1e-15 absolute (checked in the test
// file against @stdlib's J₀, J₁).
//
// Fields (the profile as a sum of pieces rs1d integrates exactly):
//   binary amplitude      the open slits
//   binary phase          the whole extent + (e^{iφ} − 1)·the stepped strips
//   sinusoidal amplitude  cos(2πs/d) = σ·cos(2πx/d), σ = (−1)^{count−1}: the extent at three
//                         tilts, sin θ and sin θ ± λ/d, weighted ½ and σm/4
//   sinusoidal phase      Jacobi–Anger (A&S 9.1.41): exp(i a σ sin(2πx/d)) = Σ_q J_q(a)·e^{iqσ2πx/d}:
//                         the extent at tilts sin θ + qσλ/d, weighted J_q(a), a = m/2, |q| up to where
//                         |J_q| < 1e-12 past q = a
//   blazed                on period k, e^{2πiαx/d}·e^{iπα·count}·e^{−2πiαk}: each period at tilt
//                         sin θ + αλ/d with its own constant (one extent when α is whole)
// Accuracy: rs1d's, about 1e-9 of the peak per piece or better (rs1d.ts), times the number of
// pieces' weights: well below the 1e-6 the comparisons could notice.
import type { Aperture, Illumination } from '../../src/optics/aperture.js';
import { gaussLegendre } from './quadrature.js';
import { gratingIntervals, rs1d, rs1dCost, type Light, type Problem1D } from './rs1d.js';

type GratingAperture = Extract<Aperture, { shape: 'grating' }>;
export type Profile = GratingAperture['profile'];

const sinc = (u: number) => (u === 0 ? 1 : Math.sin(Math.PI * u) / (Math.PI * u));

/** J_n(x), integer n (any sign), by Bessel's integral (A&S 9.1.21). */
export function besselJ(n: number, x: number): number {
  const rule = gaussLegendre(16);
  const panels = Math.max(2, Math.ceil(((Math.abs(n) + Math.abs(x)) * Math.PI) / 4));
  const h = Math.PI / panels;
  let s = 0;
  for (let p = 0; p < panels; p++) {
    const mid = (p + 0.5) * h;
    for (let j = 0; j < rule.x.length; j++) {
      const t = mid + (h / 2) * rule.x[j]!;
      s += rule.w[j]! * Math.cos(n * t - x * Math.sin(t));
    }
  }
  return (s * h) / 2 / Math.PI;
}

/** |c_q|²: the infinite grating's efficiency in order q (the closed forms above). */
export function efficiency(p: Profile, q: number): number {
  switch (p.kind) {
    case 'sinusoidal-amplitude':
      return q === 0 ? 0.25 : Math.abs(q) === 1 ? p.modulation ** 2 / 16 : 0;
    case 'sinusoidal-phase':
      return besselJ(q, p.modulation / 2) ** 2;
    case 'blazed':
      return sinc(q - p.depth) ** 2;
    case 'binary-amplitude':
      return (p.duty * sinc(q * p.duty)) ** 2;
    case 'binary-phase': {
      const D = p.duty;
      if (q === 0) return 1 - 2 * D * (1 - D) * (1 - Math.cos(p.step));
      return (2 * (1 - Math.cos(p.step)) * Math.sin(Math.PI * q * D) ** 2) / (Math.PI * q) ** 2;
    }
  }
}

/** One exact piece: open intervals at a tilt, times a complex weight. */
interface Piece {
  weight: [number, number];
  intervals: [number, number][];
  sinTilt: number;
}

/** The profile as pieces (see the header); `tol` drops Jacobi–Anger terms below it. */
export function pieces(a: GratingAperture, sinTilt: number, wavelength: number, tol = 1e-12): Piece[] {
  const N = a.count;
  const d = a.period;
  const half = (N * d) / 2;
  const extent: [number, number][] = [[-half, half]];
  const sigma = (N - 1) % 2 === 0 ? 1 : -1;
  const shift = wavelength / d;
  const p = a.profile;
  switch (p.kind) {
    case 'binary-amplitude':
      return [{ weight: [1, 0], intervals: gratingIntervals(N, p.duty * d, d), sinTilt }];
    case 'binary-phase':
      return [
        { weight: [1, 0], intervals: extent, sinTilt },
        { weight: [Math.cos(p.step) - 1, Math.sin(p.step)], intervals: gratingIntervals(N, p.duty * d, d), sinTilt },
      ];
    case 'sinusoidal-amplitude':
      return [
        { weight: [0.5, 0], intervals: extent, sinTilt },
        { weight: [(sigma * p.modulation) / 4, 0], intervals: extent, sinTilt: sinTilt + shift },
        { weight: [(sigma * p.modulation) / 4, 0], intervals: extent, sinTilt: sinTilt - shift },
      ];
    case 'sinusoidal-phase': {
      const amp = p.modulation / 2;
      const out: Piece[] = [];
      for (let q = 0; ; q++) {
        const j = besselJ(q, amp);
        if (q > amp + 2 && Math.abs(j) < tol) break;
        out.push({ weight: [j, 0], intervals: extent, sinTilt: sinTilt + q * sigma * shift });
        // J_{−q} = (−1)^q J_q
        if (q > 0) out.push({ weight: [q % 2 === 0 ? j : -j, 0], intervals: extent, sinTilt: sinTilt - q * sigma * shift });
      }
      return out;
    }
    case 'blazed': {
      const alpha = p.depth;
      const tilt = sinTilt + alpha * shift;
      if (Number.isInteger(alpha)) {
        const ph = Math.PI * alpha * N;
        return [{ weight: [Math.cos(ph), Math.sin(ph)], intervals: extent, sinTilt: tilt }];
      }
      const out: Piece[] = [];
      for (let k = 0; k < N; k++) {
        const c = (k - (N - 1) / 2) * d;
        // Reduce the phase before the cosine: πα·N − 2παk for large N and k.
        const ph = 2 * Math.PI * ((((alpha * N) / 2 - alpha * k) % 1) + 1);
        out.push({ weight: [Math.cos(ph), Math.sin(ph)], intervals: [[c - d / 2, c + d / 2]], sinTilt: tilt });
      }
      return out;
    }
  }
}

function lightOf(ill: Illumination, sinTilt: number): Light {
  return ill.kind === 'gaussian' ? { kind: 'gaussian', waist: ill.waist, sinTilt } : { kind: 'plane', sinTilt };
}

export interface GratingRefCase {
  wavelength: number;
  distance: number;
  aperture: GratingAperture;
  illumination: Illumination;
}

function problems(c: GratingRefCase): { weight: [number, number]; problem: Problem1D }[] {
  const s0 = Math.sin(c.illumination.tilt[0]);
  return pieces(c.aperture, s0, c.wavelength).map((pc) => ({
    weight: pc.weight,
    problem: { wavelength: c.wavelength, distance: c.distance, intervals: pc.intervals, light: lightOf(c.illumination, pc.sinTilt), opaque: false },
  }));
}

/** Estimated µs of the exact field at these x (stops counting past `limit`). */
export function gratingFieldCost(c: GratingRefCase, xs: ArrayLike<number>, limit = Infinity): number {
  let micros = 0;
  for (const { problem } of problems(c)) {
    micros += rs1dCost(problem, xs, limit - micros);
    if (micros > limit) return micros;
  }
  return micros;
}

/** |U|² of the exact 1-D Rayleigh–Sommerfeld field at each x (unit incident irradiance). */
export function gratingIntensity(c: GratingRefCase, xs: number[]): Float64Array {
  const re = new Float64Array(xs.length);
  const im = new Float64Array(xs.length);
  for (const { weight, problem } of problems(c)) {
    const u = rs1d(problem, xs);
    for (let i = 0; i < xs.length; i++) {
      re[i]! += weight[0] * u.re[i]! - weight[1] * u.im[i]!;
      im[i]! += weight[0] * u.im[i]! + weight[1] * u.re[i]!;
    }
  }
  const out = new Float64Array(xs.length);
  for (let i = 0; i < xs.length; i++) out[i] = re[i]! ** 2 + im[i]! ** 2;
  return out;
}
