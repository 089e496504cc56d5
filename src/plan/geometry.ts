// What the planner knows of a case before it samples it (the aperture's facts, the light model,
// the window), and the sampling rules every method reads from it.
import type { ApertureFacts } from '../optics/aperture.js';
import type { Axis } from '../optics/field.js';
import { LIMITS } from './limits.js';
import type { LightModel } from './light.js';
import type { Layout, SharedGrid } from './types.js';

export interface Geometry {
  lam: number;
  z: number;
  k: number;
  facts: ApertureFacts;
  oneD: boolean;
  /** An obstacle in a Gaussian beam, propagated as the beam where the obstacle is not. */
  obstructed: boolean;
  /** An obstacle in a plane wave: the free wave minus the obstacle's complement. */
  babinet: boolean;
  /** Half extent of the illuminated part of the aperture per axis. */
  aEff: [number, number];
  centre: [number, number];
  windowHalf: [number, number];
  waist: number; // Infinity for plane waves
  carrier: [number, number];
  minOutput: number;
  model: LightModel;
  /**
   * The largest local spatial frequency of a non-binary element's phase over the lit part (1/m: a
   * lens's R/(λ|f|) plus its wavefront error's slope); absent or 0 for binary elements. A method
   * that samples the transmittance resolves it (pitchFor); one that folds the lens into its
   * kernel passes only the pupil's.
   */
  phaseFrequency?: number;
  /** A sweep's shared FFT grid, taken by fftAxisPlan where it meets the case's own rules. */
  sharedGrid?: SharedGrid;
  /**
   * The output grid every line of a spectrum is delivered onto (plan/spectrum.ts): direct sums
   * evaluate at its points, FFT lattices are planned so that its points are lattice points; a
   * method whose output cannot be put there is not offered.
   */
  outputGrid?: OutputGrid;
}

/** Output axes imposed on a case: x, and y (null for a 1-D case). */
export type OutputGrid = [Axis, Axis | null];

/** No method of a case can deliver its field onto the output grid imposed on it. */
export class OffGridError extends Error {}

/**
 * How far from a Gaussian beam's axis the light begins to pass: the obstacle's half width for an
 * obstacle in the beam, the nearest open point otherwise (0 when the opening holds the axis).
 */
export function lightFrom(g: Geometry): number {
  return g.obstructed ? Math.min(g.facts.halfExtent[0], g.oneD ? Infinity : g.facts.halfExtent[1]) : g.facts.nearestOpen;
}

/** The largest direction cosine from the illuminated aperture to the window. */
export function steepestDirection(g: Geometry): number {
  let s = 0;
  for (const i of g.oneD ? [0] : [0, 1]) {
    const reach = Math.abs(g.centre[i]!) + g.windowHalf[i]! + g.aEff[i]!;
    s = Math.max(s, reach / Math.sqrt(reach * reach + g.z * g.z));
  }
  return s;
}

/**
 * Separable apertures are computed as 1-D problems when the method's kernel factorises (the
 * paraxial forms and the far-field formula: `factorises`), else on a 2-D grid.
 */
export function onTwoDGrid(g: Geometry, factorises: boolean): boolean {
  return !g.oneD && !(g.facts.separable && !g.obstructed && factorises);
}

export function featureSamples(g: Geometry, factorises: boolean): number {
  return onTwoDGrid(g, factorises) ? LIMITS.featureSamples2D : LIMITS.featureSamples1D;
}

export function oversampling(g: Geometry, factorises: boolean): number {
  return onTwoDGrid(g, factorises) ? LIMITS.oversampling2D : LIMITS.oversampling1D;
}

/**
 * The layout of a method whose kernel factorises: 1-D, separable (the beam minus an obstacle is
 * not a product of two profiles, even where the obstacle is) or a 2-D grid.
 */
export function factorisedLayout(g: Geometry): Layout {
  return g.oneD ? 'one-d' : g.facts.separable && !g.obstructed ? 'separable' : 'two-d';
}
