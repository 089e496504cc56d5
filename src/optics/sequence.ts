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
import type { Engine } from './engine.js';

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
  writeChirped(w, cells, c, xc, s, nx, 0);
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

/**
 * S = V·t·e^{iπc((x − xc)² + (y − yc)²)} at the wave's samples, written into `into` (interleaved),
 * row r of the wave at `offset + r·stride` (a grid of its own, or an FFT grid it lies on).
 */
function writeChirped(w: Wave, cells: PlaneCells | null, c: number, xc: number[], into: Float64Array, stride: number, offset: number): void {
  const [xa, ya] = [w.x, w.y];
  const chirpX = chirp(xa, xc[0]!, c);
  const chirpY = chirp(ya, xc[1]!, c);
  for (let r = 0; r < ya.n; r++) {
    const cyr = chirpY[2 * r]!;
    const cyi = chirpY[2 * r + 1]!;
    const row = offset + r * stride;
    for (let q = 0; q < xa.n; q++) {
      const i = r * xa.n + q;
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
      into[2 * (row + q)] = re * kr - im * ki;
      into[2 * (row + q) + 1] = re * ki + im * kr;
    }
  }
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

/**
 * The same leg by the angular spectrum (Goodman §3.10: multiply the field's spectrum by
 * exp(i2πz√(1/λ² − fx² − fy²)), exact for the scalar field, no paraxial approximation), for gaps
 * where wide light barely spreads (a collimated beam in its near field), which the sums above
 * would need a huge grid for. Only what is left of the curvature over the lit region is sampled
 * (c = κ − 1/(λf): no propagation chirp here), and the carrier is kept out of the samples: with
 * U = S·e^{i2πh·x}, U's spectrum is S's moved by h, so S's spectrum is multiplied by the transfer
 * function at g + h and the result is again S'·e^{i2πh·x}.
 *
 * `grid` is the FFT grid, on the same lattice as the wave's axes and `out` (its step theirs, their
 * starts on its points, `out` with a whole stride); it holds both and the light's spread between,
 * so nothing wraps around into `out`. The constant e^{ikz} is left out as in propagateLeg.
 */
export function propagateLegSpectrum(w: Wave, cells: PlaneCells | null, focal: number | null, z: number, out: [Axis, Axis], grid: [Axis, Axis], engine: Engine, flat = false): Wave {
  const lam = w.wavelength;
  const c = w.curvature - (focal === null ? 0 : 1 / (lam * focal));
  const [xa, ya] = [w.x, w.y];
  const [gx, gy] = grid;
  const xc = [axisAt(xa, (xa.n - 1) / 2), axisAt(ya, (ya.n - 1) / 2)];
  const h = [w.carrier[0] + c * xc[0]!, w.carrier[1] + c * xc[1]!];
  const nx = gx.n;
  const ny = gy.n;
  const data = engine.allocate(2 * nx * ny);
  const ox = latticeOffset(gx, xa.start);
  const oy = latticeOffset(gy, ya.start);
  writeChirped(w, cells, c, xc, data, nx, oy * nx + ox);
  engine.fft2(data, nx, ny, false);
  // The transfer function at g + h, less e^{ikz}: exp(i2πz(√(1/λ² − f²) − 1/λ)), the exponent
  // written as −2πz·f²/(√(1/λ² − f²) + 1/λ) so that small f² loses nothing to cancellation; the
  // evanescent part decays as exp(−2πz√(f² − 1/λ²)).
  const fx = Float64Array.from({ length: nx }, (_, k) => (k < nx / 2 ? k : k - nx) / (nx * gx.step) + h[0]!);
  const fy = Float64Array.from({ length: ny }, (_, k) => (k < ny / 2 ? k : k - ny) / (ny * gy.step) + h[1]!);
  const inv = 1 / lam;
  const kzConst = (2 * Math.PI * z) / lam;
  for (let r = 0; r < ny; r++) {
    const fy2 = fy[r]! * fy[r]!;
    for (let q = 0; q < nx; q++) {
      const f2 = fx[q]! * fx[q]! + fy2;
      const s = inv * inv - f2;
      let amp = 1;
      let ph: number;
      if (s >= 0) ph = (-2 * Math.PI * z * f2) / (Math.sqrt(s) + inv);
      else {
        amp = Math.exp(-2 * Math.PI * z * Math.sqrt(-s));
        ph = -kzConst;
      }
      const i = 2 * (r * nx + q);
      const kr = amp * Math.cos(ph);
      const ki = amp * Math.sin(ph);
      const re = data[i]!;
      const im = data[i + 1]!;
      data[i] = re * kr - im * ki;
      data[i + 1] = re * ki + im * kr;
    }
  }
  engine.fft2(data, nx, ny, true);
  const [mx, my] = out;
  const px = latticeOffset(gx, mx.start);
  const py = latticeOffset(gy, my.start);
  const sx = Math.round(mx.step / gx.step);
  const sy = Math.round(my.step / gy.step);
  const v = new Float64Array(2 * mx.n * my.n);
  for (let r = 0; r < my.n; r++) {
    for (let q = 0; q < mx.n; q++) {
      const src = 2 * ((py + r * sy) * nx + px + q * sx);
      v[2 * (r * mx.n + q)] = data[src]!;
      v[2 * (r * mx.n + q) + 1] = data[src + 1]!;
    }
  }
  engine.release(data);
  // `flat`: handed on as computed, U' = S'·e^{i2πh·x}, where the light stayed wide and smooth.
  if (flat) return { v, x: mx, y: my, curvature: 0, carrier: [h[0]!, h[1]!], wavelength: lam };
  // Otherwise as the sums hand on theirs (curvature 1/(λz), carrier −ξc/(λz)), so that the next
  // leg's planning holds whichever form carried this one: V' = U'·e^{−iπ(x² + y²)/(λz)}·e^{i2π(ξc·x)/(λz)}.
  const curvature = 1 / (lam * z);
  const carrier: [number, number] = [-xc[0]! / (lam * z), -xc[1]! / (lam * z)];
  const fx2 = residualPhase(mx, h[0]! - carrier[0], curvature);
  const fy2 = residualPhase(my, h[1]! - carrier[1], curvature);
  for (let r = 0; r < my.n; r++) {
    for (let q = 0; q < mx.n; q++) {
      const i = 2 * (r * mx.n + q);
      const kr = fx2[2 * q]! * fy2[2 * r]! - fx2[2 * q + 1]! * fy2[2 * r + 1]!;
      const ki = fx2[2 * q]! * fy2[2 * r + 1]! + fx2[2 * q + 1]! * fy2[2 * r]!;
      const re = v[i]!;
      const im = v[i + 1]!;
      v[i] = re * kr - im * ki;
      v[i + 1] = re * ki + im * kr;
    }
  }
  return { v, x: mx, y: my, curvature, carrier, wavelength: lam };
}

/** e^{i2π·dh·x − iπκx²} at an axis's points: what turns U'/e^{i2πh'x} into V' (above). */
function residualPhase(a: Axis, dh: number, kappa: number): Float64Array {
  const out = new Float64Array(2 * a.n);
  for (let j = 0; j < a.n; j++) {
    const x = axisAt(a, j);
    const ph = 2 * Math.PI * dh * x - Math.PI * kappa * x * x;
    out[2 * j] = Math.cos(ph);
    out[2 * j + 1] = Math.sin(ph);
  }
  return out;
}

/** The index on a lattice axis of the point at `start` (which lies on it, to rounding). */
function latticeOffset(a: Axis, start: number): number {
  const j = Math.round((start - a.start) / a.step);
  if (Math.abs(start - axisAt(a, j)) > 1e-6 * a.step || j < 0 || j >= a.n) throw new Error(`internal: ${start} is not on the spectrum grid`);
  return j;
}

/** The work units of a spectrum leg on an nx × ny grid: two FFTs (costs.ts's rate) and the transfer function per point. */
export function spectrumLegWork(nx: number, ny: number): number {
  const n = nx * ny;
  return 3.3 * n * Math.log2(n) + 60 * n;
}
