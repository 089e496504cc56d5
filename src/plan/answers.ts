// The extra propagations that a case's answers make (run/searches.ts: from which distance the
// far-field size holds, the aperture size with the smallest spot), described here so that the
// planner can cost them: the variants each search plans, the limits they are planned with, and the
// memory the largest of them takes while the case's own result is held.
import { AIRY_HALF_POWER_V, SINC_HALF_POWER_U, verdictWidth } from '../analysis/verdict.js';
import { elementOf, isOneDAperture, separableProfiles, type Aperture } from '../elements/registry.js';
import type { Case } from './types.js';

/** Search evaluations are many: each may use at most this much memory (and never more than the run's limit). */
export const SEARCH_MEMORY = 512 * 1024 ** 2;

/** Output samples per axis of search evaluations: the half-power size needs no picture. */
export const SEARCH_OUTPUT = 151;

export type VerdictAxis = 'radial' | 'x' | 'y';

/**
 * The planner limits of a search evaluation under the run's memory limit. A variant's own answers
 * are never asked, so its estimate does not count them.
 */
export function searchLimits(maxMemoryBytes?: number): { maxMemoryBytes: number; minOutputSamples: number; countAnswers: false } {
  return { maxMemoryBytes: Math.min(maxMemoryBytes ?? SEARCH_MEMORY, SEARCH_MEMORY), minOutputSamples: SEARCH_OUTPUT, countAnswers: false };
}

/** The axes a verdict is given for: radial for circles, x for long slits, x and y for rectangles. */
export function verdictAxesOf(c: Case): VerdictAxis[] {
  const a = c.aperture;
  // (With planes after the aperture, its size and the screen's distance say nothing of the spot.)
  if (a.opaque || c.illumination.kind !== 'plane' || c.planes) return [];
  // (Under curved light the geometric shadow and the far field are not the flat-light references.)
  if (c.source) return [];
  const axes: VerdictAxis[] = ['radial', 'x', 'y'];
  return axes.filter((axis) => verdictWidth(a, axis) !== null);
}

/**
 * The case a spot-size measurement plans (run/searches.ts measureAt). The measure's denominator is
 * the power through the aperture, not the window's, so for round and 1-D spots the window need
 * only hold the half-power radius: three far-field half-power radii or three quarters of the
 * aperture, whichever is larger (separable rectangles keep the planner's window: their marginals
 * need all the light along the other axis, and they are cheap).
 */
export function measureVariant(c: Case, axis: VerdictAxis): Case {
  const width = verdictWidth(c.aperture, axis)!;
  let window: [number, number] | undefined;
  if (axis === 'radial' || (axis === 'x' && isOneDAperture(c.aperture))) {
    const k = (2 * Math.PI) / c.wavelength;
    const sin = axis === 'radial' ? AIRY_HALF_POWER_V / (k * (width / 2)) : (SINC_HALF_POWER_U * c.wavelength) / width;
    const half = Math.max(3 * c.distance * Math.tan(Math.asin(Math.min(0.99, sin))), 0.75 * width);
    window = [2 * half, 2 * half];
  }
  const v: Case = { ...c, grid: undefined, method: 'auto' };
  if (window) v.window = window;
  else delete v.window;
  return v;
}

/**
 * The far-field search of one verdict axis (run/searches.ts farFieldFrom): the case it varies (for
 * rectangles and finite slits the 1-D slit of that side: the paraxial field factorises), the axis
 * it measures, and the distances it scans (steps of √2 from 1/4 of 2D²/λ to 64 times it; the
 * bisection that follows stays between two of them).
 */
export function farFieldSearch(c0: Case, axis0: VerdictAxis): { c: Case; axis: VerdictAxis; distances: number[] } {
  const width = verdictWidth(c0.aperture, axis0)!;
  // A 2-D product of two intervals (a rectangle, a slit of finite length): the paraxial field factorises.
  const sep = separableProfiles(c0.aperture);
  const separable = sep !== null && sep.y !== null && sep.x.kind === 'interval' && sep.y.kind === 'interval';
  const c: Case = separable ? { ...c0, aperture: { shape: 'slit', width, opaque: false } } : c0;
  const axis: VerdictAxis = separable ? 'x' : axis0;
  const zff = (2 * width * width) / c.wavelength;
  const distances: number[] = [];
  for (let k = -4; k <= 12; k++) distances.push(zff * Math.pow(2, k / 2));
  return { c, axis, distances };
}

export function withSize(a: Aperture, size: number): Aperture {
  const search = elementOf(a).sizeSearch;
  if (!search) throw new Error(`the smallest-spot search cannot vary the size of a ${a.shape}`);
  return search.withSize(a, size) as Aperture;
}

/** The sizes the smallest-spot search scans (9, evenly in log); the golden-section steps stay between them. */
export function smallestSpotSizes(between: [number, number]): number[] {
  const [lo, hi] = between;
  const n = 9;
  return Array.from({ length: n }, (_, i) => lo * Math.pow(hi / lo, i / (n - 1)));
}

/** A variant of the smallest-spot search: the case with that size, lit by an untilted plane wave. */
export function smallestSpotVariant(c: Case, size: number): Case {
  return { ...c, aperture: withSize(c.aperture, size), illumination: { kind: 'plane', tilt: [0, 0] } };
}

/**
 * Every case the answers of c plan (scanned points; the searches' refinements lie between them),
 * as the planner sees them, each with the search limits. Empty when the case asks nothing that
 * needs extra propagations.
 */
export function answerVariants(c: Case): Case[] {
  const out: Case[] = [];
  for (const axis of verdictAxesOf(c)) {
    const s = farFieldSearch(c, axis);
    for (const z of s.distances) out.push(measureVariant({ ...s.c, distance: z }, s.axis));
  }
  const spec = c.analysis.smallestSpot;
  const search = elementOf(c.aperture).sizeSearch;
  if (spec && search) {
    const axis: VerdictAxis = search.axis;
    const sizes = smallestSpotSizes(spec.between);
    sizes.push(search.textbook(c.wavelength, c.distance));
    for (const size of sizes) {
      const v = smallestSpotVariant(c, size);
      out.push(spec.measure === 'energy' ? measureVariant(v, axis) : { ...v, window: undefined, grid: undefined, method: 'auto' });
    }
  }
  return out;
}
