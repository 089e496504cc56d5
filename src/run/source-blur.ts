// An extended incoherent source's pattern: the sum of its points' intensities. By the paraxial shift
// theorem a source point at (ξ, η) moves the pattern by −(ξ, η)·z/s, so for a uniform source the sum
// is the centre point's pattern convolved with the source's outline scaled by z/s, normalised to
// unit area (the irradiance at the aperture's centre stays 1).
//
// The convolution is made in the Fourier domain with the outline's exact transform (a box's
// sinc(2hf), a disc's 2J₁(2πρf)/(2πρf); Goodman, Introduction to Fourier Optics, §2.2 table), not
// with weights over cells: the planner samples the intensity above its Nyquist rate (it warns
// output-undersampled where it cannot), so the map stands for a band-limited function, and the
// product of its spectrum with the outline's transform is that function's convolution, sampled.
// Weights integrated over cells treat the map as constant within each cell instead, which dulls
// fringes 8 samples apart by about 2 % of their contrast (measured on the two-slit test); here
// nothing of the source is sampled at all. The window is widened by the projection's reach, where
// the computed pattern is taken as dark.
import besselj1 from '@stdlib/math-base-special-besselj1';
import { isOneD } from '../model/grid.js';
import { nextFastFftSize } from '../optics/fft.js';
import type { Engine } from '../optics/engine.js';
import { pointShifts, projectedHalfWidths, sourcePad, type CaseSource } from '../plan/curved-light.js';
import type { ComputedCase } from './compute.js';

type Extended = Extract<CaseSource, { kind: 'extended' | 'points' }>;

/** A box of half width h, unit area: its transform sin(2πhf)/(2πhf). */
export function boxTransform(h: number, f: number): number {
  const x = 2 * Math.PI * h * f;
  return x === 0 ? 1 : Math.sin(x) / x;
}

/** A disc of radius r, unit area: its transform 2J₁(2πrf)/(2πrf), f the radial frequency. */
export function discTransform(r: number, f: number): number {
  const x = 2 * Math.PI * r * f;
  return Math.abs(x) < 1e-8 ? 1 : (2 * besselj1(x)) / x;
}

/** The DFT's frequencies (1/m) for n samples at pitch d, in the transform's order. */
function frequencies(n: number, d: number): Float64Array {
  const f = new Float64Array(n);
  for (let k = 0; k < n; k++) f[k] = (k < n / 2 ? k : k - n) / (n * d);
  return f;
}

/**
 * The map convolved with the source's projection, on a window widened by its reach (sourcePad cells
 * a side). Mutually incoherent points are a kernel of weighted shifts, Σ wⱼ·δ(x − Δⱼ), whose
 * transform Σ wⱼ·e^{−2πi f·Δⱼ} moves the band-limited map by any fraction of a cell exactly.
 */
export function blurBySource(map: ComputedCase, source: Extended, z: number, engine: Engine): ComputedCase {
  const oneD = isOneD(map);
  const [hx, hy] = projectedHalfWidths(source, z);
  const px = sourcePad(hx, map.dx);
  const py = oneD ? 0 : sourcePad(hy, map.dy);
  const nx = map.nx + 2 * px;
  const ny = map.ny + 2 * py;
  // The FFT grid holds the widened window whole, so that the kernel's reach wraps into zeros only.
  const Nx = nextFastFftSize(nx);
  const Ny = oneD ? 1 : nextFastFftSize(ny);
  const a = engine.allocate(2 * Nx * Ny);
  a.fill(0);
  for (let r = 0; r < map.ny; r++) {
    for (let c = 0; c < map.nx; c++) a[2 * ((r + py) * Nx + c + px)] = map.intensity[r * map.nx + c]!;
  }
  engine.fft2(a, Nx, Ny, false);
  const fx = frequencies(Nx, map.dx);
  const fy = oneD ? new Float64Array(1) : frequencies(Ny, map.dy);
  const bx = new Float64Array(Nx);
  const by = new Float64Array(Ny);
  if (source.kind === 'points') {
    const shifts = pointShifts(source, z);
    for (let r = 0; r < Ny; r++) {
      for (let c = 0; c < Nx; c++) {
        let kr = 0;
        let ki = 0;
        for (const p of shifts) {
          // The forward transform is Σ a·e^{−2πi kn/N} (fft.ts), so a move by Δ multiplies bin f by e^{−2πi f·Δ}.
          const ph = -2 * Math.PI * (fx[c]! * p.shift[0] + (oneD ? 0 : fy[r]! * p.shift[1]));
          kr += p.weight * Math.cos(ph);
          ki += p.weight * Math.sin(ph);
        }
        const i = 2 * (r * Nx + c);
        const re = a[i]!;
        const im = a[i + 1]!;
        a[i] = re * kr - im * ki;
        a[i + 1] = re * ki + im * kr;
      }
    }
  } else if (source.shape !== 'disc' || oneD) {
    // A disc's marginal along x (a 1-D map) has the disc's transform on the fx axis.
    for (let k = 0; k < Nx; k++) bx[k] = source.shape === 'disc' ? discTransform(hx, fx[k]!) : boxTransform(hx, fx[k]!);
    for (let k = 0; k < Ny; k++) by[k] = oneD ? 1 : boxTransform(hy, fy[k]!);
  }
  if (source.kind === 'extended') for (let r = 0; r < Ny; r++) {
    for (let c = 0; c < Nx; c++) {
      const k = source.shape === 'disc' && !oneD ? discTransform(hx, Math.hypot(fx[c]!, fy[r]!)) : bx[c]! * by[r]!;
      const i = 2 * (r * Nx + c);
      a[i]! *= k;
      a[i + 1]! *= k;
    }
  }
  engine.fft2(a, Nx, Ny, true);
  const intensity = new Float64Array(nx * ny);
  // (Intensities are not negative: rounding and the band-limited kernel's faint ripple are clipped.)
  for (let r = 0; r < ny; r++) for (let c = 0; c < nx; c++) intensity[r * nx + c] = Math.max(0, a[2 * (r * Nx + c)]!);
  engine.release(a);
  const x0 = map.x0 - px * map.dx;
  const y0 = oneD ? map.y0 : map.y0 - py * map.dy;
  return { ...map, nx, ny, x0, y0, intensity, center: [-x0 / map.dx, oneD ? 0 : -y0 / map.dy] };
}
