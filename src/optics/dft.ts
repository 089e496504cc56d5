// Fourier sums evaluated at any set of frequencies (not only the FFT's), so that the direct
// Fresnel and far-field methods can put any output window at any pitch without a huge grid.
// Â(f) = Σ_m U_m e^{−i2π f ξ_m} Δξ, the sampled form of ∫U(ξ)e^{−i2πfξ}dξ.
import { axisAt, type Axis } from './field.js';

// Phasors are advanced by multiplication and re-seeded from cos/sin this often, which keeps the
// rounding drift below 1e-13 while costing one trig call per RESEED samples.
const RESEED = 64;

/** One kernel row e^{−i2π f ξ_m}, m = 0..n−1, into out (interleaved complex). */
function fillKernelRow(out: Float64Array, f: number, xi: Axis): void {
  const stepPhase = -2 * Math.PI * f * xi.step;
  const sc = Math.cos(stepPhase);
  const ss = Math.sin(stepPhase);
  let wr = 0;
  let wi = 0;
  for (let m = 0; m < xi.n; m++) {
    if (m % RESEED === 0) {
      const ph = -2 * Math.PI * f * axisAt(xi, m);
      wr = Math.cos(ph);
      wi = Math.sin(ph);
    } else {
      const t = wr * sc - wi * ss;
      wi = wr * ss + wi * sc;
      wr = t;
    }
    out[2 * m] = wr;
    out[2 * m + 1] = wi;
  }
}

/** Kernel rows e^{−i2π f_p ξ_m} for all p (rows) and m (columns), interleaved complex. */
export function dftKernel(freqs: Float64Array, xi: Axis): Float64Array {
  const n = xi.n;
  const k = new Float64Array(2 * freqs.length * n);
  for (let p = 0; p < freqs.length; p++) fillKernelRow(k.subarray(2 * p * n, 2 * (p + 1) * n), freqs[p]!, xi);
  return k;
}

/** 1-D: Â(f_p) for a vector of samples u on axis xi (one kernel row at a time: no M×N kernel). */
export function dft1(u: Float64Array, xi: Axis, freqs: Float64Array): Float64Array {
  const out = new Float64Array(2 * freqs.length);
  const [lo, hi] = nonZeroSpan(u, xi.n);
  if (lo > hi) return out;
  const sub: Axis = { n: hi - lo + 1, start: axisAt(xi, lo), step: xi.step };
  const us = u.subarray(2 * lo, 2 * (hi + 1));
  const row = new Float64Array(2 * sub.n);
  for (let p = 0; p < freqs.length; p++) {
    fillKernelRow(row, freqs[p]!, sub);
    let sr = 0;
    let si = 0;
    for (let m = 0; m < sub.n; m++) {
      const ur = us[2 * m]!;
      const ui = us[2 * m + 1]!;
      const kr = row[2 * m]!;
      const ki = row[2 * m + 1]!;
      sr += ur * kr - ui * ki;
      si += ur * ki + ui * kr;
    }
    out[2 * p] = sr * xi.step;
    out[2 * p + 1] = si * xi.step;
  }
  return out;
}

function nonZeroSpan(u: Float64Array, n: number): [number, number] {
  let lo = 0;
  while (lo < n && u[2 * lo] === 0 && u[2 * lo + 1] === 0) lo++;
  let hi = n - 1;
  while (hi >= lo && u[2 * hi] === 0 && u[2 * hi + 1] === 0) hi--;
  return [lo, hi];
}

/**
 * 2-D on a separable frequency grid: Out[q][p] = Σ_n Σ_m U[n][m] e^{−i2π(fx_p ξ_m + fy_q η_n)} ΔξΔη,
 * as two matrix products (cost ny·nx·Mx + My·ny·Mx instead of a huge zero-padded FFT).
 */
export function dft2(u: Float64Array, xi: Axis, eta: Axis, fx: Float64Array, fy: Float64Array): Float64Array {
  const nx = xi.n;
  const ny = eta.n;
  const mx = fx.length;
  const my = fy.length;
  const kx = dftKernel(fx, xi);
  const ky = dftKernel(fy, eta);
  // T[n][p] = Σ_m U[n][m] Kx[p][m]
  const t = new Float64Array(2 * ny * mx);
  const rowHasData = new Uint8Array(ny);
  for (let n = 0; n < ny; n++) {
    const ub = 2 * n * nx;
    let any = false;
    for (let m = 0; m < 2 * nx; m++) if (u[ub + m] !== 0) { any = true; break; }
    if (!any) continue;
    rowHasData[n] = 1;
    for (let p = 0; p < mx; p++) {
      let sr = 0;
      let si = 0;
      const kb = 2 * p * nx;
      for (let m = 0; m < nx; m++) {
        const ur = u[ub + 2 * m]!;
        const ui = u[ub + 2 * m + 1]!;
        const kr = kx[kb + 2 * m]!;
        const ki = kx[kb + 2 * m + 1]!;
        sr += ur * kr - ui * ki;
        si += ur * ki + ui * kr;
      }
      t[2 * (n * mx + p)] = sr;
      t[2 * (n * mx + p) + 1] = si;
    }
  }
  // Out[q][p] = Σ_n Ky[q][n] T[n][p]
  const out = new Float64Array(2 * my * mx);
  const cell = xi.step * eta.step;
  for (let q = 0; q < my; q++) {
    const ob = 2 * q * mx;
    for (let n = 0; n < ny; n++) {
      if (!rowHasData[n]) continue;
      const kr = ky[2 * (q * ny + n)]! * cell;
      const ki = ky[2 * (q * ny + n) + 1]! * cell;
      const tb = 2 * n * mx;
      for (let p = 0; p < mx; p++) {
        const tr = t[tb + 2 * p]!;
        const ti = t[tb + 2 * p + 1]!;
        out[ob + 2 * p] += kr * tr - ki * ti;
        out[ob + 2 * p + 1] += kr * ti + ki * tr;
      }
    }
  }
  return out;
}

/** 2-D at arbitrary points (fx_i, fy_i): the general, slower form for non-separable frequency sets. */
export function dft2AtPoints(
  u: Float64Array,
  xi: Axis,
  eta: Axis,
  fx: Float64Array,
  fy: Float64Array,
): Float64Array {
  const nx = xi.n;
  const ny = eta.n;
  const out = new Float64Array(2 * fx.length);
  const rows: number[] = [];
  for (let n = 0; n < ny; n++) {
    for (let m = 0; m < 2 * nx; m++) {
      if (u[2 * n * nx + m] !== 0) {
        rows.push(n);
        break;
      }
    }
  }
  const ex = new Float64Array(2 * nx);
  const cell = xi.step * eta.step;
  for (let i = 0; i < fx.length; i++) {
    fillKernelRow(ex, fx[i]!, xi);
    let sr = 0;
    let si = 0;
    for (const n of rows) {
      let rr = 0;
      let ri = 0;
      const ub = 2 * n * nx;
      for (let m = 0; m < nx; m++) {
        const ur = u[ub + 2 * m]!;
        const ui = u[ub + 2 * m + 1]!;
        const kr = ex[2 * m]!;
        const ki = ex[2 * m + 1]!;
        rr += ur * kr - ui * ki;
        ri += ur * ki + ui * kr;
      }
      const ph = -2 * Math.PI * fy[i]! * axisAt(eta, n);
      const c = Math.cos(ph);
      const s = Math.sin(ph);
      sr += rr * c - ri * s;
      si += rr * s + ri * c;
    }
    out[2 * i] = sr * cell;
    out[2 * i + 1] = si * cell;
  }
  return out;
}

/**
 * Â(f) of a 1-D source tabulated on a fine frequency grid, for evaluation at many scattered
 * frequencies. Â is band-limited in f (its "frequencies" are the positions ξ ∈ [−A, A]), so with
 * steps of 1/(32A) — a phase step of 2π/32 per entry — cubic interpolation is good to about 4e-5
 * of Σ|U| (Lagrange remainder (ωh)⁴·(9/16)/24).
 */
export interface SpectrumTable {
  start: number;
  step: number;
  values: Float64Array;
}

export function tabulateSpectrum(u: Float64Array, xi: Axis, fMin: number, fMax: number): SpectrumTable {
  const [lo, hi] = nonZeroSpan(u, xi.n);
  const reach = lo > hi ? xi.step : Math.max(Math.abs(axisAt(xi, lo)), Math.abs(axisAt(xi, hi))) + xi.step;
  const step = 1 / (32 * reach);
  const start = fMin - 2 * step;
  const n = Math.ceil((fMax - fMin) / step) + 5;
  const freqs = new Float64Array(n);
  for (let i = 0; i < n; i++) freqs[i] = start + i * step;
  return { start, step, values: dft1(u, xi, freqs) };
}

/** Cubic (4-point Lagrange) interpolation of a table at f, into out[2i], out[2i+1]. */
export function interpolateSpectrum(t: SpectrumTable, f: number, out: Float64Array, i: number): void {
  const pos = (f - t.start) / t.step;
  const k = Math.min(Math.max(1, Math.floor(pos)), t.values.length / 2 - 3);
  const s = pos - k;
  const w0 = (-s * (s - 1) * (s - 2)) / 6;
  const w1 = ((s + 1) * (s - 1) * (s - 2)) / 2;
  const w2 = (-(s + 1) * s * (s - 2)) / 2;
  const w3 = ((s + 1) * s * (s - 1)) / 6;
  const v = t.values;
  const b = 2 * (k - 1);
  out[2 * i] = w0 * v[b]! + w1 * v[b + 2]! + w2 * v[b + 4]! + w3 * v[b + 6]!;
  out[2 * i + 1] = w0 * v[b + 1]! + w1 * v[b + 3]! + w2 * v[b + 5]! + w3 * v[b + 7]!;
}
