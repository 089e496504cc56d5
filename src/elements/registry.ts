// The element kinds, one file each. A new kind is one file and one line here; the job schema's
// union, the folder-name tokens, the Aperture type and every question the rest of the program asks
// about an element come from this list.
import type { Axis } from '../optics/field.js';
import type { GratingProfile } from '../optics/grating-profile.js';
import { geometryFacts, type ApertureFacts, type ApertureGeometry, type Profile } from '../optics/geometry.js';
import { sampleGeometry } from '../optics/mask-cells.js';
import { annulus } from './annulus.js';
import { makeArray } from './array.js';
import { circle } from './circle.js';
import { makeCombined, type PartKind } from './combined.js';
import { grating } from './grating.js';
import { polygon } from './polygon.js';
import { rectangle } from './rectangle.js';
import { slit } from './slit.js';
import { slits } from './slits.js';
import { zonePlate } from './zone-plate.js';
import { lens } from './lens.js';
import type { CellTransmittance, ElementKind, ElementSchema, ElementSpec, Focusing } from './types.js';

/** The binary openings a combination or an array may be built from. */
const PARTS = [circle, rectangle, slit, annulus, slits, polygon] as const;
const parts = PARTS as unknown as readonly PartKind[];

export const ELEMENTS = [...PARTS, makeCombined(parts), makeArray(parts), grating, zonePlate, lens] as const;

type SpecOf<E> = E extends ElementKind<infer S, infer _Sch> ? S : never;
/** One case's element (SI units), whichever kind. */
export type Aperture = SpecOf<(typeof ELEMENTS)[number]>;
export type ShapeName = Aperture['shape'];
export const SHAPE_NAMES: ShapeName[] = ELEMENTS.map((e) => e.shape);

// The registry's entries are typed per kind; through this view the rest of the program calls any
// of them with any spec (each entry is only ever given specs of its own kind: elementOf).
type AnyElement = ElementKind<ElementSpec, ElementSchema, { shape: string; opaque: boolean } & Record<string, unknown>>;
const BY_SHAPE = new Map<string, AnyElement>(ELEMENTS.map((e) => [e.shape, e as unknown as AnyElement]));

/** The kind of an element spec (or of a job's element mapping, by its shape). */
export function elementOf(a: { shape: string }): AnyElement {
  const e = BY_SHAPE.get(a.shape);
  if (!e) throw new Error(`unknown element shape ${a.shape}`);
  return e;
}

export function geometryOf(a: Aperture): ApertureGeometry {
  return elementOf(a).geometry(a);
}

export function apertureFacts(a: Aperture): ApertureFacts {
  const e = elementOf(a);
  return e.facts ? e.facts(a) : geometryFacts(e.geometry(a), e.describe(a));
}

/** Exact open fraction of each cell of a 2-D grid (row-major, rows along y), for the open part. */
export function apertureMask(a: Aperture, xa: Axis, ya: Axis): Float64Array {
  const e = elementOf(a);
  return e.mask ? e.mask(a, xa, ya) : sampleGeometry(e.geometry(a), xa, ya);
}

/** The complex transmittance per cell of a non-binary element; null for a binary one (its mask is it). */
export function apertureTransmittance(a: Aperture, xa: Axis, ya: Axis, wavelength: number): CellTransmittance | null {
  const e = elementOf(a);
  return e.transmittance && !isBinary(a) ? e.transmittance(a, xa, ya, wavelength) : null;
}

/** The largest local spatial frequency of a non-binary element's phase within `reach` of the axis (1/m); 0 for none. */
export function phaseFrequencyOf(a: Aperture, wavelength: number, reach: number): number {
  const e = elementOf(a);
  return e.phaseFrequency ? e.phaseFrequency(a, wavelength, reach) : 0;
}

/** A thin lens's focal length, stop and pupil, or null for an element that does not focus. */
export function lensOf(a: Aperture): Focusing | null {
  const e = elementOf(a);
  return e.focusing ? e.focusing(a) : null;
}

/** Binary: open or closed everywhere (a mask); Babinet's complement and the exact edge methods apply. */
export function isBinary(a: Aperture): boolean {
  const e = elementOf(a);
  return !e.transmittance || (e.binary?.(a) ?? false);
}

/**
 * The aperture as x-profile × y-profile when it is one (rectangles, slits, gratings); null
 * otherwise. A null y-profile means the aperture is infinitely long along y (a 1-D problem).
 */
export function separableProfiles(a: Aperture): { x: Profile; y: Profile | null } | null {
  const g = geometryOf(a);
  return g.kind === 'separable' ? { x: g.x, y: g.y } : null;
}

export function isOneDAperture(a: Aperture): boolean {
  const g = geometryOf(a);
  return g.kind === 'separable' && g.y === null;
}

/**
 * A grating of lines along x, or null: its periods, their length (null: infinitely long), and
 * either its slit width (a binary amplitude grating of equal slits, whose thin-grating theory is
 * (w/d)·sinc²(m·w/d)) or its profile (any thin grating: grating-profile.ts).
 */
export function gratingOf(a: Aperture): GratingLines | null {
  const g = geometryOf(a);
  if (g.kind !== 'separable' || (g.x.kind !== 'grating' && g.x.kind !== 'periodic')) return null;
  const length = g.y && g.y.kind === 'interval' ? g.y.width : null;
  if (g.x.kind === 'grating') return { count: g.x.count, width: g.x.width, profile: null, period: g.x.period, length };
  return { count: g.x.count, width: null, profile: g.x.profile, period: g.x.period, length };
}

export type GratingLines =
  | { count: number; period: number; length: number | null; width: number; profile: null }
  | { count: number; period: number; length: number | null; width: null; profile: GratingProfile };

/** Concentric rings centred on the axis (a disc, an annulus): radially symmetric under an untilted beam. */
export function isRound(a: Aperture): boolean {
  return geometryOf(a).kind === 'rings';
}

export function describe(a: Aperture): string {
  return elementOf(a).describe(a);
}
