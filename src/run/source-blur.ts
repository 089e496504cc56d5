// An extended incoherent source's pattern: the sum of its points' intensities. By the paraxial shift
// theorem a source point at (ξ, η) moves the pattern by −(ξ, η)·z/s, so for a uniform source the sum
// is the centre point's pattern convolved with the source's outline scaled by z/s, normalised to
// unit area (the irradiance at the aperture's centre stays 1). The map is taken as constant over
// each cell and the kernel is integrated exactly over cells (box overlaps; a disc's exact area in
// each cell, optics/mask-cells.ts), so a source smaller than a cell leaves the map as it is and no
// coarse sampling of the source shows. The window is widened by the projection's reach, where the
// computed pattern is taken as dark.
import { isOneD } from '../model/grid.js';
import { discCellFraction } from '../optics/mask-cells.js';
import { nextFastFftSize } from '../optics/fft.js';
import type { Engine } from '../optics/engine.js';
import { projectedHalfWidths, sourcePad, type CaseSource } from '../plan/curved-light.js';
import type { ComputedCase } from './compute.js';

type Extended = Extract<CaseSource, { kind: 'extended' }>;

/** Weights of a box of half width h over cells of pitch `step` at offsets −pad…pad (sum 1). */
export function boxWeights(h: number, step: number, pad: number): Float64Array {
  const w = new Float64Array(2 * pad + 1);
  if (pad === 0) return w.fill(1);
  for (let m = -pad; m <= pad; m++) {
    const a = Math.max(m * step - step / 2, -h);
    const b = Math.min(m * step + step / 2, h);
    w[m + pad] = Math.max(0, b - a) / (2 * h);
  }
  return w;
}

/** Weights of a disc of radius r over a 1-D axis (its marginal: the chord through each strip; sum 1). */
export function discMarginalWeights(r: number, step: number, pad: number): Float64Array {
  const w = new Float64Array(2 * pad + 1);
  if (pad === 0) return w.fill(1);
  for (let m = -pad; m <= pad; m++) w[m + pad] = (discCellFraction(m * step, 0, step / 2, r, r) * step * 2 * r) / (Math.PI * r * r);
  return w;
}

/** Weights of a disc of radius r over 2-D cells, row-major (2py+1)×(2px+1) (sum 1). */
export function discWeights(r: number, dx: number, dy: number, px: number, py: number): Float64Array {
  const nx = 2 * px + 1;
  const w = new Float64Array(nx * (2 * py + 1));
  if (px === 0 && py === 0) return w.fill(1);
  for (let n = -py; n <= py; n++) {
    for (let m = -px; m <= px; m++) w[(n + py) * nx + m + px] = (discCellFraction(m * dx, n * dy, dx / 2, dy / 2, r) * dx * dy) / (Math.PI * r * r);
  }
  return w;
}

/** 1-D convolution of each line (length n, stride `stride` between samples, lines `count` apart by `lineStride`). */
function convolveLines(src: Float64Array, n: number, stride: number, count: number, lineStride: number, w: Float64Array): Float64Array {
  const out = new Float64Array(src.length);
  const pad = (w.length - 1) / 2;
  for (let l = 0; l < count; l++) {
    const base = l * lineStride;
    for (let i = 0; i < n; i++) {
      let s = 0;
      const lo = Math.max(-pad, i - (n - 1));
      const hi = Math.min(pad, i);
      for (let m = lo; m <= hi; m++) s += w[m + pad]! * src[base + (i - m) * stride]!;
      out[base + i * stride] = s;
    }
  }
  return out;
}

/** Full 2-D convolution by FFT on the engine (the map already holds the zero margin). */
function convolve2D(src: Float64Array, nx: number, ny: number, w: Float64Array, px: number, py: number, engine: Engine): Float64Array {
  const Nx = nextFastFftSize(nx + 2 * px + 1);
  const Ny = nextFastFftSize(ny + 2 * py + 1);
  const a = new Float64Array(2 * Nx * Ny);
  const b = new Float64Array(2 * Nx * Ny);
  for (let r = 0; r < ny; r++) for (let c = 0; c < nx; c++) a[2 * (r * Nx + c)] = src[r * nx + c]!;
  // The kernel with its centre at index 0 (negative offsets wrapped).
  const kx = 2 * px + 1;
  for (let n = -py; n <= py; n++) {
    for (let m = -px; m <= px; m++) b[2 * (((n + Ny) % Ny) * Nx + ((m + Nx) % Nx))] = w[(n + py) * kx + m + px]!;
  }
  engine.fft2(a, Nx, Ny, false);
  engine.fft2(b, Nx, Ny, false);
  for (let i = 0; i < Nx * Ny; i++) {
    const re = a[2 * i]! * b[2 * i]! - a[2 * i + 1]! * b[2 * i + 1]!;
    const im = a[2 * i]! * b[2 * i + 1]! + a[2 * i + 1]! * b[2 * i]!;
    a[2 * i] = re;
    a[2 * i + 1] = im;
  }
  engine.fft2(a, Nx, Ny, true);
  const out = new Float64Array(nx * ny);
  // (Intensities are not negative: the transform's rounding is clipped.)
  for (let r = 0; r < ny; r++) for (let c = 0; c < nx; c++) out[r * nx + c] = Math.max(0, a[2 * (r * Nx + c)]!);
  return out;
}

/** The map convolved with the source's projection, on a window widened by its reach (sourcePad cells a side). */
export function blurBySource(map: ComputedCase, source: Extended, z: number, engine: Engine): ComputedCase {
  const oneD = isOneD(map);
  const [hx, hy] = projectedHalfWidths(source, z);
  const px = sourcePad(hx, map.dx);
  const py = oneD ? 0 : sourcePad(hy, map.dy);
  const nx = map.nx + 2 * px;
  const ny = map.ny + 2 * py;
  const padded = new Float64Array(nx * ny);
  for (let r = 0; r < map.ny; r++) padded.set(map.intensity.subarray(r * map.nx, (r + 1) * map.nx), (r + py) * nx + px);
  let intensity: Float64Array;
  if (oneD) {
    const w = source.shape === 'disc' ? discMarginalWeights(hx, map.dx, px) : boxWeights(hx, map.dx, px);
    intensity = convolveLines(padded, nx, 1, 1, nx, w);
  } else if (source.shape === 'disc') {
    intensity = convolve2D(padded, nx, ny, discWeights(hx, map.dx, map.dy, px, py), px, py, engine);
  } else {
    // A rectangle (a slit source on a 2-D aperture is refused by the planner): rows, then columns.
    const rows = convolveLines(padded, nx, 1, ny, nx, boxWeights(hx, map.dx, px));
    intensity = convolveLines(rows, ny, nx, nx, 1, boxWeights(hy, map.dy, py));
  }
  const x0 = map.x0 - px * map.dx;
  const y0 = oneD ? map.y0 : map.y0 - py * map.dy;
  return {
    ...map,
    nx,
    ny,
    x0,
    y0,
    intensity,
    center: [-x0 / map.dx, oneD ? 0 : -y0 / map.dy],
  };
}
