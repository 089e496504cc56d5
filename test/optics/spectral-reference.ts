// The transfer-function propagators as first written: every sample's transfer evaluated on its
// own, through a closure, with the FFT of fft.js. Kept as the reference that the faster
// src/optics/spectral.ts (mirror symmetry, per-axis tables, cached spectra) must reproduce.
import { binFrequency, fft2Reference } from '../../src/optics/fft.js';
import { createField, fftAxis, isOneD, type Field } from '../../src/optics/field.js';
import { propagationPhase, rotate } from '../../src/optics/phase.js';
import { bandLimitFrequency, cellResponse, type PixelCompensation } from '../../src/optics/spectral.js';

type Transfer = (fx: number, fy: number) => { phase: number; amp: number; kind: 0 | 1 | 2 };

function applyTransfer(f: Field, transfer: Transfer, globalPhase: number, comp: PixelCompensation | undefined) {
  const oneD = isOneD(f);
  fft2Reference(f.data, f.nx, f.ny, false);
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
  fft2Reference(f.data, f.nx, f.ny, true);
  return { bandLimitLoss: total > 0 ? cut / total : 0, evanescentLoss: total > 0 ? evan / total : 0 };
}

export function referenceAngularSpectrum(f: Field, z: number, comp?: PixelCompensation) {
  const lam = f.wavelength;
  const oneD = isOneD(f);
  const limX = bandLimitFrequency(z, lam, f.nx * f.dx);
  const limY = oneD ? Infinity : bandLimitFrequency(z, lam, f.ny * f.dy);
  const inv2 = 1 / (lam * lam);
  const kz = propagationPhase(z, lam);
  return applyTransfer(
    f,
    (fx, fy) => {
      const f2 = fx * fx + fy * fy;
      if (f2 >= inv2) return { phase: -kz, amp: Math.exp(-2 * Math.PI * z * Math.sqrt(f2 - inv2)), kind: 2 };
      if (Math.abs(fx) > limX || Math.abs(fy) > limY) return { phase: 0, amp: 0, kind: 1 };
      const phase = (-2 * Math.PI * z * lam * f2) / (1 + Math.sqrt(1 - lam * lam * f2));
      return { phase, amp: 1, kind: 0 };
    },
    kz,
    comp,
  );
}

export function referenceFresnelTransfer(f: Field, z: number, comp?: PixelCompensation) {
  const lam = f.wavelength;
  return applyTransfer(
    f,
    (fx, fy) => ({ phase: -Math.PI * lam * z * (fx * fx + fy * fy), amp: 1, kind: 0 }),
    propagationPhase(z, lam),
    comp,
  );
}

/** A disc of radius `a` (2-D) or a slit of half-width `a` (1-D) with a smooth random phase. */
export function randomPhaseSource(nx: number, ny: number, dx: number, a: number, lam: number): Field {
  const f = createField(fftAxis(nx, dx), ny > 1 ? fftAxis(ny, dx) : null, lam);
  let s = 12345;
  for (let r = 0; r < f.ny; r++) {
    for (let c = 0; c < f.nx; c++) {
      const x = f.x0 + c * dx;
      const y = ny > 1 ? f.y0 + r * dx : 0;
      if (x * x + y * y > a * a) continue;
      s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
      const ph = (s / 2 ** 32) * 0.3;
      f.data[2 * (r * f.nx + c)] = Math.cos(ph);
      f.data[2 * (r * f.nx + c) + 1] = Math.sin(ph);
    }
  }
  return f;
}

/** max |a − b| over max |a|. */
export function maxRelDiff(a: Float64Array, b: Float64Array): number {
  let peak = 0;
  let diff = 0;
  for (let i = 0; i < a.length; i++) {
    peak = Math.max(peak, Math.abs(a[i]!));
    diff = Math.max(diff, Math.abs(a[i]! - b[i]!));
  }
  return diff / peak;
}
