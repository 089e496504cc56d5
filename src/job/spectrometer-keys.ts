// The spectrometer mapping (issue 14 §6): an entrance slit in the focal plane of a collimator lens,
// the job's aperture as the grating in the collimated light, a camera lens and a detector of pixels
// in its focal plane. The detector's signal and the answers are computed per case by
// analysis/spectrometer.ts; the job's screen at `distance` is computed as before, beside it.
import { z } from 'zod';
import { dispersingOrder } from './order-keys.js';
import { mappingError, positiveLength, sweepLength, WAVELENGTH } from './quantities.js';

/** Orders the camera may be pointed at: |m| up to this, not 0 (order 0 does not disperse). */
export const CAMERA_ORDER_MAX = 100;
/** Pixels along the dispersion: up to this many (a long linear array has about 10⁴). */
export const DETECTOR_PIXELS_MAX = 100_000;

const pixelsMsg = `expected the number of pixels along the dispersion: a whole number from 2 to ${DETECTOR_PIXELS_MAX}`;

const centre = z.strictObject(
  {
    wavelength: positiveLength(WAVELENGTH),
    order: dispersingOrder('the order the camera is pointed at', CAMERA_ORDER_MAX),
  },
  { error: mappingError("expected a mapping such as {wavelength: '589.3 nm', order: 1}: the wavelength and order at the detector's centre") },
);

export const spectrometerSchema = z.strictObject(
  {
    /** The entrance slit's width (sweepable, as the three lengths below: which slit resolves the lines?). */
    slit: sweepLength(),
    /** The collimator lens's focal length (the slit is at its front focus). */
    collimator: sweepLength(),
    /** The camera lens's focal length (the detector is at its back focus). */
    camera: sweepLength(),
    /** The detector's pixel pitch along the dispersion. */
    pixel: sweepLength(),
    pixels: z.number({ error: pixelsMsg }).int({ error: pixelsMsg }).min(2, { error: pixelsMsg }).max(DETECTOR_PIXELS_MAX, { error: pixelsMsg }),
    /** The camera's axis: where this wavelength leaves in this order. */
    centre,
  },
  { error: mappingError("expected a mapping such as {slit: '20 um', collimator: '300 mm', camera: '300 mm', pixel: '13.5 um', pixels: 2048, centre: {wavelength: '589.3 nm', order: 1}}") },
);

export type SpectrometerJob = z.output<typeof spectrometerSchema>;

/** The keys whose values are lengths (for schema.ts's unit table). */
export const SPECTROMETER_LENGTH_KEYS = ['slit', 'collimator', 'camera', 'pixel', 'centre.wavelength'] as const;

/** The sweepable keys and their tokens in case folder names. */
export const SPECTROMETER_SWEEPS = { slit: 'slit', collimator: 'fcol', camera: 'fcam', pixel: 'px' } as const;
