// Steps the propagations share: the source's axis, cutting the window out of a lattice, the power
// near the edge of a padded grid, and a tilt's carrier multiplied in.
import { centredAxis, createField, fftAxis, type Axis, type Field } from '../optics/field.js';
import { rotate } from '../optics/phase.js';
import { LIMITS } from '../plan/limits.js';
import type { AxisPlan } from '../plan/types.js';

/** The aperture-plane axis: the FFT lattice (FFT grids) or centred on the axis (direct sums). */
export function sourceAxis(a: AxisPlan, fft: boolean): Axis {
  return fft ? fftAxis(a.inputSamples, a.inputPitch) : centredAxis(a.inputSamples, a.inputPitch);
}

/**
 * Copies the samples of f that fall on the output axes (which lie on f's lattice, every k-th
 * sample where an output step is k lattice steps: a spectrum's common grid).
 */
export function cropTo(f: Field, outX: Axis, outY: Axis | null): Field {
  const out = createField(outX, outY, f.wavelength);
  const c0 = Math.round((outX.start - f.x0) / f.dx);
  const r0 = outY ? Math.round((outY.start - f.y0) / f.dy) : 0;
  const kx = Math.max(1, Math.round(outX.step / f.dx));
  const ky = outY && f.ny > 1 ? Math.max(1, Math.round(outY.step / f.dy)) : 1;
  for (let r = 0; r < out.ny; r++) {
    const src = 2 * ((r0 + r * ky) * f.nx + c0);
    if (kx === 1) {
      out.data.set(f.data.subarray(src, src + 2 * out.nx), 2 * r * out.nx);
      continue;
    }
    const dst = 2 * r * out.nx;
    for (let c = 0; c < out.nx; c++) {
      out.data[dst + 2 * c] = f.data[src + 2 * c * kx]!;
      out.data[dst + 2 * c + 1] = f.data[src + 2 * c * kx + 1]!;
    }
  }
  return out;
}

export function edgeEnergy(f: Field): number {
  const fx = Math.max(1, Math.floor(f.nx * LIMITS.edgeFrame));
  const fy = f.ny === 1 ? 0 : Math.max(1, Math.floor(f.ny * LIMITS.edgeFrame));
  let edge = 0;
  let total = 0;
  for (let r = 0; r < f.ny; r++) {
    const rowEdge = r < fy || r >= f.ny - fy;
    for (let c = 0; c < f.nx; c++) {
      const i = 2 * (r * f.nx + c);
      const p = f.data[i]! * f.data[i]! + f.data[i + 1]! * f.data[i + 1]!;
      total += p;
      if (rowEdge || c < fx || c >= f.nx - fx) edge += p;
    }
  }
  return total > 0 ? edge / total : 0;
}

export function multiplyCarrier(f: Field, carrier: [number, number]): void {
  if (carrier[0] === 0 && carrier[1] === 0) return;
  for (let r = 0; r < f.ny; r++) {
    const y = f.ny === 1 ? 0 : f.y0 + r * f.dy;
    for (let c = 0; c < f.nx; c++) {
      rotate(f.data, 2 * (r * f.nx + c), 2 * Math.PI * (carrier[0] * (f.x0 + c * f.dx) + carrier[1] * y));
    }
  }
}
