// Sources of the direct Rayleigh–Sommerfeld sums as cells with exact edges, and the rule that
// sizes the cells. A cell is a piece [c − h/2, c + h/2] of an open interval, carrying the field at
// its centre a and the phase slope t of the source across it: the sums integrate the linear part
// of the total phase (source slope minus the kernel's) exactly, so only curvature limits h.

/** An open part of the aperture line, lo < hi (m). */
export interface Interval {
  lo: number;
  hi: number;
}

/**
 * Light on a 1-D aperture: a plane wave, or a Gaussian amplitude exp(−ξ²/w²) (waist w, centred on
 * ξ = 0), both times the tilt carrier e^{ik·sinTilt·ξ}.
 */
export interface Light1D {
  sinTilt: number;
  waist?: number;
}

/**
 * n cells, structure of arrays (the sums read them in the inner loop): centre c_j, width h_j,
 * complex amplitude a_j at the centre (interleaved), phase slope t_j (rad/m) across the cell, and
 * the variation of the amplitude's modulus about the centre, |a(c+u)| ≈ |a_j|·exp(β_j u + γ_j u²):
 * β_j = d ln|a|/dξ and γ_j = ½ d² ln|a|/dξ² (both 0 for a plane wave; for a Gaussian exp(−ξ²/w²),
 * β = −2c/w², γ = −1/w²). The sums integrate them with the kernel's own to second order.
 */
export interface RsCells {
  n: number;
  centre: Float64Array;
  width: Float64Array;
  amp: Float64Array;
  slope: Float64Array;
  logSlope: Float64Array;
  logCurv: Float64Array;
}

/**
 * Phase budgets ε (rad) of the cell rule and the accuracy each gave when measured: worst
 * |I − I_ref| over the window / peak I_ref, against an independent Gauss–Legendre quadrature of
 * the same integral (J₁, Y₁ from @stdlib), for slits 1λ–200λ wide and Gaussian beams (waist 2λ and
 * 5λ, alone and through a slit) at z = 2λ–1000λ, tilts 0°, 15°, 30°:
 * ε = 0.05 → at most 6.8e-4; ε = 0.015 → at most 5.5e-5. The error goes as about 0.26·ε²: what the
 * cells leave out is the quartic term of e^{iαu²} ≈ 1 + iαu² − α²u⁴/2 (see rsMaxCell).
 */
export const RS_PHASE_BUDGET = {
  /** Intensity within 1e-3 of the peak. */
  intensity1e3: 0.05,
  /** Intensity within 1e-4 of the peak. */
  intensity1e4: 0.015,
} as const;

/** The default budget: 1e-3 of the peak, the accuracy the project's other near-field methods keep. */
export const RS_DEFAULT_PHASE_BUDGET = RS_PHASE_BUDGET.intensity1e3;

/**
 * Widest cell (m) for the direct sums at distance z (per axis in 2-D).
 *
 * Phase: about a cell centre the kernel's phase kr(ξ) has curvature φ″ = k·z²/r³ along the
 * aperture, largest (k/z) at r = z (in 2-D, k(r² − Δx²)/r³ ≤ k/z per axis too). The sums integrate
 * the linear phase exactly and the curvature to first order (e^{iφ″u²/2} ≈ 1 + iφ″u²/2, rs-moments.ts);
 * with ε = k·h²/(8z), the curvature phase at the cell edges, the first neglected term is
 * (φ″u²/2)²/2 ≤ ε²/2 there, so h ≤ √(8εz/k). (Integrating only the linear phase, the error would be
 * about ε/3 in the field; measured, 0.4–5 % of the peak intensity at ε = 0.05–0.25.)
 * Amplitude: the kernel's modulus falls as r^{−3/2} (1-D) or r^{−2}·|1/r − ik| (2-D); its logarithm
 * is expanded to second order too, which leaves terms of order (h/z)³; h ≤ z/8 keeps them below the
 * phase term (it binds for z below about 81ελ: 4λ at the default budget).
 * Gaussian light (waist w): ln of the envelope, −ξ²/w², is exactly quadratic and enters the same
 * expansion (β = −2c/w², γ = −1/w²); what is dropped is (βu)³/6 and its kin, at most
 * (h/w)³/6 ≈ 3e-3 at a cell edge where the envelope is 1/e and odd about the centre, so that it
 * mostly cancels over the cell: h ≤ w/4 (measured with the rest above).
 */
export function rsMaxCell(wavelength: number, z: number, opts: { phaseBudget?: number; waist?: number } = {}): number {
  if (!(wavelength > 0) || !(z > 0)) throw new Error('rsMaxCell: wavelength and distance must be positive');
  const eps = opts.phaseBudget ?? RS_DEFAULT_PHASE_BUDGET;
  if (!(eps > 0)) throw new Error('rsMaxCell: the phase budget must be positive');
  const k = (2 * Math.PI) / wavelength;
  let h = Math.min(Math.sqrt((8 * eps * z) / k), z / 8);
  if (opts.waist !== undefined) h = Math.min(h, opts.waist / 4);
  return h;
}

/**
 * The extra error of rsDirect2D from an area-sampled source, as a fraction of the peak intensity:
 * 0.1·(π·pitch·sinMax/λ)², sinMax the largest sine of the angle between a point of the aperture
 * and a point of the window. A sample holds its cell's open fraction, not where in the cell the
 * edge runs; after the cell-response division (rsDirect2D) the error measured over discs (radius
 * 3λ and 5.3λ), squares with edges on, half-way and 0.3 of the way across cells, at z = 3λ–40λ and
 * pitches λ/4–λ/16, was at most 0.07 times that scale, and it goes as pitch². For 1e-3 of the peak
 * the pitch must then be ≤ 0.032λ/sinMax; for 2 %, 0.14λ/sinMax.
 */
export function rsAreaSamplingError(pitch: number, wavelength: number, sinMax: number): number {
  return 0.1 * ((Math.PI * pitch * sinMax) / wavelength) ** 2;
}

/**
 * A Gaussian envelope is cut where it is below e^{−37} ≈ 9e-17 of its peak (|ξ| > √37·w ≈ 6.08w):
 * beyond that the field is under double rounding of the peak and cells there would only cost time.
 */
const GAUSSIAN_REACH = Math.sqrt(37);

/**
 * Cells of the open intervals under the given light: each interval is split into equal cells no
 * wider than maxCell, so every edge is exact (no area sampling, no aliasing of edges). Amplitudes
 * are the light at each cell centre; the slope is k·sinTilt.
 */
export function cellsFromIntervals(open: Interval[], light: Light1D, wavelength: number, maxCell: number): RsCells {
  if (!(maxCell > 0)) throw new Error('cellsFromIntervals: maxCell must be positive');
  const k = (2 * Math.PI) / wavelength;
  const w = light.waist;
  if (w !== undefined && !(w > 0)) throw new Error('cellsFromIntervals: the waist must be positive');
  const pieces: Array<[number, number, number]> = [];
  let n = 0;
  for (const iv of open) {
    if (!(iv.lo <= iv.hi) || !Number.isFinite(iv.lo) || !Number.isFinite(iv.hi)) {
      throw new Error(`cellsFromIntervals: bad interval [${iv.lo}, ${iv.hi}]`);
    }
    let lo = iv.lo;
    let hi = iv.hi;
    if (w !== undefined) {
      lo = Math.max(lo, -GAUSSIAN_REACH * w);
      hi = Math.min(hi, GAUSSIAN_REACH * w);
    }
    if (!(hi > lo)) continue;
    // The tiny allowance keeps an interval of exactly m·maxCell (as computed) at m cells.
    const m = Math.max(1, Math.ceil((hi - lo) / maxCell - 1e-9));
    pieces.push([lo, hi, m]);
    n += m;
  }
  const cells: RsCells = {
    n,
    centre: new Float64Array(n),
    width: new Float64Array(n),
    amp: new Float64Array(2 * n),
    slope: new Float64Array(n).fill(k * light.sinTilt),
    logSlope: new Float64Array(n),
    logCurv: new Float64Array(n).fill(w === undefined ? 0 : -1 / (w * w)),
  };
  let j = 0;
  for (const [lo, hi, m] of pieces) {
    const h = (hi - lo) / m;
    for (let i = 0; i < m; i++, j++) {
      // Centres from both ends' weights, so the last cell ends exactly at hi.
      const c = lo + ((i + 0.5) / m) * (hi - lo);
      const env = w === undefined ? 1 : Math.exp(-(c * c) / (w * w));
      const ph = k * light.sinTilt * c;
      cells.centre[j] = c;
      cells.width[j] = h;
      cells.amp[2 * j] = env * Math.cos(ph);
      cells.amp[2 * j + 1] = env * Math.sin(ph);
      if (w !== undefined) cells.logSlope[j] = (-2 * c) / (w * w);
    }
  }
  return cells;
}
