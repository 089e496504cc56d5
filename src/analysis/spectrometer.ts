// A grating spectrometer in one job (issue 14 §6): an entrance slit in the focal plane of a
// collimator lens, the job's grating lit by the collimated light, a camera lens, and a detector of
// pixels in the camera's focal plane. What reaches each pixel is computed for every line, in
// closed form, from the thin grating's exact angular spectrum:
//
// - A point u of the slit becomes, after the collimator (an ideal lens, focal length f₁), a plane
//   wave at sin α(u) = sin(α − atan(u/f₁)) on the grating, α the incidence of the collimator's axis.
// - The field just behind a thin grating lit by it is t(ξ)·e^{i2πξ sin α/λ}; its angular spectrum at
//   the direction cosine s is T((s − sin α)/λ), T the transform of the whole grating
//   (periodTransform × the array factor sin(πNfd)/sin(πfd)). The power per unit s is
//   P(s − sin α) = |T|²/(λ·W), W = N·d the lit width, so ∫P ds is the fraction of the light on the
//   grating that it passes (Parseval). Exact in direction cosines: incidence only shifts it.
// - The camera (an ideal lens, focal length f₂) pointed at β_c sends the direction β to
//   x = f₂·tan(β − β_c) on the detector.
// - The slit's points are mutually incoherent and evenly lit: their powers add. A pixel
//   [x_a, x_b] receives ∫ over the slit of ∫_{s(x_a)}^{s(x_b)} P(s − sin α(u)) ds du / w, which is
//   differences of the first and second running integrals of P (C and D below): no sampling of the
//   slit or of the pixel, only of P, at 32 samples per fringe λ/W of its array factor (pixel values
//   good to about 2e-4 of the brightest; the few that come out below zero by less are set to 0).
//
// Model limits, said in the output: scalar thin-grating theory (order powers unreliable where λ/d is
// large: the warning detector-powers-scalar), aberration-free lenses large enough to take every
// order that reaches the detector, no obliquity factor (as the order table's shares), the lines
// along the slit not followed (each pixel column is the whole slit height).
import type { GratingProfile } from '../optics/grating-profile.js';
import { periodTransformer } from '../optics/grating-transform.js';
import { colourMatching } from './colour.js';
import { readTwoLines, RAYLEIGH_DIP } from './resolution.js';

export interface SpectrometerSetup {
  /** Entrance slit width (m). */
  slit: number;
  /** Collimator and camera focal lengths (m). */
  collimator: number;
  camera: number;
  /** Detector pixel pitch (m) and number of pixels along the dispersion. */
  pixel: number;
  pixels: number;
  /** The wavelength (m) and order the camera's axis is pointed at: the detector's centre. */
  centre: { wavelength: number; order: number };
}

export interface SpectrometerGrating {
  period: number;
  /** The periods the collimated light covers (the whole grating). */
  count: number;
  /** sin α of the collimator's axis (the slit's centre). */
  sinIncidence: number;
}

export interface SpectrometerLine {
  wavelength: number;
  /** Its share of the light (the weights of a spectrum add up to 1). */
  weight: number;
  /** The grating's profile at this wavelength (a phase profile's phase goes as 1/λ). */
  profile: GratingProfile;
}

/** One line in one order that lands on the detector. */
export interface DetectorLine {
  wavelength: number;
  order: number;
  /** Diffraction angle of the slit's centre (rad) and where it lands (m from the detector's centre). */
  angle: number;
  position: number;
  /** The same as a fractional pixel index (0 … pixels−1, centres). */
  pixel: number;
  /** Fraction of the line's light on the grating that lands on the detector in this order. */
  power: number;
  /** The geometric image of the slit, w·(f₂/f₁)·(cos α/cos β) (m), and the grating's diffraction FWHM 0.886·λf₂/(W·cos β) (m). */
  slitImage: number;
  diffractionWidth: number;
  /** The FWHM of the computed image before the pixels (m; null where it runs off the detector). */
  imageFwhm: number | null;
  /** Reciprocal linear dispersion here, d·cos β/(|m|·f₂) (m of wavelength per m on the detector). */
  reciprocalDispersion: number;
}

export interface DetectorPair {
  order: number;
  wavelengths: [number, number];
  /** Fractional pixel indices where the two lines land. */
  pixels: [number, number];
  /** The valley over the lower of the two pixel maxima (1: one maximum); null within two pixels. */
  dip: number | null;
  resolved: boolean;
  sparrow: boolean;
  /** The instrument's bandpass at the pair (the largest of slit, diffraction and two pixels, m). */
  bandpass: number;
}

export interface SpectrometerResult {
  /** Direction of the camera's axis from the grating normal (rad). */
  cameraAngle: number;
  /** At the detector's centre: d·cos β_c/(|m|·f₂) (m/m) and per pixel (m). */
  reciprocalDispersion: number;
  perPixel: number;
  /** Bandpass contributions at the centre (m of wavelength): slit w·d·cos α/(|m|·f₁), diffraction λ/(|m|N), two pixels. */
  bandpass: { slit: number; diffraction: number; pixels: number; largest: 'slit' | 'diffraction' | 'pixels' };
  /** Anamorphic magnification cos α/cos β_c and the slit's geometric image at the centre (m). */
  anamorphic: number;
  slitImage: number;
  /** Pixel centres (m from the detector's centre), the centre order's wavelength there, the signal (fraction of all the light on the grating). */
  positions: Float64Array;
  wavelengths: Float64Array;
  signal: Float64Array;
  /** The signal's CIE 1931 tristimulus values per pixel, Σ weight·power·[x̄, ȳ, z̄](λ) (for the colour strip). */
  xyz: { X: Float64Array; Y: Float64Array; Z: Float64Array };
  lines: DetectorLine[];
  /** Orders of the lines that land on the detector but are not in `lines` (beyond the ORDERS_LISTED brightest of each line). */
  ordersNotListed: number;
  pairs: DetectorPair[];
}

/**
 * Samples of P per fringe λ/W of the array factor. Measured on 60 random setups against 256 per
 * fringe: 16 leave pixel values off by up to 1.4e-3 of the brightest pixel, 32 by 1.2e-4.
 */
export const SAMPLES_PER_FRINGE = 32;
/** What the pixel values are good to, relative to the brightest pixel (said in the model's words). */
export const PIXEL_ACCURACY = 2e-4;
/**
 * Sub-slits whose incidence is taken as even in sin α (the slit's mapping to sin α is not): at
 * least 16, and enough that each spans at most 5 mrad (the density's change across one is then
 * under 0.5 %·tan α), up to 1024.
 */
const SUB_SLITS = 16;
const SUB_SLIT_ANGLE = 5e-3;
const SUB_SLITS_MAX = 1024;
/** Most samples of P one line may need (four arrays of doubles: 256 MiB). */
export const DETECTOR_SAMPLES_MAX = 8_000_000;
/** Above this λ/d thin-grating order powers are unreliable (scalar domain; Loewen & Popov, Diffraction Gratings and Applications, ch. 4, from memory). */
export const SCALAR_LIMIT = 0.2;
/** Orders of one line listed (the brightest that land on the detector). */
export const ORDERS_LISTED = 40;
/** Pairs closer than this many bandpasses are read for resolution. */
export const CLOSE_PAIR_BANDPASSES = 3;

/** The grating's power per unit direction cosine, P(σ) = |T(σ/λ)|²/(λW), for σ = s − sin α. */
export function anglePower(profile: GratingProfile, period: number, count: number, wavelength: number, sigma: number): number {
  return anglePowerOf(profile, period, count, wavelength)(sigma);
}

/** anglePower as a function of σ alone (the profile's constants computed once). */
export function anglePowerOf(profile: GratingProfile, period: number, count: number, wavelength: number): (sigma: number) => number {
  const transform = periodTransformer(profile, period);
  return (sigma) => powerAt(transform, period, count, wavelength, sigma);
}

function powerAt(transform: (f: number) => [number, number], period: number, count: number, wavelength: number, sigma: number): number {
  const f = sigma / wavelength;
  const [re, im] = transform(f);
  const u = f * period;
  const r = u - Math.round(u);
  // |sin(πNu)/sin(πu)| is periodic in u with period 1 (both change sign together, or N even): the
  // remainder keeps the arguments small.
  const af = Math.abs(r) < 1e-13 ? count : Math.sin(Math.PI * count * r) / Math.sin(Math.PI * r);
  return ((re * re + im * im) * af * af) / (wavelength * count * period);
}

/** The detector's centre direction, or an error saying why there is none. */
export function cameraAngle(setup: SpectrometerSetup, g: SpectrometerGrating): number {
  const s = g.sinIncidence + (setup.centre.order * setup.centre.wavelength) / g.period;
  if (!(Math.abs(s) < 1)) {
    throw new Error(`spectrometer.centre: order ${setup.centre.order} of ${(setup.centre.wavelength * 1e9).toPrecision(6)} nm does not leave the grating (sin θ = ${s.toFixed(4)}): choose another order or wavelength`);
  }
  return Math.asin(s);
}

/**
 * P on a uniform grid, at the nodes and the midpoints, read as the quadratic through the three on
 * each interval (its error falls as the cube of the step: see SAMPLES_PER_FRINGE), with its
 * running integrals C = ∫P and D = ∫C exact for that quadratic (Simpson's rule at the nodes). Pixels and slits far narrower than a sample are then integrated as finely as wide
 * ones.
 */
interface Running {
  lo: number;
  h: number;
  P: Float64Array;
  Pm: Float64Array;
  C: Float64Array;
  D: Float64Array;
}

function runningIntegrals(line: SpectrometerLine, g: SpectrometerGrating, lo: number, hi: number, h: number): Running {
  const n = Math.max(2, Math.ceil((hi - lo) / h) + 1);
  const P = new Float64Array(n);
  const Pm = new Float64Array(n);
  const C = new Float64Array(n);
  const D = new Float64Array(n);
  const at = anglePowerOf(line.profile, g.period, g.count, line.wavelength);
  P[0] = at(lo);
  for (let i = 1; i < n; i++) {
    P[i] = at(lo + i * h);
    Pm[i - 1] = at(lo + (i - 0.5) * h);
    const [a, b, c] = quadratic(P[i - 1]!, Pm[i - 1]!, P[i]!);
    C[i] = C[i - 1]! + h * (a + b / 2 + c / 3);
    D[i] = D[i - 1]! + h * (C[i - 1]! + h * (a / 2 + b / 6 + c / 12));
  }
  return { lo, h, P, Pm, C, D };
}

/** The quadratic a + bτ + cτ² through p0 (τ = 0), pm (½) and p1 (1). */
function quadratic(p0: number, pm: number, p1: number): [number, number, number] {
  return [p0, -3 * p0 + 4 * pm - p1, 2 * p0 - 4 * pm + 2 * p1];
}

/** The interval holding sigma and the fraction into it, or null outside the table. */
function locate(r: Running, sigma: number): [number, number] | null {
  const t = (sigma - r.lo) / r.h;
  if (!(t >= 0 && t < r.C.length - 1)) return null;
  const i = Math.floor(t);
  return [i, t - i];
}

function pAt(r: Running, sigma: number): number {
  const at = locate(r, sigma);
  if (!at) return 0;
  const [i, f] = at;
  const [a, b, c] = quadratic(r.P[i]!, r.Pm[i]!, r.P[i + 1]!);
  return a + f * (b + f * c);
}

function cAt(r: Running, sigma: number): number {
  const at = locate(r, sigma);
  if (!at) return sigma < r.lo ? 0 : r.C[r.C.length - 1]!;
  const [i, f] = at;
  const [a, b, c] = quadratic(r.P[i]!, r.Pm[i]!, r.P[i + 1]!);
  return r.C[i]! + r.h * f * (a + f * (b / 2 + (f * c) / 3));
}

function dAt(r: Running, sigma: number): number {
  const at = locate(r, sigma);
  if (!at) {
    if (sigma < r.lo) return 0;
    const n = r.C.length;
    return r.D[n - 1]! + r.C[n - 1]! * (sigma - (r.lo + (n - 1) * r.h));
  }
  const [i, f] = at;
  const [a, b, c] = quadratic(r.P[i]!, r.Pm[i]!, r.P[i + 1]!);
  return r.D[i]! + r.h * f * (r.C[i]! + r.h * f * (a / 2 + f * (b / 6 + (f * c) / 12)));
}

/** How many sub-slits the slit is cut into (where it is wider than a sample of P). */
export function subSlits(setup: SpectrometerSetup): number {
  const span = 2 * Math.atan(setup.slit / 2 / setup.collimator);
  return Math.min(SUB_SLITS_MAX, Math.max(SUB_SLITS, Math.ceil(span / SUB_SLIT_ANGLE)));
}

/** The slit as sub-slits: edges in sin α (from u = −w/2 to +w/2). */
function slitEdges(setup: SpectrometerSetup, g: SpectrometerGrating, h: number): number[] {
  const alpha = Math.asin(g.sinIncidence);
  const at = (u: number) => Math.sin(alpha - Math.atan(u / setup.collimator));
  const whole = Math.abs(at(setup.slit / 2) - at(-setup.slit / 2));
  // A slit narrower in sin α than a sample of P is a point (its average is its centre's value).
  if (whole <= h) return [at(0)];
  const count = subSlits(setup);
  const edges: number[] = [];
  for (let k = 0; k <= count; k++) edges.push(at(-setup.slit / 2 + (k * setup.slit) / count));
  return edges;
}

/** Power of one line between directions sa < sb, averaged over the slit. */
function bandPower(r: Running, edges: number[], sa: number, sb: number): number {
  if (edges.length === 1) return cAt(r, sb - edges[0]!) - cAt(r, sa - edges[0]!);
  let sum = 0;
  for (let k = 0; k + 1 < edges.length; k++) {
    const a0 = edges[k]!;
    const a1 = edges[k + 1]!;
    sum += (dAt(r, sb - a0) - dAt(r, sb - a1) - dAt(r, sa - a0) + dAt(r, sa - a1)) / (a1 - a0);
  }
  return sum / (edges.length - 1);
}

/** Power per unit direction cosine at s, averaged over the slit. */
function densityAt(r: Running, edges: number[], s: number): number {
  if (edges.length === 1) return pAt(r, s - edges[0]!);
  let sum = 0;
  for (let k = 0; k + 1 < edges.length; k++) sum += (cAt(r, s - edges[k]!) - cAt(r, s - edges[k + 1]!)) / (edges[k + 1]! - edges[k]!);
  return sum / (edges.length - 1);
}

/** The direction cosine seen at detector position x, or NaN beyond grazing. */
function directionAt(betaC: number, camera: number, x: number): number {
  const b = betaC + Math.atan(x / camera);
  return Math.abs(b) < Math.PI / 2 ? Math.sin(b) : NaN;
}

/** The samples of P one line needs across the detector (for the planner's refusal and the work estimate). */
export function detectorSamples(setup: SpectrometerSetup, g: SpectrometerGrating, wavelength: number): number {
  const range = directionRange(setup, g);
  const h = wavelength / (g.count * g.period * SAMPLES_PER_FRINGE);
  return Math.ceil((range[1] - range[0]) / h) + 1;
}

/** [σ_lo, σ_hi]: the directions the detector sees less the slit's incidences. */
function directionRange(setup: SpectrometerSetup, g: SpectrometerGrating): [number, number] {
  const betaC = cameraAngle(setup, g);
  const half = (setup.pixels * setup.pixel) / 2;
  const lim = (x: number) => {
    const b = betaC + Math.atan(x / setup.camera);
    return Math.sin(Math.max(-Math.PI / 2, Math.min(Math.PI / 2, b)));
  };
  const alpha = Math.asin(g.sinIncidence);
  const a0 = Math.sin(alpha - Math.atan(setup.slit / 2 / setup.collimator));
  const a1 = Math.sin(alpha + Math.atan(setup.slit / 2 / setup.collimator));
  return [lim(-half) - Math.max(a0, a1), lim(half) - Math.min(a0, a1)];
}

/** The detector's signal and the answers about every line (weights of the lines add up to 1). */
export function spectrometerSignal(setup: SpectrometerSetup, g: SpectrometerGrating, lines: SpectrometerLine[], opts: { samplesPerFringe?: number } = {}): SpectrometerResult {
  const perFringe = opts.samplesPerFringe ?? SAMPLES_PER_FRINGE;
  const betaC = cameraAngle(setup, g);
  const n = setup.pixels;
  const p = setup.pixel;
  const f2 = setup.camera;
  const mc = setup.centre.order;
  const W = g.count * g.period;
  const alpha = Math.asin(g.sinIncidence);
  const cosA = Math.cos(alpha);
  const positions = new Float64Array(n);
  const wavelengths = new Float64Array(n);
  const edgesS = new Float64Array(n + 1);
  for (let j = 0; j <= n; j++) edgesS[j] = directionAt(betaC, f2, (j - n / 2) * p);
  // The detector's ends as directions: beyond grazing (no direction) the last one that leaves.
  const sFirst = Number.isNaN(edgesS[0]!) ? -1 : edgesS[0]!;
  const sLast = Number.isNaN(edgesS[n]!) ? 1 : edgesS[n]!;
  for (let j = 0; j < n; j++) {
    positions[j] = (j - (n - 1) / 2) * p;
    const s = directionAt(betaC, f2, positions[j]!);
    wavelengths[j] = Number.isNaN(s) ? NaN : ((s - g.sinIncidence) * g.period) / mc;
  }
  const signal = new Float64Array(n);
  const xyz = { X: new Float64Array(n), Y: new Float64Array(n), Z: new Float64Array(n) };
  const [lo, hi] = directionRange(setup, g);
  const out: DetectorLine[] = [];
  let ordersNotListed = 0;
  for (const line of lines) {
    const h = line.wavelength / (W * perFringe);
    const need = Math.ceil((hi - lo) / h) + 1;
    if (need > DETECTOR_SAMPLES_MAX) {
      throw new Error(`spectrometer: the detector spans ${Math.round((hi - lo) / (h * perFringe))} of the grating's resolution elements at ${(line.wavelength * 1e9).toPrecision(6)} nm, more than ${Math.floor(DETECTOR_SAMPLES_MAX / perFringe)} can be computed; use fewer pixels or a shorter camera`);
    }
    // A margin of two samples keeps every query inside the tabulated range.
    const r = runningIntegrals(line, g, lo - 2 * h, hi + 2 * h, h);
    const edges = slitEdges(setup, g, h);
    // The image's width is read with at most 16 sub-slits (a wide slit's finer cut matters to the
    // pixel values, not to a width): every order's image costs the same.
    const imageEdges = edges.length <= SUB_SLITS + 1 ? edges : edges.filter((_, k) => k % Math.ceil((edges.length - 1) / SUB_SLITS) === 0 || k === edges.length - 1);
    const [xb, yb, zb] = colourMatching(line.wavelength);
    for (let j = 0; j < n; j++) {
      const sa = edgesS[j]!;
      const sb = edgesS[j + 1]!;
      if (Number.isNaN(sa) || Number.isNaN(sb)) continue;
      // (A value below zero is the interpolation's error near a zero of P, under PIXEL_ACCURACY.)
      const v = line.weight * Math.max(0, bandPower(r, edges, sa, sb));
      signal[j] = signal[j]! + v;
      xyz.X[j] = xyz.X[j]! + v * xb;
      xyz.Y[j] = xyz.Y[j]! + v * yb;
      xyz.Z[j] = xyz.Z[j]! + v * zb;
    }
    // The orders that land on the detector.
    const landing: DetectorLine[] = [];
    const q = g.period / line.wavelength;
    const mLo = Math.ceil((-1 - g.sinIncidence) * q);
    const mHi = Math.floor((1 - g.sinIncidence) * q);
    for (let m = mLo; m <= mHi; m++) {
      const s = g.sinIncidence + m / q;
      if (!(Math.abs(s) < 1)) continue;
      const beta = Math.asin(s);
      if (!(Math.abs(beta - betaC) < Math.PI / 2)) continue;
      const x = f2 * Math.tan(beta - betaC);
      if (!(Math.abs(x) <= (n * p) / 2)) continue;
      const cosB = Math.cos(beta);
      const slitImage = (setup.slit * f2 * cosA) / (setup.collimator * cosB);
      const diffractionWidth = (0.8859 * line.wavelength * f2) / (W * cosB);
      const rd = (g.period * cosB) / (Math.abs(m) * f2);
      // The order's own light on the detector: its interval between the neighbouring orders' midpoints.
      const sHalf = line.wavelength / g.period / 2;
      const sa = Math.max(sFirst, s - sHalf);
      const sb = Math.min(sLast, s + sHalf);
      const power = sb > sa ? Math.max(0, bandPower(r, edges, sa, sb)) : 0;
      landing.push({
        wavelength: line.wavelength,
        order: m,
        angle: beta,
        position: x,
        pixel: x / p + (n - 1) / 2,
        power,
        slitImage,
        diffractionWidth,
        imageFwhm: null,
        reciprocalDispersion: rd,
      });
    }
    // A coarse grating can put hundreds of orders on the detector: the brightest are listed (and
    // their images measured), the rest counted.
    landing.sort((a, b) => b.power - a.power);
    for (const l of landing.slice(0, ORDERS_LISTED)) {
      l.imageFwhm = imageFwhm(r, imageEdges, betaC, f2, l.position, Math.max(l.slitImage, l.diffractionWidth), Math.min(l.slitImage, l.diffractionWidth), (n * p) / 2);
      out.push(l);
    }
    ordersNotListed += Math.max(0, landing.length - ORDERS_LISTED);
  }
  out.sort((a, b) => a.wavelength - b.wavelength || a.order - b.order);
  const cosC = Math.cos(betaC);
  const reciprocalDispersion = (g.period * cosC) / (Math.abs(mc) * f2);
  const slitBand = (setup.slit * g.period * cosA) / (Math.abs(mc) * setup.collimator);
  const diffBand = setup.centre.wavelength / (Math.abs(mc) * g.count);
  const pixBand = 2 * p * reciprocalDispersion;
  const largest = slitBand >= diffBand && slitBand >= pixBand ? 'slit' : diffBand >= pixBand ? 'diffraction' : 'pixels';
  return {
    cameraAngle: betaC,
    reciprocalDispersion,
    perPixel: p * reciprocalDispersion,
    bandpass: { slit: slitBand, diffraction: diffBand, pixels: pixBand, largest },
    anamorphic: cosA / cosC,
    slitImage: (setup.slit * f2 * cosA) / (setup.collimator * cosC),
    positions,
    wavelengths,
    signal,
    xyz,
    lines: out,
    ordersNotListed,
    pairs: detectorPairs(signal, out, setup, g),
  };
}

/** FWHM of one line's image (before the pixels) about x, sampled at a 16th of its narrower width scale. */
function imageFwhm(r: Running, edges: number[], betaC: number, f2: number, x: number, wide: number, narrow: number, half: number): number | null {
  const step = Math.max(narrow / 16, wide / 400);
  const reach = Math.ceil((2 * wide + 4 * narrow) / step);
  const q = (k: number) => {
    const xx = x + k * step;
    const s = directionAt(betaC, f2, xx);
    if (Number.isNaN(s)) return 0;
    // Per unit length: ds/dx = cos(β)·/(f₂(1 + (x/f₂)²)).
    const b = betaC + Math.atan(xx / f2);
    return (densityAt(r, edges, s) * Math.cos(b)) / (f2 * (1 + (xx / f2) ** 2));
  };
  const vals: number[] = [];
  for (let k = -reach; k <= reach; k++) vals.push(q(k));
  let top = 0;
  for (let i = 1; i < vals.length; i++) if (vals[i]! > vals[top]!) top = i;
  const halfMax = vals[top]! / 2;
  if (!(halfMax > 0)) return null;
  let i = top;
  while (i > 0 && vals[i]! > halfMax) i--;
  let k = top;
  while (k < vals.length - 1 && vals[k]! > halfMax) k++;
  if (vals[i]! > halfMax || vals[k]! > halfMax) return null;
  const left = i + (halfMax - vals[i]!) / (vals[i + 1]! - vals[i]!);
  const right = k - 1 + (vals[k - 1]! - halfMax) / (vals[k - 1]! - vals[k]!);
  const width = (right - left) * step;
  // An image that runs off the detector has no width there.
  if (Math.abs(x) + width / 2 > half) return null;
  return width;
}

/** Neighbouring lines in each order, closer than a few bandpasses, read on the pixels. */
function detectorPairs(signal: Float64Array, lines: DetectorLine[], setup: SpectrometerSetup, g: SpectrometerGrating): DetectorPair[] {
  const out: DetectorPair[] = [];
  const orders = [...new Set(lines.map((l) => l.order))].sort((a, b) => a - b);
  for (const m of orders) {
    const inOrder = lines.filter((l) => l.order === m).sort((a, b) => a.wavelength - b.wavelength);
    for (let i = 1; i < inOrder.length; i++) {
      const [a, b] = [inOrder[i - 1]!, inOrder[i]!];
      if (b.wavelength === a.wavelength) continue;
      const rd = (a.reciprocalDispersion + b.reciprocalDispersion) / 2;
      const lam = (a.wavelength + b.wavelength) / 2;
      const bandpass = Math.max(((a.slitImage + b.slitImage) / 2) * rd, lam / (Math.abs(m) * g.count), 2 * setup.pixel * rd);
      if (b.wavelength - a.wavelength > CLOSE_PAIR_BANDPASSES * bandpass) continue;
      const [pa, pb] = a.pixel < b.pixel ? [a.pixel, b.pixel] : [b.pixel, a.pixel];
      const base = { order: m, wavelengths: [a.wavelength, b.wavelength] as [number, number], pixels: [a.pixel, b.pixel] as [number, number], bandpass };
      if (pb - pa < 2) {
        out.push({ ...base, dip: null, resolved: false, sparrow: false });
        continue;
      }
      const reading = readTwoLines(signal, pa, pb, Math.max(1, (pb - pa) / 2 - 0.5));
      const isMax = (i: number) => signal[i]! >= (signal[i - 1] ?? -Infinity) && signal[i]! >= (signal[i + 1] ?? -Infinity);
      if (!reading || !isMax(reading.peaks[0]) || !isMax(reading.peaks[1])) {
        out.push({ ...base, dip: 1, resolved: false, sparrow: false });
        continue;
      }
      const dip = Math.min(1, reading.dip);
      out.push({ ...base, dip, resolved: dip <= RAYLEIGH_DIP + 1e-9, sparrow: dip < 1 - 1e-9 });
    }
  }
  return out;
}
