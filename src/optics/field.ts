// The one complex-field type of the program: a grid (model/grid.ts: row-major [y][x], sample
// (row, col) at (x0 + col·dx, y0 + row·dy); 1-D, invariant along y, is ny = 1, dy = 0) with its
// samples interleaved (re, im).
import { cellMeasure, isOneD, type Grid } from '../model/grid.js';
import type { IntensityMap } from '../model/intensity-map.js';

export { cellMeasure, isOneD } from '../model/grid.js';

export interface Field extends Grid {
  data: Float64Array;
  wavelength: number;
}

/** A regular set of sample positions along one axis: x_j = start + j·step, j = 0..n-1. */
export interface Axis {
  n: number;
  start: number;
  step: number;
}

export function axisAt(a: Axis, j: number): number {
  return a.start + j * a.step;
}

/** n samples at pitch step, placed symmetrically about centre. */
export function centredAxis(n: number, step: number, centre = 0): Axis {
  return { n, start: centre - ((n - 1) / 2) * step, step };
}

/** The sample layout of FFT grids: x = 0 falls on index n/2. */
export function fftAxis(n: number, step: number): Axis {
  return { n, start: -Math.floor(n / 2) * step, step };
}

/** Where a field's samples come from (an engine's allocate); a plain zeroed array by default. */
export type Allocate = (values: number) => Float64Array;

const plainArray: Allocate = (values) => new Float64Array(values);

/**
 * A zeroed field on these axes. Arrays an engine will transform come from its `allocate` (while
 * threads share transforms they must live in shared memory; sweeps reuse a pooled grid).
 */
export function createField(xAxis: Axis, yAxis: Axis | null, wavelength: number, allocate: Allocate = plainArray): Field {
  const ny = yAxis ? yAxis.n : 1;
  return {
    data: allocate(2 * xAxis.n * ny),
    nx: xAxis.n,
    ny,
    dx: xAxis.step,
    dy: yAxis ? yAxis.step : 0,
    x0: xAxis.start,
    y0: yAxis ? yAxis.start : 0,
    wavelength,
  };
}

export function xAxisOf(f: Field): Axis {
  return { n: f.nx, start: f.x0, step: f.dx };
}

export function yAxisOf(f: Field): Axis | null {
  return isOneD(f) ? null : { n: f.ny, start: f.y0, step: f.dy };
}

/** |U|² per sample: intensity relative to the incident irradiance when the input was scaled so. */
export function intensityOf(f: Field): Float64Array {
  const n = f.nx * f.ny;
  const out = new Float64Array(n);
  const d = f.data;
  for (let i = 0; i < n; i++) {
    const re = d[2 * i]!;
    const im = d[2 * i + 1]!;
    out[i] = re * re + im * im;
  }
  return out;
}

/** The field's intensity map: its grid and |U|² (intensityOf). */
export function intensityMapOf(f: Field): IntensityMap {
  return { nx: f.nx, ny: f.ny, dx: f.dx, dy: f.dy, x0: f.x0, y0: f.y0, intensity: intensityOf(f) };
}

/** ∫|U|² over the sampled region (power per unit length for 1-D fields). */
export function powerOf(f: Field): number {
  const d = f.data;
  let s = 0;
  for (let i = 0; i < d.length; i++) s += d[i]! * d[i]!;
  return s * cellMeasure(f);
}

/** Multiplies the n complex samples of data from sample `at` on by f's, one by one: data[at + j] ·= f[j]. */
export function multiplyComplex(data: Float64Array, at: number, f: Float64Array, n: number): void {
  for (let j = 0; j < n; j++) {
    const i = 2 * (at + j);
    const re = data[i]!;
    const im = data[i + 1]!;
    const fr = f[2 * j]!;
    const fi = f[2 * j + 1]!;
    data[i] = re * fr - im * fi;
    data[i + 1] = re * fi + im * fr;
  }
}

/** Multiplies every sample by exp(iφ)·scale. */
export function scaleField(f: Field, scale: number, phase = 0): void {
  const c = scale * Math.cos(phase);
  const s = scale * Math.sin(phase);
  const d = f.data;
  for (let i = 0; i < d.length; i += 2) {
    const re = d[i]!;
    const im = d[i + 1]!;
    d[i] = re * c - im * s;
    d[i + 1] = re * s + im * c;
  }
}
