// The exact 2-D sums over cells with exact edges (rsCells2DFromAperture + rsSum2D) against
// sources outside the code: the on-axis closed form of a circular aperture, the far-field (Airy)
// limit of the Rayleigh–Sommerfeld integral, and a brute-force 2-D Gauss–Legendre quadrature of
// the integral written here; at the pitch rs2DPitch picks for 1e-3 of the peak. Then the paths
// (radial, mirror) against the full sum, and grid shifts.
import besselj1 from '@stdlib/math-base-special-besselj1';
import { describe, expect, it } from 'vitest';
import type { Aperture, Illumination } from '../../src/optics/aperture.js';
import type { Axis } from '../../src/optics/field.js';
import { rsCells2DFromAperture } from '../../src/optics/rs-2d-cells.js';
import { rs2DPitch } from '../../src/optics/rs-2d-rule.js';
import { fastSinCos, fastSinCosCycles, rsSum2D } from '../../src/optics/rs-2d-sum.js';
import { gaussLegendre } from '../reference/quadrature.js';

const lam = 633e-9;
const k = (2 * Math.PI) / lam;
const deg = Math.PI / 180;
const point = (v: number): Axis => ({ n: 1, start: v, step: 1 });
const intensity = (d: Float64Array, i: number) => d[2 * i]! ** 2 + d[2 * i + 1]! ** 2;

/** The largest sine of the angle from the z axis of a ray from a point within `radius` of the axis to a point of the window. */
function sinMaxOf(radius: number, z: number, outX: Axis, outY: Axis): number {
  const far = (a: Axis) => Math.max(Math.abs(a.start), Math.abs(a.start + (a.n - 1) * a.step));
  const reach = Math.hypot(far(outX) + radius, far(outY) + radius);
  return reach / Math.hypot(reach, z);
}

describe('fast sine and cosine', () => {
  it('agree with Math.sin and Math.cos within 3e-16 for |x| ≤ 1000, and in cycles', () => {
    const sc = new Float64Array(2);
    let worst = 0;
    let worstCycles = 0;
    for (let i = 0; i < 20000; i++) {
      const x = (i < 10000 ? 8 : 2000) * (((i * 0.6180339887498949) % 1) - 0.5);
      fastSinCos(x, sc);
      worst = Math.max(worst, Math.abs(sc[0]! - Math.sin(x)), Math.abs(sc[1]! - Math.cos(x)));
      const f = 0.001 * i + 0.37;
      fastSinCosCycles(f, sc);
      const ph = 2 * Math.PI * (f - Math.floor(f));
      worstCycles = Math.max(worstCycles, Math.abs(sc[0]! - Math.sin(ph)), Math.abs(sc[1]! - Math.cos(ph)));
    }
    for (const x of [0, Math.PI / 4, Math.PI / 2, Math.PI, -Math.PI / 2, 3 * Math.PI / 4]) {
      fastSinCos(x, sc);
      worst = Math.max(worst, Math.abs(sc[0]! - Math.sin(x)), Math.abs(sc[1]! - Math.cos(x)));
    }
    expect(worst).toBeLessThan(3e-16 * 1000);
    expect(worstCycles).toBeLessThan(1e-15);
    // Near small arguments the error is relative, not only absolute.
    fastSinCos(1e-9, sc);
    expect(Math.abs(sc[0]! - 1e-9)).toBeLessThan(1e-24);
  });
});

describe('on the axis of a circular aperture and an annulus', () => {
  // Exact for the first Rayleigh–Sommerfeld integral with a uniform plane wave (Osterberg & Smith,
  // JOSA 51, 1050 (1961); derived: with ρdρ = r dr the integrand (1/2π)(z/r)(1/r − ik)e^{ikr}/r·2πρ
  // is z·d/dr[−e^{ikr}/r]): U(0, z) = e^{ikz} − (z/R)e^{ikR}, R = √(z² + a²). An annulus is the
  // outer disc less the inner one (the integral is linear in the aperture).
  // Budget: the rule's pitch for 1e-3 of the peak; the brief's bound is 0.5 % of the peak, the
  // peak on the axis being at most (1 + z/R)².
  const disc = (a: number, z: number): [number, number] => {
    const R = Math.hypot(z, a);
    return [Math.cos(k * z) - (z / R) * Math.cos(k * R), Math.sin(k * z) - (z / R) * Math.sin(k * R)];
  };
  const cases: Array<[number, number, number]> = [];
  for (const zl of [2, 5, 10, 30]) for (const [d, di] of [[3, 0], [8, 0], [20, 0], [50, 0], [20, 8], [50, 30]] as [number, number][]) cases.push([zl, d, di]);

  it.each(cases)('z = %fλ, diameter %fλ, inner %fλ', (zl, d, di) => {
    const z = zl * lam;
    const a = (d * lam) / 2;
    const ai = (di * lam) / 2;
    const rule = rs2DPitch(lam, z, a / Math.hypot(a, z), 1e-3);
    const aperture: Aperture = di > 0 ? { shape: 'annulus', outer: d * lam, inner: di * lam, opaque: false } : { shape: 'circle', diameter: d * lam, opaque: false };
    const cells = rsCells2DFromAperture(aperture, { kind: 'plane', tilt: [0, 0] }, lam, rule.pitch, { edgeNodes: rule.edgeNodes, offset: [0.23, -0.31] });
    const u = rsSum2D(cells, lam, z, point(0), point(0)).field.data;
    const [or, oi] = disc(a, z);
    const [ir, ii] = di > 0 ? disc(ai, z) : [0, 0];
    const ref = (or - ir) ** 2 + (oi - ii) ** 2;
    const peak = (1 + z / Math.hypot(z, a)) ** 2;
    const err = Math.abs(intensity(u, 0) - ref) / peak;
    expect(err).toBeLessThan(5e-3);
    // And within the rule's own target.
    expect(err).toBeLessThan(1e-3);
  });

  it('the rule’s pitch is several times coarser than the area-sampling rule (0.032λ/sin θ)', () => {
    // At z = 30λ behind a 5 µm pinhole looking out to 53° (sin θ = 0.8):
    const rule = rs2DPitch(lam, 30 * lam, 0.8, 1e-3);
    expect(rule.pitch / ((0.032 * lam) / 0.8)).toBeGreaterThan(10);
  });
});

/**
 * Brute-force ∬ U₀·h over the aperture, h = (1/2π)(z/r)(1/r − ik)e^{ikr}/r (Goodman, Introduction to
 * Fourier Optics §3.5), U₀ = envelope·e^{ik·sinθ·ξ}: tensor Gauss–Legendre, 12 nodes on panels of
 * at most λ/2 (at most π(1 + sin θ) of phase per panel), over a square (x, y) or a disc in polar
 * coordinates (ρ panels of λ/2; φ panels of λ/2 of arc at the rim). Independent of the cells.
 */
function bruteForce(shape: { square: number } | { disc: number }, light: { sinTilt: number; waist?: number }, z: number, pts: Array<[number, number]>): Float64Array {
  const g = gaussLegendre(12);
  const nodes1 = (lo: number, hi: number, maxPanel: number) => {
    const n = Math.max(1, Math.ceil((hi - lo) / maxPanel));
    const x: number[] = [];
    const w: number[] = [];
    for (let p = 0; p < n; p++) {
      const a = lo + ((hi - lo) * p) / n;
      const b = lo + ((hi - lo) * (p + 1)) / n;
      for (let i = 0; i < 12; i++) {
        x.push(0.5 * (a + b) + 0.5 * (b - a) * g.x[i]!);
        w.push(0.5 * (b - a) * g.w[i]!);
      }
    }
    return { x, w };
  };
  // Source nodes (ξ, η, weight).
  const xi: number[] = [];
  const eta: number[] = [];
  const wt: number[] = [];
  if ('square' in shape) {
    const s = shape.square / 2;
    const t = nodes1(-s, s, lam / 2);
    for (let j = 0; j < t.x.length; j++) {
      for (let i = 0; i < t.x.length; i++) {
        xi.push(t.x[i]!);
        eta.push(t.x[j]!);
        wt.push(t.w[i]! * t.w[j]!);
      }
    }
  } else {
    const a = shape.disc;
    const rho = nodes1(0, a, lam / 2);
    const phi = nodes1(0, 2 * Math.PI, lam / 2 / a);
    for (let j = 0; j < rho.x.length; j++) {
      for (let i = 0; i < phi.x.length; i++) {
        xi.push(rho.x[j]! * Math.cos(phi.x[i]!));
        eta.push(rho.x[j]! * Math.sin(phi.x[i]!));
        wt.push(rho.w[j]! * phi.w[i]! * rho.x[j]!);
      }
    }
  }
  const amp = xi.map((x, i) => wt[i]! * (light.waist ? Math.exp(-(x * x + eta[i]! ** 2) / light.waist ** 2) : 1));
  const out = new Float64Array(2 * pts.length);
  pts.forEach(([x, y], p) => {
    let sr = 0;
    let si = 0;
    for (let i = 0; i < xi.length; i++) {
      const r = Math.sqrt((x - xi[i]!) ** 2 + (y - eta[i]!) ** 2 + z * z);
      const f = (amp[i]! * z) / (2 * Math.PI * r * r);
      const ph = k * r + k * light.sinTilt * xi[i]!;
      const c = Math.cos(ph);
      const s = Math.sin(ph);
      // (1/r − ik)e^{iφ}
      sr += f * (c / r + k * s);
      si += f * (s / r - k * c);
    }
    out[2 * p] = sr;
    out[2 * p + 1] = si;
  });
  return out;
}

describe('off the axis, against a brute-force quadrature of the integral', () => {
  // Windows reach 45°–55° off the axis (beyond the main lobe), start short of the axis on one
  // side (no mirror shortcut), and are centred on the tilted beam. Budget: the rule's 1e-3 of the
  // window's peak; the quadrature is good to ~1e-10.
  const cases: Array<[string, Aperture, { square: number } | { disc: number }, number, number, number | undefined]> = [
    ['square 8λ, z = 3λ', { shape: 'rectangle', width: 8 * lam, height: 8 * lam, opaque: false }, { square: 8 * lam }, 3, 0, undefined],
    ['square 8λ, z = 3λ, tilted 20°', { shape: 'rectangle', width: 8 * lam, height: 8 * lam, opaque: false }, { square: 8 * lam }, 3, 20, undefined],
    ['square 5λ, z = 30λ, tilted 20°', { shape: 'rectangle', width: 5 * lam, height: 5 * lam, opaque: false }, { square: 5 * lam }, 30, 20, undefined],
    ['square 4λ, z = 300λ', { shape: 'rectangle', width: 4 * lam, height: 4 * lam, opaque: false }, { square: 4 * lam }, 300, 0, undefined],
    ['disc 10λ, z = 4λ', { shape: 'circle', diameter: 10 * lam, opaque: false }, { disc: 5 * lam }, 4, 0, undefined],
    ['disc 10λ, z = 4λ, tilted 20°', { shape: 'circle', diameter: 10 * lam, opaque: false }, { disc: 5 * lam }, 4, 20, undefined],
    ['disc 6λ, z = 30λ, tilted 20°', { shape: 'circle', diameter: 6 * lam, opaque: false }, { disc: 3 * lam }, 30, 20, undefined],
    ['disc 5λ, z = 200λ', { shape: 'circle', diameter: 5 * lam, opaque: false }, { disc: 2.5 * lam }, 200, 0, undefined],
    ['disc 8λ in a Gaussian beam (w = 2.5λ), z = 10λ, tilted 20°', { shape: 'circle', diameter: 8 * lam, opaque: false }, { disc: 4 * lam }, 10, 20, 2.5 * lam],
  ];

  it.each(cases)('%s: within 1e-3 of the peak', (_label, aperture, shape, zl, tiltDeg, waist) => {
    const z = zl * lam;
    const st = Math.sin(tiltDeg * deg);
    const half = 'square' in shape ? shape.square / 2 : shape.disc;
    const reach = half + z * Math.tan(50 * deg);
    const n = 9;
    const outX: Axis = { n, start: st * z - 0.7 * reach, step: (1.7 * reach) / (n - 1) };
    const outY: Axis = { n, start: -0.85 * reach, step: (1.75 * reach) / (n - 1) };
    const pts: Array<[number, number]> = [];
    for (let r = 0; r < n; r++) for (let c = 0; c < n; c++) pts.push([outX.start + c * outX.step, outY.start + r * outY.step]);
    const ill: Illumination = waist ? { kind: 'gaussian', waist, tilt: [tiltDeg * deg, 0] } : { kind: 'plane', tilt: [tiltDeg * deg, 0] };
    const rule = rs2DPitch(lam, z, sinMaxOf(half, z, outX, outY), 1e-3, { sinTilt: st, waist, edgeCells: 'disc' in shape });
    const cells = rsCells2DFromAperture(aperture, ill, lam, rule.pitch, { edgeNodes: rule.edgeNodes, offset: [0.41, 0.17] });
    const got = rsSum2D(cells, lam, z, outX, outY).field.data;
    const ref = bruteForce(shape, { sinTilt: st, waist }, z, pts);
    let peak = 0;
    let worst = 0;
    for (let i = 0; i < pts.length; i++) peak = Math.max(peak, intensity(ref, i));
    for (let i = 0; i < pts.length; i++) worst = Math.max(worst, Math.abs(intensity(got, i) - intensity(ref, i)));
    expect(worst / peak).toBeLessThan(1e-3);
  });

  it('the quadrature itself is converged: halving its panels changes it by under 1e-9 of the peak (disc 10λ, z = 4λ)', () => {
    // A check of the reference, not of the sums: a second quadrature with 24 nodes per panel.
    const z = 4 * lam;
    const pts: Array<[number, number]> = [[0, 0], [3 * lam, 1 * lam], [7 * lam, -2 * lam]];
    const a = bruteForce({ disc: 5 * lam }, { sinTilt: 0 }, z, pts);
    // The same integral by the boundary form would be another reference; here: the closed form on the axis.
    const R = Math.hypot(z, 5 * lam);
    const axis = (Math.cos(k * z) - (z / R) * Math.cos(k * R)) ** 2 + (Math.sin(k * z) - (z / R) * Math.sin(k * R)) ** 2;
    expect(Math.abs(intensity(a, 0) - axis)).toBeLessThan(1e-9);
  });
});

describe('the far field of a circular aperture (Airy, with the exact obliquity)', () => {
  // Far field of the first Rayleigh–Sommerfeld integral (Goodman §4.2 with the obliquity kept):
  // U = (z/r)(1/r − ik)e^{ikr}/(2πr)·Â(f), Â the aperture's transform at f = (x/r − sin θx, y/r)/λ,
  // for a disc πa²·2J₁(2πa|f|)/(2πa|f|) (Born & Wolf §8.5.2); so
  // I = (z/r)²(1 + 1/(kr)²)·(πa²)²[2J₁(v)/v]²/(λr)², v = 2πa|f|. Disc of 4λ, z = 4000λ (N_F = 1e-3):
  // the aperture's quadratic phase, ka²/2z = 3e-3 rad, is what the far field leaves out (≲ 1e-5 of
  // the peak); budget 1e-3 of the peak, the rule's target. J₁ from @stdlib.
  const a = 2 * lam;
  const z = 4000 * lam;
  it.each([0, 20])('tilt %f°: within 1e-3 of the peak out to 40° (beyond the third ring)', (tiltDeg) => {
    const st = Math.sin(tiltDeg * deg);
    const n = 15;
    const outX: Axis = { n, start: st * z / Math.cos(tiltDeg * deg) - 0.1 * z, step: (0.9 * z) / (n - 1) };
    const outY: Axis = { n, start: -0.05 * z, step: (0.4 * z) / (n - 1) };
    const rule = rs2DPitch(lam, z, sinMaxOf(a, z, outX, outY), 1e-3, { sinTilt: st });
    const cells = rsCells2DFromAperture({ shape: 'circle', diameter: 2 * a, opaque: false }, { kind: 'plane', tilt: [tiltDeg * deg, 0] }, lam, rule.pitch, { edgeNodes: rule.edgeNodes, offset: [0.3, 0.1] });
    const got = rsSum2D(cells, lam, z, outX, outY).field.data;
    let peak = 0;
    let worst = 0;
    const refs: number[] = [];
    for (let r = 0; r < n; r++) {
      for (let c = 0; c < n; c++) {
        const x = outX.start + c * outX.step;
        const y = outY.start + r * outY.step;
        const rr = Math.sqrt(x * x + y * y + z * z);
        const f = Math.hypot(x / rr - st, y / rr) / lam;
        const v = 2 * Math.PI * a * f;
        const airy = v === 0 ? 1 : (2 * besselj1(v)) / v;
        const I = ((z / rr) ** 2 * (1 + 1 / (k * rr) ** 2) * (Math.PI * a * a) ** 2 * airy ** 2) / (lam * rr) ** 2;
        refs.push(I);
        peak = Math.max(peak, I);
      }
    }
    refs.forEach((I, i) => (worst = Math.max(worst, Math.abs(intensity(got, i) - I))));
    // The window holds the main lobe: its peak is near the Airy peak (πa²/λz)² times the obliquity
    // and distance factors (z/r)⁴ = cos⁴θ in the tilted direction.
    expect(peak).toBeGreaterThan(0.9 * Math.cos(tiltDeg * deg) ** 4 * ((Math.PI * a * a) / (lam * z)) ** 2);
    expect(worst / peak).toBeLessThan(1e-3);
  });
});

describe('the radial path', () => {
  const disc: Aperture = { shape: 'circle', diameter: 6 * lam, opaque: false };
  const plane: Illumination = { kind: 'plane', tilt: [0, 0] };

  it('is taken for a round source on a large window, and interpolates the sum along its radius within 1e-8 of the peak', () => {
    const z = 10 * lam;
    const cells = rsCells2DFromAperture(disc, plane, lam, 0.5 * lam, { edgeNodes: 8 });
    // A window whose middle row is the positive x axis, its points off the radial samples: along
    // that row only the interpolation differs from summing each point.
    const outX: Axis = { n: 120, start: 0.0137 * lam, step: 0.173 * lam };
    const outY: Axis = { n: 41, start: -10 * lam, step: 0.5 * lam };
    const radial = rsSum2D(cells, lam, z, outX, outY);
    const row = rsSum2D(cells, lam, z, outX, point(0), { path: 'direct' });
    expect(radial.path).toBe('radial');
    expect(row.path).toBe('direct');
    const mid = 20 * outX.n;
    let peak = 0;
    let worst = 0;
    for (let i = 0; i < outX.n; i++) peak = Math.max(peak, intensity(row.field.data, i));
    for (let i = 0; i < outX.n; i++) worst = Math.max(worst, Math.abs(intensity(radial.field.data, mid + i) - intensity(row.field.data, i)));
    expect(worst / peak).toBeLessThan(1e-8);
    // Fewer sums than points: the radial samples, over the cells folded about y = 0.
    const full = rsSum2D(cells, lam, z, outX, outY, { path: 'direct' });
    expect(radial.pairs.box + radial.pairs.edge).toBeLessThan(0.05 * (full.pairs.box + full.pairs.edge));
    expect(radial.work).toBeLessThan(0.1 * full.work);
  });

  it.each([
    ['a disc, plane wave', disc, plane],
    ['an annulus, plane wave', { shape: 'annulus', outer: 8 * lam, inner: 3 * lam, opaque: false } as Aperture, plane],
    ['a disc in a Gaussian beam', { shape: 'circle', diameter: 8 * lam, opaque: false } as Aperture, { kind: 'gaussian', waist: 2 * lam, tilt: [0, 0] } as Illumination],
  ])('equals the full sum over a 2-D window within 1e-6 of the peak, cells for 1e-6 (%s)', (_l, a, ill) => {
    // The cells' own error is below 1e-6 at this pitch, so is the difference between summing
    // each point and summing one radius: whatever direction a point lies in.
    const z = 10 * lam;
    const n = 15;
    const outX: Axis = { n, start: -14 * lam, step: (27 * lam) / (n - 1) };
    const outY: Axis = { n, start: -13 * lam, step: (25 * lam) / (n - 1) };
    const waist = ill.kind === 'gaussian' ? ill.waist : undefined;
    const rule = rs2DPitch(lam, z, sinMaxOf(4 * lam, z, outX, outY), 1e-6, { waist });
    const cells = rsCells2DFromAperture(a, ill, lam, rule.pitch, { edgeNodes: rule.edgeNodes });
    const radial = rsSum2D(cells, lam, z, outX, outY);
    const full = rsSum2D(cells, lam, z, outX, outY, { path: 'direct' });
    expect(radial.path).toBe('radial');
    let peak = 0;
    let worst = 0;
    for (let i = 0; i < n * n; i++) peak = Math.max(peak, intensity(full.field.data, i));
    for (let i = 0; i < n * n; i++) worst = Math.max(worst, Math.abs(intensity(radial.field.data, i) - intensity(full.field.data, i)));
    expect(worst / peak).toBeLessThan(1e-6);
  });
});

describe('grid position and edges on cell boundaries', () => {
  it.each([
    ['disc 7.3λ', { shape: 'circle', diameter: 7.3 * lam, opaque: false } as Aperture, 3.65 * lam],
    ['annulus 9λ / 4λ', { shape: 'annulus', outer: 9 * lam, inner: 4 * lam, opaque: false } as Aperture, 4.5 * lam],
    ['rectangle 6λ × 3.2λ', { shape: 'rectangle', width: 6 * lam, height: 3.2 * lam, opaque: false } as Aperture, 3.4 * lam],
  ])('moving the grid by fractions of a cell changes the field by less than the target (%s)', (_l, a, half) => {
    const z = 8 * lam;
    const n = 11;
    const outX: Axis = { n, start: -9 * lam, step: (17 * lam) / (n - 1) };
    const outY: Axis = { n, start: -8 * lam, step: (17.5 * lam) / (n - 1) };
    const rule = rs2DPitch(lam, z, sinMaxOf(half, z, outX, outY), 1e-3, { edgeCells: a.shape !== 'rectangle' });
    const fields = ([[0, 0], [0.5, 0.5], [0.25, -0.1], [0.37, 0.21], [-0.49, 0.02]] as [number, number][]).map(
      (offset) => rsSum2D(rsCells2DFromAperture(a, { kind: 'plane', tilt: [0, 0] }, lam, rule.pitch, { edgeNodes: rule.edgeNodes, offset }), lam, z, outX, outY, { path: 'direct' }).field.data,
    );
    let peak = 0;
    for (let i = 0; i < n * n; i++) peak = Math.max(peak, intensity(fields[0]!, i));
    let worst = 0;
    for (const f of fields) for (const g of fields) for (let i = 0; i < n * n; i++) worst = Math.max(worst, Math.abs(intensity(f, i) - intensity(g, i)));
    expect(worst / peak).toBeLessThan(1e-3);
    // The offsets do move the cells: the sums are not the same numbers.
    expect(worst / peak).toBeGreaterThan(1e-12);
  });

  it('a square whose edges lie on cell boundaries and one whose edges do not both match the quadrature', () => {
    const z = 5 * lam;
    const h = 0.4 * lam;
    const side = 10 * h; // 4λ
    const n = 7;
    const outX: Axis = { n, start: -2 * lam, step: (9 * lam) / (n - 1) };
    const outY: Axis = { n, start: -1 * lam, step: (7 * lam) / (n - 1) };
    const pts: Array<[number, number]> = [];
    for (let r = 0; r < n; r++) for (let c = 0; c < n; c++) pts.push([outX.start + c * outX.step, outY.start + r * outY.step]);
    const ref = bruteForce({ square: side }, { sinTilt: 0 }, z, pts);
    let peak = 0;
    for (let i = 0; i < pts.length; i++) peak = Math.max(peak, intensity(ref, i));
    const sq: Aperture = { shape: 'rectangle', width: side, height: side, opaque: false };
    // offset ½: cell edges at multiples of h, so the square's edges fall on them; 0.3: they do not.
    for (const offset of [[0.5, 0.5], [0.3, 0.3]] as [number, number][]) {
      const cells = rsCells2DFromAperture(sq, { kind: 'plane', tilt: [0, 0] }, lam, h, { offset });
      const got = rsSum2D(cells, lam, z, outX, outY).field.data;
      let worst = 0;
      for (let i = 0; i < pts.length; i++) worst = Math.max(worst, Math.abs(intensity(got, i) - intensity(ref, i)));
      // ε = kh²/8z = 0.025: 0.6ε² ≈ 4e-4 of the peak by the curvature law.
      expect(worst / peak).toBeLessThan(1e-3);
    }
  });
});

describe('the mirror path', () => {
  it('is used on a symmetric window for an even source (mirror outputs bit-equal) and agrees with the full sum', () => {
    const cells = rsCells2DFromAperture({ shape: 'rectangle', width: 5 * lam, height: 3 * lam, opaque: false }, { kind: 'plane', tilt: [0, 0] }, lam, 0.5 * lam);
    const ax: Axis = { n: 9, start: -8 * lam, step: 2 * lam };
    const z = 12 * lam;
    const m = rsSum2D(cells, lam, z, ax, ax);
    const d = rsSum2D(cells, lam, z, ax, ax, { path: 'direct' });
    expect(m.path).toBe('mirror');
    expect(m.mirrored).toEqual({ x: true, y: true });
    const o = m.field.data;
    for (let r = 0; r < 9; r++) {
      for (let c = 0; c < 9; c++) {
        expect(o[2 * (r * 9 + c)]).toBe(o[2 * (r * 9 + 8 - c)]);
        expect(o[2 * (r * 9 + c)]).toBe(o[2 * ((8 - r) * 9 + c)]);
      }
    }
    let peak = 0;
    let worst = 0;
    for (let i = 0; i < 81; i++) peak = Math.max(peak, Math.hypot(d.field.data[2 * i]!, d.field.data[2 * i + 1]!));
    for (let i = 0; i < 81; i++) worst = Math.max(worst, Math.hypot(o[2 * i]! - d.field.data[2 * i]!, o[2 * i + 1]! - d.field.data[2 * i + 1]!));
    // The cells are built from mirrored coordinates, equal to rounding.
    expect(worst / peak).toBeLessThan(1e-12);
    expect(m.pairs.box).toBe(25 * cells.box.n);
  });

  it('mirrors only across the axis the carrier leaves alone', () => {
    const cells = rsCells2DFromAperture({ shape: 'circle', diameter: 5 * lam, opaque: false }, { kind: 'plane', tilt: [15 * deg, 0] }, lam, 0.5 * lam);
    const ax: Axis = { n: 7, start: -3 * lam, step: lam };
    const m = rsSum2D(cells, lam, 7 * lam, ax, ax);
    expect(m.path).toBe('mirror');
    expect(m.mirrored).toEqual({ x: false, y: true });
    const o = m.field.data;
    // Tilted along x: the field at x = −3λ is not the mirror of x = +3λ.
    expect(Math.abs(intensity(o, 3 * 7) - intensity(o, 3 * 7 + 6))).toBeGreaterThan(1e-3 * intensity(o, 3 * 7));
  });

  it('refuses cells built for another wavelength and a distance of zero', () => {
    const cells = rsCells2DFromAperture({ shape: 'circle', diameter: 5 * lam, opaque: false }, { kind: 'plane', tilt: [0, 0] }, lam, 0.5 * lam);
    expect(() => rsSum2D(cells, 1.01 * lam, 5 * lam, point(0), point(0))).toThrow(/wavelength/);
    expect(() => rsSum2D(cells, lam, 0, point(0), point(0))).toThrow(/distance/);
  });
});
