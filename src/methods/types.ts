// One propagation method (or one form of it) as the rest of the program sees it: what it is
// called, what kind of grid it computes on, where it is valid, how it is sampled and what that
// costs, how it is put in words, and how it propagates. The registry (registry.ts) lists them.
import type { AxisPlan, Case, Checks, Layout, MethodForm, MethodName, MethodOption, Plan, Warning } from '../plan/types.js';
import type { Geometry } from '../plan/geometry.js';
import type { LensParaxial } from '../plan/paraxial.js';
import type { Field } from '../optics/field.js';
import type { Engine } from '../optics/engine.js';
import type { SourceSpectrum, SpectralReport } from '../optics/spectral.js';

/**
 * How a form computes, as the planner's checks, the source-spectrum sharing and the scheduler
 * ask it:
 * - 'transfer': the source on a padded FFT grid, a transfer function, the output on the same
 *   lattice (the angular spectrum, also in a tilted beam's frame; Fresnel's transfer function);
 * - 'single-fft': the source zero-padded onto an FFT grid, one transform onto the lattice λz/(NΔx);
 * - 'direct': sums from the aperture's samples or cells onto the window's own axis.
 */
export type GridKind = 'transfer' | 'single-fft' | 'direct';

/** One way of sampling a case with a method: the axes, the layout and what it costs. */
export interface Sampling {
  /** Set when a size the sampling needs cannot exist (see impossibleSize in the planner). */
  impossible?: string;
  axes: AxisPlan[];
  layout: Layout;
  memory: number;
  work: number;
  shifted?: Plan['shifted'];
  exact2D?: Plan['exact2D'];
}

/** A method's validity where the light lands. */
export interface Validity {
  valid: boolean;
  /** Why it is not valid. */
  why?: string;
  /** Why it is valid (for the reasons). */
  because: string;
}

/** What the planner knows before it samples, for the validity of each method. */
export interface ValidityInputs {
  g: Geometry;
  /** The paraxial approximation's error where the light lands (plan/paraxial.ts), weighted, rad. */
  paraxialError: number;
  /** Where it is largest: the point, the unweighted phase variation there and the weight. */
  paraxial: { at: [number, number]; phase: number; weight: number };
  /** The aperture's quadratic phase π·N_F the far-field formula neglects, rad. */
  farFieldPhase: number;
  /** The far-field formula's estimated relative error at the peak. */
  farFieldError: number;
  /** A thin lens: the paraxial model's error over its cone (plan/paraxial.ts lensParaxial). */
  lens?: LensParaxial;
}

/** What a form's check on its own use needs: the plan's checks, the geometry, and the options for advice. */
export interface UseCheckInputs {
  checks: Checks;
  g: Geometry;
  options: MethodOption[];
}

/** A field a propagation step delivers, with what it measured on the way. */
export interface FieldStep {
  field: Field;
  report?: SpectralReport;
  /** Fraction of the power in the outer frame of the padded FFT grid (wrap-around risk). */
  edge?: number;
}

/** Planes in sequence: the power arriving on the region sampled at a plane, and what its element passes. */
export interface PlanePower {
  /** 1 for the aperture, 2… for the planes after it. */
  plane: number;
  arriving: number;
  passed: number;
  /** The region was the planner's estimate of where the light lands (not the element's extent): its loss is checked. */
  sampledFromLight: boolean;
}

/** A form's propagation of a case: the field on the window and the power through the aperture. */
export interface Propagated extends FieldStep {
  /** Power through the aperture, ∫|U₀|² (per metre of slit length in 1-D); with planes, through the last. */
  powerIn: number;
  /** Planes in sequence: each plane's powers, in order. */
  planes?: PlanePower[];
  /** For a shared source (plan.sharedSpectrum): whether its spectrum was computed here or reused. */
  sourceSpectrum?: 'computed' | 'reused';
}

/**
 * The spectrum of the last shared source a thread computed (plans with sharedSpectrum), kept for the
 * sweep's next distance, with the padded grid the next distance writes into. The runner owns the
 * holder (one per worker thread, or per run in the main thread: src/run/context.ts).
 */
export interface KeptSpectrum {
  key: string;
  spectrum: SourceSpectrum;
  powerIn: number;
  work?: Float64Array;
}

/** Where a thread's kept source spectrum lives between cases (null: none kept). */
export interface SpectrumKeeper {
  kept: KeptSpectrum | null;
}

/** What every form's propagation is given besides the plan. */
export interface PropagationInputs {
  /** The FFT kernel, threads and allocator to propagate with (optics/engine.ts). */
  engine: Engine;
  /** The runner's holder of the kept source spectrum (transfer forms with a shared source). */
  spectra: SpectrumKeeper;
  /** The tilt's carrier frequencies (1/m). */
  carrier: [number, number];
  /** An obstacle in a Gaussian beam: propagated as the beam where the obstacle is not (not Babinet). */
  obstructed: boolean;
}

export interface MethodDescriptor {
  /** The file's name, for messages and tests. */
  id: string;
  method: MethodName;
  /** The plan's form (absent for a method with one form, or its axis-centred form). */
  form?: MethodForm;
  grid: GridKind;
  /**
   * The padded source's spectrum does not depend on the distance: cases of a sweep in distance on
   * one grid can share it (plan/share.ts).
   */
  sharesSourceSpectrum: boolean;
  /** The aperture is divided into cells with exact edges, not sampled: words, and no samples-per-feature check. */
  apertureCells: boolean;
  /**
   * The form takes openings only (cells, intervals, boundaries: open or closed everywhere), not a
   * complex transmittance: the planner does not offer it for a non-binary element (isBinary).
   */
  binaryOnly: boolean;
  /**
   * A closed form a practitioner checks by hand (the far-field formula, Fresnel): preferred, in
   * registry order, to the cheapest exact form unless it costs more than 20× that.
   */
  closedForm: boolean;
  /** Where the method is valid (the same for every form of a method). */
  validity(v: ValidityInputs): Validity;
  /** The form's sampling and cost for this case, or null where the form does not apply. */
  sample(g: Geometry, c: Case): Sampling | null;
  /** The method's name in words, and the form's (in parentheses after it). */
  words: { method: string; form?: string };
  /** Checks of the chosen form's own sampling, added to the plan's checks. */
  checks?(axes: AxisPlan[], g: Geometry): Partial<Checks>;
  /** A warning when the form is used where it is not valid (a method the job asks for). */
  useWarning?(v: UseCheckInputs): Warning | null;
  /**
   * Where several descriptors share a method and form (the exact integral's direct sums: 1-D
   * cells, 2-D area cells, 2-D edge cells), whether a plan is this one's.
   */
  claims?(plan: Plan): boolean;
  /**
   * Builds the source and propagates it to the window. For an obstacle in a plane wave (Babinet)
   * it is the complementary hole's field; the caller takes it off the free wave.
   */
  propagate(plan: Plan, run: PropagationInputs): Propagated;
}
