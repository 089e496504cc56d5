// The band-limited angular spectrum for tilted light on a grid only as large as the beam.
//
// A source U₀(ξ) = E(ξ)·e^{i2π f_c·ξ} (E the envelope: open fraction × illumination amplitude, no
// carrier; f_c = (α, β)/λ the carrier, α = sin θx, β = sin θy) has the angular spectrum Ê(f − f_c).
// With g the FFT's own frequencies of the envelope, the exact scalar field (Goodman, Introduction to
// Fourier Optics, §3.10) is
//
//   U(x, z) = e^{i2π f_c·x} ∬ Ê(g)·H(g + f_c)·e^{i2π g·x} dg,   H(f) = exp(i2πz√(1/λ² − |f|²)),
//
// evanescent where the root is imaginary (a decay). On a window centred at x_c (by default where
// the carrier lands, z·(α, β)/γ, γ = √(1 − α² − β²)) write x = x_c + x'; the factor e^{i2π g·x_c}
// joins the transfer, and one inverse FFT gives
//
//   ψ(x') = ∬ Ê(g)·H(g + f_c)·e^{i2π g·x_c}·e^{i2π g·x'} dg,   U(x_c + x') = e^{i2π f_c·(x_c + x')}·ψ(x'),
//
// so the intensity is |ψ|². The grid samples only the envelope: its pitch follows the envelope's
// bandwidth (what reaches the window), not the carrier's sin θ/λ, and it spans only the window.
//
// Band limit. Where frequency f lands on the screen (stationary phase of the integral; the ray of
// direction cosines λf from the aperture): x = zλf/√(1 − λ²|f|²). Relative to the window centre,
// the transfer's local frequency in g is (1/2π)∂φ/∂g = −(x(g + f_c) − x_c): sampled at Δg = 1/L it
// is resolved only while |x(g + f_c) − x_c| ≤ L/2 per axis, i.e. while the light lands on the padded
// grid. Anything landing beyond would wrap around onto the far side of the grid, so it is cut and
// its power reported. With f_c = 0 and x_c = 0, one axis at a time, this is the limit of Matsushima
// & Shimobaba, Opt. Express 17, 19662 (2009), |f| ≤ 1/(λ√((2Δf·z)² + 1)); the shift generalises it as
// Matsushima's shifted angular spectrum does (Opt. Express 18, 18453 (2010)), derived here from
// where each frequency lands. Two shapes:
//   'landing' (default): the exact landing point (both components, through the full root) must lie
//      in the grid's box. For each row (fy fixed) the landing x grows monotonically with fx, so the
//      passing fx form one interval per row, and likewise fy per column.
//   'axes': each axis's landing with the other frequency component held at the carrier's — a
//      rectangle, the generalisation of the per-axis form spectral.ts uses. With f_c = 0, x_c = 0
//      it is that form exactly. It under-estimates the landing of frequencies far off the carrier
//      in the other axis (corners of the spectrum at high angles), whose transfer it then samples
//      too coarsely.
//
// Taper. A sharp band edge (the band limit, or the grid's own band ±1/(2Δ)) rings: the truncated
// integral's end contributes about Ê(g_c)/(2π·distance) everywhere, which behind a hard-edged
// aperture reaches 1e-2 of the peak (measured: a 20 µm square at N_F = 0.01 had 2e-2 at five cells
// across it; spectral.ts at normal incidence behaves alike). The options `taper` and `bandTaper`
// roll the limits off with cos² over the outer fraction of the grid's half-width (in landing
// position) and of its band (in frequency). A taper is smooth only if its zone is wide against
// the Fresnel scale ρ = √(λz/γ³) of the tilted beam — the width over which one frequency's light
// lands, d(landing)/dg = ρ² — and far enough from the window; shiftedGridFor sizes both for that.
// The power the tapers remove is counted in bandLimitLoss (as Σ|F|²(1 − w²)).
//
// The cell response sinc(gΔx)·sinc(gΔy) of an area-sampled envelope is divided out about the
// envelope's own frequencies (there is no carrier in the samples).
//
// Pure: typed arrays in and out, no I/O, no module state.
import { erfc } from './special.js';
import type { Engine } from './engine.js';
import { binFrequency, nextFastFftSize } from './fft.js';
import { isOneD, type Field } from './field.js';
import { propagationPhase } from './phase.js';
import { bandLimitFrequency, cellResponse, toSpectrum, type SourceSpectrum } from './spectral.js';

/** The shape of a grid, as a Field has it (nx×ny samples at pitch dx, dy; ny = 1, dy = 0 for 1-D). */
export interface GridShape {
  nx: number;
  ny: number;
  dx: number;
  dy: number;
  wavelength: number;
}

export type ShiftedBandLimit = 'landing' | 'axes';

export interface ShiftedOptions {
  /** Divide the area-sampled cell response sinc(gΔ) out of the envelope's spectrum (default true). */
  cellResponse?: boolean;
  /** Shape of the band limit (default 'landing'; see the head of this file). */
  bandLimit?: ShiftedBandLimit;
  /**
   * The envelope's spectrum, kept from an earlier call (toSpectrum on the padded envelope): the
   * envelope's samples are then not read and no forward transform is made. It does not depend on
   * z, the carrier or the centre, so a sweep over any of them shares one.
   */
  spectrum?: SourceSpectrum;
  /** Write the result into the envelope's own array instead of a new one (default false). */
  inPlace?: boolean;
  /**
   * Roll the band limit off smoothly instead of cutting sharply (default 0: sharp): a cos² taper
   * over the outer `taper` fraction (at most 0.5) of the grid's half-width, in landing position.
   * See the head of this file.
   */
  taper?: number;
  /** The same over the outer fraction of the grid's own band ±1/(2Δ), in frequency (default: `taper`). */
  bandTaper?: number;
}

export interface ShiftedSpectrumReport {
  /** Fraction of the envelope's spectral power cut by the band limit (propagating, landing off the grid). */
  bandLimitLoss: number;
  /** Fraction of the envelope's spectral power in evanescent waves (|g + f_c| ≥ 1/λ). */
  evanescentLoss: number;
  /** Range of the envelope frequencies that passed, per axis [lo, hi] (1/m); null if nothing passed. */
  passed: { x: [number, number]; y: [number, number] } | null;
  /** Where the passed frequencies land relative to the centre, per axis [lo, hi] (m). */
  landing: { x: [number, number]; y: [number, number] } | null;
  /** The window centre and carrier used. */
  centre: [number, number];
  carrier: [number, number];
}

export interface ShiftedResult {
  /** ψ on the padded grid: sample (r, c) sits at (centre + envelope's own coordinates); |ψ|² is the intensity. */
  field: Field;
  report: ShiftedSpectrumReport;
}

/** γ = √(1 − λ²|f_c|²) of a carrier; throws for a carrier at or beyond grazing. */
export function carrierCosine(carrier: [number, number], wavelength: number): number {
  const s2 = wavelength * wavelength * (carrier[0] * carrier[0] + carrier[1] * carrier[1]);
  if (!(s2 < 1)) throw new Error(`shifted angular spectrum: the carrier (${carrier[0]}, ${carrier[1]}) 1/m is not a propagating direction at λ = ${wavelength} m`);
  return Math.sqrt(1 - s2);
}

/** Where the carrier's direction, leaving the origin, meets the plane at z: z·(α, β)/γ. */
export function landingCentre(carrier: [number, number], wavelength: number, z: number): [number, number] {
  const g = carrierCosine(carrier, wavelength);
  return [(z * wavelength * carrier[0]) / g, (z * wavelength * carrier[1]) / g];
}

/**
 * The frequency component f (1/m) along one axis whose light lands at X along that axis, with the
 * other axis's frequency component held at `other`: X = zλf/√(1 − λ²(f² + other²)) solved for f,
 * f = sign(X)·√(1 − λ²·other²)/(λ√((z/X)² + 1)). Written through bandLimitFrequency so that with
 * other = 0 and X = ±L/2 it is the existing limit to the last bit.
 */
export function frequencyLandingAt(X: number, other: number, wavelength: number, z: number): number {
  const c2 = 1 - wavelength * wavelength * other * other;
  if (!(c2 > 0)) return 0;
  if (X === 0) return 0;
  const f = bandLimitFrequency(z, wavelength, 2 * Math.abs(X));
  const s = c2 === 1 ? f : Math.sqrt(c2) * f;
  return X < 0 ? -s : s;
}

/**
 * Propagates a padded envelope (no carrier: aperture open fraction × illumination amplitude, on a
 * grid laid out as padField lays it) over z for light of carrier `carrier` (1/m, [α, β]/λ), onto a
 * window centred at `centre` (m; landingCentre for the beam's own landing point). Returns ψ on the
 * padded grid, whose sample (r, c) sits at (centre + the envelope's own coordinates of (r, c)), and
 * what was cut. The full field is U = e^{i2π f_c·x}·ψ (restoreCarrier).
 *
 * 1-D fields (ny = 1, dy = 0) are invariant along y: a carrier[1] ≠ 0 is a conical incidence
 * (|f|² = (g + f_cx)² + f_cy², exact); centre[1] is ignored.
 */
export function propagateShiftedSpectrum(
  engine: Engine,
  envelope: Field,
  z: number,
  carrier: [number, number],
  centre: [number, number],
  opts: ShiftedOptions = {},
): ShiftedResult {
  const oneD = isOneD(envelope);
  const { nx, ny, dx, dy, wavelength: lam } = envelope;
  const gamma = carrierCosine(carrier, lam);
  const cx = centre[0];
  const cy = oneD ? 0 : centre[1];
  const spectrumIn = opts.spectrum;
  if (spectrumIn && spectrumIn.data.length !== envelope.data.length) {
    throw new Error('shifted angular spectrum: the kept spectrum is not of this grid');
  }
  let data: Float64Array;
  let total: number;
  let src: Float64Array;
  if (spectrumIn) {
    data = opts.inPlace ? envelope.data : engine.allocate(envelope.data.length);
    src = spectrumIn.data;
    total = spectrumIn.totalPower;
  } else {
    if (opts.inPlace) data = envelope.data;
    else {
      data = engine.allocate(envelope.data.length);
      data.set(envelope.data);
    }
    const work: Field = { ...envelope, data };
    total = toSpectrum(engine, work);
    src = data;
  }
  const mode: ShiftedBandLimit = opts.bandLimit ?? 'landing';
  const tau = opts.taper ?? 0;
  const tauBand = opts.bandTaper ?? tau;
  for (const t of [tau, tauBand]) {
    if (!(t >= 0 && t <= 0.5)) throw new Error(`shifted angular spectrum: a taper must be in [0, 0.5], got ${t}`);
  }
  const divide = opts.cellResponse ?? true;

  // Per-axis tables: envelope frequencies and the reciprocal cell responses.
  const gx = new Float64Array(nx);
  const icx = new Float64Array(nx);
  for (let c = 0; c < nx; c++) {
    gx[c] = binFrequency(c, nx, dx);
    icx[c] = divide ? 1 / cellResponse(gx[c]!, dx) : 1;
  }
  const gy = new Float64Array(ny);
  const icy = new Float64Array(ny);
  for (let r = 0; r < ny; r++) {
    gy[r] = oneD ? 0 : binFrequency(r, ny, dy);
    icy[r] = divide && !oneD ? 1 / cellResponse(gy[r]!, dy) : 1;
  }
  // Frequency tapers (1 inside the grid's band less its outer fraction τ, cos² to 0 at its edge).
  const wnx = new Float64Array(nx);
  for (let c = 0; c < nx; c++) wnx[c] = taperWeight(Math.abs(gx[c]!) * 2 * dx, tauBand);
  const wny = new Float64Array(ny);
  for (let r = 0; r < ny; r++) wny[r] = oneD ? 1 : taperWeight(Math.abs(gy[r]!) * 2 * dy, tauBand);
  const [fcx, fcy] = carrier;
  const halfX = (nx * dx) / 2;
  const halfY = oneD ? Infinity : (ny * dy) / 2;
  // Pass intervals in absolute frequency: for fx per row (given that row's fy) and for fy per column.
  const xLo = new Float64Array(ny);
  const xHi = new Float64Array(ny);
  for (let r = 0; r < ny; r++) {
    const fyr = gy[r]! + fcy;
    const other = mode === 'axes' || oneD ? fcy : fyr;
    xLo[r] = frequencyLandingAt(cx - halfX, other, lam, z);
    xHi[r] = frequencyLandingAt(cx + halfX, other, lam, z);
  }
  const yLo = new Float64Array(nx);
  const yHi = new Float64Array(nx);
  for (let c = 0; c < nx; c++) {
    if (oneD) {
      yLo[c] = -Infinity;
      yHi[c] = Infinity;
      continue;
    }
    const other = mode === 'axes' ? fcx : gx[c]! + fcx;
    yLo[c] = frequencyLandingAt(cy - halfY, other, lam, z);
    yHi[c] = frequencyLandingAt(cy + halfY, other, lam, z);
  }

  const inv2 = 1 / (lam * lam);
  // e^{i2πzγ/λ}, reduced without losing digits (with γ = 1 it is spectral.ts's common phase).
  const globalPhase = propagationPhase(gamma === 1 ? z : z * gamma, lam);
  const twoPi = 2 * Math.PI;
  // The window shift's phase 2π(g_x·x_c + g_y·y_c), per column and per row.
  const linX = new Float64Array(nx);
  for (let c = 0; c < nx; c++) linX[c] = twoPi * gx[c]! * cx;
  // ((−2π·z)·λ)·q as spectral.ts multiplies it (the same bits at normal incidence).
  const k0 = -2 * Math.PI * z * lam;
  const zl = z * lam;
  const lam2 = lam * lam;
  const decay = -twoPi * z;
  let cut = 0;
  let evan = 0;
  let pgx0 = Infinity;
  let pgx1 = -Infinity;
  let pgy0 = Infinity;
  let pgy1 = -Infinity;
  let lx0 = Infinity;
  let lx1 = -Infinity;
  let ly0 = Infinity;
  let ly1 = -Infinity;
  for (let r = 0; r < ny; r++) {
    const g2 = gy[r]!;
    const fy = g2 + fcy;
    const iy = icy[r]!;
    const base = 2 * r * nx;
    const lo = xLo[r]!;
    const hi = xHi[r]!;
    const linY = twoPi * g2 * cy;
    for (let c = 0; c < nx; c++) {
      const i = base + 2 * c;
      const re = src[i]!;
      const im = src[i + 1]!;
      const g1 = gx[c]!;
      const fx = g1 + fcx;
      const f2 = fx * fx + fy * fy;
      let amp: number;
      let phase: number;
      if (f2 >= inv2) {
        // Evanescent: a pure decay exp(−2πz√(f² − 1/λ²)), with the window shift's phase only.
        evan += re * re + im * im;
        amp = Math.exp(decay * Math.sqrt(f2 - inv2));
        phase = linX[c]! + linY;
      } else if (fx < lo || fx > hi || fy < yLo[c]! || fy > yHi[c]!) {
        cut += re * re + im * im;
        data[i] = 0;
        data[i + 1] = 0;
        continue;
      } else {
        const root = Math.sqrt(1 - lam2 * f2);
        // 2πz(√(1/λ² − |g + f_c|²) − γ/λ) without cancellation: −2πzλ(2f_c·g + |g|²)/(γ + root).
        const q = g1 * g1 + g2 * g2 + 2 * (fcx * g1 + fcy * g2);
        const dev = (k0 * q) / (gamma + root);
        phase = dev + (linX[c]! + linY) + globalPhase;
        amp = 1;
        const inv = zl / root;
        const lx = fx * inv - cx;
        const ly = oneD ? 0 : fy * inv - cy;
        if (tau > 0 || tauBand > 0) {
          amp = wnx[c]! * wny[r]! * taperWeight(Math.abs(lx) / halfX, tau) * (oneD ? 1 : taperWeight(Math.abs(ly) / halfY, tau));
          if (amp < 1) cut += (re * re + im * im) * (1 - amp * amp);
          if (amp === 0) {
            data[i] = 0;
            data[i + 1] = 0;
            continue;
          }
        }
        if (g1 < pgx0) pgx0 = g1;
        if (g1 > pgx1) pgx1 = g1;
        if (g2 < pgy0) pgy0 = g2;
        if (g2 > pgy1) pgy1 = g2;
        if (lx < lx0) lx0 = lx;
        if (lx > lx1) lx1 = lx;
        if (ly < ly0) ly0 = ly;
        if (ly > ly1) ly1 = ly;
      }
      const s = amp * icx[c]! * iy;
      const cr = s * Math.cos(phase);
      const sn = s * Math.sin(phase);
      data[i] = re * cr - im * sn;
      data[i + 1] = re * sn + im * cr;
    }
  }
  engine.fft2(data, nx, ny, true);
  const field: Field = {
    data,
    nx,
    ny,
    dx,
    dy,
    x0: envelope.x0 + cx,
    y0: oneD ? 0 : envelope.y0 + cy,
    wavelength: lam,
  };
  const any = pgx1 >= pgx0;
  return {
    field,
    report: {
      bandLimitLoss: total > 0 ? cut / total : 0,
      evanescentLoss: total > 0 ? evan / total : 0,
      passed: any ? { x: [pgx0, pgx1], y: oneD ? [0, 0] : [pgy0, pgy1] } : null,
      landing: any ? { x: [lx0, lx1], y: oneD ? [0, 0] : [ly0, ly1] } : null,
      centre: [cx, cy],
      carrier: [fcx, fcy],
    },
  };
}

/** 1 for u ≤ 1 − τ, cos² down to 0 at u = 1, 0 beyond (u a position or frequency over its limit). */
function taperWeight(u: number, tau: number): number {
  if (tau === 0 || u <= 1 - tau) return 1;
  if (u >= 1) return 0;
  const c = Math.cos((Math.PI / 2) * ((u - (1 - tau)) / tau));
  return c * c;
}

/**
 * U = e^{i2π f_c·x}·ψ in place, x the field's own (absolute) coordinates: the full complex field,
 * for what needs its phase (a Babinet complement, interference with another beam). The phase is
 * taken in cycles and reduced before the 2π, so that it keeps its digits far off axis.
 */
export function restoreCarrier(f: Field, carrier: [number, number]): void {
  const oneD = isOneD(f);
  const d = f.data;
  for (let r = 0; r < f.ny; r++) {
    const y = oneD ? 0 : f.y0 + r * f.dy;
    const cyc = carrier[1] * y;
    for (let c = 0; c < f.nx; c++) {
      const x = f.x0 + c * f.dx;
      let t = carrier[0] * x + cyc;
      t -= Math.floor(t);
      const ph = 2 * Math.PI * t;
      const i = 2 * (r * f.nx + c);
      const cs = Math.cos(ph);
      const sn = Math.sin(ph);
      const re = d[i]!;
      const im = d[i + 1]!;
      d[i] = re * cs - im * sn;
      d[i + 1] = re * sn + im * cs;
    }
  }
}

// --- Planning: which part of the spectrum lands on a grid, and the grid a beam needs ------------

/**
 * A model of the envelope's power spectrum, as the fraction of its power with g_axis > G (one
 * side; the same fraction lies below −G), for G ≥ 0. Used before anything is computed.
 */
export type SpectrumTail = (axis: 0 | 1, G: number) => number;

/**
 * Hard edges: E·/(4π²G) per side, E the edge measure per unit power behind that axis's tails
 * (the 1/g² tail of a step, |1/(2πg)|², summed over the edges, half of it per side; the same law the
 * planner's window uses: a slit of width D has E = 2/D and 1/(π²DG) of its power beyond |g| > G).
 * Common practice (the asymptotic sinc² tail averaged over its fringes).
 */
export function edgeSpectrumTail(edgesPerPower: [number, number]): SpectrumTail {
  return (axis, G) => (G > 0 ? Math.min(0.5, edgesPerPower[axis] / (4 * Math.PI * Math.PI * G)) : 0.5);
}

/**
 * A Gaussian envelope exp(−r²/w²): its power spectrum is exp(−2π²w²g²) per axis, so the fraction
 * beyond G on one side is erfc(√2·πwG)/2 (Siegman, Lasers, ch. 17: the far-field spread of a
 * Gaussian beam, θ = λ/(πw) at 1/e²).
 */
export function gaussianSpectrumTail(waist: number): SpectrumTail {
  return (_axis, G) => 0.5 * erfc(Math.SQRT2 * Math.PI * waist * Math.max(0, G));
}


export interface ShiftedBand {
  /**
   * Per axis, the envelope frequencies (1/m) whose light lands on the grid, along the line through
   * the carrier (the other component at the carrier's), within the grid's own band: [lo, hi]. With a
   * taper, the frequencies passed at full weight.
   */
  passed: [[number, number], [number, number]];
  /** The grid's own band per axis, ±1/(2Δ) (Infinity for the y of a 1-D grid). */
  nyquist: [number, number];
  /**
   * Estimated fraction of the envelope's power that the band limit cuts (between its limit and the
   * grid's band); a taper counts as a sharp cut at its half-weight point.
   */
  cutEstimate: number;
  /** Estimated fraction beyond the grid's own band (not cut: absent, or folded back by sampling). */
  beyondNyquist: number;
}

/**
 * For a planned grid, which envelope frequencies land on it, and (with a tail model of the
 * envelope's spectrum) how much power the band limit will cut. The 'axes' view: exact in 1-D and
 * along the lines through the carrier.
 */
export function shiftedBand(
  grid: GridShape,
  z: number,
  carrier: [number, number],
  centre: [number, number],
  tail?: SpectrumTail,
  taper = 0,
  bandTaper = taper,
): ShiftedBand {
  const oneD = grid.ny === 1 && grid.dy === 0;
  const lam = grid.wavelength;
  carrierCosine(carrier, lam);
  const axes: (0 | 1)[] = oneD ? [0] : [0, 1];
  const passed: [[number, number], [number, number]] = [
    [0, 0],
    [0, 0],
  ];
  const nyq: [number, number] = [0.5 / grid.dx, oneD ? Infinity : 0.5 / grid.dy];
  let cutEstimate = 0;
  let beyond = 0;
  for (const i of axes) {
    const half = i === 0 ? (grid.nx * grid.dx) / 2 : (grid.ny * grid.dy) / 2;
    const other = carrier[1 - i]!;
    const at = (k: number) => {
      const h = k * half;
      return [frequencyLandingAt(centre[i]! - h, other, lam, z) - carrier[i]!, frequencyLandingAt(centre[i]! + h, other, lam, z) - carrier[i]!] as const;
    };
    const n = nyq[i]!;
    const [fullLo, fullHi] = at(1 - taper);
    passed[i] = [Math.max(fullLo, -(1 - bandTaper) * n), Math.min(fullHi, (1 - bandTaper) * n)];
    if (tail) {
      const [lo, hi] = at(1 - taper / 2);
      const m = (1 - bandTaper / 2) * n;
      // Power below a (signed) frequency, and above one, from the one-sided tail.
      const below = (g: number) => (g <= 0 ? tail(i, -g) : 1 - tail(i, g));
      const above = (g: number) => (g >= 0 ? tail(i, g) : 1 - tail(i, -g));
      cutEstimate += Math.max(0, below(Math.min(lo, m)) - below(-n)) + Math.max(0, above(Math.max(hi, -m)) - above(n));
      beyond += below(-n) + above(n);
    }
  }
  return { passed, nyquist: nyq, cutEstimate: Math.min(1, cutEstimate), beyondNyquist: Math.min(1, beyond) };
}

export interface ShiftedGridRequest {
  wavelength: number;
  z: number;
  /** Carrier (1/m): [sin θx, sin θy]/λ. */
  carrier: [number, number];
  /** Window centre on the screen (m); default: where the carrier lands, landingCentre. */
  centre?: [number, number];
  /** Half widths of the illuminated envelope in the aperture plane (m); [a, 0] for 1-D. */
  footprint: [number, number];
  /** Half widths of the output window about the centre (m) that must be on the grid. */
  window: [number, number];
  /** Invariant along y (ny = 1). */
  oneD?: boolean;
  /** Samples per period of the highest envelope frequency that reaches the window (default 4; 2 is Nyquist). */
  samplesPerPeriod?: number;
  /** Upper bound on the pitch per axis (m), e.g. from the smallest feature. */
  maxPitch?: [number, number];
  /** A fixed pitch per axis (m) instead of the band rules. */
  pitch?: [number, number];
  /** Power spectrum model of the envelope, for the cut estimate. */
  tail?: SpectrumTail;
  /**
   * Largest band-limit cut to aim for: with a tail model, the grid is doubled while the estimate
   * exceeds it. Without one nothing is doubled: the cut light lands off the window, and the tapers
   * keep its edge from ringing into it; a target only shrinks what the window's surroundings lose.
   */
  target?: number;
  /** Largest samples per axis (default 2^20 in 1-D, 2^14 in 2-D). */
  maxSamples?: number;
  /** The landing taper to use (ShiftedOptions.taper); default: as much as the grid's slack allows, up to 0.5. */
  taper?: number;
  /** The band taper to use (ShiftedOptions.bandTaper); default likewise. */
  bandTaper?: number;
  /**
   * Margins in Fresnel scales ρ = √(λz/γ³) of the tilted beam (default 2): between the window's
   * reach and the taper's start, and the least width of the taper zone, in landing position (κρ)
   * and in frequency (κ/ρ). A judgement, measured on a square at N_F = 0.01 and 1, tilts 10°–50°:
   * see test/optics/shifted-spectrum-tilted.test.ts.
   */
  taperZones?: number;
}

export interface ShiftedGrid {
  /** Pitch per axis (m); dy = 0 for 1-D. */
  pitch: [number, number];
  /** Padded grid size per axis (FFT sizes: 5-smooth); ny = 1 for 1-D. */
  samples: [number, number];
  centre: [number, number];
  /** Envelope frequencies (1/m) whose light reaches the window from some point of the footprint, per axis [lo, hi]. */
  reaching: [[number, number], [number, number]];
  /** Fresnel scale per axis (m): √(zλ(1 − λ²f_c,other²)/γ³), the spread of one frequency's landing. */
  fresnelScale: [number, number];
  /** The band check of the grid chosen. */
  band: ShiftedBand;
  /** Whether the cut estimate is within the target (false when no tail model or no target was given). */
  targetMet: boolean;
  /** Bytes of one complex grid (16 per sample). */
  gridBytes: number;
  /** The tapers planned for: pass them to propagateShiftedSpectrum as taper and bandTaper. */
  taper: number;
  bandTaper: number;
  /**
   * On every axis: the window's reach plus a gap of κρ lies inside the untapered part of the grid,
   * the landing taper zone is at least κρ wide, and likewise in frequency (the band that reaches
   * the window plus κ/ρ inside the untapered band, a band taper zone of at least κ/ρ). False with a
   * given pitch, taper or size cap that does not allow it, and always without a taper (a sharp cut
   * rings into the window: measured).
   */
  windowClear: boolean;
}

/**
 * The grid for a tilted beam. The window's reach is its half width plus the footprint, W + a (the
 * light that lands in the window left some point of the footprint). Per axis:
 * - band: the envelope frequencies that reach the window, from the direction cosines of the rays
 *   to the corners (and the nearest points to the axis) of the window box widened by the
 *   footprint, less the carrier's; G the largest of them in size.
 * - pitch: `samplesPerPeriod` samples per period of G, and a band 1/(2Δ) ≥ G + 2κ/ρ: a gap of κ/ρ
 *   and a taper zone of κ/ρ beyond G.
 * - size: L/2 ≥ W + a + 2κρ: a gap of κρ and a taper zone of κρ beyond the window's reach.
 * ρ = √(λz·(1 − λ²f_c,other²)/γ³) is the Fresnel scale of the tilted beam along the axis: the
 * width over which one frequency's light lands (the transfer's phase curvature, d(landing)/dg = ρ²).
 * A taper narrower than that, or starting closer than that to the window, rings into it.
 * Every frequency that reaches the window then lands on the grid at full weight, the light wrapping
 * round (at most a beyond the grid's edge) stays off the window, and the band edges are smooth on
 * the scale that matters. The tapers then take the slack that rounding up to an FFT size leaves
 * (up to 0.5). Last, with a target and a tail model, the grid is doubled while the model says the
 * band limit would cut more than the target.
 */
export function shiftedGridFor(req: ShiftedGridRequest): ShiftedGrid {
  const lam = req.wavelength;
  const z = req.z;
  const oneD = !!req.oneD;
  const gamma = carrierCosine(req.carrier, lam);
  const centre: [number, number] = req.centre ? [req.centre[0], req.centre[1]] : landingCentre(req.carrier, lam, z);
  if (oneD) centre[1] = 0;
  const q = req.samplesPerPeriod ?? 4;
  const kappa = req.taperZones ?? 2;
  const target = req.target;
  const maxN = req.maxSamples ?? (oneD ? 2 ** 20 : 2 ** 14);
  const axes: (0 | 1)[] = oneD ? [0] : [0, 1];
  const reach: [number, number] = [req.window[0] + req.footprint[0], oneD ? 0 : req.window[1] + req.footprint[1]];
  const rho: [number, number] = [0, 0];
  for (const i of axes) {
    const other = req.carrier[1 - i]!;
    rho[i] = Math.sqrt((z * lam * (1 - lam * lam * other * other)) / gamma ** 3);
  }
  // Direction-cosine frequencies of rays to the window box's corners and to its points nearest the
  // other axis's zero (where a component is largest for a given X): their hull bounds the box's.
  const xs = [centre[0] - reach[0], centre[0] + reach[0]];
  const ys = oneD ? [0] : [centre[1] - reach[1], centre[1] + reach[1]];
  const clampY = oneD ? [0] : [Math.min(Math.max(0, ys[0]!), ys[1]!)];
  const clampX = [Math.min(Math.max(0, xs[0]!), xs[1]!)];
  const lo: [number, number] = [Infinity, Infinity];
  const hi: [number, number] = [-Infinity, -Infinity];
  const visit = (X: number, Y: number) => {
    if (oneD) {
      // Conical: the y component stays the carrier's.
      const f = frequencyLandingAt(X, req.carrier[1], lam, z) - req.carrier[0];
      lo[0] = Math.min(lo[0], f);
      hi[0] = Math.max(hi[0], f);
      return;
    }
    const R = Math.sqrt(X * X + Y * Y + z * z);
    const f = [X / (lam * R) - req.carrier[0], Y / (lam * R) - req.carrier[1]];
    for (const i of axes) {
      lo[i] = Math.min(lo[i]!, f[i]!);
      hi[i] = Math.max(hi[i]!, f[i]!);
    }
  };
  for (const X of xs) for (const Y of [...ys, ...clampY]) visit(X, Y);
  for (const X of clampX) for (const Y of ys) visit(X, Y);
  const G: [number, number] = [0, 0];
  const pitch: [number, number] = [0, 0];
  const samples: [number, number] = [1, 1];
  for (const i of axes) {
    G[i] = Math.max(Math.abs(lo[i]!), Math.abs(hi[i]!));
    let p: number;
    if (req.pitch) p = req.pitch[i]!;
    else {
      p = Math.min(1 / (q * G[i]!), 1 / (2 * (G[i]! + (2 * kappa) / rho[i]!)));
      if (req.maxPitch) p = Math.min(p, req.maxPitch[i]!);
    }
    if (!(p > 0 && Number.isFinite(p))) throw new Error(`shiftedGridFor: no finite pitch along ${i === 0 ? 'x' : 'y'} (give maxPitch)`);
    pitch[i] = p;
    samples[i] = Math.min(maxN, nextFastFftSize(Math.ceil((2 * (reach[i]! + 2 * kappa * rho[i]!)) / p)));
  }
  // Per axis, the landing taper's least and largest fraction (zone κρ; gap κρ), and the band's.
  const half = (i: number) => (samples[i]! * pitch[i]!) / 2;
  const nyq = (i: number) => 0.5 / pitch[i]!;
  const landingNeed = (i: number) => (kappa * rho[i]!) / half(i);
  const landingRoom = (i: number) => (half(i) - reach[i]! - kappa * rho[i]!) / half(i);
  const bandNeed = (i: number) => kappa / (rho[i]! * nyq(i));
  const bandRoom = (i: number) => (nyq(i) - G[i]! - kappa / rho[i]!) / nyq(i);
  const fits = (need: (i: number) => number, room: (i: number) => number) => Math.max(...axes.map(need)) <= Math.min(...axes.map(room));
  // Each axis alone has room for its landing taper at the size above; one fraction for both axes
  // may need a little more: the axis that needs the wider fraction, or has the least room, goes to
  // its next FFT size until one fraction fits (the rounding up to powers of two used to leave that
  // slack by chance).
  for (let k = 0; k < 200 && !fits(landingNeed, landingRoom); k++) {
    const needs = axes.map(landingNeed), rooms = axes.map(landingRoom);
    const tight = new Set([axes[needs.indexOf(Math.max(...needs))]!, axes[rooms.indexOf(Math.min(...rooms))]!]);
    let grown = false;
    for (const i of tight) {
      const next = nextFastFftSize(samples[i]! + 1);
      if (next > maxN) continue;
      samples[i] = next;
      grown = true;
    }
    if (!grown) break;
  }
  if (!req.pitch) {
    // One fraction serves both axes: where one axis's need exceeds another's room, the needing
    // axis gets twice the samples (landing) or half the pitch (band) until they fit.
    for (let k = 0; k < 8 && !fits(landingNeed, landingRoom); k++) {
      const i = axes.reduce((b, j) => (landingNeed(j) > landingNeed(b) ? j : b), axes[0]!);
      if (samples[i]! * 2 > maxN) break;
      samples[i] *= 2;
    }
    for (let k = 0; k < 8 && !fits(bandNeed, bandRoom); k++) {
      const i = axes.reduce((b, j) => (bandNeed(j) > bandNeed(b) ? j : b), axes[0]!);
      if (samples[i]! * 2 > maxN) break;
      pitch[i] /= 2;
      samples[i] *= 2;
    }
  }
  const clampTaper = (t: number) => Math.min(0.5, Math.max(0, t));
  const tau = req.taper ?? clampTaper(Math.min(...axes.map(landingRoom)));
  const tauBand = req.bandTaper ?? clampTaper(Math.min(...axes.map(bandRoom)));
  for (const t of [tau, tauBand]) if (!(t >= 0 && t <= 0.5)) throw new Error(`shiftedGridFor: a taper must be in [0, 0.5], got ${t}`);
  const shape = (): GridShape => ({ nx: samples[0], ny: oneD ? 1 : samples[1], dx: pitch[0], dy: oneD ? 0 : pitch[1], wavelength: lam });
  let band = shiftedBand(shape(), z, req.carrier, centre, req.tail, tau, tauBand);
  let met = !!req.tail && target !== undefined && band.cutEstimate <= target;
  while (req.tail && target !== undefined && !met) {
    // Double the axis whose band limit cuts more (by the same estimate, one axis at a time).
    let best: 0 | 1 | null = null;
    let bestCut = Infinity;
    for (const i of axes) {
      if (samples[i]! * 2 > maxN) continue;
      samples[i] *= 2;
      const cut = shiftedBand(shape(), z, req.carrier, centre, req.tail, tau, tauBand).cutEstimate;
      samples[i] /= 2;
      if (cut < bestCut) {
        bestCut = cut;
        best = i;
      }
    }
    if (best === null || bestCut >= band.cutEstimate) break;
    samples[best] *= 2;
    band = shiftedBand(shape(), z, req.carrier, centre, req.tail, tau, tauBand);
    met = band.cutEstimate <= target;
  }
  const eps = 1e-9;
  let clear = tau > 0 && tauBand > 0;
  for (const i of axes) {
    if (tau < landingNeed(i) * (1 - eps) || tau > landingRoom(i) + eps) clear = false;
    if (tauBand < bandNeed(i) * (1 - eps) || tauBand > bandRoom(i) + eps) clear = false;
  }
  const s = shape();
  return {
    pitch: [s.dx, s.dy],
    samples: [s.nx, s.ny],
    centre,
    reaching: [
      [lo[0], hi[0]],
      oneD ? [0, 0] : [lo[1], hi[1]],
    ],
    fresnelScale: [rho[0], oneD ? 0 : rho[1]],
    band,
    targetMet: met,
    gridBytes: 16 * s.nx * s.ny,
    taper: tau,
    bandTaper: tauBand,
    windowClear: clear,
  };
}
