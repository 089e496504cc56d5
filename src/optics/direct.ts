// Propagators that evaluate the diffraction integral directly onto a chosen output grid:
// the Fresnel integral (single-transform form, paraxial) and the far-field formula.
import { dft1, dft2, dft2AtPoints, interpolateSpectrum, tabulateSpectrum } from './dft.js';
import type { Engine } from './engine.js';
import { axisAt, createField, isOneD, multiplyComplex, xAxisOf, yAxisOf, type Allocate, type Axis, type Field } from './field.js';
import { propagationPhase, rotate } from './phase.js';
import { cellResponse } from './spectral.js';
import { hankel1Into } from './hankel.js';
import { farFieldByTable } from './spectrum-table.js';

function axisValues(a: Axis, scale: number, offset: number): Float64Array {
  const v = new Float64Array(a.n);
  for (let j = 0; j < a.n; j++) v[j] = axisAt(a, j) * scale + offset;
  return v;
}

/**
 * Fresnel integral in its single-transform form (Goodman, Introduction to Fourier Optics, eq. 4-17):
 * U(x,y) = e^{ikz}/(iλz) e^{iπ(x²+y²)/λz} ∬ U₀ e^{iπ(ξ²+η²)/λz} e^{−i2π(xξ+yη)/λz} dξdη,
 * evaluated at any output axes. For 1-D fields the prefactor is e^{ikz}/√(iλz).
 * carrier = [α/λ, β/λ]: a tilt that the source does not contain, applied as a frequency shift.
 */
export function propagateFresnelDirect(
  src: Field,
  z: number,
  outX: Axis,
  outY: Axis | null,
  carrier: [number, number] = [0, 0],
): Field {
  const lam = src.wavelength;
  const oneD = isOneD(src);
  const u = withInputChirp(src, z);
  const fx = axisValues(outX, 1 / (lam * z), -carrier[0]);
  const out = createField(outX, oneD ? null : outY, lam);
  if (oneD) {
    out.data.set(dft1(u, xAxisOf(src), fx));
  } else {
    if (!outY) throw new Error('a 2-D field needs a y output axis');
    const fy = axisValues(outY, 1 / (lam * z), -carrier[1]);
    out.data.set(dft2(u, xAxisOf(src), yAxisOf(src)!, fx, fy));
  }
  applyFresnelFactor(out, z, 1);
  return out;
}

/**
 * A copy of the source samples times the Fresnel integral's input chirp e^{iπ(ξ²+η²)/λz}. With a
 * thin lens of focal length `focal` folded in (its phase e^{−iπ(ξ²+η²)/(λf)} left out of the
 * samples), the residual chirp e^{iπ(ξ²+η²)(1/z − 1/f)/λ}: none at all in the focal plane.
 */
export function withInputChirp(src: Field, z: number, allocate: Allocate = (values) => new Float64Array(values), focal?: number): Float64Array {
  const chirp = focal === undefined ? Math.PI / (src.wavelength * z) : (Math.PI * (1 / z - 1 / focal)) / src.wavelength;
  // The single-FFT form transforms this copy, and passes its engine's allocate: an FFT team can
  // share it only in shared memory.
  const u = allocate(src.data.length);
  u.set(src.data);
  for (let r = 0; r < src.ny; r++) {
    const y = src.y0 + r * src.dy;
    for (let c = 0; c < src.nx; c++) {
      const x = src.x0 + c * src.dx;
      rotate(u, 2 * (r * src.nx + c), chirp * (x * x + y * y));
    }
  }
  return u;
}

/**
 * Multiplies a computed Fresnel sum by its prefactor e^{ikz}/(iλz)·e^{iπ(x²+y²)/λz} (1-D:
 * e^{ikz}/√(iλz)·e^{iπx²/λz}), times scale (the cell measure when the sum did not include it).
 */
export function applyFresnelFactor(out: Field, z: number, scale: number): void {
  const lam = out.wavelength;
  const oneD = isOneD(out);
  const chirp = Math.PI / (lam * z);
  const kz = propagationPhase(z, lam);
  const amp = scale * (oneD ? 1 / Math.sqrt(lam * z) : 1 / (lam * z));
  const iPhase = oneD ? -Math.PI / 4 : -Math.PI / 2; // 1/√i or 1/i
  for (let r = 0; r < out.ny; r++) {
    const y = oneD ? 0 : out.y0 + r * out.dy;
    for (let c = 0; c < out.nx; c++) {
      const x = out.x0 + c * out.dx;
      rotate(out.data, 2 * (r * out.nx + c), kz + iPhase + chirp * (x * x + y * y), amp);
    }
  }
}

export interface FarFieldOptions {
  /**
   * Largest phase error (rad) that evaluating the spectrum at x/(λz) instead of x/(λr) may cause
   * across the aperture; below it the separable fast path is taken. Default 1e-4.
   */
  mappingTolerance?: number;
  /**
   * The source is rotationally symmetric (a centred round aperture in an untilted, centred beam):
   * its spectrum depends on |f| only, so it is tabulated along one radius and interpolated.
   */
  radial?: boolean;
  /**
   * Where the fast path does not hold, sum over every source sample for every output point instead
   * of tabulating the spectrum (spectrum-table.ts) and interpolating: the independent reference the
   * table is tested against. Slow: O(samples × points).
   */
  pointByPoint?: boolean;
}

/**
 * Far-field (Fraunhofer) formula in direction cosines, from the Rayleigh–Sommerfeld integral with
 * r ≫ aperture (Goodman, Introduction to Fourier Optics, §4.2–4.3 with the obliquity kept):
 * U(x,y) = (z/r) e^{ikr}/(iλr) · Â(x/(λr) − α/λ, y/(λr) − β/λ),  r = √(x²+y²+z²).
 * Non-paraxial in the observation angle; it neglects only the aperture's own quadratic phase
 * (π N_F). For 1-D fields the prefactor is (z/r) e^{ikr}/√(iλr).
 */
export function propagateFarField(
  engine: Engine,
  src: Field,
  z: number,
  outX: Axis,
  outY: Axis | null,
  carrier: [number, number] = [0, 0],
  opts: FarFieldOptions = {},
): Field {
  const lam = src.wavelength;
  const oneD = isOneD(src);
  const out = createField(outX, oneD ? null : outY, lam);
  if (oneD) {
    const fx = new Float64Array(outX.n);
    for (let c = 0; c < outX.n; c++) {
      const x = axisAt(outX, c);
      fx[c] = x / (lam * Math.hypot(x, z)) - carrier[0];
    }
    out.data.set(dft1(src.data, xAxisOf(src), fx));
    divideCellResponse(out.data, fx, null, src.dx, 0);
  } else {
    if (!outY) throw new Error('a 2-D field needs a y output axis');
    const tol = opts.mappingTolerance ?? 1e-4;
    if (opts.radial && carrier[0] === 0 && carrier[1] === 0) out.data.set(radialFarFieldSpectrum(src, z, outX, outY));
    else if (opts.pointByPoint || mappingError(sourceHalf(src), z, outX, outY, lam) <= tol) out.data.set(farFieldSpectrum2D(src, z, outX, outY, carrier, tol));
    // Wide windows: the spectrum tabulated once (FFT or chirp-z) and interpolated at each point,
    // within a stated bound of 5e-5 of the peak (spectrum-table.ts), instead of a sum per point.
    else return farFieldByTable(engine, src, z, outX, outY, carrier);
  }
  applyFarFieldFactor(out, z);
  return out;
}

/** Largest |x/(λr) − x/(λz)| over the window, times 2π·(half extent): the fast path's phase error. */
export function mappingError(halfExtent: [number, number], z: number, outX: Axis, outY: Axis | null, lam: number) {
  const xs = [axisAt(outX, 0), axisAt(outX, outX.n - 1)];
  const ys = outY ? [axisAt(outY, 0), axisAt(outY, outY.n - 1)] : [0];
  let worst = 0;
  for (const x of xs) {
    for (const y of ys) {
      const r = Math.sqrt(x * x + y * y + z * z);
      const dfx = Math.abs(x) * (1 / z - 1 / r) / lam;
      const dfy = Math.abs(y) * (1 / z - 1 / r) / lam;
      worst = Math.max(worst, 2 * Math.PI * (halfExtent[0] * dfx + halfExtent[1] * dfy));
    }
  }
  return worst;
}

/**
 * Â(|f|) of a rotationally symmetric source: computed along the fx axis (fy = 0) on a fine radial
 * grid — steps of 1/(32R), R the source's reach, as in tabulateSpectrum — with the cell response
 * divided out there, then interpolated (cubic) at each output point's |f| = ρ/(λr). The cost is
 * N²·T for T table entries instead of N²·M² point by point.
 */
function radialFarFieldSpectrum(src: Field, z: number, outX: Axis, outY: Axis): Float64Array {
  const lam = src.wavelength;
  const xi = xAxisOf(src);
  const eta = yAxisOf(src)!;
  const reach = Math.max(Math.abs(xi.start), Math.abs(axisAt(xi, xi.n - 1)), Math.abs(eta.start), Math.abs(axisAt(eta, eta.n - 1))) + xi.step;
  let fMax = 0;
  for (const x of [axisAt(outX, 0), axisAt(outX, outX.n - 1)]) {
    for (const y of [axisAt(outY, 0), axisAt(outY, outY.n - 1)]) {
      const r = Math.sqrt(x * x + y * y + z * z);
      fMax = Math.max(fMax, Math.sqrt(x * x + y * y) / (lam * r));
    }
  }
  const step = 1 / (32 * reach);
  const n = Math.ceil(fMax / step) + 4;
  const freqs = new Float64Array(n + 1);
  for (let i = 0; i <= n; i++) freqs[i] = (i - 1) * step; // one entry below 0 for the interpolation
  const line = dft2(src.data, xi, eta, freqs, new Float64Array([0]));
  for (let i = 0; i <= n; i++) {
    const g = 1 / cellResponse(freqs[i]!, xi.step);
    line[2 * i] = line[2 * i]! * g;
    line[2 * i + 1] = line[2 * i + 1]! * g;
  }
  const table = { start: -step, step, values: line };
  const out = new Float64Array(2 * outX.n * outY.n);
  // The value depends on x² + y² only: on a window mirrored about the axis the mirror rows and
  // columns copy the first of each pair (see applyPlaneFactor for what rounding that moves).
  const nx = outX.n;
  const colSum = mirrorIndexSum(nx, outX.start, outX.step);
  const rowSum = mirrorIndexSum(outY.n, outY.start, outY.step);
  for (let r = 0; r < outY.n; r++) {
    const rm = earlierMirror(rowSum, r);
    if (rm >= 0) {
      out.copyWithin(2 * r * nx, 2 * rm * nx, 2 * (rm + 1) * nx);
      continue;
    }
    const y = axisAt(outY, r);
    for (let c = 0; c < nx; c++) {
      const cm = earlierMirror(colSum, c);
      const i = r * nx + c;
      if (cm >= 0) {
        out[2 * i] = out[2 * (i - c + cm)]!;
        out[2 * i + 1] = out[2 * (i - c + cm) + 1]!;
        continue;
      }
      const x = axisAt(outX, c);
      const rr = Math.sqrt(x * x + y * y + z * z);
      interpolateSpectrum(table, Math.sqrt(x * x + y * y) / (lam * rr), out, i);
    }
  }
  return out;
}

function farFieldSpectrum2D(
  src: Field,
  z: number,
  outX: Axis,
  outY: Axis,
  carrier: [number, number],
  tol: number,
): Float64Array {
  const lam = src.wavelength;
  const xi = xAxisOf(src);
  const eta = yAxisOf(src)!;
  if (mappingError(sourceHalf(src), z, outX, outY, lam) <= tol) {
    const fxs = axisValues(outX, 1 / (lam * z), -carrier[0]);
    const fys = axisValues(outY, 1 / (lam * z), -carrier[1]);
    const out = dft2(src.data, xi, eta, fxs, fys);
    const gx = new Float64Array(outX.n);
    for (let c = 0; c < outX.n; c++) gx[c] = 1 / cellResponse(fxs[c]!, xi.step);
    for (let r = 0; r < outY.n; r++) {
      const gy = 1 / cellResponse(fys[r]!, eta.step);
      for (let c = 0; c < outX.n; c++) {
        const i = 2 * (r * outX.n + c);
        out[i] = out[i]! * gx[c]! * gy;
        out[i + 1] = out[i + 1]! * gx[c]! * gy;
      }
    }
    return out;
  }
  // A source that is real and mirror-symmetric in x and y (a round aperture in an untilted beam)
  // has a real, mirror-symmetric spectrum: on a window symmetric about the axis one quadrant is
  // computed and mirrored, a quarter of the work.
  const sym = carrier[0] === 0 && carrier[1] === 0 && isMirrorSymmetric(src) && isSymmetricAxis(outX) && isSymmetricAxis(outY);
  const cols = sym ? (outX.n + 1) / 2 : outX.n;
  const rows = sym ? (outY.n + 1) / 2 : outY.n;
  const [fx, fy] = directionFrequencies(outX, outY, rows, cols, z, lam, carrier);
  const part = dft2AtPoints(src.data, xi, eta, fx, fy);
  divideCellResponse(part, fx, fy, xi.step, eta.step);
  if (!sym) return part;
  const out = new Float64Array(2 * outX.n * outY.n);
  for (let r = 0; r < outY.n; r++) {
    const rq = Math.min(r, outY.n - 1 - r);
    for (let c = 0; c < outX.n; c++) {
      const cq = Math.min(c, outX.n - 1 - c);
      out[2 * (r * outX.n + c)] = part[2 * (rq * cols + cq)]!;
      out[2 * (r * outX.n + c) + 1] = part[2 * (rq * cols + cq) + 1]!;
    }
  }
  return out;
}

/** Half extents of a source grid about the axis. */
function sourceHalf(src: Field): [number, number] {
  const xi = xAxisOf(src);
  const eta = yAxisOf(src)!;
  return [Math.max(Math.abs(xi.start), Math.abs(axisAt(xi, xi.n - 1))), Math.max(Math.abs(eta.start), Math.abs(axisAt(eta, eta.n - 1)))];
}

function isSymmetricAxis(a: Axis): boolean {
  return a.n % 2 === 1 && Math.abs(a.start + ((a.n - 1) / 2) * a.step) <= 1e-12 * Math.abs(a.step);
}

/**
 * Real samples with U(−ξ, η) = U(ξ, η) = U(ξ, −η) on a grid centred on the axis, to rounding
 * (mirror cells' open fractions are computed from mirrored coordinates and may differ in the
 * last bits; mirroring then changes the result by as little).
 */
function isMirrorSymmetric(f: Field): boolean {
  if (!isSymmetricAxis(xAxisOf(f)) || !isSymmetricAxis(yAxisOf(f)!)) return false;
  const d = f.data;
  let peak = 0;
  for (let i = 0; i < d.length; i += 2) peak = Math.max(peak, Math.abs(d[i]!));
  const tol = 1e-12 * peak;
  for (let r = 0; r < f.ny; r++) {
    for (let c = 0; c < f.nx; c++) {
      const i = 2 * (r * f.nx + c);
      const v = d[i]!;
      if (Math.abs(d[i + 1]!) > tol) return false;
      if (Math.abs(v - d[2 * (r * f.nx + (f.nx - 1 - c))]!) > tol || Math.abs(v - d[2 * ((f.ny - 1 - r) * f.nx + c)]!) > tol) return false;
    }
  }
  return true;
}

/**
 * Spatial frequencies (α/λ − carrier) seen from the first rows×cols output points: the direction
 * cosines x/r, y/r over λ, row-major.
 */
function directionFrequencies(
  outX: Axis,
  outY: Axis,
  rows: number,
  cols: number,
  z: number,
  lam: number,
  carrier: [number, number],
): [Float64Array, Float64Array] {
  const fx = new Float64Array(rows * cols);
  const fy = new Float64Array(rows * cols);
  for (let r = 0; r < rows; r++) {
    const y = axisAt(outY, r);
    for (let c = 0; c < cols; c++) {
      const x = axisAt(outX, c);
      const rr = Math.sqrt(x * x + y * y + z * z);
      fx[r * cols + c] = x / (lam * rr) - carrier[0];
      fy[r * cols + c] = y / (lam * rr) - carrier[1];
    }
  }
  return [fx, fy];
}

/**
 * Area-sampled masks carry the cell response sinc(fΔ) in their spectrum (see spectral.ts);
 * dividing it out at the evaluated frequencies gives the aperture's own spectrum.
 */
function divideCellResponse(spec: Float64Array, fx: Float64Array, fy: Float64Array | null, dx: number, dy: number): void {
  for (let i = 0; i < fx.length; i++) {
    const g = 1 / (cellResponse(fx[i]!, dx) * (fy ? cellResponse(fy[i]!, dy) : 1));
    spec[2 * i] = spec[2 * i]! * g;
    spec[2 * i + 1] = spec[2 * i + 1]! * g;
  }
}

/**
 * Multiplies a computed spectrum by the far-field prefactor with the exact kernel, so that only the
 * aperture's own quadratic phase is neglected, not the kernel's near-zone terms. 3-D: the kernel
 * (1/2π)(z/r)(1/r − ik)e^{ikr}/r = (z/r)·e^{ikr}/(iλr)·(1 + i/(kr)). 1-D: (ikz/(2r))·H₁⁽¹⁾(kr), whose
 * large-kr form is (z/r)·e^{ikr}/√(iλr) (Goodman §3.5; the 2-D Green's function). The corrections
 * are 1/(kr) relative: a few per cent a few wavelengths from the aperture, nothing far away.
 */
export function applyFarFieldFactor(out: Field, z: number): void {
  if (isOneD(out)) applyLineFactor(out, z);
  else applyPlaneFactor(out, z);
}

/** applyFarFieldFactor on a line (1-D): the Hankel function near the aperture, its large-kr form beyond. */
function applyLineFactor(out: Field, z: number): void {
  const lam = out.wavelength;
  const k = (2 * Math.PI) / lam;
  const h = new Float64Array(2);
  for (let c = 0; c < out.nx; c++) {
    const x = out.x0 + c * out.dx;
    const rr = Math.sqrt(x * x + z * z);
    const i = 2 * c;
    if (k * rr < NEAR_KERNEL_KR) {
      // (ikz/2r)·H₁: multiply by i·(kz/2r)·(H_re + i·H_im).
      hankel1Into(k * rr, h, 0);
      const s = (k * z) / (2 * rr);
      const re = out.data[i]!;
      const im = out.data[i + 1]!;
      const kr = -s * h[1]!;
      const ki = s * h[0]!;
      out.data[i] = re * kr - im * ki;
      out.data[i + 1] = re * ki + im * kr;
    } else {
      rotate(out.data, i, propagationPhase(rr, lam) - Math.PI / 4, (z / rr) / Math.sqrt(lam * rr));
    }
  }
}

/**
 * applyFarFieldFactor on a plane: (z/r)·e^{ikr}/(iλr)·(1 + i/(kr)) = s·(1 + iq)·(sin θ − i cos θ)
 * with s = z/(λr²), q = 1/(kr), θ = kr reduced (propagationPhase): one sine and one cosine a
 * point. The factor depends on x² and y² only, so where the window is mirrored about the axis
 * (x(c′) = −x(c) to a few ulps, as in a window centred on it) the mirror column and row take the
 * factor computed for the first of the pair: a quarter of the trigonometry on a centred window,
 * which was most of the small far-field case's propagation. The mirror's own x may differ from −x
 * by rounding (at most 4ε × the window's width) and its r then by an ulp or so: the phase moves by
 * about k·r·ε (1e-8 rad at metres), as much as the rounding of r already leaves in kr, and the
 * modulus by a relative 1e-16 (test/optics/far-field-factor.test.ts holds every point to 8·k·r·ε
 * of the kernel written out).
 */
function applyPlaneFactor(out: Field, z: number): void {
  const lam = out.wavelength;
  const k = (2 * Math.PI) / lam;
  const { nx, ny, data } = out;
  const colSum = mirrorIndexSum(nx, out.x0, out.dx);
  const rowSum = mirrorIndexSum(ny, out.y0, out.dy);
  // The factor along the row being done (re, im interleaved), for it and its mirror row.
  const f = new Float64Array(2 * nx);
  const z2 = z * z;
  for (let r = 0; r < ny; r++) {
    if (earlierMirror(rowSum, r) >= 0) continue; // done with its mirror
    const y = out.y0 + r * out.dy;
    const y2 = y * y;
    for (let c = 0; c < nx; c++) {
      const cm = earlierMirror(colSum, c);
      if (cm >= 0) {
        f[2 * c] = f[2 * cm]!;
        f[2 * c + 1] = f[2 * cm + 1]!;
        continue;
      }
      const x = out.x0 + c * out.dx;
      const rr = Math.sqrt(x * x + y2 + z2);
      const q = 1 / (k * rr);
      const s = (z / rr) / (lam * rr);
      const theta = propagationPhase(rr, lam);
      const sn = Math.sin(theta);
      const cs = Math.cos(theta);
      f[2 * c] = s * (sn + q * cs);
      f[2 * c + 1] = s * (q * sn - cs);
    }
    multiplyComplex(data, r * nx, f, nx);
    const later = rowSum === null ? -1 : rowSum - r;
    if (later > r && later < ny) multiplyComplex(data, later * nx, f, nx);
  }
}

/** The mirror of sample i when it comes before i (index sum `sum`, mirrorIndexSum), else −1. */
function earlierMirror(sum: number | null, i: number): number {
  const m = sum === null ? -1 : sum - i;
  return m >= 0 && m < i ? m : -1;
}

/**
 * The index sum c + c′ of the samples x0 + c·d mirrored about 0 (x(c′) = −x(c)), when −2·x0/d is a
 * whole number to a few ulps; null when the axis is not a mirror line of the samples.
 */
export function mirrorIndexSum(n: number, x0: number, d: number): number | null {
  if (n < 2 || !(d > 0)) return null;
  const m = (-2 * x0) / d;
  const whole = Math.round(m);
  return Math.abs(m - whole) <= 4 * Number.EPSILON * Math.max(1, Math.abs(m)) ? whole : null;
}

/**
 * Beyond this kr the 1-D kernel's asymptotic form (z/r)e^{ikr}/√(iλr) is within 3/(8kr) < 4e-6 of
 * H₁; the phase is then taken from r/λ reduced exactly (propagationPhase), which keeps every digit
 * at distances of metres.
 */
const NEAR_KERNEL_KR = 1e5;

/**
 * Far field of a separable source U₀(ξ,η) = ux(ξ)·uy(η): Â = Âx·Ây, each evaluated at the point's
 * own direction cosine. Each factor is tabulated once on a fine frequency grid and interpolated
 * (see tabulateSpectrum), so the exact non-paraxial mapping costs O(M²) after O((Mx+My)·N).
 */
export function propagateFarFieldSeparable(
  ux: Field,
  uy: Field,
  z: number,
  outX: Axis,
  outY: Axis,
  carrier: [number, number] = [0, 0],
): Field {
  const lam = ux.wavelength;
  const out = createField(outX, outY, lam);
  const n = outX.n;
  const m = outY.n;
  const [fx, fy] = directionFrequencies(outX, outY, m, n, z, lam, carrier);
  const range = (f: Float64Array) => f.reduce(([lo, hi], v) => [Math.min(lo, v), Math.max(hi, v)], [Infinity, -Infinity]);
  const [x0, x1] = range(fx);
  const [y0, y1] = range(fy);
  const tx = tabulateSpectrum(ux.data, xAxisOf(ux), x0, x1);
  const ty = tabulateSpectrum(uy.data, xAxisOf(uy), y0, y1);
  const ax = new Float64Array(2);
  const ay = new Float64Array(2);
  for (let i = 0; i < n * m; i++) {
    interpolateSpectrum(tx, fx[i]!, ax, 0);
    interpolateSpectrum(ty, fy[i]!, ay, 0);
    const g = 1 / (cellResponse(fx[i]!, ux.dx) * cellResponse(fy[i]!, uy.dx));
    out.data[2 * i] = g * (ax[0]! * ay[0]! - ax[1]! * ay[1]!);
    out.data[2 * i + 1] = g * (ax[0]! * ay[1]! + ax[1]! * ay[0]!);
  }
  applyFarFieldFactor(out, z);
  return out;
}
