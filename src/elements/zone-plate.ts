// A Fresnel zone plate: concentric zones whose edges sit where the path to the first-order focus
// grows by half a design wavelength. Zone radii (Attwood, Soft X-Rays and EUV Radiation, ch. 9):
//   r_n² = n·λ_d·f + (n·λ_d/2)²,  i.e.  √(r_n² + f²) = f + n·λ_d/2  exactly,
// zone n the ring between r_{n−1} and r_n (r_0 = 0), n = 1 … zones.
//
// Two kinds:
// - amplitude: the odd zones open, the even zones and everything beyond r_zones opaque (so the
//   centre is open). Binary: its mask is the sum of exact annulus fractions, and its boundary is a
//   set of discs with alternating signs, for the boundary form of the exact integral.
// - phase (binary π phase): the odd zones pass the light unchanged, the even zones with phase π
//   (t = −1), everything beyond r_zones opaque. Not binary: the element gives its transmittance
//   (cell averages of t and of |t|²) and no mask, no boundary and no exact edges, so that only the
//   methods that propagate a sampled complex source take it.
//
// The design wavelength is a key of its own (`design`); without it the plate is designed for each
// case's wavelength. Given, it stays fixed across a wavelength sweep: a zone plate used at another
// wavelength than its design is a real case (its focus moves to f·λ_d/λ).
import { z } from 'zod';
import { sweepCount, sweepLength, WAVELENGTH } from '../job/quantities.js';
import { formatLength } from '../job/units.js';
import { axisAt, type Axis } from '../optics/field.js';
import { sizeWords, type ApertureFacts } from '../optics/geometry.js';
import { discCellFraction } from '../optics/mask-cells.js';
import type { BoundaryRegion } from '../optics/rs-boundary.js';
import type { CellTransmittance, ElementKind } from './types.js';

export interface ZonePlate {
  shape: 'zone-plate';
  /** First-order focal length at the design wavelength (m). */
  focal: number;
  /** Number of zones (the outermost is zone `zones`). */
  zones: number;
  /** Design wavelength (m). */
  design: number;
  kind: 'amplitude' | 'phase';
  /** Always false: a zone plate is not an obstacle (no complement). */
  opaque: false;
}

/**
 * Zones in one plate: each zone edge is a disc of the boundary form and a radius the mask tests,
 * so the count bounds the planner's costing and the per-cell work; 10 000 zones is beyond the
 * usual optical zone plates (tens to a few thousand).
 */
export const MAX_ZONES = 10_000;

const schema = z.strictObject({
  shape: z.literal('zone-plate'),
  focal: sweepLength(),
  zones: sweepCount(1, MAX_ZONES),
  design: sweepLength(WAVELENGTH).optional(),
  kind: z.enum(['amplitude', 'phase'], { error: "expected 'amplitude' (odd zones open) or 'phase' (even zones shifted by π)" }).default('amplitude'),
  opaque: z.literal(false, { error: 'expected no opaque zone plates (the complement of a zone plate is not supported; the amplitude plate with the centre closed is not offered)' }).default(false),
});

/** r_n (m): √(n·λ_d·f + (n·λ_d/2)²); r_0 = 0. */
export function zoneRadius(s: Pick<ZonePlate, 'focal' | 'design'>, n: number): number {
  const h = (n * s.design) / 2;
  return Math.sqrt(n * s.design * s.focal + h * h);
}

/** All edge radii r_1 … r_zones (index n − 1). */
function radii(s: ZonePlate): Float64Array {
  const r = new Float64Array(s.zones);
  for (let n = 1; n <= s.zones; n++) r[n - 1] = zoneRadius(s, n);
  return r;
}

/**
 * The continuous zone index at radius r: 2(√(r² + f²) − f)/λ_d, whole at the edges (ν(r_n) = n).
 * Written without the cancellation of √(r² + f²) − f for r ≪ f.
 */
function zoneIndex(s: ZonePlate, r: number): number {
  return (2 * (r * r)) / (Math.sqrt(r * r + s.focal * s.focal) + s.focal) / s.design;
}

/** The outermost edge of the open part: r_zones, or for an amplitude plate of even count r_{zones−1} (its last zone is closed). */
function lastEdge(s: ZonePlate): number {
  return s.kind === 'amplitude' && s.zones % 2 === 0 ? s.zones - 1 : s.zones;
}

/**
 * Per cell (row-major, rows along y): the fraction of the cell in the odd zones (1, 3, …) and in
 * the even zones (2, 4, …), up to zone `zones`. Exact: zone n's fraction is D_n − D_{n−1}, D_k the
 * exact fraction of the cell inside the disc of radius r_k (discCellFraction); only the edges that
 * cross the cell are evaluated, the others are 0 (inside the cell's nearest point) or 1 (beyond
 * its farthest corner).
 */
export function zoneFractions(s: ZonePlate, xa: Axis, ya: Axis): { odd: Float64Array; even: Float64Array } {
  const odd = new Float64Array(xa.n * ya.n);
  const even = new Float64Array(xa.n * ya.n);
  const r = radii(s);
  const N = s.zones;
  const rOut = r[N - 1]!;
  const hx = xa.step / 2;
  const hy = ya.step / 2;
  for (let row = 0; row < ya.n; row++) {
    const y = axisAt(ya, row);
    const ny = Math.max(0, Math.abs(y) - hy);
    if (ny >= rOut) continue;
    const fy = Math.abs(y) + hy;
    for (let col = 0; col < xa.n; col++) {
      const x = axisAt(xa, col);
      const nx = Math.max(0, Math.abs(x) - hx);
      const rMin = Math.sqrt(nx * nx + ny * ny);
      if (rMin >= rOut) continue;
      const fx = Math.abs(x) + hx;
      const rMax = Math.sqrt(fx * fx + fy * fy);
      // The first edge beyond the cell's nearest point (the zone index, corrected for rounding).
      let n = Math.min(N, Math.max(1, Math.floor(zoneIndex(s, rMin)) + 1));
      while (n < N && r[n - 1]! <= rMin) n++;
      while (n > 1 && r[n - 2]! > rMin) n--;
      let o = 0;
      let e = 0;
      let below = 0;
      for (; n <= N; n++) {
        const rn = r[n - 1]!;
        const d = rn >= rMax ? 1 : discCellFraction(x, y, hx, hy, rn);
        if (n % 2 === 1) o += d - below;
        else e += d - below;
        below = d;
        if (rn >= rMax) break;
      }
      const k = row * xa.n + col;
      odd[k] = Math.min(1, Math.max(0, o));
      even[k] = Math.min(1, Math.max(0, e));
    }
  }
  return { odd, even };
}

function facts(s: ZonePlate): ApertureFacts {
  const r = radii(s);
  const last = lastEdge(s);
  const rOut = r[last - 1]!;
  const rIn = last >= 2 ? r[last - 2]! : 0;
  let open = 0;
  let edges = 0;
  for (let n = 1; n <= last; n++) {
    const a = r[n - 1]!;
    const b = n >= 2 ? r[n - 2]! : 0;
    edges += 2 * Math.PI * a;
    if (s.kind === 'phase' || n % 2 === 1) open += Math.PI * (a * a - b * b);
  }
  return {
    oneD: false,
    separable: false,
    halfExtent: [rOut, rOut],
    characteristic: [rOut, rOut],
    // The outermost zone's width (one zone: the disc's diameter, as for a circle).
    minFeature: last >= 2 ? rOut - rIn : 2 * rOut,
    // The area that passes light: the odd zones (amplitude), the whole plate (phase).
    openMeasure: open,
    edgeMeasure: edges,
    nearestOpen: 0,
    // The exact edge cells know one annulus only (rs-2d-cells.ts); the boundary form takes the
    // amplitude plate's discs (boundary below), area-sampled cells the rest.
    exactEdges: false,
    description: describe(s),
  };
}

function describe(s: ZonePlate): string {
  const rOut = zoneRadius(s, lastEdge(s));
  const what = s.kind === 'amplitude' ? 'amplitude zone plate' : 'binary phase zone plate';
  return `${what} of ${s.zones} zone${s.zones === 1 ? '' : 's'}, focal length ${sizeWords(s.focal)} at ${formatLength(s.design)}, diameter ${sizeWords(2 * rOut)}`;
}

export const zonePlate: ElementKind<ZonePlate, typeof schema> = {
  shape: 'zone-plate',
  schema,
  tokens: { focal: 'f', zones: 'zones', design: 'design' },
  counts: ['zones'],
  resolve: (job, v, context) => ({ shape: 'zone-plate', focal: v('focal'), zones: v('zones'), design: job.design ? v('design') : context.wavelength, kind: job.kind, opaque: false }),
  geometry: () => ({ kind: 'sampled' }),
  facts,
  binary: (s) => s.kind === 'amplitude',
  mask(s, xa, ya) {
    if (s.kind === 'phase') throw new Error('a phase zone plate has a transmittance, not a mask');
    return zoneFractions(s, xa, ya).odd;
  },
  // The binary phase plate: t = +1 in the odd zones, −1 in the even ones, 0 beyond r_zones; a
  // cell's average t = odd − even fraction, its average |t|² the fraction inside r_zones.
  transmittance(s, xa, ya): CellTransmittance {
    const { odd, even } = zoneFractions(s, xa, ya);
    const t = new Float64Array(2 * odd.length);
    const weight = new Float64Array(odd.length);
    for (let k = 0; k < odd.length; k++) {
      t[2 * k] = odd[k]! - even[k]!;
      weight[k] = Math.min(1, odd[k]! + even[k]!);
    }
    return { t, weight };
  },
  // The amplitude plate's open zones as discs with alternating signs: zone n (odd) = disc r_n less
  // disc r_{n−1}. The phase plate has none (its transmittance is not open/closed).
  boundary(s) {
    if (s.kind !== 'amplitude') return null;
    const out: BoundaryRegion[] = [];
    for (let n = 1; n <= s.zones; n += 2) {
      out.push({ kind: 'disc', radius: zoneRadius(s, n), sign: 1 });
      if (n > 1) out.push({ kind: 'disc', radius: zoneRadius(s, n - 1), sign: -1 });
    }
    return out;
  },
  describe,
};
