// The pitch rule of the exact 2-D sums (rs2DPitch) against the exact references of
// test/reference/rs2d.ts (the boundary form of the integral for plane waves at normal incidence,
// 2-D Gauss–Legendre quadrature for tilted and Gaussian light: test code that shares nothing with
// the sums), and the path choice and costs the planner reads.
import { describe, expect, it } from 'vitest';
import type { Aperture, Illumination } from '../../src/optics/aperture.js';
import type { Axis } from '../../src/optics/field.js';
import { rsCellCount2D, rsCells2DFromAperture } from '../../src/optics/rs-2d-cells.js';
import { rs2DSampling } from '../../src/optics/rs-2d-plan.js';
import { rsSum2DChoice, summarizeCells } from '../../src/optics/rs-2d-paths.js';
import { rs2DCurvatureError, rs2DEdgeError, rs2DEnvelopeError, rs2DPitch } from '../../src/optics/rs-2d-rule.js';
import { rsSum2D } from '../../src/optics/rs-2d-sum.js';
import { costRsSum2D, RS2D_BOX_PAIR_WORK, rs2DEdgePairWork } from '../../src/optics/rs-cost.js';
import { boundaryField, quad2dField, type Problem2D, type SignedRegion } from '../reference/rs2d.js';

const lam = 1e-6;
const deg = Math.PI / 180;

describe('rs2DPitch', () => {
  it('predicts errors within the target, finer for a finer target, coarser farther away', () => {
    for (const target of [1e-2, 1e-3, 1e-4, 1e-5]) {
      for (const zl of [1, 3, 10, 100, 1000]) {
        for (const sinMax of [0.1, 0.5, 0.95]) {
          const r = rs2DPitch(lam, zl * lam, sinMax, target, { waist: 3 * lam, sinTilt: 0.3 });
          expect(r.predicted.total).toBeLessThanOrEqual(target * (1 + 1e-12));
          expect(r.pitch).toBeGreaterThan(0);
          expect(r.edgeNodes % 2).toBe(0);
          expect(rs2DPitch(lam, zl * lam, sinMax, target / 10, { waist: 3 * lam, sinTilt: 0.3 }).pitch).toBeLessThanOrEqual(r.pitch);
        }
      }
    }
    expect(rs2DPitch(lam, 100 * lam, 0.5, 1e-3, { edgeCells: false }).pitch).toBeGreaterThan(rs2DPitch(lam, 10 * lam, 0.5, 1e-3, { edgeCells: false }).pitch);
  });

  it('says which rule set the pitch', () => {
    expect(rs2DPitch(lam, 30 * lam, 0.5, 1e-3).limit).toBe('curvature');
    expect(rs2DPitch(lam, 0.5 * lam, 0.5, 1e-2).limit).toBe('distance');
    expect(rs2DPitch(lam, 1000 * lam, 0.5, 1e-3, { waist: 2 * lam }).limit).toBe('envelope');
    // Far away, at wide angles, the edge cells' nodes run out first (at most 12 by default).
    const edge = rs2DPitch(lam, 3000 * lam, 0.95, 1e-4, { sinTilt: 0.5 });
    expect(edge.limit).toBe('edge');
    expect(edge.edgeNodes).toBe(12);
    expect(rs2DEdgeError((Math.PI * edge.pitch * 1.45) / lam, 12)).toBeLessThanOrEqual(0.25e-4 * (1 + 1e-9));
  });

  it('error laws grow with the pitch as measured (ε², σ^m, (h/w)⁶)', () => {
    expect(rs2DCurvatureError(2 * lam, lam, 10 * lam) / rs2DCurvatureError(lam, lam, 10 * lam)).toBeCloseTo(16, 10);
    expect(rs2DEdgeError(2, 8) / rs2DEdgeError(1, 8)).toBeCloseTo(256, 8);
    expect(rs2DEnvelopeError(lam, 2 * lam) / rs2DEnvelopeError(lam / 2, 2 * lam)).toBeCloseTo(64, 10);
  });

  it('refuses what it cannot rule on', () => {
    expect(() => rs2DPitch(lam, 0, 0.5, 1e-3)).toThrow();
    expect(() => rs2DPitch(lam, lam, 1.5, 1e-3)).toThrow();
    expect(() => rs2DPitch(lam, lam, 0.5, 0)).toThrow();
  });
});

interface Case {
  label: string;
  aperture: Aperture;
  regions: SignedRegion[];
  z: number;
  tiltDeg: number;
  waist?: number;
  /** Window half-size beyond the aperture, as a tangent of the angle. */
  tan: number;
}

const cases: Case[] = [
  {
    label: 'disc 12λ, z = 2λ',
    aperture: { shape: 'circle', diameter: 12 * lam, opaque: false },
    regions: [{ region: { kind: 'disc', radius: 6 * lam }, sign: 1 }],
    z: 2 * lam,
    tiltDeg: 0,
    tan: 1.5,
  },
  {
    label: 'annulus 24λ / 10λ, z = 20λ',
    aperture: { shape: 'annulus', outer: 24 * lam, inner: 10 * lam, opaque: false },
    regions: [
      { region: { kind: 'disc', radius: 12 * lam }, sign: 1 },
      { region: { kind: 'disc', radius: 5 * lam }, sign: -1 },
    ],
    z: 20 * lam,
    tiltDeg: 0,
    tan: 1.2,
  },
  {
    label: 'rectangle 9λ × 5λ, z = 60λ, tilted 20°',
    aperture: { shape: 'rectangle', width: 9 * lam, height: 5 * lam, opaque: false },
    regions: [{ region: { kind: 'rect', x0: -4.5 * lam, x1: 4.5 * lam, y0: -2.5 * lam, y1: 2.5 * lam }, sign: 1 }],
    z: 60 * lam,
    tiltDeg: 20,
    tan: 0.8,
  },
  {
    label: 'three slits 1.5λ wide, period 4λ, 7λ long, z = 12λ',
    aperture: { shape: 'slits', count: 3, width: 1.5 * lam, period: 4 * lam, length: 7 * lam, opaque: false },
    regions: [-4, 0, 4].map((c) => ({ region: { kind: 'rect' as const, x0: (c - 0.75) * lam, x1: (c + 0.75) * lam, y0: -3.5 * lam, y1: 3.5 * lam }, sign: 1 as const })),
    z: 12 * lam,
    tiltDeg: 0,
    tan: 1.2,
  },
  {
    // The light on the open part is the beam's steep tail (inner edge at 2.2 waists): the case a
    // second-order expansion of the envelope got wrong by 2–3 times the target.
    label: 'annulus 20λ / 13λ in a Gaussian beam (w = 3λ), z = 100λ',
    aperture: { shape: 'annulus', outer: 20 * lam, inner: 13 * lam, opaque: false },
    regions: [
      { region: { kind: 'disc', radius: 10 * lam }, sign: 1 },
      { region: { kind: 'disc', radius: 6.5 * lam }, sign: -1 },
    ],
    z: 100 * lam,
    tiltDeg: 0,
    waist: 3 * lam,
    tan: 0.6,
  },
  {
    label: 'disc 6λ in a Gaussian beam (w = 2λ), z = 8λ, tilted 20°',
    aperture: { shape: 'circle', diameter: 6 * lam, opaque: false },
    regions: [{ region: { kind: 'disc', radius: 3 * lam }, sign: 1 }],
    z: 8 * lam,
    tiltDeg: 20,
    waist: 2 * lam,
    tan: 1,
  },
];

describe('the rule’s pitch meets its target against the exact references', () => {
  // Worst |I − I_ref| over a 9 × 9 window (off-centre, past the main lobe) / the window's peak.
  // The window is the beam's, as the planner places it; budget: the target itself.
  it.each(cases.flatMap((c) => [1e-3, 1e-4].map((t) => [c.label, t, c] as const)))('%s, target %f', (_l, target, c) => {
    const st = Math.sin(c.tiltDeg * deg);
    const R = c.regions.reduce((m, r) => Math.max(m, r.region.kind === 'disc' ? r.region.radius : Math.max(r.region.x1, r.region.y1)), 0);
    const reach = R + c.z * c.tan;
    const n = 9;
    const outX: Axis = { n, start: st * c.z - 0.8 * reach, step: (1.75 * reach) / (n - 1) };
    const outY: Axis = { n, start: -0.9 * reach, step: (1.7 * reach) / (n - 1) };
    const pts: Array<[number, number]> = [];
    for (let r = 0; r < n; r++) for (let q = 0; q < n; q++) pts.push([outX.start + q * outX.step, outY.start + r * outY.step]);
    const prob: Problem2D = {
      wavelength: lam,
      distance: c.z,
      regions: c.regions,
      light: { kind: c.waist ? 'gaussian' : 'plane', waist: c.waist, sinTilt: st },
      opaque: false,
    };
    const ref = !c.waist && st === 0 ? boundaryField(prob, pts) : quad2dField(prob, pts);
    const far = (a: Axis) => Math.max(Math.abs(a.start), Math.abs(a.start + (a.n - 1) * a.step));
    const rr = Math.hypot(far(outX) + R, far(outY) + R);
    const rule = rs2DPitch(lam, c.z, rr / Math.hypot(rr, c.z), target, { sinTilt: st, waist: c.waist, edgeCells: c.aperture.shape === 'circle' || c.aperture.shape === 'annulus' });
    const ill: Illumination = c.waist ? { kind: 'gaussian', waist: c.waist, tilt: [c.tiltDeg * deg, 0] } : { kind: 'plane', tilt: [c.tiltDeg * deg, 0] };
    const cells = rsCells2DFromAperture(c.aperture, ill, lam, rule.pitch, { edgeNodes: rule.edgeNodes, offset: [0.29, -0.38] });
    const got = rsSum2D(cells, lam, c.z, outX, outY).field.data;
    let peak = 0;
    let worst = 0;
    for (let i = 0; i < pts.length; i++) peak = Math.max(peak, ref.re[i]! ** 2 + ref.im[i]! ** 2);
    for (let i = 0; i < pts.length; i++) worst = Math.max(worst, Math.abs(got[2 * i]! ** 2 + got[2 * i + 1]! ** 2 - ref.re[i]! ** 2 - ref.im[i]! ** 2));
    expect(worst / peak).toBeLessThan(target);
  });
});

describe('path choice and costs', () => {
  const disc: Aperture = { shape: 'circle', diameter: 10 * lam, opaque: false };
  const plane: Illumination = { kind: 'plane', tilt: [0, 0] };

  it('prices a path as its pairs, rows and interpolated points', () => {
    const w = costRsSum2D({ box: 100, edge: 10, edgeNodes: 6, gaussian: false, points: 50, rows: 5, interpolated: 0, outputs: 200 });
    expect(w).toBe(50 * (100 * RS2D_BOX_PAIR_WORK + 10 * rs2DEdgePairWork(6)) + 4 * 5 * 110 + 20 * 200);
    expect(costRsSum2D({ box: 100, edge: 0, edgeNodes: 6, gaussian: true, points: 1, rows: 1, interpolated: 0, outputs: 1 })).toBeGreaterThan(
      costRsSum2D({ box: 100, edge: 0, edgeNodes: 6, gaussian: false, points: 1, rows: 1, interpolated: 0, outputs: 1 }),
    );
  });

  it('takes the radial path for a round source on a large window, the mirror path when it is cheaper, and what it costs is what the sums report', () => {
    const cells = rsCells2DFromAperture(disc, plane, lam, 0.5 * lam);
    const big: Axis = { n: 201, start: -50 * lam, step: 0.5 * lam };
    const small: Axis = { n: 3, start: -lam, step: lam };
    const s = summarizeCells(cells);
    const a = rsSum2DChoice(s, 20 * lam, big, big);
    expect(a.path).toBe('radial');
    expect(a.cells.box).toBeLessThan(0.6 * cells.box.n); // folded about y = 0
    const b = rsSum2DChoice(s, 20 * lam, small, small);
    expect(b.path).toBe('mirror');
    expect(b.points).toBe(4);
    const c = rsSum2DChoice(s, 20 * lam, big, big, { path: 'direct' });
    expect(c.path).toBe('direct');
    expect(c.points).toBe(201 * 201);
    expect(a.work).toBeLessThan(c.work / 50);
    expect(rsSum2D(cells, lam, 20 * lam, small, small).work).toBe(b.work);
    // Counting cells without building them gives the same decision.
    const counted = rsCellCount2D(disc, plane, lam, 0.5 * lam);
    expect(rsSum2DChoice(counted, 20 * lam, big, big).path).toBe('radial');
    expect(rsSum2DChoice(counted, 20 * lam, small, small).path).toBe('mirror');
  });

  it('never takes the radial path for a tilted or off-centre-grid source it cannot fold', () => {
    const tilted = rsCellCount2D(disc, { kind: 'plane', tilt: [5 * deg, 0] }, lam, 0.5 * lam);
    const big: Axis = { n: 101, start: -50 * lam, step: lam };
    expect(tilted.round).toBe(false);
    expect(rsSum2DChoice(tilted, 20 * lam, big, big).path).toBe('mirror');
    // An off-centre grid keeps the source round (the field is), but nothing is folded or mirrored.
    const shifted = rsCellCount2D(disc, plane, lam, 0.5 * lam, { offset: [0.3, 0.3] });
    const choice = rsSum2DChoice(shifted, 20 * lam, big, big);
    expect(choice.path).toBe('radial');
    expect(choice.cells.box).toBe(shifted.box);
  });
});

describe('rs2DSampling (what the planner asks for)', () => {
  const lam633 = 633e-9;
  const pinhole: Aperture = { shape: 'circle', diameter: 5e-6, opaque: false };
  const window: Axis = { n: 400, start: -40 * lam633, step: (80 * lam633) / 399 };

  it('a 5 µm pinhole at 30λ onto 400 × 400 points: tens of cells and the radial path', () => {
    const s = rs2DSampling(pinhole, { kind: 'plane', tilt: [0, 0] }, lam633, 30 * lam633, window, window, 1e-3);
    expect(s.predicted.total).toBeLessThanOrEqual(1e-3);
    expect(s.choice.path).toBe('radial');
    expect(s.cells.box + s.cells.edge).toBeLessThan(200);
    // The area-sampled cells needed about 0.035λ here (rsAreaSamplingError at sin θ = 0.9): ~4e4 cells.
    expect(s.pitch).toBeGreaterThan(20 * 0.035 * lam633);
  });

  it('never costs more than the coarsest pitch the rule allows, and meets its target (disc 4λ, z = 60λ)', () => {
    const a: Aperture = { shape: 'circle', diameter: 4 * lam, opaque: false };
    const ill: Illumination = { kind: 'plane', tilt: [0, 0] };
    const z = 60 * lam;
    const n = 9;
    const outX: Axis = { n, start: -30 * lam, step: (75 * lam) / (n - 1) };
    const outY: Axis = { n, start: -40 * lam, step: (70 * lam) / (n - 1) };
    const s = rs2DSampling(a, ill, lam, z, outX, outY, 1e-4);
    const coarsest = rsSum2DChoice(rsCellCount2D(a, ill, lam, s.rule.pitch, { edgeNodes: s.rule.edgeNodes }), z, outX, outY);
    expect(s.choice.work).toBeLessThanOrEqual(coarsest.work);
    expect(s.predicted.total).toBeLessThanOrEqual(1e-4);
    const pts: Array<[number, number]> = [];
    for (let r = 0; r < n; r++) for (let q = 0; q < n; q++) pts.push([outX.start + q * outX.step, outY.start + r * outY.step]);
    const ref = boundaryField({ wavelength: lam, distance: z, regions: [{ region: { kind: 'disc', radius: 2 * lam }, sign: 1 }], light: { kind: 'plane', sinTilt: 0 }, opaque: false }, pts);
    const got = rsSum2D(rsCells2DFromAperture(a, ill, lam, s.pitch, { edgeNodes: s.edgeNodes }), lam, z, outX, outY).field.data;
    let peak = 0;
    let worst = 0;
    for (let i = 0; i < pts.length; i++) peak = Math.max(peak, ref.re[i]! ** 2 + ref.im[i]! ** 2);
    for (let i = 0; i < pts.length; i++) worst = Math.max(worst, Math.abs(got[2 * i]! ** 2 + got[2 * i + 1]! ** 2 - ref.re[i]! ** 2 - ref.im[i]! ** 2));
    expect(worst / peak).toBeLessThan(1e-4);
  });
});
