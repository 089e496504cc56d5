// The pure optics layer: fields, masks, sources and propagators (SI units, no I/O).
export * from './field.js';
export * from './aperture.js';
export { sampleMask2D, sampleProfile } from './mask.js';
export { sourceField1D, sourceField2D, directionCosines, carrierFrequencies, envelope, type Source } from './source.js';
export {
  padField,
  propagateAngularSpectrum,
  propagateFresnelTransfer,
  compensateCellResponse,
  bandLimitFrequency,
  cellResponse,
  type SpectralReport,
} from './spectral.js';
export { propagateFresnelDirect, propagateFarField, propagateFarFieldSeparable } from './direct.js';
export { freeField, complementInPlace } from './free.js';
export { nextPowerOfTwo, isPowerOfTwo, isFastFftSize, nextFastFftSize, nextEvenFastFftSize, binFrequency } from './fft.js';
export { singleThreadEngine, type Engine } from './engine.js';
export { createFftKernel, type FftKernel } from './fft-fast.js';
export { dft1, dft2, dft2AtPoints } from './dft.js';
export { rsDirect1D, rsPerPeriod1D, periodicAxis, cellsFromIntervals, rsMaxCell, rsAreaSamplingError, rsDirect2D, costRsDirect1D, costRsPerPeriod1D, costRsDirect2D, RS_PHASE_BUDGET, rsCells2DFromAperture, rsSum2D, rs2DSampling, costRsSum2D, type Interval, type Light1D, type RsCells, type PeriodicAperture, type RsCells2D } from './rayleigh-sommerfeld.js';
export { propagateShiftedSpectrum, restoreCarrier, shiftedGridFor } from './shifted-spectrum.js';
export { hankel1 } from './hankel.js';
