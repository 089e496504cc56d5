// A thin grating's period as a far-field source, and the power it passes per cell: what the order
// checks and the source need beyond the order amplitudes of grating-profile.ts. Conventions are
// that file's: period k centred on c_k = (k − (count−1)/2)·d, T(s) written about the period's centre.
import { besselJnSignificant } from './bessel-jn.js';
import { axisAt, type Axis } from './field.js';
import { sinc } from './grating.js';
import type { GratingProfile } from './grating-profile.js';

/**
 * The transform of one period about its centre, T̂(f) = ∫_{−d/2}^{d/2} T(s)·e^{−i2πfs} ds (re, im),
 * at any spatial frequency f (1/m); at f = q/d it is d·c_q. Closed forms (Goodman, Introduction to
 * Fourier Optics, §4.4 and ch. 7 for the sinusoidal and blazed profiles; the binary ones are rect
 * pairs): the sinusoidal phase by its Jacobi–Anger series, Σ J_q(m/2)·d·sinc(fd − q).
 */
export function periodTransform(p: GratingProfile, d: number, f: number): [number, number] {
  return periodTransformer(p, d)(f);
}

/**
 * periodTransform as a function of f alone, with what does not depend on f (the sinusoidal phase's
 * Bessel coefficients) computed once: for callers that evaluate it at many frequencies.
 */
export function periodTransformer(p: GratingProfile, d: number): (f: number) => [number, number] {
  if (p.kind === 'sinusoidal-phase') {
    const j = besselJnSignificant(p.modulation / 2, 1e-17);
    return (f) => {
      const u = f * d;
      let re = 0;
      for (let q = -(j.length - 1); q < j.length; q++) {
        const jq = q < 0 && (-q) % 2 === 1 ? -j[-q]! : j[Math.abs(q)]!;
        re += jq * sinc(u - q);
      }
      // exp(i a sin θ) = Σ J_q(a) e^{iqθ}: real coefficients, so the transform is real.
      return [d * re, 0];
    };
  }
  return (f) => closedTransform(p, d, f);
}

function closedTransform(p: Exclude<GratingProfile, { kind: 'sinusoidal-phase' }>, d: number, f: number): [number, number] {
  const u = f * d;
  switch (p.kind) {
    case 'binary-amplitude': {
      const w = p.duty * d;
      return [w * sinc(f * w), 0];
    }
    case 'binary-phase': {
      const w = p.duty * d;
      const s = w * sinc(f * w);
      return [d * sinc(u) + (Math.cos(p.step) - 1) * s, Math.sin(p.step) * s];
    }
    case 'sinusoidal-amplitude':
      return [d * (0.5 * sinc(u) + (p.modulation / 4) * (sinc(u - 1) + sinc(u + 1))), 0];
    case 'blazed': {
      const a = p.depth;
      const s = d * sinc(a - u);
      return [s * Math.cos(Math.PI * a), s * Math.sin(Math.PI * a)];
    }
  }
}

/**
 * Cell averages of |T|² over a finite grating (count periods centred on 0, nothing outside): the
 * power weight of each sample of a complex source. Phase profiles pass all the light (|T| = 1 on
 * the grating); the binary amplitude profile is its own square; the sinusoidal amplitude one is
 * ¼ + m²/8 + (m/2)·cos + (m²/8)·cos(2·), and each harmonic cos(2πk(x − c_j)/d) is one function over
 * the whole grating, (−1)^{k(count−1)}·cos(2πkx/d), so its average over a cell is a closed form.
 */
export function gratingPowerAverages(p: GratingProfile, d: number, count: number, axis: Axis, binaryAverages?: Float64Array): Float64Array {
  const out = new Float64Array(axis.n);
  const half = (count * d) / 2;
  const h = axis.step / 2;
  for (let j = 0; j < axis.n; j++) {
    const x = axisAt(axis, j);
    const x0 = Math.max(x - h, -half);
    const x1 = Math.min(x + h, half);
    if (!(x1 > x0)) continue;
    const frac = (x1 - x0) / axis.step;
    switch (p.kind) {
      case 'binary-amplitude':
        out[j] = binaryAverages ? binaryAverages[2 * j]! : NaN;
        break;
      case 'sinusoidal-amplitude': {
        const m = p.modulation;
        const harmonic = (k: number) => {
          const sign = (k * (count - 1)) % 2 === 0 ? 1 : -1;
          const w = (2 * Math.PI * k) / d;
          return (sign * (Math.sin(w * x1) - Math.sin(w * x0))) / w / axis.step;
        };
        out[j] = (0.25 + (m * m) / 8) * frac + (m / 2) * harmonic(1) + ((m * m) / 8) * harmonic(2);
        break;
      }
      default:
        out[j] = frac;
    }
  }
  return out;
}
