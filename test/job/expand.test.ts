// Sweep expansion: the cartesian product of every swept key (each combination exactly once), in
// odometer order with distance innermost, and case ids that are safe, unique folder names.
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseJobText } from '../../src/job/load.js';
import { caseCount, expandJob, MAX_CASES, sweepAxes } from '../../src/job/expand.js';
import { safeJoin } from '../../src/output/atomic.js';

const SAFE_ID = /^[A-Za-z0-9._-]+$/;

const sweepJob = `
name: grid-of-holes
wavelength: [450 nm, 633 nm]
distance: {from: 0.1 m, to: 10 m, count: 3, spacing: log}
aperture:
  shape: rectangle
  width: [10 um, 20 um, 30 um]
  height: {from: 5 um, to: 10 um, count: 2}
method: fraunhofer
output: {npy: float32}
`;

describe('cartesian product of several swept keys', () => {
  const { spec } = parseJobText(sweepJob, 'grid.yaml');
  const cases = expandJob(spec);
  const wl = [450e-9, 633e-9];
  const widths = [10e-6, 20e-6, 30e-6];
  const heights = [5e-6, 10e-6];
  const zs = [0.1, 1, 10];
  const near = (a: number, b: number) => Math.abs(a - b) <= 1e-12 * Math.abs(b);
  const indexIn = (list: number[], v: number) => list.findIndex((x) => near(v, x));

  it('has count = product of the list lengths (2 × 3 × 2 × 3 = 36)', () => {
    expect(caseCount(spec)).toBe(36);
    expect(cases).toHaveLength(36);
    expect(cases.map((c) => c.index)).toEqual(Array.from({ length: 36 }, (_, i) => i));
  });

  it('holds every combination exactly once', () => {
    const seen = new Set<string>();
    for (const c of cases) {
      if (c.aperture.shape !== 'rectangle') throw new Error('shape');
      const key = [
        indexIn(wl, c.wavelength),
        indexIn(widths, c.aperture.width),
        indexIn(heights, c.aperture.height),
        indexIn(zs, c.distance),
      ];
      expect(key, `case ${c.id}`).not.toContain(-1);
      seen.add(key.join(','));
    }
    expect(seen.size).toBe(36);
  });

  it('runs distance innermost and wavelength outermost (mixed-radix order)', () => {
    cases.forEach((c, n) => {
      if (c.aperture.shape !== 'rectangle') throw new Error('shape');
      // n = ((iλ·3 + iw)·2 + ih)·3 + iz
      expect(indexIn(zs, c.distance)).toBe(n % 3);
      expect(indexIn(heights, c.aperture.height)).toBe(Math.floor(n / 3) % 2);
      expect(indexIn(widths, c.aperture.width)).toBe(Math.floor(n / 6) % 3);
      expect(indexIn(wl, c.wavelength)).toBe(Math.floor(n / 18));
    });
    expect(sweepAxes(spec).map((a) => a.key)).toEqual(['wavelength', 'aperture.width', 'aperture.height', 'distance']);
  });

  it('records the swept values, and only those, per case', () => {
    for (const c of cases) {
      if (c.aperture.shape !== 'rectangle') throw new Error('shape');
      expect(Object.keys(c.swept).sort()).toEqual(['aperture.height', 'aperture.width', 'distance', 'wavelength']);
      expect(c.swept['aperture.width']).toBe(c.aperture.width);
      expect(c.swept['aperture.height']).toBe(c.aperture.height);
      expect(c.swept.distance).toBe(c.distance);
      expect(c.swept.wavelength).toBe(c.wavelength);
    }
  });

  it('carries the job-wide settings into every case', () => {
    for (const c of cases) {
      expect(c.job).toBe('grid-of-holes');
      expect(c.method).toBe('fraunhofer');
      expect(c.output).toEqual({ npy: 'float32', logDecades: 5 });
      expect(c.illumination).toEqual({ kind: 'plane', tilt: [0, 0] });
    }
  });

  it('gives unique ids of [A-Za-z0-9._-] only, led by a zero-padded index', async () => {
    const ids = cases.map((c) => c.id);
    expect(new Set(ids).size).toBe(ids.length);
    for (const id of ids) expect(id).toMatch(SAFE_ID);
    expect(ids[0]!.startsWith('01_')).toBe(true);
    expect(ids[35]!.startsWith('36_')).toBe(true);
    expect(ids[0]).toBe('01_wl-450nm_w-10um_h-5um_z-100mm');
    // Every id is accepted as an output folder name.
    const dir = await mkdtemp(join(tmpdir(), 'spotcast-ids-'));
    try {
      for (const id of ids) await expect(safeJoin(dir, 'job', id)).resolves.toBe(join(dir, 'job', id));
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });
});

describe('other sweepable keys and edge cases', () => {
  const head = 'name: j\nwavelength: 633 nm\ndistance: 1 m\n';

  it('a job with no sweep is one case, id "1", nothing swept', () => {
    const cases = expandJob(parseJobText(head + 'aperture: {shape: circle, diameter: 50 um}\n').spec);
    expect(cases).toHaveLength(1);
    expect(cases[0]!.id).toBe('1');
    expect(cases[0]!.swept).toEqual({});
  });

  it('a swept slit count is a plain number in ids', () => {
    const cases = expandJob(parseJobText(head + 'aperture: {shape: slits, count: [2, 5], width: 2 um, period: 8 um}\n').spec);
    expect(cases.map((c) => c.id)).toEqual(['1_n-2', '2_n-5']);
    expect(cases.map((c) => (c.aperture.shape === 'slits' ? c.aperture.count : -1))).toEqual([2, 5]);
  });

  it('a swept Gaussian waist, between the aperture keys and distance', () => {
    const spec = parseJobText(
      'name: j\nwavelength: 633 nm\ndistance: [1 m, 2 m]\naperture: {shape: circle, diameter: [1 mm, 2 mm]}\nillumination: {kind: gaussian, waist: [0.3 mm, 0.6 mm]}\n',
    ).spec;
    expect(sweepAxes(spec).map((a) => a.key)).toEqual(['wavelength', 'aperture.diameter', 'illumination.waist', 'distance']);
    const cases = expandJob(spec);
    expect(cases).toHaveLength(8);
    expect(cases.map((c) => (c.illumination.kind === 'gaussian' ? c.illumination.waist * 1e3 : -1)).map((x) => x.toFixed(1))).toEqual(
      ['0.3', '0.3', '0.6', '0.6', '0.3', '0.3', '0.6', '0.6'],
    );
    for (const c of cases) expect(c.id).toMatch(SAFE_ID);
  });

  it('ids stay safe for extreme lengths (no "+" from exponents, no micro sign)', () => {
    // The ends of the length bounds (1e-10 m and 1e4 m); lengths beyond them are refused at load.
    const cases = expandJob(
      parseJobText('name: j\nwavelength: [633 nm, 1.5 um]\ndistance: [1 mm, 1e4 m]\naperture: {shape: slit, width: [0.5 um, 1e-10 m]}\n').spec,
    );
    expect(cases).toHaveLength(8);
    for (const c of cases) expect(c.id).toMatch(SAFE_ID);
    expect(new Set(cases.map((c) => c.id)).size).toBe(8);
  });

  it('values equal to 6 digits still get unique ids (the index leads)', () => {
    const cases = expandJob(parseJobText(head.replace('1 m', '[1 m, 1.0000001 m]') + 'aperture: {shape: slit, width: 20 um}\n').spec);
    expect(cases.map((c) => c.id)).toEqual(['1_z-1m', '2_z-1m']);
  });

  it('refuses more cases than a job may hold, before building them', () => {
    const spec = parseJobText(
      'name: j\nwavelength: {from: 400 nm, to: 700 nm, count: 1000}\ndistance: {from: 1 m, to: 2 m, count: 1001}\naperture: {shape: slit, width: 20 um}\n',
    ).spec;
    expect(caseCount(spec)).toBe(1_001_000);
    expect(MAX_CASES).toBeLessThan(1_001_000);
    expect(() => expandJob(spec)).toThrow(/the sweeps make 1001000 cases, more than the 1000000 one job may hold; split the job/);
  });
});
