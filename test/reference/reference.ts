// The exact reference for one case of the job schema's space, at given observation points, or the
// reason there is none (test code only). It picks the cheapest exact reference that applies and
// fits a time budget, else a paraxial one whose error is provably below 0.1 % of the peak, else an
// exact on-axis value, else none. Which one was used is returned in words.
//
// - 1-D apertures (slit, slits without length): rs1d.ts (exact), else fresnel.ts (plane wave).
// - 2-D, plane wave at normal incidence: the boundary form of rs2d.ts (exact).
// - 2-D, tilted or Gaussian: 2-D quadrature of rs2d.ts (exact), if affordable.
// - Else, where the paraxial bound allows: Fresnel integrals (rectangles, slits with length, plane
//   wave) or the radial Fresnel integral (circles and annuli, no tilt, open or plane wave).
// - Else, round apertures without tilt: the exact on-axis value, at the axis only.
// Accuracy: that of the reference used (see each file): 1e-9 of the peak or better for the exact
// ones, ≤ 1e-3 of the peak (bounded) for the paraxial ones.
import type { Aperture, Illumination } from '../../src/optics/aperture.js';
import { gratingIntervals, intensity as intensity1, rs1d, rs1dCost, type Problem1D } from './rs1d.js';
import {
  boundaryCost,
  boundaryField,
  quad2dCost,
  quad2dField,
  roundOnAxisIntensity,
  type Problem2D,
  type SignedRegion,
} from './rs2d.js';
import { fresnel1D, fresnelRadial, fresnelSeparableIntensity, paraxialBound } from './fresnel.js';

export interface RefCase {
  wavelength: number;
  distance: number;
  aperture: Aperture;
  illumination: Illumination;
}

/** Rough cost per kernel evaluation (µs) on one core, measured in reference.test.ts' neighbour runs. */
export const MICROS_PER_NODE = { bessel: 1.6, boundary: 0.06, quad: 0.09 } as const; // 1-D: rs1dCost gives µs itself

export type RefOutcome =
  | { ok: true; how: string; intensity: Float64Array; points: [number, number][] }
  | { ok: false; reason: string };

export function isOneD(a: Aperture): boolean {
  return (a.shape === 'slit' || a.shape === 'slits' || a.shape === 'grating') && !a.length;
}

/** Open intervals along x of a 1-D aperture (or of a separable one's x-profile). */
export function xIntervals(a: Aperture): [number, number][] {
  if (a.shape === 'slit') return [[-a.width / 2, a.width / 2]];
  if (a.shape === 'slits') return gratingIntervals(a.count, a.width, a.period);
  if (a.shape === 'rectangle') return [[-a.width / 2, a.width / 2]];
  throw new Error(`no x-intervals for ${a.shape}`);
}

export function regionsOf(a: Aperture): SignedRegion[] {
  switch (a.shape) {
    case 'circle':
      return [{ region: { kind: 'disc', radius: a.diameter / 2 }, sign: 1 }];
    case 'annulus':
      return [
        { region: { kind: 'disc', radius: a.outer / 2 }, sign: 1 },
        { region: { kind: 'disc', radius: a.inner / 2 }, sign: -1 },
      ];
    case 'rectangle':
      return [{ region: { kind: 'rect', x0: -a.width / 2, x1: a.width / 2, y0: -a.height / 2, y1: a.height / 2 }, sign: 1 }];
    case 'slit':
    case 'slits': {
      const h = (a.length ?? NaN) / 2;
      return xIntervals(a).map(([x0, x1]) => ({ region: { kind: 'rect', x0, x1, y0: -h, y1: h }, sign: 1 }));
    }
    default: {
      const rects = placedRects(a);
      if (!rects) throw new Error(`no regions for ${a.shape}`);
      return rects.map(([x0, x1, y0, y1, sign]) => ({ region: { kind: 'rect', x0, x1, y0, y1 }, sign }));
    }
  }
}

type SignedRect = [number, number, number, number, 1 | -1];

/**
 * Polygons, combinations and arrays as signed axis-aligned rectangles, where they are made of
 * them: a rectilinear polygon cut into horizontal slabs (between consecutive vertex heights the
 * vertical edges crossing the slab bound its open intervals, paired left to right); a combination
 * of rectangles (and rectilinear polygons) as its added parts (+) and cut parts (−), which the
 * draw keeps disjoint and inside respectively; an array of rectangles as its copies, at the
 * lattice of the job's definition (rectangular, or hexagonal: rows √3/2 of the pitch apart, every
 * other one shifted by ±¼ pitch). Null for anything else (no exact reference here).
 */
export function placedRects(a: Aperture): SignedRect[] | null {
  const shift = (r: SignedRect[], dx: number, dy: number, sign: 1 | -1): SignedRect[] =>
    r.map(([x0, x1, y0, y1, s]) => [x0 + dx, x1 + dx, y0 + dy, y1 + dy, (s * sign) as 1 | -1]);
  const own = (e: { shape: string } & Record<string, unknown>): SignedRect[] | null => {
    if (e.shape === 'rectangle') {
      const w = e.width as number;
      const h = e.height as number;
      return [[-w / 2, w / 2, -h / 2, h / 2, 1]];
    }
    if (e.shape === 'polygon') return rectilinearSlabs(e.vertices as [number, number][]);
    return null;
  };
  if (a.shape === 'polygon') return rectilinearSlabs(a.vertices);
  if (a.shape === 'combined') {
    const out: SignedRect[] = [];
    for (const [list, sign] of [[a.add, 1], [a.cut, -1]] as const) {
      for (const p of list) {
        const r = own(p.element);
        if (!r) return null;
        out.push(...shift(r, p.at[0], p.at[1], sign));
      }
    }
    return out;
  }
  if (a.shape === 'array') {
    const r = own(a.of.element);
    if (!r) return null;
    const [nx, ny] = a.count;
    const hex = a.layout === 'hexagonal';
    const out: SignedRect[] = [];
    for (let j = 0; j < ny; j++) {
      const off = hex && ny > 1 ? (j % 2 === 0 ? -0.25 : 0.25) * a.pitch : 0;
      const y = (j - (ny - 1) / 2) * a.pitch * (hex ? Math.sqrt(3) / 2 : 1);
      for (let i = 0; i < nx; i++) out.push(...shift(r, (i - (nx - 1) / 2) * a.pitch + off + a.of.at[0], y + a.of.at[1], 1));
    }
    return out;
  }
  return null;
}

/** A rectilinear polygon's horizontal slabs as rectangles; null when an edge is not axis-aligned. */
function rectilinearSlabs(v: readonly [number, number][]): SignedRect[] | null {
  const n = v.length;
  for (let i = 0; i < n; i++) {
    const [x1, y1] = v[i]!;
    const [x2, y2] = v[(i + 1) % n]!;
    if (x1 !== x2 && y1 !== y2) return null;
  }
  const ys = [...new Set(v.map((p) => p[1]))].sort((p, q) => p - q);
  const out: SignedRect[] = [];
  for (let k = 0; k + 1 < ys.length; k++) {
    const y0 = ys[k]!;
    const y1 = ys[k + 1]!;
    const mid = (y0 + y1) / 2;
    const xs: number[] = [];
    for (let i = 0; i < n; i++) {
      const [xa, ya] = v[i]!;
      const [xb, yb] = v[(i + 1) % n]!;
      if (xa === xb && Math.min(ya, yb) < mid && mid < Math.max(ya, yb)) xs.push(xa);
    }
    xs.sort((p, q) => p - q);
    for (let i = 0; i + 1 < xs.length; i += 2) out.push([xs[i]!, xs[i + 1]!, y0, y1, 1]);
  }
  return out;
}

function lightOf(ill: Illumination) {
  return ill.kind === 'gaussian'
    ? { kind: 'gaussian' as const, waist: ill.waist, sinTilt: Math.sin(ill.tilt[0]) }
    : { kind: 'plane' as const, sinTilt: Math.sin(ill.tilt[0]) };
}

/** Half extents of the aperture along x and y. */
function halfExtent(a: Aperture): [number, number] {
  switch (a.shape) {
    case 'circle':
      return [a.diameter / 2, a.diameter / 2];
    case 'annulus':
      return [a.outer / 2, a.outer / 2];
    case 'rectangle':
      return [a.width / 2, a.height / 2];
    case 'slit':
      return [a.width / 2, (a.length ?? 0) / 2];
    case 'slits':
      return [((a.count - 1) * a.period + a.width) / 2, (a.length ?? 0) / 2];
    default: {
      let hx = 0;
      let hy = 0;
      for (const [x0, x1, y0, y1] of placedRects(a) ?? []) {
        hx = Math.max(hx, Math.abs(x0), Math.abs(x1));
        hy = Math.max(hy, Math.abs(y0), Math.abs(y1));
      }
      return [hx, hy];
    }
  }
}

function openMeasure(a: Aperture): number {
  switch (a.shape) {
    case 'circle':
      return (Math.PI * a.diameter ** 2) / 4;
    case 'annulus':
      return (Math.PI * (a.outer ** 2 - a.inner ** 2)) / 4;
    case 'rectangle':
      return a.width * a.height;
    case 'slit':
      return a.width * (a.length ?? 1);
    case 'slits':
      return a.count * a.width * (a.length ?? 1);
    default: {
      let s = 0;
      for (const [x0, x1, y0, y1, sign] of placedRects(a) ?? []) s += sign * (x1 - x0) * (y1 - y0);
      return s;
    }
  }
}

/** Estimated µs of the exact 1-D reference at these points (for choosing how many to compare). */
export function referenceCost1D(c: RefCase, pts: [number, number][]): number {
  const a = c.aperture;
  if (a.shape === 'grating') {
    // The extent and the steps (see referenceIntensity): about twice the cost of the steps alone.
    const w = (a.profile.kind === 'binary-phase' ? a.profile.duty : 0.5) * a.period;
    const steps = gratingIntervals(a.count, w, a.period);
    const q: Problem1D = { wavelength: c.wavelength, distance: c.distance, intervals: steps, light: lightOf(c.illumination), opaque: false };
    return 2 * rs1dCost(q, pts.map(([x]) => x));
  }
  const p: Problem1D = { wavelength: c.wavelength, distance: c.distance, intervals: xIntervals(c.aperture), light: lightOf(c.illumination), opaque: c.aperture.opaque };
  return rs1dCost(p, pts.map(([x]) => x));
}

/**
 * The reference intensity at `pts` ([x, y]; y is ignored for 1-D apertures), within a budget of
 * about `budgetMicros` of computing. For 2-D cases the caller passes the points it wants; when only
 * the axis can be had, `axisIndex` (the index in pts of the point on the axis, if any) is used.
 */
export function referenceIntensity(c: RefCase, pts: [number, number][], budgetMicros: number, axisIndex = -1): RefOutcome {
  const lam = c.wavelength;
  const z = c.distance;
  const a = c.aperture;
  const ill = c.illumination;
  const light = lightOf(ill);
  if (ill.tilt[1] !== 0 && !isOneD(a)) return { ok: false, reason: 'tilt in y: no reference here' };
  const [hx, hy] = halfExtent(a);
  const rhoMax = Math.max(...pts.map(([x, y]) => Math.hypot(Math.abs(x) + hx, isOneD(a) ? 0 : Math.abs(y) + hy)));
  const k = (2 * Math.PI) / lam;
  const freePhase = a.opaque && ill.kind === 'plane' ? Math.abs(k * z * (Math.cos(ill.tilt[0]) - 1 + Math.sin(ill.tilt[0]) ** 2 / 2)) : 0;

  if (a.shape === 'grating') {
    // A binary phase grating is piecewise constant: the whole extent open, plus (e^{iφ} − 1) times
    // its stepped strips, each an exact 1-D problem (linearity of the integral). Other profiles
    // have no exact reference here.
    const g = a.profile;
    if (g.kind !== 'binary-phase' || a.length || ill.tilt[1] !== 0) return { ok: false, reason: `no exact reference for a ${g.kind} grating${a.length ? ' of finite length' : ''}` };
    const half = (a.count * a.period) / 2;
    const w = g.duty * a.period;
    const steps: [number, number][] = [];
    for (let k = 0; k < a.count; k++) {
      const c = (k - (a.count - 1) / 2) * a.period;
      steps.push([c - w / 2, c + w / 2]);
    }
    const xs = pts.map(([x]) => x);
    const whole: Problem1D = { wavelength: lam, distance: z, intervals: [[-half, half]], light, opaque: false };
    const stepped: Problem1D = { wavelength: lam, distance: z, intervals: steps, light, opaque: false };
    if (rs1dCost(whole, xs, budgetMicros) + rs1dCost(stepped, xs, budgetMicros) > budgetMicros) return { ok: false, reason: 'exact 1-D reference over budget' };
    const u1 = rs1d(whole, xs);
    const u2 = rs1d(stepped, xs);
    const cr = Math.cos(g.step) - 1;
    const ci = Math.sin(g.step);
    const I = new Float64Array(xs.length);
    for (let i = 0; i < xs.length; i++) {
      const re = u1.re[i]! + cr * u2.re[i]! - ci * u2.im[i]!;
      const im = u1.im[i]! + cr * u2.im[i]! + ci * u2.re[i]!;
      I[i] = re * re + im * im;
    }
    return { ok: true, how: 'exact 1-D Rayleigh–Sommerfeld (the extent plus the phase steps, by linearity)', intensity: I, points: pts };
  }

  if (isOneD(a)) {
    const p: Problem1D = { wavelength: lam, distance: z, intervals: xIntervals(a), light, opaque: a.opaque };
    const xs = pts.map(([x]) => x);
    if (rs1dCost(p, xs, budgetMicros) <= budgetMicros) {
      return { ok: true, how: 'exact 1-D Rayleigh–Sommerfeld', intensity: intensity1(rs1d(p, xs)), points: pts };
    }
    if (ill.kind === 'plane') {
      const I = new Float64Array(xs.map((x) => {
        const u = fresnel1D(lam, z, p.intervals, light.sinTilt, x, a.opaque);
        return u.re * u.re + u.im * u.im;
      }));
      const B = paraxialBound(lam, z, openMeasure(a), rhoMax, true) + freePhase;
      if (paraxialOk(I, B)) return { ok: true, how: 'paraxial Fresnel integrals (error bound < 0.1 % of the peak)', intensity: I, points: pts };
    }
    return { ok: false, reason: 'exact 1-D reference over budget, paraxial bound not small' };
  }

  if (!['circle', 'annulus', 'rectangle', 'slit', 'slits'].includes(a.shape) && !placedRects(a)) return { ok: false, reason: `no exact reference for this ${a.shape}` };
  const p: Problem2D = { wavelength: lam, distance: z, regions: regionsOf(a), light, opaque: a.opaque };
  const normal = ill.kind === 'plane' && light.sinTilt === 0;
  if (normal && boundaryCost(p, pts) * MICROS_PER_NODE.boundary <= budgetMicros) {
    const f = boundaryField(p, pts);
    return { ok: true, how: 'exact boundary form of the Rayleigh–Sommerfeld integral', intensity: intensity1(f), points: pts };
  }
  if (!normal) {
    const limit = budgetMicros / MICROS_PER_NODE.quad;
    if (quad2dCost(p, pts, limit) <= limit) {
      return { ok: true, how: 'exact 2-D quadrature of the Rayleigh–Sommerfeld integral', intensity: intensity1(quad2dField(p, pts)), points: pts };
    }
  }
  // Paraxial references where the bound allows.
  const w = ill.kind === 'gaussian' ? ill.waist : Infinity;
  const open = Math.min(openMeasure(a), Number.isFinite(w) ? Math.PI * w * w : Infinity);
  const B = paraxialBound(lam, z, open, rhoMax, false) + freePhase;
  if (ill.kind === 'plane' && (a.shape === 'rectangle' || a.shape === 'slit' || a.shape === 'slits')) {
    const yIv: [number, number][] = [[-hy, hy]];
    const I = new Float64Array(pts.map(([x, y]) => fresnelSeparableIntensity(lam, z, xIntervals(a), yIv, light.sinTilt, x, y, a.opaque)));
    if (paraxialOk(I, B)) return { ok: true, how: 'paraxial Fresnel integrals (error bound < 0.1 % of the peak)', intensity: I, points: pts };
  }
  const round = a.shape === 'circle' || a.shape === 'annulus';
  if (round && light.sinTilt === 0 && !(a.opaque && Number.isFinite(w))) {
    const inner = a.shape === 'annulus' ? a.inner / 2 : 0;
    const outer = hx;
    // Cost: the radial integral's panels (~ (k a²/2z + k ρ a/z)/8 per point), J₀ at 16 nodes each.
    const panels = pts.reduce((s, [x, y]) => s + (k * outer * outer) / (2 * z) / 8 + (k * Math.hypot(x, y) * outer) / z / 8 + 2, 0);
    if (panels * 16 * MICROS_PER_NODE.bessel <= budgetMicros) {
      const I = new Float64Array(pts.map(([x, y]) => {
        const u = fresnelRadial(lam, z, inner, outer, w, Math.hypot(x, y), a.opaque);
        return u.re * u.re + u.im * u.im;
      }));
      if (paraxialOk(I, B)) return { ok: true, how: 'paraxial radial Fresnel integral (error bound < 0.1 % of the peak)', intensity: I, points: pts };
    }
  }
  if (round && light.sinTilt === 0 && axisIndex >= 0) {
    const discs = regionsOf(a).map((r) => ({ radius: (r.region as { radius: number }).radius, sign: r.sign }));
    const I = roundOnAxisIntensity(lam, z, discs, w, a.opaque);
    return { ok: true, how: 'exact on-axis value only', intensity: new Float64Array([I]), points: [pts[axisIndex]!] };
  }
  return { ok: false, reason: normal ? 'boundary form over budget, paraxial bound not small' : '2-D quadrature over budget, paraxial bound not small' };
}

/** A paraxial field is accepted when its bounded intensity error is below 0.1 % of its peak. */
function paraxialOk(I: Float64Array, B: number): boolean {
  let peak = 0;
  for (const v of I) peak = Math.max(peak, v);
  if (!(peak > 0) || !Number.isFinite(B)) return false;
  return 2 * Math.sqrt(peak) * B + B * B <= 1e-3 * peak;
}
