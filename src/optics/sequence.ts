// Light carried from plane to plane by the Fresnel integral (Goodman, Introduction to Fourier
// Optics, §4.2), each plane's field held as a smooth sampled envelope times a quadratic and a
// linear phase known in closed form:
//
//   U(x, y) = V(x, y) · exp(iπκ(x² + y²)) · exp(i2π(βx·x + βy·y)).
//
// Behind a plane at distance z the Fresnel integral is
//   U'(x) = (1/(iλz)) e^{iπx²/(λz)} ∫ U(ξ) t(ξ) e^{−iπξ²/(λf)} e^{iπξ²/(λz)} e^{−i2πxξ/(λz)} dξ
// (t the element's transmittance without a lens's phase, f its focal length, 1/f = 0 for any other
// element; the constant e^{ikz} is left out), so the new field is again of that form with
// κ' = 1/(λz), and V' a finite Fourier sum of the samples evaluated at the next window's own points
// (separable, two matrix products). The curvatures — a lens's, the propagation's — never need to be
// sampled: only what is left of them over the lit region does (c below). This is what makes a lens
// followed by a pinhole at its focus cheap: at the focus V is the pupil's Fourier transform.
//
// With ξ = ξc + u about the lit region's centre, e^{iπcξ²} = e^{iπcξc²} e^{i2πcξc·u} e^{iπcu²}: the
// linear part joins the carrier (h below) and only e^{iπcu²} is sampled.
import type { Axis } from './field.js';
import { axisAt } from './field.js';
import { dft2 } from './dft.js';

/** One plane's field: V on its grid (row-major [y][x], interleaved re, im), and its analytic phases. */
export interface Wave {
  v: Float64Array;
  x: Axis;
  y: Axis;
  /** κ (1/m²): the quadratic phase's coefficient, exp(iπκr²). */
  curvature: number;
  /** βx, βy (1/m): the linear phase's frequencies. */
  carrier: [number, number];
  wavelength: number;
}

/** Cell averages of an element's transmittance on a wave's grid (lens phase excluded) and of |t|². */
export interface PlaneCells {
  t: Float64Array;
  weight: Float64Array;
}

/** Σ |V|²·(cell average of |t|²)·ΔxΔy: the power the element passes (all of V's without an element). */
export function passedPower(w: Wave, cells: PlaneCells | null): number {
  let p = 0;
  const v = w.v;
  const n = w.x.n * w.y.n;
  for (let i = 0; i < n; i++) {
    const a = v[2 * i]! * v[2 * i]! + v[2 * i + 1]! * v[2 * i + 1]!;
    p += cells ? a * cells.weight[i]! : a;
  }
  return p * Math.abs(w.x.step * w.y.step);
}

/**
 * The wave behind a plane (transmittance `cells`, lens of focal length `focal` or null) carried a
 * distance z and evaluated on the axes `out`. Work: about nx·ny·mx + ny·mx·my complex products.
 */
export function propagateLeg(w: Wave, cells: PlaneCells | null, focal: number | null, z: number, out: [Axis, Axis]): Wave {
  const lam = w.wavelength;
  const c = w.curvature + (1 / z - (focal === null ? 0 : 1 / focal)) / lam;
  const [xa, ya] = [w.x, w.y];
  const xc = [axisAt(xa, (xa.n - 1) / 2), axisAt(ya, (ya.n - 1) / 2)];
  const h = [w.carrier[0] + c * xc[0]!, w.carrier[1] + c * xc[1]!];
  // S(u) = V·t·e^{iπc(u² + v²)}, u measured from the lit region's centre.
  const nx = xa.n;
  const ny = ya.n;
  const s = new Float64Array(2 * nx * ny);
  const chirpX = chirp(xa, xc[0]!, c);
  const chirpY = chirp(ya, xc[1]!, c);
  for (let r = 0; r < ny; r++) {
    const cyr = chirpY[2 * r]!;
    const cyi = chirpY[2 * r + 1]!;
    for (let q = 0; q < nx; q++) {
      const i = r * nx + q;
      let re = w.v[2 * i]!;
      let im = w.v[2 * i + 1]!;
      if (cells) {
        const tr = cells.t[2 * i]!;
        const ti = cells.t[2 * i + 1]!;
        const a = re * tr - im * ti;
        im = re * ti + im * tr;
        re = a;
      }
      if (re === 0 && im === 0) continue;
      // × chirpX[q] × chirpY[r]
      const kr = chirpX[2 * q]! * cyr - chirpX[2 * q + 1]! * cyi;
      const ki = chirpX[2 * q]! * cyi + chirpX[2 * q + 1]! * cyr;
      s[2 * i] = re * kr - im * ki;
      s[2 * i + 1] = re * ki + im * kr;
    }
  }
  // V'(x, y) = (1/(iλz)) Σ S(u, v) e^{−i2π((x/(λz) − hx)u + (y/(λz) − hy)v)} ΔuΔv: the Fourier sums of
  // dft.ts at those frequencies, with u, v from the lit region's centre. e^{iπcξc²} (the chirp's
  // constant part, per axis) is a phase common to the whole plane and left out with e^{ikz}.
  const [mxA, myA] = out;
  const freqs = (a: Axis, hh: number) => Float64Array.from({ length: a.n }, (_, m) => axisAt(a, m) / (lam * z) - hh);
  const v = dft2(s, { ...xa, start: xa.start - xc[0]! }, { ...ya, start: ya.start - xc[1]! }, freqs(mxA, h[0]!), freqs(myA, h[1]!));
  // × 1/(iλz) = −i/(λz).
  const scale = 1 / (lam * z);
  for (let i = 0; i < mxA.n * myA.n; i++) {
    const re = v[2 * i]!;
    v[2 * i] = v[2 * i + 1]! * scale;
    v[2 * i + 1] = -re * scale;
  }
  // The sum's e^{−i2πx·ξc/(λz)} is the new linear phase.
  return { v, x: mxA, y: myA, curvature: 1 / (lam * z), carrier: [-xc[0]! / (lam * z), -xc[1]! / (lam * z)], wavelength: lam };
}

/** e^{iπc(ξ − ξc)²} at an axis's samples. */
function chirp(a: Axis, centre: number, c: number): Float64Array {
  const out = new Float64Array(2 * a.n);
  for (let j = 0; j < a.n; j++) {
    const u = axisAt(a, j) - centre;
    const ph = Math.PI * c * u * u;
    out[2 * j] = Math.cos(ph);
    out[2 * j + 1] = Math.sin(ph);
  }
  return out;
}

/** The work units (8 per complex product, as LIMITS.workPerSecond counts them) of one leg. */
export function legWork(nx: number, ny: number, mx: number, my: number): number {
  // The two matrix products, the chirp over the samples, the two kernels.
  return 8 * (nx * ny * mx + ny * mx * my + nx * ny + mx * nx + my * ny);
}
