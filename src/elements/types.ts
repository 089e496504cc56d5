// What an element kind declares: its job-file keys, how one case's element is made from them, its
// geometry and facts for the planner, its mask, and its words. Everything outside src/elements/
// asks an element these questions (through registry.ts) instead of switching on its name.
import type { z } from 'zod';
import type { Axis } from '../optics/field.js';
import type { ApertureFacts, ApertureGeometry } from '../optics/geometry.js';
import type { BoundaryRegion } from '../optics/rs-boundary.js';
import type { ReadLimits } from '../job/read-file.js';

/** Cell averages of a complex transmittance (interleaved re, im) and of its squared modulus. */
export interface CellTransmittance {
  t: Float64Array;
  weight: Float64Array;
}

/**
 * A thin lens as the planner and the focal-plane form see it: the quadratic phase
 * exp(−iπr²/(λf)) is known in closed form and folded into a propagator's chirp, so the pupil
 * (stop × wavefront error) is all that is sampled.
 */
export interface Focusing {
  /** Focal length (m): positive converging, negative diverging. */
  focal: number;
  /** Radius of the circular stop (m), or null: unbounded (the illumination limits the light). */
  stopRadius: number | null;
  /** RMS wavefront error over the stop in waves at this wavelength (piston left out; tilt too if asked). */
  rmsWaves(wavelength: number, withoutTilt?: boolean): number;
  /** Cell averages of the pupil without the lens phase: stop × exp(i2πW), and the stop's open fraction. */
  pupil(xa: Axis, ya: Axis, wavelength: number): CellTransmittance;
  /** The pupil's largest local spatial frequency (1/m): the wavefront error's steepest slope. */
  pupilFrequency(wavelength: number): number;
}

/** Every element spec: its kind and whether it is an obstacle (the complement) rather than an opening. */
export interface ElementSpec {
  shape: string;
  opaque: boolean;
}

/** What resolving an element may use beyond its own keys. */
export interface ResolveContext {
  wavelength: number;
  /**
   * The incident light's direction cosine along the axis, cos θ_i (1 when absent): a reflection
   * grating's groove depth h is an optical path 2h·cos θ_i (elements/grating.ts).
   */
  cosIncidence?: number;
}

/** Reports a problem with one of the element's keys at load time. */
export type KeyProblem = (key: string | (string | number)[], message: string) => void;

/** A file one of an element's keys names (an image), as written in the job. */
export interface NamedFile {
  /** The key that names it (under `aperture.`). */
  key: string;
  /** The path as written: relative paths are from the job file's folder. */
  path: string;
  limits: ReadLimits;
}

/**
 * Elements whose keys name files: the loader (src/job/load.ts, loadJobFile) reads them after the
 * job validates, without blocking and within their limits, and hands their bytes to `attach`,
 * which returns the mapping with what they hold (decoded, checked) for `resolve`. Expansion and
 * planning then read nothing; what the files held travels in each case.
 */
export interface ElementFiles<J> {
  named(job: J): NamedFile[];
  /** bytes: by key. A problem names the key; the mapping returned is not used when there is one. */
  attach(job: J, bytes: Map<string, Buffer>, problem: KeyProblem): J;
}

/** The spot-size searches an element supports (the smallest-spot search and the verdict axes). */
export interface SizeSearch<S, J = unknown> {
  /** The job key the search varies (under `aperture.`). */
  key: string;
  /** What a search message calls the elements it can vary ("a circle"). */
  words: string;
  /** Whether this job's element can be searched (a slit only without a length); absent: always. */
  applies?(job: J): boolean;
  /** The axis the spot is measured along. */
  axis: 'radial' | 'x';
  /** The element with that size. */
  withSize(s: S, size: number): S;
  /**
   * The textbook size balancing geometric shadow and far-field spread at distance z (common
   * practice): D = √(2.44 λz) for a pinhole, w = √(2λz) for a slit.
   */
  textbook(wavelength: number, z: number): number;
}

/** The job file's mapping of an element: a strict zod object (its keys, `shape` and `opaque` included). */
export type ElementSchema = z.ZodObject<z.ZodRawShape, z.core.$ZodObjectConfig>;

export interface ElementKind<S extends ElementSpec, Sch extends ElementSchema = ElementSchema, J = z.output<Sch>> {
  /** The value of `shape:` in the job file. */
  shape: S['shape'];
  /** The job file's mapping (zod strict object, `shape` included). Sweepable keys hold SweepValues. */
  schema: Sch;
  /** Folder-name tokens of the sweepable keys (key → token), and which of them are counts, not lengths. */
  tokens: Record<string, string>;
  counts?: readonly string[];
  /**
   * Checks across keys at load time (the annulus's inner diameter below its outer one); `light` is
   * the job's illumination kind (an unbounded lens needs a beam of finite extent).
   */
  check?(job: J, problem: KeyProblem, light?: { illumination: string }): void;
  /** The files its keys name, read by the loader (absent: none). */
  files?: ElementFiles<J>;
  /** Sweepable length keys whose values may be negative (a diverging lens's focal length); never zero. */
  signed?: readonly string[];
  /**
   * One case's element from the job's mapping; value(key) is the key's value in this case, and the
   * context holds what an element may depend on beyond its own keys (the case's wavelength: a
   * blazed grating's depth given as an optical path is so many waves at each wavelength).
   */
  resolve(job: J, value: (key: string) => number, context: ResolveContext): S;
  /**
   * The same physical element met by light of another wavelength (a spectrum's lines): resolved at
   * `from`, seen at `to`. Absent: the element's transmittance is taken as it is at every wavelength
   * (exact for openings; the planner says so for others).
   */
  atWavelength?(s: S, from: number, to: number): S;
  /** The open part as a geometry the optics and exact methods know. */
  geometry(s: S): ApertureGeometry;
  /** Facts for the planner (default: from the geometry). */
  facts?(s: S): ApertureFacts;
  /** Exact open fraction of every cell (default: from the geometry). */
  mask?(s: S, xa: Axis, ya: Axis): Float64Array;
  /**
   * Elements that change the phase or the amplitude other than open/closed (phase gratings, lenses,
   * zone plates, wavefront errors): the complex transmittance averaged over every cell, and the
   * average of |t|² over every cell (the power weight: for a pure phase element inside a stop, the
   * stop's open fraction). Absent: the element is binary and its mask is the transmittance.
   */
  transmittance?(s: S, xa: Axis, ya: Axis, wavelength: number): CellTransmittance;
  /**
   * For a kind with a transmittance whose specs are binary for some values of its keys (a zone
   * plate: amplitude or phase), whether this one is: then its mask is its transmittance, and
   * `transmittance` is not asked. Absent: every spec of a kind with a transmittance is non-binary.
   */
  binary?(s: S): boolean;
  /**
   * The largest local spatial frequency of the transmittance's phase (1/m) over the part lit out to
   * `reach` from the axis: what a method that samples the transmittance must resolve. Absent: none.
   */
  phaseFrequency?(s: S, wavelength: number, reach: number): number;
  /** A focusing element (a thin lens): its focal length, stop and pupil, for the lens-aware planning. */
  focusing?(s: S): Focusing;
  /** The open part as boundary regions for the boundary form of the exact integral (null: none). */
  boundary?(s: S): BoundaryRegion[] | null;
  /** The width a diffraction-limited verdict measures along an axis (null: no verdict there). */
  verdictWidth?(s: S, axis: 'radial' | 'x' | 'y'): number | null;
  sizeSearch?: SizeSearch<S, J>;
  /** In words, for plans, reports and case titles. */
  describe(s: S): string;
}
