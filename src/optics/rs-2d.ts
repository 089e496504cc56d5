// The first Rayleigh–Sommerfeld integral in 3-D (a 2-D aperture), evaluated directly:
// U(x,y,z) = ∬ U₀(ξ,η)·h(x−ξ, y−η) dξdη, h = (1/2π)·(z/r)·(1/r − ik)·e^{ikr}/r,
// r = √(Δx² + Δy² + z²) (Goodman, Introduction to Fourier Optics, §3.5).
// Each source sample is a cell of the grid (dx × dy); over it the carrier's phase slope minus the
// kernel's is integrated exactly and the rest of the kernel to second order (rs-moments.ts), as in
// the 1-D sums.
//
// Superseded for new work by rs-2d-cells.ts + rs-2d-sum.ts (rsCells2DFromAperture, rsSum2D): the
// same kernel integral over cells whose edges are exact instead of area-sampled, so that the pitch
// is set by the kernel's curvature (rs-2d-rule.ts) rather than by 0.032λ/sin θ, with a radial path
// for round sources. This function stays for area-sampled sources given as a Field (its tests:
// rayleigh-sommerfeld-2d.test.ts).
import { axisAt, createField, isOneD, type Axis, type Field } from './field.js';
import { sincMoments } from './rs-moments.js';

const TWO_PI = 2 * Math.PI;

/**
 * The field of an area-sampled source (src.data: open fraction × envelope, no carrier) at the
 * points outX × outY, distance z. slope = k·[sin θx, sin θy] of the carrier e^{i(slope·ξ)}, which
 * is applied analytically per cell. Zero cells are skipped.
 *
 * About a cell centre (offsets u, w; Δ = output − centre) the kernel's logarithm is ψ(r), with
 * ψ′ = −2/r − 1/(r(1+(kr)²)) + i·k(kr)²/(1+(kr)²) (the phase of 1/r − ik included) and
 * ψ″ = 2/r² + (1+3(kr)²)/(r²(1+(kr)²)²) + i·2k²·kr/(1+(kr)²)², and r_u = −Δx/r, r_uu = (r²−Δx²)/r³,
 * r_uw = −ΔxΔy/r³ (likewise for w). The linear imaginary part goes into the exact sinc·sinc, the
 * rest of the quadratic expansion into the cell moments.
 *
 * Area sampling: a sample is the cell's open fraction, the aperture blurred by the cell, and the
 * sums hold it over the cell, which blurs it again: to leading order the aperture's spectrum at
 * frequency f arrives times sinc²(f·dx)·sinc²(f·dy) (an edge wave seen at angle θ, f = sin θ/λ,
 * loses a fraction (π·dx·f)²/3). Each pair is divided by it at the frequency it selects,
 * f = s/2π (the slope in the cell factor): in the stationary region s ≈ 0 and the factor is 1, at
 * edges it restores the edge wave. (The project's FFT and far-field methods divide one such
 * factor, for point samples; spectral.ts.)
 *
 * Symmetry: with no carrier along an axis, a source even about 0 along it (to 1e-9 of its largest
 * sample: mask.ts computes mirror cells' areas from mirrored coordinates, and they differ by ~2e-12;
 * mirroring then changes the field by as little, far below the sums' accuracy) and an output axis
 * symmetric about 0, the field is even along that axis, and only the half (or quarter) not
 * mirrored is computed.
 */
export interface RsDirect2DOptions {
  /**
   * Divide out the area-sampling cell response (default true). Set false only when every edge of
   * the aperture lies on a cell boundary (a rectangle aligned with the grid): its samples are then
   * exact and there is no blur to undo (dividing would over-correct by as much).
   */
  cellResponse?: boolean;
}

export function rsDirect2D(src: Field, z: number, outX: Axis, outY: Axis, slope: [number, number], opts: RsDirect2DOptions = {}): Field {
  if (isOneD(src)) throw new Error('rsDirect2D: the source is 1-D; use rsDirect1D');
  if (!(z > 0)) throw new Error('rsDirect2D: the distance must be positive');
  const lam = src.wavelength;
  const k = TWO_PI / lam;
  const invLam = 1 / lam;
  const z2 = z * z;
  const { nx, ny, dx, dy, x0, y0, data } = src;

  // Non-zero cells, with the carrier and the cell area folded into the amplitude.
  let n = 0;
  for (let i = 0; i < nx * ny; i++) if (data[2 * i] !== 0 || data[2 * i + 1] !== 0) n++;
  const xi = new Float64Array(n);
  const eta = new Float64Array(n);
  const ar = new Float64Array(n);
  const ai = new Float64Array(n);
  const area = (dx * dy) / TWO_PI; // the kernel's 1/2π too
  let j = 0;
  for (let r = 0; r < ny; r++) {
    const y = y0 + r * dy;
    for (let c = 0; c < nx; c++) {
      const i = r * nx + c;
      const re = data[2 * i]!;
      const im = data[2 * i + 1]!;
      if (re === 0 && im === 0) continue;
      const x = x0 + c * dx;
      const ph = slope[0] * x + slope[1] * y;
      const cs = Math.cos(ph);
      const sn = Math.sin(ph);
      xi[j] = x;
      eta[j] = y;
      ar[j] = (re * cs - im * sn) * area;
      ai[j] = (re * sn + im * cs) * area;
      j++;
    }
  }

  const symX = slope[0] === 0 && isSymmetricAxis(outX) && isEven(src, 'x');
  const symY = slope[1] === 0 && isSymmetricAxis(outY) && isEven(src, 'y');
  const cols = symX ? Math.ceil(outX.n / 2) : outX.n;
  const rows = symY ? Math.ceil(outY.n / 2) : outY.n;
  const hx = dx / 2;
  const hy = dy / 2;
  const sx0 = slope[0];
  const sy0 = slope[1];
  const divide = opts.cellResponse ?? true;
  const mx = new Float64Array(3);
  const my = new Float64Array(3);
  const out = createField(outX, outY, lam);
  const o = out.data;
  for (let row = 0; row < rows; row++) {
    const y = axisAt(outY, row);
    for (let col = 0; col < cols; col++) {
      const x = axisAt(outX, col);
      let sr = 0;
      let si = 0;
      for (let m = 0; m < n; m++) {
        const ex = x - xi[m]!;
        const ey = y - eta[m]!;
        const r = Math.sqrt(ex * ex + ey * ey + z2);
        const ir = 1 / r;
        const kr = k * r;
        // kr reduced as 2π·frac(r/λ): see rsDirect1D.
        const cyc = r * invLam;
        const ph = TWO_PI * (cyc - Math.floor(cyc));
        const cs = Math.cos(ph);
        const sn = Math.sin(ph);
        // (z/r²)(1/r − ik)e^{ikr}
        const f = z * ir * ir;
        const hr = f * (ir * cs + k * sn);
        const hi = f * (ir * sn - k * cs);
        const d = 1 / (1 + kr * kr);
        const rate = k * (1 - d);
        const a1 = -ir * (2 + d);
        const a2 = ir * ir * (2 + (1 + 3 * kr * kr) * d * d);
        const b2 = 2 * k * k * kr * d * d;
        const ux = -ex * ir;
        const uy = -ey * ir;
        const cxx = (r * r - ex * ex) * ir * ir * ir;
        const cyy = (r * r - ey * ey) * ir * ir * ir;
        const cxy = -ex * ey * ir * ir * ir;
        // Linear (real) and quadratic (complex) coefficients of the kernel's logarithm.
        const bx = a1 * ux;
        const by = a1 * uy;
        const qxxr = 0.5 * (a2 * ux * ux + a1 * cxx) + 0.5 * bx * bx;
        const qxxi = 0.5 * (b2 * ux * ux + rate * cxx);
        const qyyr = 0.5 * (a2 * uy * uy + a1 * cyy) + 0.5 * by * by;
        const qyyi = 0.5 * (b2 * uy * uy + rate * cyy);
        const qxyr = a2 * ux * uy + a1 * cxy + bx * by;
        const qxyi = b2 * ux * uy + rate * cxy;
        sincMoments(hx * (sx0 + rate * ux), mx);
        sincMoments(hy * (sy0 + rate * uy), my);
        const s0 = mx[0]! * my[0]!;
        const tx = hx * hx * mx[2]! * my[0]!;
        const ty = hy * hy * mx[0]! * my[2]!;
        const txy = hx * hy * mx[1]! * my[1]!;
        // S S − iBx hx S′S − iBy hy S S′ − Qxx hx² S″S − Qyy hy² S S″ − Qxy hx hy S′S′
        const gr = s0 - qxxr * tx - qyyr * ty - qxyr * txy;
        const gi = -bx * hx * mx[1]! * my[0]! - by * hy * mx[0]! * my[1]! - qxxi * tx - qyyi * ty - qxyi * txy;
        const cr = divide ? cellResponse2(mx[0]!, hx * (sx0 + rate * ux)) * cellResponse2(my[0]!, hy * (sy0 + rate * uy)) : 1;
        const wr = (ar[m]! * gr - ai[m]! * gi) / cr;
        const wi = (ar[m]! * gi + ai[m]! * gr) / cr;
        sr += wr * hr - wi * hi;
        si += wr * hi + wi * hr;
      }
      const at = 2 * (row * outX.n + col);
      o[at] = sr;
      o[at + 1] = si;
    }
  }
  // Mirror the computed part.
  for (let row = 0; row < outY.n; row++) {
    const rs = symY ? Math.min(row, outY.n - 1 - row) : row;
    for (let col = 0; col < outX.n; col++) {
      const cs = symX ? Math.min(col, outX.n - 1 - col) : col;
      if (rs === row && cs === col) continue;
      o[2 * (row * outX.n + col)] = o[2 * (rs * outX.n + cs)]!;
      o[2 * (row * outX.n + col) + 1] = o[2 * (rs * outX.n + cs) + 1]!;
    }
  }
  return out;
}

/**
 * sinc²(v) of the cell response to divide out, v = π·(aperture frequency)·pitch, given sinc(v) from
 * the moments; clamped at |v| = π/2 (half the sampling frequency) as spectral.ts's cellResponse is,
 * so the division never exceeds (π/2)² ≈ 2.47 where the grid no longer resolves the aperture.
 */
function cellResponse2(sinc: number, v: number): number {
  if (Math.abs(v) <= Math.PI / 2) return sinc * sinc;
  return (2 / Math.PI) ** 2;
}

/** Samples at ±x about 0: start = −(n−1)·step/2 to rounding. */
function isSymmetricAxis(a: Axis): boolean {
  return Math.abs(a.start + ((a.n - 1) / 2) * a.step) <= 1e-9 * Math.abs(a.step);
}

/** The source grid is centred on 0 along the axis and its samples are even along it. */
function isEven(f: Field, along: 'x' | 'y'): boolean {
  const ax: Axis = along === 'x' ? { n: f.nx, start: f.x0, step: f.dx } : { n: f.ny, start: f.y0, step: f.dy };
  if (!isSymmetricAxis(ax)) return false;
  const d = f.data;
  let peak = 0;
  for (let i = 0; i < d.length; i++) peak = Math.max(peak, Math.abs(d[i]!));
  const tol = 1e-9 * peak;
  for (let r = 0; r < f.ny; r++) {
    for (let c = 0; c < f.nx; c++) {
      const i = 2 * (r * f.nx + c);
      const mi = along === 'x' ? 2 * (r * f.nx + (f.nx - 1 - c)) : 2 * ((f.ny - 1 - r) * f.nx + c);
      if (Math.abs(d[i]! - d[mi]!) > tol || Math.abs(d[i + 1]! - d[mi + 1]!) > tol) return false;
    }
  }
  return true;
}
