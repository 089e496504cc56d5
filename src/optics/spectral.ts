// Propagation by transfer functions on FFT grids: the band-limited angular spectrum (exact scalar
// propagation) and the Fresnel transfer function (paraxial). Both work in place on a field that the
// caller has already zero-padded, and report how much of the field's spectrum they had to drop.
import { binFrequency, fft2, nextPowerOfTwo } from './fft.js';
import { createField, fftAxis, isOneD, type Field } from './field.js';
import { propagationPhase, rotate } from './phase.js';

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
export function padField(f: Field, nx: number, ny: number): Field {
  const oneD = isOneD(f);
  const xa = fftAxis(nx, f.dx);
  const ya = oneD ? null : fftAxis(ny, f.dy);
  const out = createField(xa, ya, f.wavelength);
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

/** kind: 0 passed, 1 cut by the band limit, 2 evanescent. phase excludes the common e^{ikz}. */
type Transfer = (fx: number, fy: number) => { phase: number; amp: number; kind: 0 | 1 | 2 };

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

function applyTransfer(
  f: Field,
  transfer: Transfer,
  globalPhase: number,
  comp: PixelCompensation | undefined,
): SpectralReport {
  const oneD = isOneD(f);
  fft2(f.data, f.nx, f.ny, false);
  let total = 0;
  let cut = 0;
  let evan = 0;
  const d = f.data;
  for (let r = 0; r < f.ny; r++) {
    const fy = oneD ? 0 : binFrequency(r, f.ny, f.dy);
    for (let c = 0; c < f.nx; c++) {
      const fx = binFrequency(c, f.nx, f.dx);
      const i = 2 * (r * f.nx + c);
      const p = d[i]! * d[i]! + d[i + 1]! * d[i + 1]!;
      total += p;
      const t = transfer(fx, fy);
      if (t.kind === 1) cut += p;
      else if (t.kind === 2) evan += p;
      if (t.amp === 0) {
        d[i] = 0;
        d[i + 1] = 0;
      } else {
        const cell = comp
          ? cellResponse(fx - comp.carrier[0], f.dx) * (oneD ? 1 : cellResponse(fy - comp.carrier[1], f.dy))
          : 1;
        rotate(d, i, t.phase + globalPhase, t.amp / cell);
      }
    }
  }
  fft2(f.data, f.nx, f.ny, true);
  return {
    bandLimitLoss: total > 0 ? cut / total : 0,
    evanescentLoss: total > 0 ? evan / total : 0,
    bandLimit: [Infinity, Infinity],
  };
}

/** Band-limited angular spectrum propagation over z, in place. */
export function propagateAngularSpectrum(f: Field, z: number, comp?: PixelCompensation): SpectralReport {
  const lam = f.wavelength;
  const oneD = isOneD(f);
  const limX = bandLimitFrequency(z, lam, f.nx * f.dx);
  const limY = oneD ? Infinity : bandLimitFrequency(z, lam, f.ny * f.dy);
  const inv2 = 1 / (lam * lam);
  const kz = propagationPhase(z, lam);
  const report = applyTransfer(
    f,
    (fx, fy) => {
      const f2 = fx * fx + fy * fy;
      if (f2 >= inv2) {
        // Evanescent: a pure decay exp(−2πz√(f²−1/λ²)), so the common e^{ikz} is undone here.
        return { phase: -kz, amp: Math.exp(-2 * Math.PI * z * Math.sqrt(f2 - inv2)), kind: 2 };
      }
      if (Math.abs(fx) > limX || Math.abs(fy) > limY) return { phase: 0, amp: 0, kind: 1 };
      // 2πz(√(1/λ²−f²) − 1/λ) in a form without cancellation.
      const phase = (-2 * Math.PI * z * lam * f2) / (1 + Math.sqrt(1 - lam * lam * f2));
      return { phase, amp: 1, kind: 0 };
    },
    kz,
    comp,
  );
  report.bandLimit = [limX, limY];
  return report;
}

/** Fresnel transfer function H = e^{ikz}·exp(−iπλz(fx²+fy²)), in place (paraxial). */
export function propagateFresnelTransfer(f: Field, z: number, comp?: PixelCompensation): SpectralReport {
  const lam = f.wavelength;
  return applyTransfer(
    f,
    (fx, fy) => ({ phase: -Math.PI * lam * z * (fx * fx + fy * fy), amp: 1, kind: 0 }),
    propagationPhase(z, lam),
    comp,
  );
}

/**
 * Removes the cell response from an area-sampled source (no carrier) in place, for methods that do
 * not pass through its spectrum otherwise. The field's grid should leave a few cells of margin
 * around the aperture for the (short) ringing of the correction.
 */
export function compensateCellResponse(f: Field): void {
  const nx = nextPowerOfTwo(2 * f.nx);
  const ny = isOneD(f) ? 1 : nextPowerOfTwo(2 * f.ny);
  const padded = padField(f, nx, ny);
  applyTransfer(padded, () => ({ phase: 0, amp: 1, kind: 0 }), 0, { carrier: [0, 0] });
  const c0 = Math.round((f.x0 - padded.x0) / f.dx);
  const r0 = isOneD(f) ? 0 : Math.round((f.y0 - padded.y0) / f.dy);
  for (let r = 0; r < f.ny; r++) {
    const src = 2 * ((r + r0) * nx + c0);
    f.data.set(padded.data.subarray(src, src + 2 * f.nx), 2 * r * f.nx);
  }
}
