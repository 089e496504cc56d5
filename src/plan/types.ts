import type { Aperture, Illumination } from '../optics/aperture.js';
import type { Axis } from '../optics/field.js';
import type { MethodRequest } from '../job/schema.js';
import type { WarningCode } from '../warnings/catalogue.js';
import type { SpectrumSource } from '../analysis/spectrum.js';
import type { SpectrumPlan } from './spectrum.js';
import type { SpectrometerSetup } from '../analysis/spectrometer.js';
import type { CaseSource, FlatLight } from './curved-light.js';

export type MethodName = 'angular-spectrum' | 'fresnel' | 'fraunhofer' | 'rayleigh-sommerfeld';
export type FresnelForm = 'transfer-function' | 'single-fft' | 'direct' | 'lens-chirp' | 'planes';
/**
 * The exact integral summed over the aperture's cells, one period's field summed over a grating's
 * periods, or (a plane wave at normal incidence) as an integral along the aperture's boundary.
 */
export type RsForm = 'direct' | 'per-period' | 'boundary';
/** The angular spectrum in the frame of a tilted beam: carrier taken out, window shifted to where it lands. */
export type AsForm = 'shifted';
export type MethodForm = FresnelForm | RsForm | AsForm;
export type Regime = 'near-field' | 'transition' | 'far-field';
/** one-d: invariant along y; separable: x-problem × y-problem; two-d: a full 2-D grid. */
export type Layout = 'one-d' | 'separable' | 'two-d';

/** A warning on a case: build it with warning() from src/warnings/catalogue.ts, which holds every code and its wording. */
export interface Warning {
  code: WarningCode;
  message: string;
}

/** One computed case: a point of the job's sweep. */
export interface Case {
  job: string;
  index: number;
  /** Folder name, unique within the job. */
  id: string;
  wavelength: number;
  distance: number;
  aperture: Aperture;
  /**
   * Planes after the first (the aperture), in order: each element `after` metres behind the one
   * before; `distance` is then from the last plane to the screen (plan/sequence.ts).
   */
  planes?: PlaneSpec[];
  illumination: Illumination;
  /**
   * Light of several wavelengths at once (the job's spectrum): the case's intensity is the
   * power-weighted sum of its lines' intensities on one output grid (plan/spectrum.ts); `wavelength`
   * is then the spectrum's mean.
   */
  spectrum?: SpectrumSource;
  /**
   * Light curved at the aperture (a point source, a Gaussian waist before it, an extended source):
   * `illumination` is then the flat light that stands in for it (plan/curved-light.ts).
   */
  source?: CaseSource;
  grid?: { size?: number; pitch?: number };
  window?: [number, number];
  method: MethodRequest;
  /** Values of the swept keys for this case, by dotted key path (SI units). */
  swept: Record<string, number>;
  /** lineMaps: a spectrum's per-wavelength maps written beside the sum (line-<λ>.npy). */
  output: { npy: 'float64' | 'float32'; logDecades: number; zoom?: { centre: [number, number]; width: number }; lineMaps?: boolean };
  /** What to measure beyond the standard metrics (the job's detector, search and orders keys). */
  analysis: CaseAnalysis;
}

/**
 * One padded FFT grid for a group of a sweep's cases (plan/shared-grids.ts): per axis the pitch,
 * the source samples and the padded size; how many cases share it and the work estimates that
 * made the planner share (all the cases together, and the sum of each on its own grid).
 */
export interface SharedGrid {
  pitch: [number, number];
  samples: [number, number];
  padded: [number, number];
  cases: number;
  sharedWork: number;
  soloWork: number;
}

export interface PlaneSpec {
  /** Distance from the previous plane (m). */
  after: number;
  aperture: Aperture;
}

/**
 * One leg of a sequence: from plane `from` (0 = the aperture) to the next plane or the screen,
 * the lit region sampled at the start and the window evaluated at the end (plan/sequence.ts).
 */
export interface SequenceLeg {
  /** Distance (m). */
  z: number;
  /** Samples of the start plane's lit region, per axis. */
  input: [Axis, Axis];
  /** Where the leg's field is evaluated: the next plane's window, or the screen's. */
  output: [Axis, Axis];
  /** The start plane's lens (focal length, m) folded into the leg's chirp, or null. */
  focal: number | null;
  /** The Fresnel approximation's phase error over the leg (rad): what it drops, kρ⁴/(8z³), between the lit region and the window. */
  paraxialPhase: number;
  /** Whether the end plane's window is narrower than its element (the light's estimate): its loss is then checked. */
  windowFromLight: boolean;
  /**
   * 'sum': the Fresnel integral's two matrix products onto the end's own points; 'spectrum': the
   * angular spectrum on `grid`, an FFT grid on the lattice both ends' samples lie on (for gaps where
   * wide light barely spreads).
   */
  form: 'sum' | 'spectrum';
  grid?: [Axis, Axis];
  /** A spectrum leg hands its field on as computed (no curvature) rather than in the sums' form. */
  flat?: boolean;
  /** The start plane's element has edges in the light: its cells' response is removed first. */
  cellResponse: boolean;
}

export interface DetectorRequest {
  kind: 'pinhole' | 'square';
  size: number;
  /** Centre in the observation plane; absent: the spot's centroid. */
  at?: [number, number];
}

export interface CaseAnalysis {
  detectors: DetectorRequest[];
  smallestSpot?: { between: [number, number]; measure: 'energy' | 'fwhm' | 'd4sigma' };
  /** Orders of different wavelengths closer than this on the screen count as overlapping. */
  orderOverlap?: number;
  /** The camera lens's focal length for the orders' linear dispersion in its focal plane (orders.focal_length). */
  focalLength?: number;
  /**
   * The wavelength range [from, to] used in one order (orders.use), with the light's wavelengths
   * [lowest, highest] that order sorting considers: the job's wavelength sweep, or the range itself
   * when the job has one wavelength.
   */
  orderUse?: { from: number; to: number; order: number; light: [number, number] };
  /** Fractions whose passing pinhole diameter is wanted at a converging lens's focus (search.pinhole.passing). */
  pinholePassing?: number[];
  /** The job's spectrometer: slit, lenses and detector around the grating (analysis/spectrometer.ts). */
  spectrometer?: SpectrometerSetup;
}

export interface AxisPlan {
  /** Pitch of the aperture-plane samples. */
  inputPitch: number;
  /** Aperture-plane samples (before padding). */
  inputSamples: number;
  /** Samples after zero padding (FFT methods); equals inputSamples for direct methods. */
  paddedSamples: number;
  /** Output samples: the observation window. */
  output: Axis;
  /** Half extent of the illuminated aperture along this axis. */
  apertureHalf: number;
  windowHalf: number;
  windowCentre: number;
  /** The pitch the accuracy rules asked for, and which rule set it. */
  requiredPitch: number;
  pitchRule: string;
  /**
   * The per-period sums (a grating): the output pitch is s·(period/p), and one period's field is
   * evaluated on the lattice of pitch period/p.
   */
  periodic?: { p: number; s: number };
}

export interface Checks {
  /** a in N_F = a²/(λz), per axis. */
  fresnelNumbers: [number, number | null];
  /** N_F used for the regime (with a Gaussian beam narrower than the aperture, the beam's). */
  effectiveFresnelNumber: number;
  /** 2D²/λ with D the largest aperture dimension (common practice far-field distance). */
  farFieldDistance: number;
  /**
   * The paraxial approximation's error where the light lands: over the window, the largest
   * peak-to-peak variation across the aperture of the phase it drops, weighted by the share of the
   * peak intensity the planner's model puts there (rad; see plan/paraxial.ts).
   */
  paraxialPhaseError: number;
  /** Where that error is largest, the unweighted phase variation there and the weight. */
  paraxialWorst?: { at: [number, number]; phase: number; weight: number };
  /** Goodman's sufficient condition z³ ≫ (π/4λ)·max ρ⁴ as the ratio (π/4λ)ρ⁴/z³ over the window. */
  goodmanRatio: number;
  /** The aperture's quadratic phase π·N_F that the far-field formula neglects (rad). */
  farFieldPhaseError: number;
  /**
   * Estimated relative error of the far-field formula's peak: (πN_F)²/12 for a uniformly lit
   * aperture (on-axis 4sin²(πN_F/2) against (πN_F)²), (z_R/z)² for a Gaussian beam narrower than
   * the aperture (w(z)² = w_ff²(1 + z_R²/z²)); behind an obstacle, the error of the interference
   * of the hole's field with the free beam, relative to the beam.
   */
  farFieldPeakError: number;
  /** Estimated fraction of power outside the window (before computing). */
  windowLossEstimate: number;
  /** Smallest feature over wavelength. */
  featureOverWavelength: number;
  /** Samples across the smallest feature. */
  samplesPerFeature: number;
  /** Fresnel TF sampling: Δx / (λz/L); ≥ 1 is adequately sampled (Voelz). */
  transferSampling?: number;
  /** Band-limit frequency (1/m) of the angular spectrum, per axis. */
  bandLimit?: [number, number | null];
  /**
   * Fraction of the power through the aperture (∫|U₀|²) that the aperture sends into evanescent
   * waves (spatial frequencies above 1/λ), as the planner's model of the light predicts it (for a
   * grating: the thin-grating powers of the orders with |sin θ_m| > 1). It never reaches the screen.
   */
  evanescentFraction?: number;
}

/** A method the planner considered, whether it is valid here, and what it would cost. */
export interface MethodOption {
  method: MethodName;
  form?: MethodForm;
  valid: boolean;
  /** Why it is not valid (when it is not). */
  why?: string;
  memoryBytes?: number;
  work?: number;
  /** Within the memory and time limits. */
  fits?: boolean;
}

/** A beam of the planner's light model (src/plan/light.ts), as plain data. */
export interface PlannedBeam {
  order: number | null;
  dir: [number, number];
  power: number;
  propagates: boolean;
  landing: [number, number] | null;
}

export interface Plan {
  case: Case;
  regime: Regime;
  method: MethodName;
  form?: MethodForm;
  layout: Layout;
  /** Opaque apertures: U = U_free − U_open (Babinet). */
  babinet: boolean;
  x: AxisPlan;
  y: AxisPlan | null;
  checks: Checks;
  /** Where the planner expects the light: every beam (grating order) it sized the window for. */
  beams: PlannedBeam[];
  /** Every method considered, valid or not, with its cost: advice is chosen from these. */
  options: MethodOption[];
  reasons: string[];
  warnings: Warning[];
  /** Estimated peak memory of the case (bytes), counting a kept source spectrum (sharedSpectrum). */
  memoryBytes: number;
  /**
   * Set by shareSourceSpectra when other cases of the run propagate the same padded source (a
   * sweep in distance on one grid): the source's spectrum is computed once and kept. `id` names
   * the source (a digest of aperture, light and grid); `cases` is how many cases share it.
   */
  sharedSpectrum?: { id: string; cases: number };
  /** Rough count of floating-point operations, for ordering and progress. */
  work: number;
  /** A Gaussian beam's radius at the observation plane (m). */
  beamRadius?: number;
  /**
   * The shifted angular spectrum (form 'shifted'): the window's centre the grid is shifted to, and
   * the tapers of its band limit (src/optics/shifted-spectrum.ts).
   */
  shifted?: { centre: [number, number]; taper: number; bandTaper: number };
  /** The exact 2-D sums with exact edge cells: nodes per edge cell (per axis) and the path taken. */
  exact2D?: { edgeNodes: number; path: 'direct' | 'mirror' | 'radial' };
  /** Planes in sequence (form 'planes'): one leg per gap, the last to the screen. */
  sequence?: { legs: SequenceLeg[] };
  /** Several wavelengths (case.spectrum): the lines and their plans on the case's output grid. */
  spectrum?: SpectrumPlan;
  /** Set when the case cannot be computed as planned (it is then reported, not run). */
  error?: string;
  /** Curved light (case.source): the flat-light plan computed in its place, and how its result maps back. */
  flatLight?: FlatLight;
}
