// Propagation by transfer functions on FFT grids: the band-limited angular spectrum (exact scalar
// propagation) and the Fresnel transfer function (paraxial). Both work in place on a field that the
// caller has already zero-padded, and report how much of the field's spectrum they had to drop.
import type { Engine } from './engine.js';
import { binFrequency, nextFastFftSize } from './fft.js';
import { createField, fftAxis, isOneD, type Field } from './field.js';
import { propagationPhase } from './phase.js';

export interface SpectralReport {
  /** Fraction of the spectral power outside the band limit (and not evanescent). */
  bandLimitLoss: number;
  /** Fraction of the spectral power in evanescent waves (|f| > 1/λ). */
  evanescentLoss: number;
  /** Band-limit frequencies [fx, fy] (1/m); Infinity where none applies. */
  bandLimit: [number, number];
}

/**
 * Places a field in the centre of a larger zero grid of nx×ny samples (ny ignored for 1-D). The
 * padded grid keeps x = 0 on index n/2, the layout the FFT-based propagators expect.
 */
export function padField(f: Field, nx: number, ny: number, engine?: Pick<Engine, 'allocate'>): Field {
  const oneD = isOneD(f);
  const xa = fftAxis(nx, f.dx);
  const ya = oneD ? null : fftAxis(ny, f.dy);
  // From the engine when the grid is to be transformed (see createField).
  const out = createField(xa, ya, f.wavelength, engine?.allocate);
  const cx = Math.round((f.x0 - xa.start) / f.dx);
  const cy = oneD ? 0 : Math.round((f.y0 - ya!.start) / f.dy);
  if (cx < 0 || cy < 0 || cx + f.nx > nx || cy + f.ny > out.ny) {
    throw new Error(`padField: a ${f.nx}×${f.ny} field does not fit in ${nx}×${out.ny}`);
  }
  for (let r = 0; r < f.ny; r++) {
    out.data.set(f.data.subarray(2 * r * f.nx, 2 * (r + 1) * f.nx), 2 * ((r + cy) * nx + cx));
  }
  // Keep the exact coordinates of the source samples (they may sit off the x = 0 lattice by design).
  out.x0 = f.x0 - cx * f.dx;
  out.y0 = oneD ? 0 : f.y0 - cy * f.dy;
  return out;
}

/** Matsushima & Shimobaba, Opt. Express 17, 19662 (2009): |f| < 1/(λ√((2Δf·z)²+1)), Δf = 1/L. */
export function bandLimitFrequency(z: number, wavelength: number, gridWidth: number): number {
  const df = 1 / gridWidth;
  return 1 / (wavelength * Math.sqrt((2 * df * z) ** 2 + 1));
}

/**
 * The spectrum of an area-sampled mask is the aperture's spectrum times the cell's response
 * sinc(fΔx)·sinc(fΔy) (plus aliases): its samples are the aperture blurred by one cell. Dividing
 * the response out restores the aperture's own spectrum inside the band, which removes a
 * one-cell blur of the result. The carrier of a tilted beam shifts the mask spectrum, hence f − f₀.
 */
export interface PixelCompensation {
  carrier: [number, number];
}

/** sinc(f·d), limited to the Nyquist band's edge value so that it never divides by ~0. */
export function cellResponse(f: number, d: number): number {
  const u = Math.min(Math.abs(f * d), 0.5);
  return u < 1e-8 ? 1 : Math.sin(Math.PI * u) / (Math.PI * u);
}

/**
 * What multiplies the spectrum: the exact angular-spectrum factor with its band limit, the paraxial
 * Fresnel factor, or nothing (only the cell-response division). All depend on fx² + fy² alone.
 */
export type TransferSpec =
  | { kind: 'angular-spectrum'; z: number; wavelength: number; limit: [number, number] }
  | { kind: 'fresnel'; z: number; wavelength: number }
  | { kind: 'identity' };

/** The band-limited angular-spectrum transfer over z for a grid of this size and pitch. */
export function angularSpectrumTransfer(f: Field, z: number): TransferSpec {
  const lam = f.wavelength;
  const limX = bandLimitFrequency(z, lam, f.nx * f.dx);
  const limY = isOneD(f) ? Infinity : bandLimitFrequency(z, lam, f.ny * f.dy);
  return { kind: 'angular-spectrum', z, wavelength: lam, limit: [limX, limY] };
}

/**
 * A padded source's forward transform, kept so that the same source can be propagated to several
 * distances for one inverse transform each. `totalPower` is Σ|F|², which the loss fractions need.
 */
export interface SourceSpectrum {
  data: Float64Array;
  totalPower: number;
}

/** Transforms a (padded) field to its spectrum in place and returns Σ|F|². */
export function toSpectrum(engine: Engine, f: Field): number {
  engine.fft2(f.data, f.nx, f.ny, false);
  const d = f.data;
  let total = 0;
  for (let i = 0; i < d.length; i += 2) total += d[i]! * d[i]! + d[i + 1]! * d[i + 1]!;
  return total;
}

/** Per-axis tables: bin frequencies and the cell responses (about the carrier) they are divided by. */
function axisTables(n: number, d: number, carrier: number | null): { f: Float64Array; cell: Float64Array } {
  const f = new Float64Array(n);
  const cell = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    f[k] = binFrequency(k, n, d);
    cell[k] = carrier === null ? 1 : cellResponse(f[k]! - carrier, d);
  }
  return { f, cell };
}

/**
 * The transfer for one row of the spectrum at frequency fy, for columns 0..m (m = ⌊nx/2⌋: the other
 * columns mirror these, since binFrequency(nx−k) = −binFrequency(k) exactly), as the rotation
 * cos/sin of the total phase, the amplitude and the kind (0 passed, 1 cut by the band limit,
 * 2 evanescent).
 */
function rowTransfer(
  spec: TransferSpec,
  fy: number,
  fx: Float64Array,
  m: number,
  globalPhase: number,
  cos: Float64Array,
  sin: Float64Array,
  amp: Float64Array,
  kind: Uint8Array,
): void {
  if (spec.kind === 'identity') {
    for (let c = 0; c <= m; c++) {
      cos[c] = Math.cos(globalPhase);
      sin[c] = Math.sin(globalPhase);
      amp[c] = 1;
      kind[c] = 0;
    }
    return;
  }
  const lam = spec.wavelength;
  const z = spec.z;
  if (spec.kind === 'fresnel') {
    for (let c = 0; c <= m; c++) {
      const phase = -Math.PI * lam * z * (fx[c]! * fx[c]! + fy * fy);
      cos[c] = Math.cos(phase + globalPhase);
      sin[c] = Math.sin(phase + globalPhase);
      amp[c] = 1;
      kind[c] = 0;
    }
    return;
  }
  const inv2 = 1 / (lam * lam);
  const [limX, limY] = spec.limit;
  const rowCut = Math.abs(fy) > limY;
  for (let c = 0; c <= m; c++) {
    const f2 = fx[c]! * fx[c]! + fy * fy;
    if (f2 >= inv2) {
      // Evanescent: a pure decay exp(−2πz√(f²−1/λ²)), without the common e^{ikz}.
      cos[c] = 1;
      sin[c] = 0;
      amp[c] = Math.exp(-2 * Math.PI * z * Math.sqrt(f2 - inv2));
      kind[c] = 2;
    } else if (rowCut || Math.abs(fx[c]!) > limX) {
      cos[c] = 1;
      sin[c] = 0;
      amp[c] = 0;
      kind[c] = 1;
    } else {
      // 2πz(√(1/λ²−f²) − 1/λ) in a form without cancellation.
      const phase = (-2 * Math.PI * z * lam * f2) / (1 + Math.sqrt(1 - lam * lam * f2));
      cos[c] = Math.cos(phase + globalPhase);
      sin[c] = Math.sin(phase + globalPhase);
      amp[c] = 1;
      kind[c] = 0;
    }
  }
}

/**
 * Multiplies a field's spectrum (in place) by the transfer and the common phase, dividing out the
 * cell response when asked, and sums the power it cuts and finds evanescent. `spectrum` is read
 * and f.data written (the same array, or a kept source spectrum with no copy made).
 *
 * The transfer depends on |fx| and |fy| only, so it is evaluated on one quadrant (a quarter of the
 * square roots and sines) and applied to all four; the cell response is a product of per-axis
 * factors, so a row pair's multiplier is made once and the inner loop is a plain complex multiply.
 * Without evanescent bins the band limit is a rectangle: rows beyond it are zeroed without being
 * read, columns beyond it likewise, and the cut power is the total less what passes.
 */
function multiplyTransfer(
  f: Field,
  spec: TransferSpec,
  globalPhase: number,
  comp: PixelCompensation | undefined,
  spectrum: Float64Array,
  total: number,
): { cut: number; evan: number } {
  const oneD = isOneD(f);
  const { nx, ny } = f;
  const X = axisTables(nx, f.dx, comp ? comp.carrier[0] : null);
  const Y = oneD ? { f: new Float64Array(1), cell: new Float64Array([1]) } : axisTables(ny, f.dy, comp ? comp.carrier[1] : null);
  const m = nx >> 1;
  const cos = new Float64Array(m + 1);
  const sin = new Float64Array(m + 1);
  const amp = new Float64Array(m + 1);
  const kind = new Uint8Array(m + 1);
  // The row pair's multiplier before the row's own cell factor: amp·e^{iφ}/cell_x, per column.
  const mr = new Float64Array(nx);
  const mi = new Float64Array(nx);
  const src = spectrum;
  const d = f.data;
  const half = oneD ? 0 : ny >> 1;
  const fNyq2 = (0.5 / f.dx) ** 2 + (oneD ? 0 : (0.5 / f.dy) ** 2);
  const evanescent = spec.kind === 'angular-spectrum' && fNyq2 * spec.wavelength * spec.wavelength >= 1;
  const limX = spec.kind === 'angular-spectrum' ? spec.limit[0] : Infinity;
  const limY = spec.kind === 'angular-spectrum' ? spec.limit[1] : Infinity;
  // Columns 0..a and nx−a..nx−1 pass the band limit (the same in every row when nothing is evanescent).
  let a = 0;
  while (a < m && Math.abs(X.f[a + 1]!) <= limX) a++;
  const passAll = a === m && Math.abs(X.f[m]!) <= limX;
  let cut = 0;
  let evan = 0;
  let passed = 0;
  let anyCut = !passAll;
  for (let q = 0; q <= half; q++) {
    // Rows q and ny − q see the same transfer (fy² equal); row 0 and, for an even ny, row ny/2
    // have no mirror (for an odd ny, row ⌊ny/2⌋ has ⌊ny/2⌋ + 1).
    const rows = oneD || q === 0 || 2 * q === ny ? 1 : 2;
    if (!evanescent && Math.abs(Y.f[q]!) > limY) {
      anyCut = true;
      for (let k = 0; k < rows; k++) {
        const r = k === 0 ? q : ny - q;
        d.fill(0, 2 * r * nx, 2 * (r + 1) * nx);
      }
      continue;
    }
    rowTransfer(spec, Y.f[q]!, X.f, m, globalPhase, cos, sin, amp, kind);
    for (let c = 0; c < nx; c++) {
      const j = c <= m ? c : nx - c;
      const s = amp[j]! / X.cell[c]!;
      mr[c] = s * cos[j]!;
      mi[c] = s * sin[j]!;
    }
    for (let k = 0; k < rows; k++) {
      const r = k === 0 ? q : ny - q;
      const iy = 1 / Y.cell[r]!;
      const base = 2 * r * nx;
      if (evanescent) {
        for (let c = 0; c < nx; c++) {
          const kd = kind[c <= m ? c : nx - c]!;
          if (kd === 0) continue;
          const i = base + 2 * c;
          const p = src[i]! * src[i]! + src[i + 1]! * src[i + 1]!;
          if (kd === 1) cut += p;
          else evan += p;
        }
        multiplyRange(src, d, mr, mi, iy, base, 0, nx);
      } else if (passAll) {
        passed += multiplyRange(src, d, mr, mi, iy, base, 0, nx);
      } else {
        passed += multiplyRange(src, d, mr, mi, iy, base, 0, a + 1);
        passed += multiplyRange(src, d, mr, mi, iy, base, nx - a, nx);
        d.fill(0, base + 2 * (a + 1), base + 2 * (nx - a));
      }
    }
  }
  if (!evanescent && anyCut) cut = Math.max(0, total - passed);
  return { cut, evan };
}

/** d = src·(mr + i·mi)·iy over columns c0..c1 of the row at `base`; returns Σ|src|² there. */
function multiplyRange(
  src: Float64Array,
  d: Float64Array,
  mr: Float64Array,
  mi: Float64Array,
  iy: number,
  base: number,
  c0: number,
  c1: number,
): number {
  let p = 0;
  for (let c = c0, i = base + 2 * c0; c < c1; c++, i += 2) {
    const re = src[i]!;
    const im = src[i + 1]!;
    p += re * re + im * im;
    const cr = mr[c]! * iy;
    const sn = mi[c]! * iy;
    d[i] = re * cr - im * sn;
    d[i + 1] = re * sn + im * cr;
  }
  return p;
}

/**
 * Propagates by a transfer function, in place: f holds the padded source on entry and the
 * propagated field on return. With `cached`, f's entry contents are ignored and the source's
 * kept spectrum is used instead (one inverse transform, no forward one).
 */
export function propagateByTransfer(
  engine: Engine,
  f: Field,
  spec: TransferSpec,
  comp?: PixelCompensation,
  cached?: SourceSpectrum,
): SpectralReport {
  const total = cached ? cached.totalPower : toSpectrum(engine, f);
  const globalPhase = spec.kind === 'identity' ? 0 : propagationPhase(spec.z, spec.wavelength);
  const { cut, evan } = multiplyTransfer(f, spec, globalPhase, comp, cached ? cached.data : f.data, total);
  engine.fft2(f.data, f.nx, f.ny, true);
  return {
    bandLimitLoss: total > 0 ? cut / total : 0,
    evanescentLoss: total > 0 ? evan / total : 0,
    bandLimit: spec.kind === 'angular-spectrum' ? spec.limit : [Infinity, Infinity],
  };
}

/** Band-limited angular spectrum propagation over z, in place. */
export function propagateAngularSpectrum(engine: Engine, f: Field, z: number, comp?: PixelCompensation, cached?: SourceSpectrum): SpectralReport {
  return propagateByTransfer(engine, f, angularSpectrumTransfer(f, z), comp, cached);
}

/** Fresnel transfer function H = e^{ikz}·exp(−iπλz(fx²+fy²)), in place (paraxial). */
export function propagateFresnelTransfer(engine: Engine, f: Field, z: number, comp?: PixelCompensation, cached?: SourceSpectrum): SpectralReport {
  return propagateByTransfer(engine, f, { kind: 'fresnel', z, wavelength: f.wavelength }, comp, cached);
}

/**
 * Removes the cell response from an area-sampled source (no carrier) in place, for methods that do
 * not pass through its spectrum otherwise. The field's grid should leave a few cells of margin
 * around the aperture for the (short) ringing of the correction.
 */
export function compensateCellResponse(engine: Engine, f: Field): void {
  // Twice the field (against wrap-around of the correction's ringing), to the next FFT size.
  const nx = nextFastFftSize(2 * f.nx);
  const ny = isOneD(f) ? 1 : nextFastFftSize(2 * f.ny);
  const padded = padField(f, nx, ny, engine);
  propagateByTransfer(engine, padded, { kind: 'identity' }, { carrier: [0, 0] });
  const c0 = Math.round((f.x0 - padded.x0) / f.dx);
  const r0 = isOneD(f) ? 0 : Math.round((f.y0 - padded.y0) / f.dy);
  for (let r = 0; r < f.ny; r++) {
    const src = 2 * ((r + r0) * nx + c0);
    f.data.set(padded.data.subarray(src, src + 2 * f.nx), 2 * r * f.nx);
  }
}
