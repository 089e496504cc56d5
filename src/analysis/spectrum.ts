// A light's spectrum as the lines a case computes: each line one monochromatic propagation, the
// case's intensity their power-weighted sum (mutually incoherent wavelengths add in intensity).
// Weights are fractions of the light's total power (they sum to 1), so the summed intensity is
// relative to the total incident irradiance, as a single line's is to its own.

/** A spectrum as the job gives it, in SI (wavelengths in metres, temperature in kelvin). */
export type SpectrumSource =
  | { kind: 'lines'; lines: { wavelength: number; power: number }[] }
  | { kind: 'band'; from: number; to: number; samples: number }
  | { kind: 'blackbody'; temperature: number; from: number; to: number; samples: number }
  /** A table of spectral power density (any unit per unit wavelength), from a CSV file. */
  | { kind: 'table'; file: string; wavelengths: number[]; density: number[] };

export interface SpectrumLine {
  wavelength: number;
  /** Fraction of the light's total power (the weights sum to 1). */
  weight: number;
}

/** Wavelength samples a band gets when the job does not say (the planner may refine). */
export const DEFAULT_BAND_SAMPLES = 31;

// CODATA 2018 exact values (h, c, k_B).
const H = 6.62607015e-34;
const C = 299792458;
const KB = 1.380649e-23;

/** Planck's law: a blackbody's spectral radiance per unit wavelength, W·m⁻²·sr⁻¹·m⁻¹. */
export function planck(wavelength: number, temperature: number): number {
  const x = (H * C) / (wavelength * KB * temperature);
  return (2 * H * C * C) / wavelength ** 5 / Math.expm1(x);
}

/** The spectral density of a band-like source at a wavelength (relative units). */
function density(s: Exclude<SpectrumSource, { kind: 'lines' }>, lam: number): number {
  if (s.kind === 'band') return lam >= s.from && lam <= s.to ? 1 : 0;
  if (s.kind === 'blackbody') return lam >= s.from && lam <= s.to ? planck(lam, s.temperature) : 0;
  const w = s.wavelengths;
  if (lam < w[0]! || lam > w[w.length - 1]!) return 0;
  let i = 1;
  while (i < w.length - 1 && w[i]! < lam) i++;
  const t = (lam - w[i - 1]!) / (w[i]! - w[i - 1]! || 1);
  return s.density[i - 1]! + t * (s.density[i]! - s.density[i - 1]!);
}

/** The wavelengths the light spans: [shortest, longest]. */
export function spectrumRange(s: SpectrumSource): [number, number] {
  if (s.kind === 'lines') {
    const w = s.lines.map((l) => l.wavelength);
    return [Math.min(...w), Math.max(...w)];
  }
  if (s.kind === 'table') return [s.wavelengths[0]!, s.wavelengths[s.wavelengths.length - 1]!];
  return [s.from, s.to];
}

/** How many samples the source has of itself: lines as given, a band's `samples`, a table's rows. */
export function ownSamples(s: SpectrumSource): number {
  return s.kind === 'lines' ? s.lines.length : s.kind === 'table' ? s.wavelengths.length : s.samples;
}

/**
 * The lines a case computes. Lines as given. A band, a blackbody or a table with `samples` (at
 * least its own): the midpoints of that many equal intervals, each weighted by the density there
 * times the interval (the midpoint rule, exact for a flat band). A table at its own rows: the
 * trapezoid rule on them. Weights are normalised to sum to 1; lines of zero weight are dropped.
 */
export function spectrumLines(s: SpectrumSource, samples = ownSamples(s)): SpectrumLine[] {
  let raw: SpectrumLine[];
  if (s.kind === 'lines') {
    raw = s.lines.map((l) => ({ wavelength: l.wavelength, weight: l.power }));
  } else if (s.kind === 'table' && samples <= s.wavelengths.length) {
    const w = s.wavelengths;
    raw = w.map((lam, i) => ({ wavelength: lam, weight: s.density[i]! * ((w[Math.min(i + 1, w.length - 1)]! - w[Math.max(i - 1, 0)]!) / 2) }));
  } else {
    const [lo, hi] = spectrumRange(s);
    const n = Math.max(1, samples);
    const step = (hi - lo) / n;
    raw = Array.from({ length: n }, (_, i) => {
      const lam = lo + (i + 0.5) * step;
      return { wavelength: lam, weight: density(s, lam) * step };
    });
  }
  const total = raw.reduce((t, l) => t + l.weight, 0);
  if (!(total > 0)) throw new Error('the spectrum carries no power (every weight is 0)');
  return raw.filter((l) => l.weight > 0).map((l) => ({ wavelength: l.wavelength, weight: l.weight / total }));
}

/** The power-weighted mean wavelength: the case's one wavelength where a single value is asked. */
export function meanWavelength(lines: readonly SpectrumLine[]): number {
  return lines.reduce((t, l) => t + l.weight * l.wavelength, 0);
}

/** The source in words, for reasons and the report. */
export function spectrumWords(s: SpectrumSource, samples = ownSamples(s)): string {
  const nm = (m: number) => `${Number((m * 1e9).toPrecision(5))} nm`;
  if (s.kind === 'lines') return s.lines.length === 1 ? `one line at ${nm(s.lines[0]!.wavelength)}` : `${s.lines.length} lines from ${nm(spectrumRange(s)[0])} to ${nm(spectrumRange(s)[1])}`;
  const [lo, hi] = spectrumRange(s);
  const what = s.kind === 'band' ? 'a flat band' : s.kind === 'blackbody' ? `a ${Number(s.temperature.toPrecision(6))} K blackbody` : `the spectrum of ${s.file}`;
  return `${what} from ${nm(lo)} to ${nm(hi)} in ${samples} samples`;
}
