// Exact 2-D references: the first Rayleigh–Sommerfeld solution behind plane apertures (circles,
// annuli, rectangles and sets of rectangles), unit incident irradiance (test code only; it shares
// nothing with src/).
//
//   U(x, y, z) = ∬ U₀(ξ, η) h(r) dξ dη,   h = (1/2π)(z/r)(1/r − ik) e^{ikr}/r,
//   r = √((x − ξ)² + (y − η)² + z²)       (Goodman, Introduction to Fourier Optics, §3.5).
//
// Three ways, each exact for the scalar problem (they are checked against each other in
// rs2d.test.ts):
//
// 1. On the axis of a circle (plane wave, normal incidence), closed form: h = −(1/2π)∂_z(e^{ikr}/r)
//    and ρdρ = r dr give U(0, z) = e^{ikz} − (z/R)e^{ikR}, R = √(z² + a²) (Osterberg & Smith,
//    J. Opt. Soc. Am. 51, 1050 (1961), from memory; derived here in two lines as said). An annulus is
//    the difference of two discs (the integral is linear in the aperture); an opaque disc is the free
//    wave e^{ikz} less the hole (Babinet): (z/R)e^{ikR}, the Poisson spot.
//
// 2. Anywhere, plane wave at normal incidence: the same two lines along every ray from the foot F
//    of the observation point give, for a segment [ρ₁, ρ₂] of a ray in the aperture,
//    ∫ h ρ dρ = −(1/2π)[g(r₂) − g(r₁)] per unit angle, g(r) = (z/r)e^{ikr}; summed over the rays:
//       U(P) = e^{ikz}·χ(F) − (1/2π) ∮_∂A g(R) dψ,
//    where χ = 1 when F is inside the aperture (the segment from ρ = 0 gives g(z) = e^{ikz}), R the
//    distance from P to the boundary point, and dψ = ((ξ − x)dη − (η − y)dξ)/ρ² the angle the
//    boundary element subtends at F, the boundary taken counter-clockwise. A boundary-diffraction-
//    wave form of the integral (the idea goes back to Maggi and Rubinowicz; Miyamoto & Wolf,
//    J. Opt. Soc. Am. 52, 615 (1962), from memory); the derivation above is all this code relies on.
//    A 1-D integral: cheap at any Fresnel number.
//
// 3. Anywhere, any illumination (tilt in x, Gaussian): 2-D Gauss–Legendre panels, the outer ones
//    along y (for a disc, η = a·sin t, so the chord a·cos t is smooth), the inner ones along x over
//    the chord, both cut at the foot and sized like the 1-D reference's (≤ 8 rad of phase, ≤ r/2,
//    ≤ w/2). The cost is the number of nodes; callers estimate it first (quad2dCost).
//
// Accuracy: 1 and 2 to about 1e-12 of the peak; 3 to about 1e-10 (rs2d.test.ts: refinement and
// agreement of 2 and 3 to 1e-9 or better).
import { countPanels, gaussLegendre, walkPanels } from './quadrature.js';

export type Region =
  | { kind: 'disc'; radius: number }
  | { kind: 'rect'; x0: number; x1: number; y0: number; y1: number };

export interface SignedRegion {
  region: Region;
  sign: 1 | -1;
}

export interface Light2D {
  kind: 'plane' | 'gaussian';
  waist?: number;
  /** sin θ of the tilt in x (the generator tilts in x only). */
  sinTilt: number;
}

export interface Problem2D {
  wavelength: number;
  distance: number;
  /** The open aperture as a signed sum of regions. */
  regions: SignedRegion[];
  light: Light2D;
  opaque: boolean;
}

export interface Field2D {
  re: Float64Array;
  im: Float64Array;
}

const NODES = 16;
const PHASE_PER_PANEL = 8;
const AMPLITUDE_FRACTION = 0.5;
const GAUSS_REACH = 6.5;

// --- 1. On the axis ---------------------------------------------------------------------------

/** U(0, z) behind an open disc of radius a, plane wave at normal incidence (closed form). */
export function discOnAxis(wavelength: number, z: number, a: number): [number, number] {
  const k = (2 * Math.PI) / wavelength;
  const R = Math.hypot(z, a);
  // e^{ikz}(1 − (z/R)e^{ik(R − z)}), with R − z as a²/(R + z) (no cancellation when a ≪ z).
  const dd = k * ((a * a) / (R + z));
  const q = z / R;
  const re0 = 1 - q * Math.cos(dd);
  const im0 = -q * Math.sin(dd);
  const c = Math.cos(k * z);
  const s = Math.sin(k * z);
  return [re0 * c - im0 * s, re0 * s + im0 * c];
}

/** Intensity on the axis of a centred signed sum of discs (circle, annulus), opaque or not. */
export function axisIntensity(wavelength: number, z: number, discs: { radius: number; sign: 1 | -1 }[], opaque: boolean): number {
  const k = (2 * Math.PI) / wavelength;
  // Work relative to e^{ikz}: U e^{−ikz} = Σ sign·(1 − (z/R)e^{ik(R−z)}).
  let re = opaque ? 1 : 0;
  let im = 0;
  const o = opaque ? -1 : 1;
  for (const d of discs) {
    const R = Math.hypot(z, d.radius);
    const ph = k * ((d.radius * d.radius) / (R + z));
    const q = z / R;
    re += o * d.sign * (1 - q * Math.cos(ph));
    im += o * d.sign * (-q * Math.sin(ph));
  }
  return re * re + im * im;
}

// --- 2. Boundary form (plane wave, normal incidence) -----------------------------------------

interface Acc {
  re: number;
  im: number;
}

/** Whether F lies on the region's boundary (within tol). */
function onBoundary(reg: Region, x: number, y: number, tol: number): boolean {
  if (reg.kind === 'disc') return Math.abs(Math.hypot(x, y) - reg.radius) <= tol;
  const inX = x >= reg.x0 - tol && x <= reg.x1 + tol;
  const inY = y >= reg.y0 - tol && y <= reg.y1 + tol;
  return (inY && (Math.abs(x - reg.x0) <= tol || Math.abs(x - reg.x1) <= tol)) || (inX && (Math.abs(y - reg.y0) <= tol || Math.abs(y - reg.y1) <= tol));
}

function inside(reg: Region, x: number, y: number): boolean {
  if (reg.kind === 'disc') return Math.hypot(x, y) < reg.radius;
  return x > reg.x0 && x < reg.x1 && y > reg.y0 && y < reg.y1;
}

/**
 * Adds −(1/2π)∫ g(R) dψ along a straight boundary piece from (ax, ay) to (bx, by) (direction of
 * travel as given), for the foot (x, y) at height z. Returns the number of nodes used. The piece is
 * parametrised by u, the distance along it from the foot's projection, so that ρ² = c² + u² holds
 * to full precision however close the foot is to the line (c: the foot's signed distance from it).
 */
function segmentIntegral(ax: number, ay: number, bx: number, by: number, x: number, y: number, z: number, k: number, acc: Acc, count: boolean): number {
  const L = Math.hypot(bx - ax, by - ay);
  if (!(L > 0)) return 0;
  const tx = (bx - ax) / L;
  const ty = (by - ay) / L;
  const sp = (x - ax) * tx + (y - ay) * ty;
  const cross = (ax - x) * ty - (ay - y) * tx; // (B − F) × t, constant along the line
  if (cross === 0) return 0; // F on the line's extension: the side subtends no angle.
  const c2 = cross * cross;
  // u from −sp to L − sp; ρ is monotonic on each side of u = 0.
  const u0 = -sp;
  const u1 = L - sp;
  const pieces: [number, number][] = u0 < 0 && u1 > 0 ? [[u0, 0], [0, u1]] : [[u0, u1]];
  const rule = gaussLegendre(NODES);
  const scale = (u: number) => {
    const rho = Math.sqrt(c2 + u * u);
    const R = Math.sqrt(rho * rho + z * z);
    return Math.min((PHASE_PER_PANEL * R) / (k * rho), AMPLITUDE_FRACTION * rho);
  };
  let nodes = 0;
  for (const [lo, hi] of pieces) {
    if (count) {
      nodes += NODES * countPanels(lo, hi, scale);
      continue;
    }
    walkPanels(lo, hi, scale, (p0, p1) => {
      const half = (p1 - p0) / 2;
      const mid = (p1 + p0) / 2;
      for (let j = 0; j < NODES; j++) {
        const u = mid + half * rule.x[j]!;
        const rho2 = c2 + u * u;
        const R = Math.sqrt(rho2 + z * z);
        const dpsi = cross / rho2; // dψ/du = ((ξ−x)t_y − (η−y)t_x)/ρ²
        const wgt = (-(rule.w[j]! * half) / (2 * Math.PI)) * (z / R) * dpsi;
        // e^{ik(R − z)}: the common e^{ikz} is put back by the caller.
        const ph = k * (rho2 / (R + z));
        acc.re += wgt * Math.cos(ph);
        acc.im += wgt * Math.sin(ph);
      }
      nodes += NODES;
    });
  }
  return nodes;
}

/**
 * The same along a circle of radius a (counter-clockwise). In a frame turned so that the foot is at
 * (d, 0), the boundary point a(cos φ, sin φ) has ρ² = (a − d)² + 4ad sin²(φ/2) and
 * dψ/dφ = (a(a − d) + 2ad sin²(φ/2))/ρ², both even in φ: twice the integral over [0, π], on which ρ
 * is monotonic, written so that a foot close to the circle loses no precision.
 */
function circleIntegral(a: number, x: number, y: number, z: number, k: number, acc: Acc, count: boolean): number {
  const d = Math.hypot(x, y);
  const amd = a - d;
  const rule = gaussLegendre(NODES);
  const rho2At = (phi: number) => {
    const s = Math.sin(phi / 2);
    return amd * amd + 4 * a * d * s * s;
  };
  const scale = (phi: number) => {
    const rho = Math.sqrt(rho2At(phi));
    const R = Math.sqrt(rho * rho + z * z);
    // |dR/dφ| ≤ (ρ/R)·a; the subtended-angle factor varies on the scale ρ/a; the arc itself 0.5 rad.
    return Math.min((PHASE_PER_PANEL * R) / (k * rho * a), (AMPLITUDE_FRACTION * rho) / a, 0.5);
  };
  if (count) return 2 * NODES * countPanels(0, Math.PI, scale);
  let nodes = 0;
  walkPanels(0, Math.PI, scale, (p0, p1) => {
    const half = (p1 - p0) / 2;
    const mid = (p1 + p0) / 2;
    for (let j = 0; j < NODES; j++) {
      const phi = mid + half * rule.x[j]!;
      const s = Math.sin(phi / 2);
      const rho2 = amd * amd + 4 * a * d * s * s;
      const R = Math.sqrt(rho2 + z * z);
      const dpsi = (a * amd + 2 * a * d * s * s) / rho2;
      const wgt = (-(2 * rule.w[j]! * half) / (2 * Math.PI)) * (z / R) * dpsi;
      const ph = k * (rho2 / (R + z));
      acc.re += wgt * Math.cos(ph);
      acc.im += wgt * Math.sin(ph);
    }
    nodes += 2 * NODES;
  });
  return nodes;
}

function boundaryAt(p: Problem2D, x0: number, y0: number, acc: Acc, count: boolean): number {
  const k = (2 * Math.PI) / p.wavelength;
  const z = p.distance;
  let nodes = 0;
  // A foot on an edge: the field is continuous there, so it is evaluated a hair away (1e-9 λ, or
  // a thousand ulps of the coordinates if that is more).
  let x = x0;
  let y = y0;
  const hair = Math.max(1e-9 * p.wavelength, 2.2e-13 * Math.max(Math.abs(x), Math.abs(y)));
  if (p.regions.some((r) => onBoundary(r.region, x, y, 1e-3 * hair))) {
    x += 1.3 * hair;
    y += 0.7 * hair;
  }
  for (const { region, sign } of p.regions) {
    const part: Acc = { re: 0, im: 0 };
    if (inside(region, x, y)) part.re += 1;
    if (region.kind === 'disc') nodes += circleIntegral(region.radius, x, y, z, k, part, count);
    else {
      const { x0: a, x1: b, y0: c, y1: d } = region;
      nodes += segmentIntegral(a, c, b, c, x, y, z, k, part, count);
      nodes += segmentIntegral(b, c, b, d, x, y, z, k, part, count);
      nodes += segmentIntegral(b, d, a, d, x, y, z, k, part, count);
      nodes += segmentIntegral(a, d, a, c, x, y, z, k, part, count);
    }
    acc.re += sign * part.re;
    acc.im += sign * part.im;
  }
  return nodes;
}

/** Nodes the boundary form needs at these points. */
export function boundaryCost(p: Problem2D, pts: [number, number][]): number {
  let n = 0;
  for (const [x, y] of pts) n += boundaryAt(p, x, y, { re: 0, im: 0 }, true);
  return n;
}

/** U at each point by the boundary form: plane wave at normal incidence only. */
export function boundaryField(p: Problem2D, pts: [number, number][]): Field2D {
  if (p.light.kind !== 'plane' || p.light.sinTilt !== 0) throw new Error('the boundary form is for a plane wave at normal incidence');
  const k = (2 * Math.PI) / p.wavelength;
  const z = p.distance;
  const re = new Float64Array(pts.length);
  const im = new Float64Array(pts.length);
  const c = Math.cos(k * z);
  const s = Math.sin(k * z);
  pts.forEach(([x, y], i) => {
    const acc: Acc = { re: 0, im: 0 };
    boundaryAt(p, x, y, acc, false);
    // Relative to e^{ikz} so far; an obstacle is the free wave (1) less the hole.
    const ur = p.opaque ? 1 - acc.re : acc.re;
    const ui = p.opaque ? -acc.im : acc.im;
    re[i] = ur * c - ui * s;
    im[i] = ur * s + ui * c;
  });
  return { re, im };
}

// --- 3. 2-D quadrature (any illumination) -----------------------------------------------------

/** The regions integrated: the open ones, or for an obstacle in a Gaussian beam the beam's disc less them. */
function quadRegions(p: Problem2D): SignedRegion[] {
  if (!p.opaque) return p.regions;
  const flipped = p.regions.map((r): SignedRegion => ({ region: r.region, sign: (-r.sign) as 1 | -1 }));
  if (p.light.kind === 'gaussian') return [{ region: { kind: 'disc', radius: GAUSS_REACH * p.light.waist! }, sign: 1 }, ...flipped];
  return flipped; // plus the free plane wave, added in closed form
}

function innerScale(k: number, zEff: number, x: number, alpha: number, w: number) {
  return (t: number) => {
    const u = t - x;
    const r = Math.sqrt(u * u + zEff * zEff);
    return Math.min(PHASE_PER_PANEL / (k * Math.abs(u / r + alpha)), AMPLITUDE_FRACTION * r, 0.5 * w);
  };
}

function cut(a: number, b: number, c: number): [number, number][] {
  return c > a && c < b ? [[a, c], [c, b]] : [[a, b]];
}

/**
 * ∬ over one region at one point; with `count`, only counts nodes (stopping past `limit`).
 * Outer variable: η for rectangles, t (η = a sin t) for discs.
 */
function quadRegion(p: Problem2D, reg: Region, x: number, y: number, acc: Acc, count: boolean, limit: number): number {
  const k = (2 * Math.PI) / p.wavelength;
  const z = p.distance;
  const alpha = p.light.sinTilt;
  const w = p.light.kind === 'gaussian' ? p.light.waist! : Infinity;
  const rule = gaussLegendre(NODES);
  let nodes = 0;
  // Outer scale in η: phase k|η − y|/√((η−y)² + z²) (an upper bound over the chord), amplitude, beam.
  const etaScale = (eta: number) => {
    const v = eta - y;
    const r = Math.sqrt(v * v + z * z);
    return Math.min(PHASE_PER_PANEL / (k * (Math.abs(v) / r)), AMPLITUDE_FRACTION * r, 0.5 * w);
  };
  const chordAt = (eta: number): [number, number] | null => {
    if (reg.kind === 'rect') return [reg.x0, reg.x1];
    const h = reg.radius * reg.radius - eta * eta;
    if (!(h > 0)) return null;
    const c = Math.sqrt(h);
    return [-c, c];
  };
  const inner = (eta: number, weight: number) => {
    const chord = chordAt(eta);
    if (!chord) return;
    const v = eta - y;
    const zEff = Math.sqrt(z * z + v * v);
    const scale = innerScale(k, zEff, x, alpha, w);
    const env = w === Infinity ? 1 : Math.exp(-(eta * eta) / (w * w));
    for (const [lo, hi] of cut(chord[0], chord[1], x)) {
      if (count) {
        nodes += NODES * countPanels(lo, hi, scale, (limit - nodes) / NODES);
        continue;
      }
      walkPanels(lo, hi, scale, (p0, p1) => {
        const half = (p1 - p0) / 2;
        const mid = (p1 + p0) / 2;
        for (let j = 0; j < NODES; j++) {
          const xi = mid + half * rule.x[j]!;
          const u = xi - x;
          const rho2 = u * u + v * v;
          const r = Math.sqrt(rho2 + z * z);
          // h e^{−ikz} = (z/(2π r²))(1/r − ik) e^{ik(r − z)}, times the tilt e^{ikαξ}.
          const amp = weight * rule.w[j]! * half * env * (w === Infinity ? 1 : Math.exp(-(xi * xi) / (w * w))) * (z / (2 * Math.PI * r * r));
          const ph = k * (rho2 / (r + z)) + k * alpha * xi;
          const c = Math.cos(ph);
          const s = Math.sin(ph);
          acc.re += amp * (c / r + k * s);
          acc.im += amp * (s / r - k * c);
        }
        nodes += NODES;
      });
    }
  };
  if (reg.kind === 'rect') {
    for (const [lo, hi] of cut(reg.y0, reg.y1, y)) {
      walkPanels(lo, hi, etaScale, (p0, p1) => {
        const half = (p1 - p0) / 2;
        const mid = (p1 + p0) / 2;
        for (let j = 0; j < NODES; j++) {
          if (count && nodes > limit) return;
          inner(mid + half * rule.x[j]!, rule.w[j]! * half);
        }
      });
    }
  } else {
    const a = reg.radius;
    const tScale = (t: number) => {
      const c = Math.cos(t);
      return Math.min(c > 0 ? etaScale(a * Math.sin(t)) / (a * c) : Infinity, 0.5);
    };
    const ty = Math.abs(y) < a ? Math.asin(y / a) : NaN;
    for (const [lo, hi] of Number.isNaN(ty) ? [[-Math.PI / 2, Math.PI / 2] as [number, number]] : cut(-Math.PI / 2, Math.PI / 2, ty)) {
      walkPanels(lo, hi, tScale, (p0, p1) => {
        const half = (p1 - p0) / 2;
        const mid = (p1 + p0) / 2;
        for (let j = 0; j < NODES; j++) {
          if (count && nodes > limit) return;
          const t = mid + half * rule.x[j]!;
          inner(a * Math.sin(t), rule.w[j]! * half * a * Math.cos(t));
        }
      });
    }
  }
  return nodes;
}

/** Nodes the 2-D quadrature needs at these points (stops counting past `limit`). */
export function quad2dCost(p: Problem2D, pts: [number, number][], limit = Infinity): number {
  let n = 0;
  for (const [x, y] of pts) {
    for (const { region } of quadRegions(p)) {
      n += quadRegion(p, region, x, y, { re: 0, im: 0 }, true, limit - n);
      if (n > limit) return n;
    }
  }
  return n;
}

/** U at each point by 2-D quadrature (any illumination). */
export function quad2dField(p: Problem2D, pts: [number, number][]): Field2D {
  const k = (2 * Math.PI) / p.wavelength;
  const z = p.distance;
  const alpha = p.light.sinTilt;
  const gamma = Math.sqrt(1 - alpha * alpha);
  const re = new Float64Array(pts.length);
  const im = new Float64Array(pts.length);
  const c = Math.cos(k * z);
  const s = Math.sin(k * z);
  const regions = quadRegions(p);
  pts.forEach(([x, y], i) => {
    const acc: Acc = { re: 0, im: 0 };
    for (const { region, sign } of regions) {
      const part: Acc = { re: 0, im: 0 };
      quadRegion(p, region, x, y, part, false, Infinity);
      acc.re += sign * part.re;
      acc.im += sign * part.im;
    }
    let ur = acc.re * c - acc.im * s;
    let ui = acc.re * s + acc.im * c;
    if (p.opaque && p.light.kind === 'plane') {
      const ph = k * (alpha * x + gamma * z);
      ur += Math.cos(ph);
      ui += Math.sin(ph);
    }
    re[i] = ur;
    im[i] = ui;
  });
  return { re, im };
}

// --- On the axis of round apertures, any radial amplitude (plane or Gaussian, no tilt) ---------

/**
 * U(0, z) behind a centred signed sum of discs lit by amplitude A(ρ) = exp(−ρ²/w²) (w = ∞: a plane
 * wave), by 1-D quadrature of ∫ A(ρ)(z/r)(1/r − ik)e^{ikr}/r ρ dρ (h·2πρ dρ, the same kernel as 3).
 * An obstacle in a Gaussian beam integrates the beam's disc (6.5 w) less the discs; in a plane wave
 * it is the free wave less them. Returns the intensity.
 */
export function roundOnAxisIntensity(wavelength: number, z: number, discs: { radius: number; sign: 1 | -1 }[], w: number, opaque: boolean): number {
  if (!Number.isFinite(w)) return axisIntensity(wavelength, z, discs, opaque);
  const k = (2 * Math.PI) / wavelength;
  const rule = gaussLegendre(NODES);
  const parts: { radius: number; sign: number }[] = opaque
    ? [{ radius: GAUSS_REACH * w, sign: 1 }, ...discs.map((d) => ({ radius: d.radius, sign: -d.sign }))]
    : discs;
  let re = 0;
  let im = 0;
  for (const d of parts) {
    const top = Math.min(d.radius, GAUSS_REACH * w);
    const scale = (rho: number) => {
      const r = Math.sqrt(rho * rho + z * z);
      return Math.min(PHASE_PER_PANEL / (k * (rho / r)), AMPLITUDE_FRACTION * r, 0.5 * w);
    };
    walkPanels(0, top, scale, (p0, p1) => {
      const half = (p1 - p0) / 2;
      const mid = (p1 + p0) / 2;
      for (let j = 0; j < NODES; j++) {
        const rho = mid + half * rule.x[j]!;
        const r = Math.sqrt(rho * rho + z * z);
        const amp = d.sign * rule.w[j]! * half * Math.exp(-(rho * rho) / (w * w)) * (z / (r * r)) * rho;
        const ph = k * ((rho * rho) / (r + z));
        const c = Math.cos(ph);
        const s = Math.sin(ph);
        re += amp * (c / r + k * s);
        im += amp * (s / r - k * c);
      }
    });
  }
  return re * re + im * im;
}
