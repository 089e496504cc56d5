// Polygons, combinations and arrays in the far field, on planner-chosen grids, against exact
// transforms: the polygon's by the edge-sum formula (Lee & Mittra, IEEE Trans. Antennas Propag. 31,
// 99 (1983); test/reference/polygon-transform.ts), rectangles' by Goodman's rect pair, discs' by
// the Airy amplitude (Born & Wolf §8.5.2), arrays as the element's transform times the array factor
// (Goodman, Introduction to Fourier Optics, §4.4: the convolution theorem). The far-field formula
// on a flat screen: U = e^{ikr}/(iλr)·(z/r)·F(x/(λr), y/(λr)) (Goodman §4.2), so I = |F|²(z/r)²/(λr)².
import { describe, expect, it } from 'vitest';
import type { Aperture } from '../../src/optics/aperture.js';
import { polygonTransform } from '../reference/polygon-transform.js';
import { discTransform, rectTransform, type Complex } from '../reference/far-field.js';
import { nm, runAgainstFarField, um } from '../helpers.js';

const lam = 633 * nm;

const rectF = rectTransform;
const discF = discTransform;
const farFieldError = (aperture: Aperture, z: number, F: (fx: number, fy: number) => Complex) => runAgainstFarField({ wavelength: lam, distance: z, aperture }, F);

describe('polygon (a triangle), far field', () => {
  const vertices: [number, number][] = [[0, 60 * um], [-52 * um, -30 * um], [52 * um, -30 * um]];
  const r = farFieldError({ shape: 'polygon', vertices, opaque: false }, 2, (fx, fy) => polygonTransform(vertices, fx, fy));
  it('is planned as far field, without warnings', () => {
    expect(r.plan.regime).toBe('far-field');
    expect(r.codes).toEqual([]);
  });
  it('matches the exact polygon transform within 0.5 % of the peak (Lee & Mittra 1983)', () => {
    expect(r.error).toBeLessThan(5e-3);
  });
  it('passes the triangle\'s area (shoelace) as the power through it', () => {
    const area = 0.5 * 104 * um * 90 * um;
    expect(Math.abs(r.rec.metrics.powerThroughAperture! - area) / area).toBeLessThan(1e-9);
  });
});

describe('a concave polygon (an L), far field', () => {
  const vertices: [number, number][] = [[-40 * um, -40 * um], [40 * um, -40 * um], [40 * um, -10 * um], [-10 * um, -10 * um], [-10 * um, 50 * um], [-40 * um, 50 * um]];
  const r = farFieldError({ shape: 'polygon', vertices, opaque: false }, 1.5, (fx, fy) => polygonTransform(vertices, fx, fy));
  it('matches the exact polygon transform within 0.5 % of the peak (Lee & Mittra 1983)', () => {
    expect(r.codes).toEqual([]);
    expect(r.error).toBeLessThan(5e-3);
  });
});

describe('combination: a cross of two rectangles less a central pinhole, far field', () => {
  // Arms of 100 µm (they were 200 µm): still long against their 20 µm width, with the same W × W
  // overlap and pinhole subtracted, so the same linearity is tested; the planner's grid grows with
  // L / W per axis, so this costs about a quarter of the former.
  const L = 100 * um;
  const W = 20 * um;
  const d = 10 * um;
  const aperture: Aperture = {
    shape: 'combined',
    add: [
      { element: { shape: 'rectangle', width: L, height: W, opaque: false }, at: [0, 0] },
      { element: { shape: 'rectangle', width: W, height: L, opaque: false }, at: [0, 0] },
    ],
    cut: [{ element: { shape: 'circle', diameter: d, opaque: false }, at: [0, 0] }],
    opaque: false,
  };
  // Linearity: cross = both rectangles less their W × W overlap, less the disc inside it.
  const F = (fx: number, fy: number): Complex => {
    const parts = [rectF(L, W, [0, 0], fx, fy), rectF(W, L, [0, 0], fx, fy)];
    const minus = [rectF(W, W, [0, 0], fx, fy), discF(d, [0, 0], fx, fy)];
    return {
      re: parts[0]!.re + parts[1]!.re - minus[0]!.re - minus[1]!.re,
      im: parts[0]!.im + parts[1]!.im - minus[0]!.im - minus[1]!.im,
    };
  };
  const r = farFieldError(aperture, 2, F);
  it('is planned as far field, without warnings', () => {
    expect(r.plan.regime).toBe('far-field');
    expect(r.codes).toEqual([]);
  });
  it('matches the transforms of its parts within 0.5 % of the peak (linearity; Goodman\'s rect pair, Airy)', () => {
    expect(r.error).toBeLessThan(5e-3);
  });
});

describe('combination: two offset slots, far field (shift theorem)', () => {
  const aperture: Aperture = {
    shape: 'combined',
    add: [
      { element: { shape: 'rectangle', width: 30 * um, height: 90 * um, opaque: false }, at: [-45 * um, 10 * um] },
      { element: { shape: 'circle', diameter: 40 * um, opaque: false }, at: [50 * um, -20 * um] },
    ],
    cut: [],
    opaque: false,
  };
  const F = (fx: number, fy: number): Complex => {
    const a = rectF(30 * um, 90 * um, [-45 * um, 10 * um], fx, fy);
    const b = discF(40 * um, [50 * um, -20 * um], fx, fy);
    return { re: a.re + b.re, im: a.im + b.im };
  };
  const r = farFieldError(aperture, 3, F);
  it('matches the shifted transforms within 0.5 % of the peak (Goodman §2.1, shift theorem)', () => {
    expect(r.codes).toEqual([]);
    expect(r.error).toBeLessThan(5e-3);
  });
});

describe('hexagonal array of pinholes, far field', () => {
  // 3 × 3 pinholes of 20 µm at a 40 µm pitch (it was 4 × 3 at 60 µm): still a hexagonal lattice
  // with a middle row shifted against the outer two and pinholes apart, so the same array factor
  // and element transform are tested; the planner's grid grows with count × pitch / D per axis, and
  // the reference is summed over every pinhole at every grid point, so this case costs about a
  // quarter of the former (which took most of this file's time).
  const D = 20 * um;
  const pitch = 40 * um;
  const [nx, ny] = [3, 3];
  const aperture: Aperture = {
    shape: 'array',
    of: { element: { shape: 'circle', diameter: D, opaque: false }, at: [0, 0] },
    pitch,
    count: [nx, ny],
    layout: 'hexagonal',
    opaque: false,
  };
  // The copies' centres, as a hexagonal lattice: rows √3/2 of the pitch apart, shifted by ±¼ pitch.
  const centres: [number, number][] = [];
  for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) centres.push([(i - (nx - 1) / 2) * pitch + (j % 2 === 0 ? -0.25 : 0.25) * pitch, (j - (ny - 1) / 2) * pitch * (Math.sqrt(3) / 2)]);
  const F = (fx: number, fy: number): Complex => {
    let re = 0;
    let im = 0;
    for (const at of centres) {
      const f = discF(D, at, fx, fy);
      re += f.re;
      im += f.im;
    }
    return { re, im };
  };
  const r = farFieldError(aperture, 2, F);
  it('is planned as far field, without warnings', () => {
    expect(r.plan.regime).toBe('far-field');
    expect(r.codes).toEqual([]);
  });
  it('matches the element\'s transform times the array factor within 0.5 % of the peak (Goodman §4.4)', () => {
    expect(r.error).toBeLessThan(5e-3);
  });
  it('passes 9 pinholes\' area', () => {
    const area = nx * ny * Math.PI * (D / 2) ** 2;
    expect(Math.abs(r.rec.metrics.powerThroughAperture! - area) / area).toBeLessThan(1e-9);
  });
});
