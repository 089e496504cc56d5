// A thin lens of focal length f (f > 0 converging, f < 0 diverging): transmittance
// t(x, y) = exp(−iπ(x² + y²)/(λf)) (Goodman, Introduction to Fourier Optics, §5.1), optionally
// behind a circular stop of diameter D. Cell averages, like every mask of the program: a sample
// holds the mean of t over its cell, so that a chirp that turns fast across a cell is attenuated
// the way area sampling attenuates it, not aliased from a point value.
//
// The Fresnel integrals come from @stdlib (C(t) = ∫₀ᵗ cos(πs²/2) ds, S likewise with sin;
// Abramowitz & Stegun ch. 7) rather than a series and an asymptotic expansion of ours: one
// well-kept routine covers the whole axis; against quadrature its values are good to a few 1e-16
// where the phase πt²/2 is small, and beyond that to the rounding of the phase itself.
import fresnel from '@stdlib/math-base-special-fresnel';
import { discCellAverage } from './disc-rim-cells.js';
import { gaussLegendreRule } from './edge-cells.js';
import { axisAt, type Axis } from './field.js';
import { sampleMask2D } from './mask.js';
import { cellRuleFor } from './zernike.js';

function checkLens(f: number, wavelength: number, who: string): void {
  if (!Number.isFinite(f) || f === 0) throw new Error(`${who}: the focal length must be a finite non-zero length (got ${f})`);
  if (!(wavelength > 0) || !Number.isFinite(wavelength)) throw new Error(`${who}: the wavelength must be positive (got ${wavelength})`);
}

/**
 * Cells whose phase range is at most GL_MAX_RANGE rad and whose width in the Fresnel variable
 * t = x·√(2/(λ|f|)) is below GL_MAX_DT are integrated by Gauss–Legendre panels rather than by the
 * difference of two Fresnel integrals: that difference loses digits to cancellation when Δt is small
 * (each value's error, a few 1e-16, divided by Δt: 6e-12 at Δt = 1e-4 against quadrature), while the
 * panels are exact to rounding at a cost of at most 4 × 10 evaluations per cell.
 */
const GL_MAX_RANGE = 8;
const GL_MAX_DT = 0.5;
/** Nodes per panel of the Gauss–Legendre branch and the largest phase change per panel (rad). */
const PANEL_NODES = 10;
const PANEL_MAX_PHASE = 2;

/**
 * Exact cell averages of the lens phase along one axis: (1/Δ)∫ exp(−iπx²/(λf)) dx over each cell
 * [x_j − Δ/2, x_j + Δ/2], interleaved complex. With t = x·√(2/(λ|f|)) the integral is
 * √(λ|f|/2)·[ΔC − i·sign(f)·ΔS] between the cell's edges (Fresnel integrals). Cells where the lens
 * turns slowly (phase range ≤ 8 rad and Δt < 0.5, see GL_MAX_RANGE) are integrated instead by
 * 10-point Gauss–Legendre panels of at most 2 rad of phase each, whose remainder for e^{iφ} is below
 * 1e-20 (A&S 25.4.30): exact to rounding either way. What limits both is the rounding of the phase
 * itself, about 1e-16 × πx²/(λ|f|) rad.
 */
export function lensAxisAverages(f: number, wavelength: number, axis: Axis): Float64Array {
  checkLens(f, wavelength, 'lensAxisAverages');
  const out = new Float64Array(2 * axis.n);
  const scale = Math.sqrt(2 / (wavelength * Math.abs(f)));
  const sign = Math.sign(f);
  const step = Math.abs(axis.step);
  const dt = scale * step;
  const rule = gaussLegendreRule(PANEL_NODES);
  // The Fresnel integrals at the n + 1 edges, computed once each where a cell needs them.
  const edge = (k: number) => fresnel(scale * (axisAt(axis, k) - step / 2));
  let left: number[] | null = null;
  for (let j = 0; j < axis.n; j++) {
    const tc = scale * axisAt(axis, j);
    // Phase range of πt²/2 across the cell.
    const range = Math.PI * (Math.abs(tc) * dt + (dt * dt) / 4);
    if (dt >= GL_MAX_DT || range > GL_MAX_RANGE) {
      const [sa, ca] = left ?? edge(j);
      const right = edge(j + 1);
      const [sb, cb] = right;
      out[2 * j] = (cb! - ca!) / dt;
      out[2 * j + 1] = (-sign * (sb! - sa!)) / dt;
      left = right;
      continue;
    }
    left = null;
    if (dt === 0) {
      // Zero-width cells: the point values.
      const phi = (Math.PI / 2) * tc * tc;
      out[2 * j] = Math.cos(phi);
      out[2 * j + 1] = -sign * Math.sin(phi);
      continue;
    }
    const panels = Math.max(1, Math.ceil(range / PANEL_MAX_PHASE));
    const h = dt / panels;
    let re = 0;
    let im = 0;
    for (let p = 0; p < panels; p++) {
      const mid = tc - dt / 2 + (p + 0.5) * h;
      for (let i = 0; i < PANEL_NODES; i++) {
        const t = mid + 0.5 * h * rule.x[i]!;
        const phi = (Math.PI / 2) * t * t;
        re += rule.w[i]! * Math.cos(phi);
        im += rule.w[i]! * Math.sin(phi);
      }
    }
    // Σ weights over all panels is 2·panels.
    out[2 * j] = re / (2 * panels);
    out[2 * j + 1] = (-sign * im) / (2 * panels);
  }
  return out;
}

/**
 * The lens on a 2-D grid (interleaved complex, row-major [y][x]): the product of the two axes'
 * averages — exact, since t(x, y) = t(x)·t(y) and a cell is a product of intervals — times the
 * stop's exact open fraction per cell when a stop of diameter `stop` is given (mask.ts).
 *
 * Away from the rim the fraction is 0 or 1 and the result is exact. A rim cell (0 < q < 1) takes
 * the mean of t over the open part of the cell only, times q (disc-rim-cells.ts): the lens' average
 * over the whole cell times q would be off by q(1−q)·(mean of t over the open part − mean over the
 * closed part), first order in the phase step per cell, and the rim's light is half the field on
 * the axis of a defocused stop.
 */
export function lensCellAverages(f: number, wavelength: number, stop: number | null, xa: Axis, ya: Axis, out?: Float64Array): Float64Array {
  checkLens(f, wavelength, 'lensCellAverages');
  if (stop !== null && (!(stop > 0) || !Number.isFinite(stop))) throw new Error(`lensCellAverages: the stop diameter must be positive (got ${stop})`);
  const size = 2 * xa.n * ya.n;
  const res = out ?? new Float64Array(size);
  if (res.length !== size) throw new Error(`lensCellAverages: out holds ${res.length} numbers, the grid ${size}`);
  const ax = lensAxisAverages(f, wavelength, xa);
  const ay = lensAxisAverages(f, wavelength, ya);
  const open = stop === null ? null : sampleMask2D({ shape: 'circle', diameter: stop, opaque: false }, xa, ya);
  const k = -Math.PI / (wavelength * f);
  const lensPhase = (x: number, y: number) => k * (x * x + y * y);
  const rule = stop === null ? null : cellRuleFor(Math.PI * lensLocalFrequency(f, wavelength, stop / 2) * Math.max(Math.abs(xa.step), Math.abs(ya.step)));
  for (let r = 0; r < ya.n; r++) {
    const yr = ay[2 * r]!;
    const yi = ay[2 * r + 1]!;
    for (let c = 0; c < xa.n; c++) {
      const i = r * xa.n + c;
      const q = open ? open[i]! : 1;
      if (q === 0) {
        // A plain 0, not the −0 a negative product would give.
        res[2 * i] = 0;
        res[2 * i + 1] = 0;
        continue;
      }
      if (q < 1) {
        const [re, im] = discCellAverage(lensPhase, stop! / 2, axisAt(xa, c), axisAt(ya, r), xa.step, ya.step, rule!);
        res[2 * i] = re;
        res[2 * i + 1] = im;
        continue;
      }
      const xr = ax[2 * c]!;
      const xi = ax[2 * c + 1]!;
      res[2 * i] = q * (xr * yr - xi * yi);
      res[2 * i + 1] = q * (xr * yi + xi * yr);
    }
  }
  return res;
}

/** The local spatial frequency of the lens phase at radius r: r/(λ|f|) (1/m). */
export function lensLocalFrequency(f: number, wavelength: number, r: number): number {
  checkLens(f, wavelength, 'lensLocalFrequency');
  return Math.abs(r) / (wavelength * Math.abs(f));
}

/**
 * j₁,₁/π: the first zero of J₁ (3.8317059702075125, A&S table 9.5) over π — the "1.22" of the
 * Airy pattern's first dark ring (Born & Wolf, Principles of Optics, §8.5.2).
 */
const AIRY_FIRST_ZERO = 3.8317059702075125 / Math.PI;

/**
 * Radius of the first dark ring in the back focal plane of a lens of focal length f with a
 * circular stop of diameter D lit by a plane wave: 1.22 λ|f|/D (the constant j₁,₁/π = 1.21967).
 */
export function airyRadius(f: number, wavelength: number, stop: number): number {
  checkLens(f, wavelength, 'airyRadius');
  if (!(stop > 0)) throw new Error(`airyRadius: the stop diameter must be positive (got ${stop})`);
  return (AIRY_FIRST_ZERO * wavelength * Math.abs(f)) / stop;
}

/**
 * 1/e² intensity radius λ|f|/(πw) of a collimated Gaussian beam of 1/e² radius w focused by the lens,
 * in its back focal plane (Siegman, Lasers, ch. 17); for f < 0 the virtual focus's.
 */
export function focusedWaist(f: number, wavelength: number, beamRadius: number): number {
  checkLens(f, wavelength, 'focusedWaist');
  if (!(beamRadius > 0)) throw new Error(`focusedWaist: the beam radius must be positive (got ${beamRadius})`);
  return (wavelength * Math.abs(f)) / (Math.PI * beamRadius);
}
