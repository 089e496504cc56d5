// The planner's accuracy rules and warning thresholds, in one place so that tests and the
// documentation refer to the same numbers. Where a number is a judgement rather than a published
// value, the comment says so.
export const LIMITS = {
  /**
   * Work units (the plans' \`work\`) one core gets through per second: a direct Fourier sum's
   * multiply-add counts 8 and ran at 5.5–5.7 ns (1.4e9 per second, dft.ts); the exact sums' pairs
   * were calibrated to the same rate; 1e9 leaves room for a slower or busier machine.
   */
  workPerSecond: 1e9,
  /** Power allowed outside a planner-chosen window (sets the window margin). */
  windowLossTarget: 0.02,
  /** Power each grating order may lose beyond a planner-chosen window (its powers are reported to 1 %). */
  orderLossTarget: 0.002,
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
  /**
   * Warn when more than this fraction of the power is evanescent (never reaches the screen). Every
   * sharp edge sends some light beyond 90° (a pinhole of diameter D about 2λ/(π²D) of it, from the
   * Airy tail), so the warning is kept for features within about ten wavelengths.
   */
  evanescentWarn: 0.01,
  /**
   * Samples per period of the finest spatial frequency that reaches the window (2 = Nyquist); a
   * judgement, measured against the Fresnel-integral and Airy references (test/physics): 4 keeps
   * errors near 0.25 % of the peak, 8 near 0.06 %. 1-D problems are cheap enough for 8.
   */
  oversampling2D: 4,
  oversampling1D: 8,
  /**
   * Samples across the smallest feature. Aliased copies of the mask spectrum fall off as
   * 1/(π·samples) in amplitude; 1-D problems are cheap, so they get more.
   */
  featureSamples2D: 16,
  featureSamples1D: 64,
  /** Fewer samples than this across the smallest feature is a warning. */
  minSamplesPerFeature: 4,
  /** Largest FFT of the single-FFT Fresnel form per axis. */
  maxSingleFft: 16384,
  /** Cells of margin around the aperture for the cell-response correction of direct sums. */
  compensationMargin: 8,
  /** Power beyond the angular spectrum's band limit above which the padding is doubled (measured: 4× padding took a slit at N_F = 3 from 0.5 % to 0.03 % error). */
  bandLimitTarget: 1e-3,
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
  /** A Gaussian beam's window reaches this many beam radii: 6w is 3× the D4σ width, the integration area ISO 11146 asks for second-moment widths (from memory). */
  beamWindow: 3,
  /** The window is never narrower than this many times the illuminated aperture. */
  minWindowOverAperture: 1.05,
  /**
   * Largest paraxial phase where a single element's light lands, weighted by the light there (rad;
   * plan/paraxial.ts paraxialEstimate): about λ/125 at the peak. The dropped phase is mostly linear
   * across a small aperture: it shifts the light at a point by Δφ/2π of its local fringe or lobe,
   * which changes the intensity there by about (I/I_peak)·Δφ times the pattern's steepest relative
   * slope (0.27 for a sinc² lobe: the largest g·|g′| of g = sin v/v, for a shift of Δφ/2 in v), so
   * the weighted phase enters the error linearly. Measured against the exact integral: 0.23–0.37 of
   * the weighted phase as a fraction of the peak (random-small-apertures.ts: slits of 1.4–4 λ at
   * 9–36 λ, 2.2–3.2 % off at 0.068–0.098 rad; a tilted grating of 54 λ, 2.2 % at 0.095 rad), so
   * 0.05 keeps it under the 2 % the property tests hold (paraxialPhase's 0.1 let 3 % through).
   */
  paraxialWeightedPhase: 0.05,
  /**
   * Largest paraxial phase of a gap between planes in sequence (unweighted, over the lit region)
   * and of a thin lens's own kR⁴/(8f³) under the Fresnel forms (rad); a judgement (≈ λ/60).
   */
  paraxialPhase: 0.1,
  /**
   * A thin lens under an exact method: its own spherical aberration (kR⁴/(8f³)) above this is
   * warned. Lower than paraxialPhase because against a defocused or aberrated pupil the error
   * enters linearly, |ΔI| ≲ 2φ√(I·I₀) (measured: a case at 0.095 rad was 4.8 % off); a judgement.
   */
  lensSphericalPhase: 0.02,
  /**
   * The same behind an obstacle in a plane wave, where the weight is 2|U_hole| and an error shows
   * linearly against the free wave: about 1 % of the peak (measured: an opaque strip at 0.1 rad
   * weighted came out 2.4 % off against the exact integral).
   */
  paraxialPhaseBabinet: 0.03,
  /**
   * A thin lens under a paraxial form: the largest relative error in positions, about NA²/2 (the
   * tangent against the sine of the cone's steepest ray), for the form to be valid; a judgement.
   */
  lensParaxialPosition: 0.01,
  /** Largest estimated peak error of the far-field formula for it to be chosen. */
  farFieldPeakError: 0.002,
  /** Warn when a forced far-field formula's estimated peak error exceeds this. */
  farFieldPeakErrorWarn: 0.01,
  /** A window whose steepest ray from the aperture has sin θ above this takes in nearly every direction. */
  steepWindow: 0.9,
  /** Error (fraction of the peak) the exact 2-D sums with exact edge cells are sampled for. */
  rsExactTarget: 1e-3,
  /** Largest error (fraction of the peak) the exact 2-D sums' area-sampled edge cells may add. */
  rsAreaError: 0.002,
  /** Below this fraction of a Gaussian beam's power passing, the result is its far tail: warned. */
  littleLight: 1e-9,
  /** Distances below this many wavelengths get the scalar-theory warning too; a judgement. */
  vectorDistance: 1,
  /** Features below this many wavelengths get the scalar-theory warning; a judgement. */
  vectorFeature: 4,
} as const;

/**
 * The default memory limit of a run (--max-memory). Here rather than in the planner so that the
 * command line can start its workers before it loads the planner (run/crew.ts).
 */
export const DEFAULT_MAX_MEMORY = 4 * 1024 ** 3;
