// The Fresnel integral's single-transform form evaluated with one FFT: the output falls on the
// FFT's own lattice, pitch λz/(NΔx), over the alias period λz/Δx. Cheaper than direct sums when
// both the aperture and the window have many samples.
import type { Engine } from './engine.js';
import { createField, fftAxis, isOneD, type Axis, type Field } from './field.js';
import { applyFresnelFactor, withInputChirp } from './direct.js';

/**
 * Output lattice of the single-FFT form for an FFT of n samples per axis at aperture pitch dx:
 * x_k = (k − n/2)·λz/(n·dx).
 */
export function singleFftAxis(n: number, dx: number, wavelength: number, z: number): Axis {
  return fftAxis(n, (wavelength * z) / (n * dx));
}

/**
 * U(x) = e^{ikz}/(iλz) e^{iπx²/λz} Σ U₀(ξ) e^{iπξ²/λz} e^{−i2πxξ/λz} Δξ², with x on the FFT lattice
 * (Goodman, Introduction to Fourier Optics, eq. 4-17; Voelz, Computational Fourier Optics, §5.3).
 * src must lie on an FFT grid of n×n (n×1 in 1-D) samples with x = 0 at index n/2, and carry any
 * tilt carrier already. Returns the full lattice; the caller cuts out its window.
 *
 * `focal`: the source is a thin lens's pupil without the lens phase e^{−iπξ²/(λf)} (Goodman §5.1),
 * which is folded into the input chirp analytically: U₀e^{−iπξ²/(λf)}e^{iπξ²/(λz)} =
 * U₀e^{iπξ²(1/z − 1/f)/λ}. At z = f this is a pure Fourier transform, x = λf·f_x (Goodman §5.2).
 */
export function propagateFresnelSingleFFT(engine: Engine, src: Field, z: number, focal?: number): Field {
  const lam = src.wavelength;
  const oneD = isOneD(src);
  const f = createField(
    singleFftAxis(src.nx, src.dx, lam, z),
    oneD ? null : singleFftAxis(src.ny, src.dy, lam, z),
    lam,
  );
  // Input chirp, then move the sample at x = 0 to index 0 (and back after the transform) so that the
  // FFT's phase reference is the optical axis.
  const u = withInputChirp(src, z, engine.allocate, focal);
  shiftHalf(u, src.nx, src.ny);
  engine.fft2(u, src.nx, src.ny, false);
  shiftHalf(u, src.nx, src.ny);
  f.data.set(u);
  applyFresnelFactor(f, z, oneD ? src.dx : src.dx * src.dy);
  return f;
}

/** Swaps the halves of each axis (even sizes), so that index n/2 and index 0 trade places. */
function shiftHalf(d: Float64Array, nx: number, ny: number): void {
  const hx = nx / 2;
  const tmp = new Float64Array(2 * nx);
  const rotateRow = (row: number) => {
    const base = 2 * row * nx;
    tmp.set(d.subarray(base, base + 2 * nx));
    d.set(tmp.subarray(2 * hx), base);
    d.set(tmp.subarray(0, 2 * hx), base + 2 * (nx - hx));
  };
  if (ny === 1) {
    rotateRow(0);
    return;
  }
  const hy = ny / 2;
  for (let r = 0; r < hy; r++) {
    rotateRow(r);
    rotateRow(r + hy);
    const b1 = 2 * r * nx;
    const b2 = 2 * (r + hy) * nx;
    tmp.set(d.subarray(b1, b1 + 2 * nx));
    d.copyWithin(b1, b2, b2 + 2 * nx);
    d.set(tmp, b2);
  }
}
