// A case with the job's spectrometer: its detector is computed beside the screen (metrics/
// spectrometer.ts), so the plan says what it will compute, adds its work and memory, refuses a
// detector the camera cannot be pointed at or one too wide to compute, and warns where thin-grating
// theory's order powers are unreliable.
import { cameraAngle, DETECTOR_SAMPLES_MAX, detectorSamples, PIXEL_ACCURACY, SAMPLES_PER_FRINGE, SCALAR_LIMIT, subSlits, type SpectrometerGrating, type SpectrometerSetup } from '../analysis/spectrometer.js';
import { gratingOf } from '../elements/registry.js';
import { formatLength } from '../job/units.js';
import type { Aperture } from '../optics/aperture.js';
import type { GratingProfile } from '../optics/grating-profile.js';
import { directionCosines } from '../optics/source.js';
import { warning } from '../warnings/catalogue.js';
import { LIMITS } from './limits.js';
import type { Plan } from './types.js';

/**
 * Seconds per sample of the grating's angular power and per pixel and sub-slit (measured on this
 * machine class, with margin: 62 000 samples in 0.24 s, 100 000 pixels of 16 sub-slits in 1.06 s).
 */
const SECONDS_PER_SAMPLE = 4e-6;
const SECONDS_PER_PIXEL_SUB_SLIT = 7e-7;

/** The grating's profile, period and count (a slits element is a binary amplitude grating), or null. */
export function spectrometerGratingOf(a: Aperture): { profile: GratingProfile; period: number; count: number } | null {
  const g = gratingOf(a);
  if (!g || a.opaque) return null;
  return { profile: g.profile ?? { kind: 'binary-amplitude', duty: g.width / g.period }, period: g.period, count: g.count };
}

/** The setup and grating of a spectrometer case, or null for cases without one. */
export function spectrometerInput(plan: Plan): { setup: SpectrometerSetup; grating: SpectrometerGrating } | null {
  const setup = plan.case.analysis.spectrometer;
  if (!setup) return null;
  const g = spectrometerGratingOf(plan.case.aperture);
  if (!g) throw new Error('spectrometer: the aperture is not a grating (slits or grating)');
  return { setup, grating: { period: g.period, count: g.count, sinIncidence: directionCosines(plan.case.illumination)[0] } };
}

/** The plan with the spectrometer's part added (unchanged without one). */
export function withSpectrometer(plan: Plan, maxWork: number): Plan {
  const input = spectrometerInput(plan);
  if (!input) return plan;
  const { setup, grating } = input;
  const wavelengths = plan.spectrum ? plan.spectrum.lines.map((l) => l.wavelength) : [plan.case.wavelength];
  let error: string | undefined;
  let samples = 0;
  try {
    const beta = cameraAngle(setup, grating);
    samples = Math.max(...wavelengths.map((w) => detectorSamples(setup, grating, w)));
    if (samples > DETECTOR_SAMPLES_MAX) {
      error = `spectrometer: the detector spans about ${Math.round(samples / SAMPLES_PER_FRINGE)} of the grating's resolution elements, more than ${DETECTOR_SAMPLES_MAX / SAMPLES_PER_FRINGE} can be computed; use fewer pixels or a shorter camera`;
    }
    const seconds = wavelengths.length * (samples * SECONDS_PER_SAMPLE + setup.pixels * subSlits(setup) * SECONDS_PER_PIXEL_SUB_SLIT);
    if (!error && seconds * LIMITS.workPerSecond > maxWork) {
      error = `spectrometer: the detector needs about ${Math.round(seconds)} s of computing for the ${wavelengths.length} wavelengths (over the ${Math.round(maxWork / LIMITS.workPerSecond)} s limit): give fewer lines or band samples, fewer pixels, or raise the limit (--accept-large)`;
    }
    const reasons = [
      ...plan.reasons,
      `Spectrometer: slit ${formatLength(setup.slit)}, collimator f = ${formatLength(setup.collimator)}, camera f = ${formatLength(setup.camera)} pointed at ${(beta * 180 / Math.PI).toFixed(3)}° (order ${setup.centre.order} of ${formatLength(setup.centre.wavelength)}), ${setup.pixels} pixels of ${formatLength(setup.pixel)}; each line's detector signal from the grating's exact angular spectrum at ${samples} directions (${SAMPLES_PER_FRINGE} per fringe λ/W, pixel values to about ${PIXEL_ACCURACY} of the brightest), about ${seconds < 0.1 ? '<0.1' : seconds.toFixed(1)} s.`,
    ];
    const ratio = Math.max(...wavelengths.map((w) => w / grating.period));
    const warnings = ratio > SCALAR_LIMIT && !plan.warnings.some((w) => w.code === 'detector-powers-scalar') ? [...plan.warnings, warning('detector-powers-scalar', { ratio, limit: SCALAR_LIMIT })] : plan.warnings;
    return {
      ...plan,
      reasons,
      warnings,
      work: plan.work + seconds * LIMITS.workPerSecond,
      memoryBytes: plan.memoryBytes + 4 * 8 * Math.min(samples, DETECTOR_SAMPLES_MAX) + 5 * 8 * setup.pixels,
      ...(plan.error || !error ? {} : { error }),
    };
  } catch (e) {
    error = (e as Error).message;
    return { ...plan, ...(plan.error ? {} : { error }) };
  }
}
