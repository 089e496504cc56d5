// The planner's accuracy rules and warning thresholds, in one place so that tests and the
// documentation refer to the same numbers. Where a number is a judgement rather than a published
// value, the comment says so.
export const LIMITS = {
  /** Power allowed outside a planner-chosen window (sets the window margin). */
  windowLossTarget: 0.02,
  /** Warn when more than this fraction of the power falls outside the window (measured). */
  windowLossWarn: 0.05,
  /** Warn when the window holds more power than went through the aperture by this fraction. */
  powerExcessWarn: 0.01,
  /** Warn when more than this fraction of the power sits in the outer frame of an FFT grid. */
  edgeEnergyWarn: 1e-3,
  /** Width of that frame, as a fraction of the padded grid per side. */
  edgeFrame: 1 / 16,
  /** Warn when the band limit drops more than this fraction of the spectral power. */
  bandLimitWarn: 0.01,
  /** Warn when more than this fraction of the spectral power is evanescent. */
  evanescentWarn: 1e-3,
  /** Samples per finest spatial frequency that reaches the window (2 = Nyquist); a judgement. */
  oversampling: 4,
  /** Samples across the smallest feature on FFT grids and for direct sums. */
  featureSamplesFft: 16,
  featureSamplesDirect: 16,
  /** Fewer samples than this across the smallest feature is a warning. */
  minSamplesPerFeature: 4,
  /** Cells of margin around the aperture for the cell-response correction of direct sums. */
  compensationMargin: 8,
  /** Zero padding factor of FFT methods (at least 2 against wrap-around). */
  padding: 2,
  minSamples1D: 256,
  minSamples2D: 64,
  minOutput1D: 2001,
  maxOutput1D: (1 << 18) + 1,
  minOutput2D: 401,
  maxOutput2D: 2049,
  /** A Gaussian beam is sampled out to this many beam radii (amplitude e^{-9} beyond). */
  gaussianReach: 3,
  /** A Gaussian beam's window reaches this many beam radii at the screen. */
  beamWindow: 1.6,
  /** The window is never narrower than this many times the illuminated aperture. */
  minWindowOverAperture: 1.05,
  /** Largest peak-to-peak quartic phase for paraxial methods (rad); a judgement (≈ λ/60). */
  paraxialPhase: 0.1,
  /** Largest π·N_F for the far-field formula to be chosen (peak error ≈ (πN_F)²/12 ≈ 0.2 %). */
  farFieldPhase: 0.16,
  /** Warn when a forced far-field formula neglects more than this (peak error ≈ 1 %). */
  farFieldPhaseWarn: 0.35,
  /** Features below this many wavelengths get the scalar-theory warning; a judgement. */
  vectorFeature: 4,
} as const;
