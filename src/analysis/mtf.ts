// The modulation transfer function from a computed point-spread function: the OTF is the 2-D Fourier
// transform of the PSF (the intensity in the screen plane of a lens's focus) normalised to 1 at zero
// frequency, the MTF its modulus (Goodman, Introduction to Fourier Optics, §6.2–6.3). Read along the
// x and y frequency axes and averaged over rings of |ν|, at frequencies in cycles per metre and as
// fractions of the incoherent cut-off ν_c = D/(λz).
//
// The transform is the Engine's fft2 (optics/engine.ts): the kernel the propagation itself ran on,
// fast, and tested against fft.js to 1e-12 (test/optics/fft-fast.test.ts); arrays come from the
// engine's allocate. The tests run the same analysis on fft.js's fft2Reference and get the same curve.
//
// The window: the computed map holds the PSF's core, not its wings (an Airy pattern's power outside
// radius ρ falls only as 2/(πv), v = πDρ/(λz)). Normalised by the window's own power the MTF comes
// out too high by about the power it lost, 1 − η, at every frequency below ~ν_c/2 (measured on the
// planner's window for a uniformly lit stop at its focus, η = 0.984: +0.017 at low frequencies,
// +0.006 at ν_c/2). The lost power is known, though: a lossless propagation delivers the whole power
// through the pupil to the screen (Parseval), and the wings' transform lies almost wholly below the
// window's own frequency resolution 1/L. So the transform is divided by the whole power (or the
// window's, where numerical excess makes that the larger): on the same window, for the Airy pattern
// in closed form, the MTF is then within 1e-3 of Goodman's curve from 1/(2L) up. Below 1/(2L) the
// missing wings still show (up to 1 − η); `resolvedFrom` says where that ends. A window holding less
// than 99.5 % of the power marks the result approximate all the same.
import type { Engine } from '../optics/engine.js';
import { nextPowerOfTwo } from '../optics/fft.js';
import { isOneD } from '../model/grid.js';
import type { IntensityMap } from '../model/intensity-map.js';

/** Below this fraction of the power in the window the MTF is flagged approximate. */
export const MTF_WINDOW_FRACTION = 0.995;
/** At least this many frequency samples from 0 to the reference frequency (zero-padding adds them). */
const MIN_SAMPLES_TO_CUTOFF = 100;
/** Blocks are summed up to this fraction of the size at which aliases would reach the band's top. */
const BLOCK_MARGIN = 0.8;
/** The padded transform's side is at most this (or the map's own power of two, if larger): 64 MB. */
const MAX_PADDED = 2048;

/** What the MTF needs to know of the pupil besides the PSF. */
export interface MtfPupil {
  wavelength: number;
  /** Distance from the pupil (the lens) to the screen (m). */
  distance: number;
  /** Diameter of the circular stop (m): a sharp cut-off D/(λz); null: no stop. */
  stopDiameter: number | null;
  /** The Gaussian beam's 1/e² intensity diameter on the lens (2w), or null: a plane wave (uniform pupil). */
  beamDiameter: number | null;
  /** The PSF's whole power (the power through the pupil), or null: unknown (the window's is used). */
  totalPower: number | null;
}

/** The transform as the analysis uses it: an Engine, or anything with its fft2 and arrays (fft.js in tests). */
export type MtfTransform = Pick<Engine, 'fft2' | 'allocate' | 'release'>;

export interface MtfCurve {
  /** Spatial frequency (cycles per metre), from 0 in equal steps. */
  frequency: Float64Array;
  /** frequency / the reference frequency (the cut-off, or the nominal one without a stop). */
  normalised: Float64Array;
  /** |OTF| along the fx axis (fy = 0) and the fy axis (fx = 0). */
  x: Float64Array;
  y: Float64Array;
  /** |OTF| averaged over the ring |ν| = frequency (the pupil is round). */
  azimuthal: Float64Array;
  /** (2/π)(arccos ν − ν√(1 − ν²)) of a uniformly lit circular stop (Goodman §6.3); null without one. */
  diffractionLimited: Float64Array | null;
}

export interface MtfSummary {
  /** Reference frequency (cycles/m): the incoherent cut-off D/(λz) of the stop, or 2w/(λz) without one. */
  cutoff: number;
  /** 'stop': a sharp cut-off; 'beam': a Gaussian pupil's nominal value, where the MTF is e^{−2}, not zero. */
  cutoffKind: 'stop' | 'beam';
  /** Azimuthal-average MTF at half the reference frequency. */
  atHalfCutoff: number | null;
  /** The diffraction-limited value there, when the reference applies (0.391). */
  diffractionLimitedAtHalfCutoff: number | null;
  /** Where the azimuthal average first falls to 0.5 (cycles/m), and as a fraction of the reference. */
  mtf50: number | null;
  mtf50Normalised: number | null;
  /** Fraction of the PSF's whole power inside the window (null: whole power unknown). */
  windowFraction: number | null;
  /** Whether the transform was divided by the whole power or by the window's. */
  normalisation: 'whole-power' | 'window-power';
  /** True where the window holds less than 99.5 % of the power (MTF_WINDOW_FRACTION) or the PSF is under-sampled. */
  approximate: boolean;
  /** Why it is approximate, in words (empty when it is not). */
  approximateWhy: string[];
  /** 1/(2L), L the window's larger side: below it the window's truncation of the PSF shows (up to 1 − windowFraction). */
  resolvedFrom: number;
  /** Frequency step of the curve (cycles/m), the samples summed per block [x, y], and the padded transform's size. */
  step: number;
  block: [number, number];
  transformSize: [number, number];
}

export interface MtfResult {
  summary: MtfSummary;
  curve: MtfCurve;
}

/** (2/π)(arccos ν − ν√(1 − ν²)) for 0 ≤ ν ≤ 1, 0 beyond: the uniformly lit circular pupil (Goodman §6.3). */
export function diffractionLimitedMtf(nu: number): number {
  if (!(nu >= 0)) return 1;
  if (nu >= 1) return 0;
  return (2 / Math.PI) * (Math.acos(nu) - nu * Math.sqrt(1 - nu * nu));
}

/**
 * The MTF of the PSF in `map` (a 2-D map; null for 1-D maps and empty ones). The map's samples are
 * taken as point samples of the PSF: the transform of the samples is the PSF's continuous transform
 * wherever the PSF is band-limited below the Nyquist frequency 1/(2Δx), as an incoherent image is
 * (to ν_c); an under-sampled map is flagged.
 */
export function mtfOf(map: IntensityMap, pupil: MtfPupil, fft: MtfTransform): MtfResult | null {
  if (isOneD(map)) return null;
  const { nx, ny, dx, dy } = map;
  const lz = pupil.wavelength * pupil.distance;
  const cutoffKind = pupil.stopDiameter !== null ? 'stop' : 'beam';
  const diameter = pupil.stopDiameter ?? pupil.beamDiameter;
  if (diameter === null || !(diameter > 0)) return null;
  const cutoff = diameter / lz;
  // The band the curve spans: just past a sharp cut-off (to show it), further for a Gaussian pupil,
  // whose MTF e^{−(λzν)²/(2w²)} is e^{−2} at the nominal value and 1 % at 1.5 times it.
  const span = (cutoffKind === 'stop' ? 1.1 : 1.5) * cutoff;

  let windowPower = 0;
  for (let i = 0; i < map.intensity.length; i++) windowPower += map.intensity[i]!;
  windowPower *= dx * dy;
  if (!(windowPower > 0)) return null;

  // The PSF is usually sampled far finer than its band needs (the lens form's pitch follows the
  // window, not ν_c), so it is summed in blocks of bx × by samples first: that is a box filter and a
  // decimation, whose transform is the PSF's times the known Dirichlet factor sin(πνb·d)/(b·sin(πνd))
  // (divided out below) plus aliases from multiples of 1/(b·d), which fall outside the band as long
  // as 1/(b·d) − band > span (the incoherent PSF holds nothing above ν_c; a Gaussian pupil's
  // e^{−2a²} is 1.5e−8 at three times the nominal value). The same curve from a transform a few
  // hundred samples wide instead of thousands.
  const band = cutoffKind === 'stop' ? cutoff : 3 * cutoff;
  const block = (d: number) => Math.max(1, Math.floor(BLOCK_MARGIN / (d * (span + band))));
  const bx = block(dx);
  const by = block(dy);
  const nbx = Math.ceil(nx / bx);
  const nby = Math.ceil(ny / by);
  // Padded transform sizes: the binned map fits (no wrap), and at least MIN_SAMPLES_TO_CUTOFF steps
  // to the reference frequency (zero-padding interpolates the continuous transform of the window).
  // Powers of two, though the engine's kernels take any 5-smooth size: the transform is passed in
  // (MtfTransform) and may be fft.js's, the reference the curve is checked against, which takes
  // powers of two only. The transform is small beside the case's own (at most MAX_PADDED a side).
  const side = (n: number, d: number) => {
    let m = nextPowerOfTwo(n);
    const wanted = nextPowerOfTwo(Math.ceil(MIN_SAMPLES_TO_CUTOFF / (cutoff * d)));
    while (m < wanted && m < MAX_PADDED) m *= 2;
    return m;
  };
  const mx = side(nbx, bx * dx);
  const my = side(nby, by * dy);
  const data = fft.allocate(2 * mx * my);
  for (let r = 0; r < ny; r++) {
    const src = r * nx;
    const dst = 2 * Math.floor(r / by) * mx;
    for (let c = 0; c < nx; c++) data[dst + 2 * Math.floor(c / bx)] += map.intensity[src + c]!;
  }
  fft.fft2(data, mx, my, false);
  // DFT × cell area is the continuous transform; at zero frequency it is the window's power.
  const whole = pupil.totalPower !== null && pupil.totalPower > 0 ? pupil.totalPower : null;
  const norm = whole !== null && whole > windowPower ? whole : windowPower;
  const scale = (dx * dy) / norm;
  const stepX = 1 / (mx * bx * dx);
  const stepY = 1 / (my * by * dy);
  /** |b·sin(πνd)/sin(πνbd)|: the block sum's factor undone (1 at ν = 0 and for b = 1). */
  const unblock = (f: number, b: number, d: number) => (b === 1 || f === 0 ? 1 : Math.abs((b * Math.sin(Math.PI * f * d)) / Math.sin(Math.PI * f * b * d)));
  const modulus = (kx: number, ky: number) => {
    const i = 2 * ((((ky % my) + my) % my) * mx + (((kx % mx) + mx) % mx));
    return Math.hypot(data[i]!, data[i + 1]!) * scale * unblock(kx * stepX, bx, dx) * unblock(ky * stepY, by, dy);
  };

  const step = stepX;
  const nyquist = Math.min(1 / (2 * dx), 1 / (2 * dy));
  const top = Math.min(span, nyquist);
  const count = Math.floor(top / step + 1e-9) + 1;
  const frequency = new Float64Array(count);
  const x = new Float64Array(count);
  const y = new Float64Array(count);
  for (let k = 0; k < count; k++) {
    const f = k * step;
    frequency[k] = f;
    x[k] = modulus(k, 0);
    // Along fy on the same frequencies: its own bins when the steps agree (square pixels, equal
    // padding), else linear interpolation between them.
    const ky = f / stepY;
    const k0 = Math.floor(ky + 1e-9);
    const t = ky - k0;
    y[k] = t < 1e-9 ? modulus(0, k0) : (1 - t) * modulus(0, k0) + t * modulus(0, k0 + 1);
  }
  // Rings of width `step` about each frequency: every bin with |ν| within half a step of it.
  const ringSum = new Float64Array(count);
  const ringN = new Float64Array(count);
  const kxMax = Math.min(mx / 2, Math.ceil((top + step) / stepX));
  const kyMax = Math.min(my / 2, Math.ceil((top + step) / stepY));
  for (let ky = -kyMax; ky <= kyMax; ky++) {
    const fy = ky * stepY;
    for (let kx = -kxMax; kx <= kxMax; kx++) {
      const k = Math.round(Math.hypot(kx * stepX, fy) / step);
      if (k >= count) continue;
      ringSum[k]! += modulus(kx, ky);
      ringN[k]! += 1;
    }
  }
  fft.release(data);
  const azimuthal = new Float64Array(count);
  for (let k = 0; k < count; k++) azimuthal[k] = ringN[k]! > 0 ? ringSum[k]! / ringN[k]! : NaN;
  // The whole PSF's OTF is 1 at zero frequency by definition; the window's transform there is its
  // share of the power (η), which says nothing of the MTF.
  x[0] = 1;
  y[0] = 1;
  azimuthal[0] = 1;

  const normalised = frequency.map((f) => f / cutoff);
  const uniform = pupil.stopDiameter !== null && pupil.beamDiameter === null;
  const diffractionLimited = uniform ? normalised.map(diffractionLimitedMtf) : null;

  const windowFraction = whole !== null ? windowPower / whole : null;
  const why: string[] = [];
  if (windowFraction !== null && windowFraction < MTF_WINDOW_FRACTION) {
    why.push(
      `the window holds ${(100 * windowFraction).toFixed(2)} % of the power (less than ${100 * MTF_WINDOW_FRACTION} %): the PSF's wings outside it are missing, which shows below ${fmtPerMm(1 / (2 * Math.max(nx * dx, ny * dy)))} and may move values elsewhere by up to ${(1 - windowFraction).toFixed(3)}`,
    );
  }
  if (whole === null) why.push("the PSF's whole power is not known: the MTF is normalised to the window's power");
  if (cutoffKind === 'stop' && cutoff > nyquist) {
    why.push(`the map's pitch samples frequencies up to ${fmtPerMm(nyquist)} only, below the cut-off ${fmtPerMm(cutoff)}: the PSF is under-sampled and its MTF aliased`);
  }
  const half = valueAt(frequency, azimuthal, cutoff / 2);
  const mtf50 = firstBelow(frequency, azimuthal, 0.5);
  const summary: MtfSummary = {
    cutoff,
    cutoffKind,
    atHalfCutoff: half,
    diffractionLimitedAtHalfCutoff: uniform ? diffractionLimitedMtf(0.5) : null,
    mtf50,
    mtf50Normalised: mtf50 !== null ? mtf50 / cutoff : null,
    windowFraction,
    normalisation: norm === windowPower ? 'window-power' : 'whole-power',
    approximate: why.length > 0,
    approximateWhy: why,
    resolvedFrom: 1 / (2 * Math.max(nx * dx, ny * dy)),
    step,
    block: [bx, by],
    transformSize: [mx, my],
  };
  return { summary, curve: { frequency, normalised, x, y, azimuthal, diffractionLimited } };
}

function fmtPerMm(perMetre: number): string {
  return `${(perMetre / 1e3).toPrecision(3)} cycles/mm`;
}

/** Linear interpolation of v at frequency f (null outside the sampled band). */
function valueAt(freq: Float64Array, v: Float64Array, f: number): number | null {
  const n = freq.length;
  if (n < 2 || f < freq[0]! || f > freq[n - 1]!) return null;
  const step = freq[1]! - freq[0]!;
  const k = Math.min(n - 2, Math.floor((f - freq[0]!) / step));
  const t = (f - freq[k]!) / step;
  const a = v[k]!;
  const b = v[k + 1]!;
  return Number.isFinite(a) && Number.isFinite(b) ? (1 - t) * a + t * b : null;
}

/** The first frequency where v falls to `level`, interpolated linearly between samples (null: it does not, in the band). */
function firstBelow(freq: Float64Array, v: Float64Array, level: number): number | null {
  for (let k = 1; k < freq.length; k++) {
    const a = v[k - 1]!;
    const b = v[k]!;
    if (a >= level && b < level) return freq[k - 1]! + ((a - level) / (a - b)) * (freq[k]! - freq[k - 1]!);
  }
  return null;
}
