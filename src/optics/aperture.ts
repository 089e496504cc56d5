// Apertures and illumination in SI units, and the geometric facts about them that the planner
// needs: extent, characteristic size, smallest feature, open area, edge length, separability.

export type Aperture =
  | { shape: 'circle'; diameter: number; opaque: boolean }
  | { shape: 'rectangle'; width: number; height: number; opaque: boolean }
  | { shape: 'slit'; width: number; length?: number; opaque: boolean }
  | { shape: 'annulus'; outer: number; inner: number; opaque: boolean }
  | { shape: 'slits'; count: number; width: number; period: number; length?: number; opaque: boolean };

export type Illumination =
  | { kind: 'plane'; tilt: [number, number] }
  | { kind: 'gaussian'; waist: number; tilt: [number, number] };

/** The open part of an aperture along one axis, when the aperture is a product of two such. */
export type Profile =
  | { kind: 'interval'; width: number }
  | { kind: 'grating'; count: number; width: number; period: number };

/**
 * The aperture as x-profile × y-profile when it is one (rectangles, slits, gratings); null for
 * round shapes. A null y-profile means the aperture is infinitely long along y (a 1-D problem).
 */
export function separableProfiles(a: Aperture): { x: Profile; y: Profile | null } | null {
  switch (a.shape) {
    case 'rectangle':
      return { x: { kind: 'interval', width: a.width }, y: { kind: 'interval', width: a.height } };
    case 'slit':
      return { x: { kind: 'interval', width: a.width }, y: a.length ? { kind: 'interval', width: a.length } : null };
    case 'slits':
      return {
        x: { kind: 'grating', count: a.count, width: a.width, period: a.period },
        y: a.length ? { kind: 'interval', width: a.length } : null,
      };
    default:
      return null;
  }
}

export function isOneDAperture(a: Aperture): boolean {
  return (a.shape === 'slit' || a.shape === 'slits') && !a.length;
}

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
  description: string;
}

/** A profile's nearest open point to the axis: 0 unless a grating has a bar on the axis. */
function nearestOpenOf(p: Profile): number {
  if (p.kind === 'interval' || p.count % 2 === 1) return 0;
  return Math.max(0, p.period / 2 - p.width / 2);
}

export function apertureFacts(a: Aperture): ApertureFacts {
  const sep = separableProfiles(a);
  if (sep) {
    const fx = profileFacts(sep.x);
    if (!sep.y) {
      return {
        oneD: true,
        separable: true,
        halfExtent: [fx.halfExtent, 0],
        characteristic: [fx.halfExtent, 0],
        minFeature: fx.minFeature,
        openMeasure: fx.open,
        edgeMeasure: fx.edges,
        nearestOpen: nearestOpenOf(sep.x),
        description: describe(a),
      };
    }
    const fy = profileFacts(sep.y);
    return {
      oneD: false,
      separable: true,
      halfExtent: [fx.halfExtent, fy.halfExtent],
      characteristic: [fx.halfExtent, fy.halfExtent],
      minFeature: Math.min(fx.minFeature, fy.minFeature),
      openMeasure: fx.open * fy.open,
      // Each x-edge runs the open length along y and vice versa.
      edgeMeasure: fx.edges * fy.open + fy.edges * fx.open,
      nearestOpen: nearestOpenOf(sep.x),
      description: describe(a),
    };
  }
  if (a.shape === 'circle') {
    const r = a.diameter / 2;
    return {
      oneD: false,
      separable: false,
      halfExtent: [r, r],
      characteristic: [r, r],
      minFeature: a.diameter,
      openMeasure: Math.PI * r * r,
      edgeMeasure: 2 * Math.PI * r,
      nearestOpen: 0,
      description: describe(a),
    };
  }
  if (a.shape === 'annulus') {
    const ro = a.outer / 2;
    const ri = a.inner / 2;
    return {
      oneD: false,
      separable: false,
      halfExtent: [ro, ro],
      characteristic: [ro, ro],
      // A central obscuration holding less than 1e-3 of the area diffracts too little light for
      // its own size to set the sampling (its area is still sampled exactly).
      minFeature: Math.min(ro - ri, a.inner > 0 && (ri / ro) ** 2 >= 1e-3 ? a.inner : Infinity),
      openMeasure: Math.PI * (ro * ro - ri * ri),
      edgeMeasure: 2 * Math.PI * (ro + ri),
      nearestOpen: ri,
      description: describe(a),
    };
  }
  throw new Error(`unknown aperture shape ${(a as { shape: string }).shape}`);
}

function um(x: number): string {
  // Sizes people read: µm below a millimetre, mm above (no import from the job layer: optics stays pure).
  return x < 1e-3 ? `${Number((x * 1e6).toPrecision(4))} µm` : `${Number((x * 1e3).toPrecision(4))} mm`;
}

export function describe(a: Aperture): string {
  const prefix = a.opaque ? 'opaque ' : '';
  switch (a.shape) {
    case 'circle':
      return `${prefix}${a.opaque ? 'disc' : 'circular aperture'}, diameter ${um(a.diameter)}`;
    case 'rectangle':
      return `${prefix}rectangle ${um(a.width)} × ${um(a.height)}`;
    case 'slit':
      return a.opaque
        ? `opaque strip (wire), width ${um(a.width)}${a.length ? `, length ${um(a.length)}` : ''}`
        : `slit, width ${um(a.width)}${a.length ? `, length ${um(a.length)}` : ' (infinitely long along y)'}`;
    case 'annulus':
      return `${prefix}annulus, outer ${um(a.outer)}, inner ${um(a.inner)}`;
    case 'slits':
      return `${prefix}grating of ${a.count} slits, width ${um(a.width)}, period ${um(a.period)}${
        a.length ? `, length ${um(a.length)}` : ''
      }`;
  }
}
