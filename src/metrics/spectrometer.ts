// A spectrometer in one job (the job's `spectrometer` mapping): the detector's signal per pixel and
// the answers about each line on it, computed by analysis/spectrometer.ts from the case's grating
// and light. The signal is written as detector.csv and detector.png (output/detector-files.ts);
// summary.csv carries the spectral width per pixel, the bandpass and the closest pair's dip.
import type { Aperture } from '../optics/aperture.js';
import { spectrometerGratingOf, spectrometerInput } from '../plan/spectrometer.js';
import type { Plan } from '../plan/types.js';
import { spectrometerSignal, type DetectorPair, type SpectrometerResult, type SpectrometerSetup } from '../analysis/spectrometer.js';
import { metric, type MetricFamily } from './types.js';

/** What the detector is computed with, in one paragraph (result.json, the report). */
export const SPECTROMETER_MODEL =
  'Entrance slit evenly lit and incoherent across its width, at the front focus of an aberration-free collimator; the grating lit by the collimated light over its whole width (its periods × period); thin-grating scalar theory, each slit point\'s plane wave diffracted exactly in direction cosines (sin θ = sin θ_i + mλ/d and the grating\'s full angular spectrum, no obliquity factor); an aberration-free camera lens large enough for every order that reaches the detector, x = f·tan(θ − θ_camera); each pixel integrates the light falling on its width, over the whole slit height; pixel values good to about 2e-4 of the brightest pixel. Signal: the fraction of all the light on the grating (every wavelength together) that reaches the pixel.';

/** The answers of analysis/spectrometer.ts without the per-pixel arrays, with the model and setup. */
export type SpectrometerMetrics = Pick<SpectrometerResult, 'cameraAngle' | 'reciprocalDispersion' | 'perPixel' | 'bandpass' | 'anamorphic' | 'slitImage' | 'lines' | 'ordersNotListed' | 'pairs'> & {
  model: string;
  setup: SpectrometerSetup;
  /** Fraction of all the light on the grating that reaches the detector. */
  powerOnDetector: number;
};

/** The per-pixel arrays behind detector.csv and detector.png. */
export interface DetectorSignal {
  positions: Float64Array;
  wavelengths: Float64Array;
  signal: Float64Array;
  /** CIE 1931 tristimulus values per pixel (detector-colour.png). */
  xyz: { X: Float64Array; Y: Float64Array; Z: Float64Array };
}

/** One line of the case's light: its wavelength, share and the element at that wavelength. */
export interface LineLight {
  wavelength: number;
  weight: number;
  aperture: Aperture;
}


/** The detector of a spectrometer case: its metrics and its signal (null without one; its warning is the plan's). */
export function spectrometerPart(plan: Plan, lines: LineLight[]): { metrics: SpectrometerMetrics; signal: DetectorSignal } | null {
  const input = spectrometerInput(plan);
  if (!input) return null;
  const r = spectrometerSignal(
    input.setup,
    input.grating,
    lines.map((l) => ({ wavelength: l.wavelength, weight: l.weight, profile: spectrometerGratingOf(l.aperture)!.profile })),
  );
  let power = 0;
  for (const v of r.signal) power += v;
  return {
    metrics: {
      model: SPECTROMETER_MODEL,
      setup: input.setup,
      cameraAngle: r.cameraAngle,
      reciprocalDispersion: r.reciprocalDispersion,
      perPixel: r.perPixel,
      bandpass: r.bandpass,
      anamorphic: r.anamorphic,
      slitImage: r.slitImage,
      powerOnDetector: power,
      lines: r.lines,
      ordersNotListed: r.ordersNotListed,
      pairs: r.pairs,
    },
    signal: { positions: r.positions, wavelengths: r.wavelengths, signal: r.signal, xyz: r.xyz },
  };
}

/** The closest pair's dip on the detector (the first pair in the table: lowest order, shortest wavelengths). */
function closestPair(pairs: DetectorPair[] | undefined): DetectorPair | undefined {
  if (!pairs?.length) return undefined;
  return pairs.reduce((b, p) => (p.wavelengths[1] - p.wavelengths[0] < b.wavelengths[1] - b.wavelengths[0] ? p : b));
}

export const spectrometerMetrics: MetricFamily = {
  key: 'spectrometer',
  quantities: ({ cases }) =>
    cases.some((c) => c.analysis.spectrometer)
      ? [
          metric('detector_per_pixel', 'spectral width per pixel at the detector centre', 'm', (s) => s.metrics.spectrometer?.perPixel, { plot: true }),
          metric('detector_bandpass', 'bandpass at the detector centre (largest of slit, diffraction, 2 pixels)', 'm', (s) => {
            const b = s.metrics.spectrometer?.bandpass;
            return b ? Math.max(b.slit, b.diffraction, b.pixels) : undefined;
          }, { plot: true }),
          metric('detector_power', 'fraction of the light on the grating reaching the detector', '1', (s) => s.metrics.spectrometer?.powerOnDetector),
          metric('detector_closest_pair_dip', 'dip between the closest pair of lines on the pixels', '1', (s) => closestPair(s.metrics.spectrometer?.pairs)?.dip, { plot: true }),
        ]
      : [],
  definitions: {
    spectrometer:
      'the job\'s spectrometer (slit, collimator, grating, camera, pixels): cameraAngle the camera axis\'s direction from the grating normal (rad); reciprocalDispersion d·cos θ_c/(|m|·f_camera) at the detector centre (m of wavelength per m), perPixel that times the pixel; bandpass: slit w·d·cos θ_i/(|m|·f_collimator), diffraction λ/(|m|·N), pixels 2 × perPixel, and which is largest; anamorphic cos θ_i/cos θ_c; slitImage the slit\'s geometric image w·(f_camera/f_collimator)·anamorphic; lines: every line in every order that lands on the detector (the 40 brightest orders of each line; ordersNotListed counts the rest), with its position (m from the centre), fractional pixel, power (fraction of that line\'s light on the grating), geometric slit image, diffraction FWHM 0.886·λ·f/(W·cos θ), the computed image\'s FWHM before the pixels, and the local reciprocal dispersion; pairs: neighbouring lines closer than three bandpasses, read on the pixel signal (dip = valley over the lower maximum; resolved by Rayleigh\'s 8/π², sparrow: any dip); the signal per pixel is detector.csv',
  },
};
