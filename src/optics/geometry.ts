// The shapes of openings as the optics and the planner see them, whatever element made them: a
// product of two 1-D profiles (rectangles, slits, gratings of lines) or concentric rings (discs,
// annuli). The facts the planner needs (extent, smallest feature, open measure, edges) follow from
// the geometry; elements (src/elements/) say which geometry they are. A representation, not a
// list of element names: a new element either is one of these or samples itself.

import { meanTransmission, profileMinFeature, type GratingProfile } from './grating-profile.js';

/** Illumination in SI units: a plane wave or a Gaussian beam (waist at the aperture), tilted. */
export type Illumination =
  | { kind: 'plane'; tilt: [number, number] }
  | { kind: 'gaussian'; waist: number; tilt: [number, number] };

/** The open part of an aperture along one axis, when the aperture is a product of two such. */
export type Profile =
  | { kind: 'interval'; width: number }
  | { kind: 'grating'; count: number; width: number; period: number }
  /** A thin grating of any profile (grating-profile.ts): complex, sampled by cell averages only. */
  | { kind: 'periodic'; count: number; period: number; profile: GratingProfile };

/**
 * The open part of an element, centred on the axis. A null y-profile means the opening is
 * infinitely long along y (a 1-D problem). Rings: the open area between two radii (inner 0: a disc).
 */
export type ApertureGeometry =
  | { kind: 'separable'; x: Profile; y: Profile | null }
  | { kind: 'rings'; outer: number; inner: number }
  /** No structure the exact methods use: the element samples itself and states its own facts. */
  | { kind: 'sampled' };

export interface ProfileFacts {
  /** Half the full extent (from the first open edge to the last). */
  halfExtent: number;
  /** Smallest open or closed feature (slit width, bar width). */
  minFeature: number;
  /** Open length (sum of open widths). */
  open: number;
  /** Number of edges. */
  edges: number;
}

export function profileFacts(p: Profile): ProfileFacts {
  if (p.kind === 'interval') return { halfExtent: p.width / 2, minFeature: p.width, open: p.width, edges: 2 };
  if (p.kind === 'periodic') {
    // Open length: the power through it per unit irradiance, count·d·mean|t|². Edges: the outline's
    // two, and every step in the profile (binary steps twice a period, a blazed tooth's reset
    // once), each counted by its jump in amplitude squared, |Δt|², against an opaque edge's 1: they
    // send light to wide angles as a slit's edges do, a phase step of π four times as much.
    const jump2 = (phase: number) => 4 * Math.sin(phase / 2) ** 2;
    const prof = p.profile;
    const steps =
      prof.kind === 'binary-amplitude' ? 2 : prof.kind === 'binary-phase' ? 2 * jump2(prof.step) : prof.kind === 'blazed' ? jump2(2 * Math.PI * prof.depth) : 0;
    return {
      halfExtent: (p.count * p.period) / 2,
      minFeature: profileMinFeature(p.profile, p.period),
      open: p.count * p.period * meanTransmission(p.profile),
      edges: 2 + steps * p.count,
    };
  }
  const extent = (p.count - 1) * p.period + p.width;
  const bar = p.period - p.width;
  return {
    halfExtent: extent / 2,
    minFeature: p.count > 1 ? Math.min(p.width, bar) : p.width,
    open: p.count * p.width,
    edges: 2 * p.count,
  };
}

export interface ApertureFacts {
  oneD: boolean;
  separable: boolean;
  /** Half extent along x and y (y = 0 for 1-D apertures). */
  halfExtent: [number, number];
  /** a in N_F = a²/(λz), per axis (for round shapes both are the radius). */
  characteristic: [number, number];
  minFeature: number;
  /** Open area (m²), or open width (m) for 1-D apertures. */
  openMeasure: number;
  /** Total edge length (m), or number of edges for 1-D apertures. */
  edgeMeasure: number;
  /**
   * Distance from the axis to the nearest open point (0 when the axis is open; an annulus's inner
   * radius; half a period less half a slit for an even number of slits): a beam centred on the axis
   * and narrower than this passes almost nothing.
   */
  nearestOpen: number;
  /**
   * The exact methods know its edges (a product of intervals, or rings): boxes, exact edge cells
   * and the boundary form apply. False for elements that only sample themselves (polygons,
   * combinations, arrays), which the exact integral takes as area-sampled cells.
   */
  exactEdges: boolean;
  description: string;
}

/** A profile's nearest open point to the axis: 0 unless a grating has a bar on the axis. */
function nearestOpenOf(p: Profile): number {
  if (p.kind === 'interval' || p.kind === 'periodic' || p.count % 2 === 1) return 0;
  return Math.max(0, p.period / 2 - p.width / 2);
}

/** The planner's facts about a geometry (the element adds its description). */
export function geometryFacts(g: ApertureGeometry, description: string): ApertureFacts {
  if (g.kind === 'separable') {
    const fx = profileFacts(g.x);
    if (!g.y) {
      return {
        oneD: true,
        separable: true,
        halfExtent: [fx.halfExtent, 0],
        characteristic: [fx.halfExtent, 0],
        minFeature: fx.minFeature,
        openMeasure: fx.open,
        edgeMeasure: fx.edges,
        nearestOpen: nearestOpenOf(g.x),
        exactEdges: true,
        description,
      };
    }
    const fy = profileFacts(g.y);
    return {
      oneD: false,
      separable: true,
      halfExtent: [fx.halfExtent, fy.halfExtent],
      characteristic: [fx.halfExtent, fy.halfExtent],
      minFeature: Math.min(fx.minFeature, fy.minFeature),
      openMeasure: fx.open * fy.open,
      // Each x-edge runs the open length along y and vice versa.
      edgeMeasure: fx.edges * fy.open + fy.edges * fx.open,
      nearestOpen: nearestOpenOf(g.x),
      exactEdges: true,
      description,
    };
  }
  if (g.kind === 'sampled') throw new Error('a sampled element states its own facts');
  const ro = g.outer;
  const ri = g.inner;
  if (ri === 0) {
    return {
      oneD: false,
      separable: false,
      halfExtent: [ro, ro],
      characteristic: [ro, ro],
      minFeature: 2 * ro,
      openMeasure: Math.PI * ro * ro,
      edgeMeasure: 2 * Math.PI * ro,
      nearestOpen: 0,
      exactEdges: true,
      description,
    };
  }
  return {
    oneD: false,
    separable: false,
    halfExtent: [ro, ro],
    characteristic: [ro, ro],
    // A central obscuration holding less than 1e-3 of the area diffracts too little light for
    // its own size to set the sampling (its area is still sampled exactly).
    minFeature: Math.min(ro - ri, (ri / ro) ** 2 >= 1e-3 ? 2 * ri : Infinity),
    openMeasure: Math.PI * (ro * ro - ri * ri),
    edgeMeasure: 2 * Math.PI * (ro + ri),
    nearestOpen: ri,
    exactEdges: true,
    description,
  };
}

/** Sizes people read: µm below a millimetre, mm above (no import from the job layer: optics stays pure). */
export function sizeWords(x: number): string {
  return x < 1e-3 ? `${Number((x * 1e6).toPrecision(4))} µm` : `${Number((x * 1e3).toPrecision(4))} mm`;
}
