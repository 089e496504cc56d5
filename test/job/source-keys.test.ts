// The curved-light job keys: illumination kinds point and extended, a Gaussian's waist_distance;
// what each case holds, and the refusals at load with the key path (common practice for the schema).
import { describe, expect, it } from 'vitest';
import { expandJob } from '../../src/job/expand.js';
import { parseJobText } from '../../src/job/load.js';
import { loadProblems } from '../helpers.js';

const HEAD = 'name: t\nwavelength: 633 nm\ndistance: 300 mm\naperture: {shape: circle, diameter: 1 mm}\n';

describe('curved-light keys', () => {
  it('a point source, swept in distance, off the axis: each case has its source and the flat light that stands in', () => {
    const cases = expandJob(parseJobText(HEAD + "illumination: {kind: point, distance: ['120 mm', '240 mm'], at: ['1 mm', 0]}\n").spec);
    expect(cases.map((c) => c.id)).toEqual(['1_source-120mm', '2_source-240mm']);
    expect(cases[0]!.source).toEqual({ kind: 'point', distance: 0.12, at: [0.001, 0] });
    expect(cases[0]!.illumination.kind).toBe('plane');
    expect(Math.sin(cases[0]!.illumination.tilt[0])).toBeCloseTo(-0.001 / Math.hypot(0.001, 0.12), 14);
  });

  it('a point on the axis by default', () => {
    const [c] = expandJob(parseJobText(HEAD + "illumination: {kind: point, distance: '50 cm'}\n").spec);
    expect(c!.source).toEqual({ kind: 'point', distance: 0.5, at: [0, 0] });
    expect(c!.illumination).toEqual({ kind: 'plane', tilt: [0, 0] });
  });

  it("a Gaussian beam with its waist before the aperture: the source keeps w₀ and d, the light has w(d)", () => {
    const [c] = expandJob(parseJobText(HEAD + "illumination: {kind: gaussian, waist: '0.4 mm', waist_distance: '200 mm'}\n").spec);
    expect(c!.source).toEqual({ kind: 'gaussian', waist: 0.0004, waistDistance: 0.2, tilt: [0, 0] });
    const zr = (Math.PI * 0.0004 ** 2) / 633e-9;
    expect(c!.illumination.kind === 'gaussian' && c!.illumination.waist).toBeCloseTo(0.0004 * Math.sqrt(1 + (0.2 / zr) ** 2), 15);
    // Without waist_distance nothing changes: the waist is at the aperture.
    const [flat] = expandJob(parseJobText(HEAD + "illumination: {kind: gaussian, waist: '0.4 mm'}\n").spec);
    expect(flat!.source).toBeUndefined();
  });

  it('an extended source: a disc, a slit, a rectangle', () => {
    const one = (ill: string) => expandJob(parseJobText(HEAD + `illumination: ${ill}\n`).spec)[0]!.source;
    expect(one("{kind: extended, shape: disc, size: '0.5 mm', distance: '300 mm'}")).toEqual({ kind: 'extended', shape: 'disc', size: [0.0005, 0.0005], distance: 0.3, at: [0, 0] });
    expect(one("{kind: extended, shape: rectangle, size: ['1 mm', '2 mm'], distance: '1 m', at: [0, '1 mm']}")).toEqual({ kind: 'extended', shape: 'rectangle', size: [0.001, 0.002], distance: 1, at: [0, 0.001] });
  });

  it('points: at a distance with positions, at infinity with directions; powers default to 1', () => {
    const near = expandJob(parseJobText(HEAD + "illumination: {kind: points, distance: '1 m', points: [{at: ['0.1 mm', 0], power: 2}, {at: ['-0.1 mm', 0]}]}\n").spec)[0]!;
    expect(near.source).toEqual({ kind: 'points', distance: 1, points: [{ at: [0.0001, 0], power: 2 }, { at: [-0.0001, 0], power: 1 }] });
    const far = expandJob(parseJobText(HEAD + "illumination: {kind: points, points: [{angle: ['1 mrad', 0]}, {angle: ['-1 mrad', 0]}]}\n").spec)[0]!;
    expect(far.source).toEqual({ kind: 'points', distance: null, points: [{ at: [0.001, 0], power: 1 }, { at: [-0.001, 0], power: 1 }] });
    // The flat light is the power-weighted centre's: here on the axis.
    expect(far.illumination).toEqual({ kind: 'plane', tilt: [0, 0] });
  });

  it('points: refusals name the point', () => {
    expect(loadProblems(HEAD + "illumination: {kind: points, distance: '1 m', points: [{angle: ['1 mrad', 0]}, {at: [0, 0]}]}\n")[0]).toMatchObject({ path: 'illumination.points[0]' });
    expect(loadProblems(HEAD + "illumination: {kind: points, points: [{angle: ['1 mrad', 0]}, {at: [0, 0]}]}\n")[0]).toMatchObject({ path: 'illumination.points[1]' });
    expect(loadProblems(HEAD + "illumination: {kind: points, points: [{angle: ['1 mrad', 0]}]}\n")[0]!.path).toMatch(/^illumination\.points/);
    expect(loadProblems(HEAD + "illumination: {kind: points, points: [{angle: [0, 0], power: 0}, {angle: [0, 0]}]}\n")[0]!.path).toMatch(/^illumination\.points\[0\]\.power/);
  });

  it('refuses bad input with the key path', () => {
    expect(loadProblems(HEAD + "illumination: {kind: point}\n")[0]).toMatchObject({ path: 'illumination.distance' });
    expect(loadProblems(HEAD + "illumination: {kind: point, distance: '-5 mm'}\n")[0]!.path).toMatch(/^illumination\.distance/);
    expect(loadProblems(HEAD + "illumination: {kind: point, distance: '5 mm', tilt: [0, 0]}\n")[0]!.path).toMatch(/^illumination/);
    expect(loadProblems(HEAD + "illumination: {kind: point, distance: '5 mm', at: '1 mm'}\n")[0]).toMatchObject({ path: 'illumination.at' });
    expect(loadProblems(HEAD + "illumination: {kind: gaussian, waist: '1 mm', waist_distance: 0}\n")[0]!.path).toMatch(/^illumination\.waist_distance/);
    expect(loadProblems(HEAD + "illumination: {kind: extended, shape: star, size: '1 mm', distance: '1 m'}\n")[0]).toMatchObject({ path: 'illumination.shape' });
    expect(loadProblems(HEAD + "illumination: {kind: extended, shape: disc, distance: '1 m'}\n")[0]).toMatchObject({ path: 'illumination.size' });
    const planes = loadProblems(HEAD + "planes: [{after: '10 mm', element: {shape: circle, diameter: 1 mm}}]\nillumination: {kind: point, distance: '1 m'}\n");
    expect(planes[0]).toMatchObject({ path: 'planes' });
    expect(planes[0]!.message).toMatch(/point source/);
    const search = loadProblems(HEAD + "search: {smallest-spot: {between: ['10 um', '1 mm']}}\nillumination: {kind: point, distance: '1 m'}\n");
    expect(search.map((p) => p.path)).toContain('search.smallest-spot');
  });
});
