// The boundary form of the Rayleigh–Sommerfeld integral (src/optics/rs-boundary.ts): the on-axis
// closed form over nine decades of Fresnel number, the rules it is built from, and the translation
// of the project's apertures into regions.
import { describe, expect, it } from 'vitest';
import {
  boundaryRegionsOf,
  costRsBoundary,
  rsBoundary,
  rsBoundaryWithStats,
  type BoundaryRegion,
} from '../../src/optics/rs-boundary.js';
import {
  antiderivativeMap,
  gaussPhaseLimit,
  glRule,
  lagrangeStepLimit,
  partialPhaseLimit,
} from '../../src/optics/rs-boundary-rules.js';
import type { Axis } from '../../src/optics/field.js';

const point = (v: number): Axis => ({ n: 1, start: v, step: 1 });

/**
 * U·e^{−ikz} on the axis of a centred disc, plane wave at normal incidence: the first Rayleigh–
 * Sommerfeld solution is U = e^{ikz} − (z/R)e^{ikR}, R = √(z² + a²) (Osterberg & Smith, J. Opt. Soc.
 * Am. 51, 1050 (1961), from memory). Written as 1 − (z/R)e^{ik(R − z)} with R − z = a²/(R + z), the
 * same number without the cancellation that would lose nine digits at N_F = 1e-3 (an identity, not
 * an approximation).
 */
function axisRelative(lam: number, z: number, a: number): [number, number] {
  const k = (2 * Math.PI) / lam;
  const R = Math.hypot(z, a);
  const ph = k * ((a * a) / (R + z));
  return [1 - (z / R) * Math.cos(ph), -(z / R) * Math.sin(ph)];
}

/** The computed field times e^{−ikz} (the same k·z as the code under test forms). */
function relative(u: Float64Array, lam: number, z: number): [number, number] {
  const kz = ((2 * Math.PI) / lam) * z;
  const c = Math.cos(kz);
  const s = Math.sin(kz);
  return [u[0]! * c + u[1]! * s, u[1]! * c - u[0]! * s];
}

describe('on the axis of a disc: e^{ikz} − (z/R)e^{ikR} (Osterberg & Smith 1961)', () => {
  const lam = 633e-9;
  const distances = [2 * lam, 100 * lam, 1e-3, 1];
  const fresnelNumbers = [1e-3, 1e-2, 0.1, 1, 10, 1e2, 1e3, 1e4];
  const cases = distances.flatMap((z) => fresnelNumbers.map((nf) => [z, nf] as const));

  // Budget: the integrand is constant around the circle on the axis, so the quadrature is exact to
  // rounding; what is tested is the kernel's evaluation without cancellation (N_F = 1e-3 puts the
  // field at 3e-3 of the incident amplitude), the 2π and the signs. The peak: the on-axis intensity
  // where N_F < 1 (the far-field peak is on the axis), else the incident irradiance 1 (the
  // geometrical region's; fringes and the axis reach a few times that: common practice).
  it.each(cases)('z = %f m, N_F = %f: |δU| ≤ 5e-10·√peak, so |δI| ≤ 1e-9 of the peak', (z, nf) => {
    const a = Math.sqrt(nf * lam * z);
    const [er, ei] = axisRelative(lam, z, a);
    const f = rsBoundary([{ kind: 'disc', radius: a, sign: 1 }], lam, z, point(0), point(0));
    const [ur, ui] = relative(f.data, lam, z);
    const peak = nf < 1 ? er * er + ei * ei : 1;
    expect(Math.hypot(ur - er, ui - ei)).toBeLessThan(5e-10 * Math.sqrt(peak));
    expect(Math.abs(ur * ur + ui * ui - (er * er + ei * ei))).toBeLessThan(1e-9 * peak);
  });

  it('an annulus is the difference of two discs, an opaque disc the free wave less the hole (the Poisson spot (z/R)e^{ikR})', () => {
    const z = 5e-3;
    const ao = 0.4e-3;
    const ai = 0.15e-3;
    const [or, oi] = axisRelative(lam, z, ao);
    const [ir, ii] = axisRelative(lam, z, ai);
    const ring = relative(rsBoundary(boundaryRegionsOf({ shape: 'annulus', outer: 2 * ao, inner: 2 * ai, opaque: false })!, lam, z, point(0), point(0)).data, lam, z);
    expect(Math.hypot(ring[0] - (or - ir), ring[1] - (oi - ii))).toBeLessThan(1e-12);
    const spot = relative(rsBoundary(boundaryRegionsOf({ shape: 'circle', diameter: 2 * ao, opaque: true })!, lam, z, point(0), point(0)).data, lam, z);
    // Babinet on the axis: 1 − (1 − (z/R)e^{ik(R−z)}) = (z/R)e^{ik(R−z)}.
    expect(Math.hypot(spot[0] - (1 - or), spot[1] + oi)).toBeLessThan(1e-12);
    const R = Math.hypot(z, ao);
    expect(Math.abs(spot[0] ** 2 + spot[1] ** 2 - (z / R) ** 2)).toBeLessThan(1e-12);
  });
});

describe('the rules the integration is built from', () => {
  it('Gauss–Legendre phase limits: the rule meets ε on e^{iωt} up to the limit and misses it a little beyond (A&S 25.4.29 nodes)', () => {
    for (const [n, eps] of [[16, 1e-8], [32, 1e-10], [32, 1e-6]] as const) {
      const phi = gaussPhaseLimit(n, eps);
      const r = glRule(n);
      const err = (w: number) => {
        let s = 0;
        for (let j = 0; j < n; j++) s += r.w[j]! * Math.cos(w * r.x[j]!);
        return Math.abs(s - (2 * Math.sin(w)) / w) / 2;
      };
      expect(err(phi / 2)).toBeLessThanOrEqual(eps);
      expect(err(phi / 2 + 0.05)).toBeGreaterThan(eps);
      // More nodes take more phase (the limit is near π rad per node from below: common practice).
      expect(phi / n).toBeLessThan(Math.PI);
    }
    expect(gaussPhaseLimit(32, 1e-8)).toBeGreaterThan(gaussPhaseLimit(16, 1e-8));
  });

  it('the antiderivative map integrates every polynomial of degree < n exactly over [−1, t]', () => {
    const n = 16;
    const x = glRule(n).x;
    const M = antiderivativeMap(n);
    for (let deg = 0; deg < n; deg++) {
      const q = Array.from(x, (t) => t ** deg);
      for (const t of [-1, -0.37, 0.2, 0.91, 1]) {
        // Chebyshev sum Σ a_m T_m(t), T_m(t) = cos(m·acos t).
        let v = 0;
        for (let m = 0; m <= n; m++) {
          let a = 0;
          for (let j = 0; j < n; j++) a += M[m * n + j]! * q[j]!;
          v += a * Math.cos(m * Math.acos(t));
        }
        const exact = (t ** (deg + 1) - (-1) ** (deg + 1)) / (deg + 1);
        expect(Math.abs(v - exact)).toBeLessThan(1e-13);
      }
    }
  });

  it('the antiderivative limit is below the quadrature limit (interpolation converges at half the rate)', () => {
    expect(partialPhaseLimit(16, 1e-8)).toBeGreaterThan(4);
    expect(partialPhaseLimit(16, 1e-8)).toBeLessThan(gaussPhaseLimit(16, 1e-8));
  });

  it('Lagrange step limits: a tone sampled at the limit is interpolated within ε', () => {
    for (const [p, eps] of [[20, 1e-6], [12, 1e-6], [20, 1e-9]] as const) {
      const wh = lagrangeStepLimit(p, eps);
      expect(wh).toBeGreaterThan(0.3);
      const off = p / 2 - 1;
      let worst = 0;
      for (let q = 1; q < 50; q++) {
        const xq = q / 50;
        let re = 0;
        let im = 0;
        for (let j = 0; j < p; j++) {
          let l = 1;
          for (let m = 0; m < p; m++) if (m !== j) l *= (xq - (m - off)) / (j - m);
          re += l * Math.cos(wh * (j - off));
          im += l * Math.sin(wh * (j - off));
        }
        worst = Math.max(worst, Math.hypot(re - Math.cos(wh * xq), im - Math.sin(wh * xq)));
      }
      expect(worst).toBeLessThan(1.5 * eps); // 50 test abscissae against the 31 the limit was found on
    }
  });
});

describe('apertures as regions', () => {
  it('every finite shape of the project, centred as mask.ts places it; opaque ones as the plane less the hole', () => {
    expect(boundaryRegionsOf({ shape: 'circle', diameter: 2e-3, opaque: false })).toEqual([{ kind: 'disc', radius: 1e-3, sign: 1 }]);
    expect(boundaryRegionsOf({ shape: 'annulus', outer: 2e-3, inner: 1e-3, opaque: false })).toEqual([
      { kind: 'disc', radius: 1e-3, sign: 1 },
      { kind: 'disc', radius: 0.5e-3, sign: -1 },
    ]);
    expect(boundaryRegionsOf({ shape: 'rectangle', width: 2e-3, height: 1e-3, opaque: true })).toEqual([
      { kind: 'plane', sign: 1 },
      { kind: 'rect', x0: -1e-3, x1: 1e-3, y0: -0.5e-3, y1: 0.5e-3, sign: -1 },
    ]);
    expect(boundaryRegionsOf({ shape: 'slit', width: 2e-6, length: 1e-3, opaque: false })).toEqual([
      { kind: 'rect', x0: -1e-6, x1: 1e-6, y0: -0.5e-3, y1: 0.5e-3, sign: 1 },
    ]);
    const g = boundaryRegionsOf({ shape: 'slits', count: 3, width: 1e-6, period: 4e-6, length: 1e-4, opaque: false })!;
    expect(g.map((r) => (r.kind === 'rect' ? [r.x0, r.x1] : null))).toEqual([
      [-4.5e-6, -3.5e-6],
      [-0.5e-6, 0.5e-6],
      [3.5e-6, 4.5e-6],
    ]);
    // Lines infinitely long along y are 1-D problems: not for this method.
    expect(boundaryRegionsOf({ shape: 'slit', width: 2e-6, opaque: false })).toBeNull();
    expect(boundaryRegionsOf({ shape: 'slits', count: 3, width: 1e-6, period: 4e-6, opaque: false })).toBeNull();
  });

  it('refuses what it cannot compute, saying why', () => {
    const d: BoundaryRegion[] = [{ kind: 'disc', radius: 1e-4, sign: 1 }];
    expect(() => rsBoundary(d, 0, 1, point(0), point(0))).toThrow(/wavelength/);
    expect(() => rsBoundary(d, 5e-7, 0, point(0), point(0))).toThrow(/distance/);
    expect(() => rsBoundary([{ kind: 'disc', radius: -1, sign: 1 }], 5e-7, 1, point(0), point(0))).toThrow(/radius/);
    expect(() => rsBoundary([{ kind: 'rect', x0: 1, x1: 0, y0: 0, y1: 1, sign: 1 }], 5e-7, 1, point(0), point(0))).toThrow(/x0 < x1/);
    expect(() => costRsBoundary(d, 5e-7, 1, { n: 0, start: 0, step: 1 }, point(0))).toThrow(/at least one/);
  });

  it('reports what it did: the on-axis point of a disc is one contour of two panels', () => {
    const r = rsBoundaryWithStats([{ kind: 'disc', radius: 1e-4, sign: 1 }], 5e-7, 0.01, point(0), point(0));
    expect(r.stats).toMatchObject({ radii: 1, radial: false, interpolated: 0, readings: 0 });
    expect(r.stats.evaluations).toBe(64);
  });
});
