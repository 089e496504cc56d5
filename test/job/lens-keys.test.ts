// The lens's job keys (src/elements/lens.ts): a signed, sweepable focal length, the stop, the
// wavefront error in waves or as a path, and the refusals at load (common practice for the schema).
import { describe, expect, it } from 'vitest';
import { expandJob } from '../../src/job/expand.js';
import { parseJobText } from '../../src/job/load.js';
import { loadProblems } from '../helpers.js';

const HEAD = 'name: t\nwavelength: 633 nm\ndistance: 100 mm\n';

describe('lens keys', () => {
  it('sweeps a signed focal length, negative for a diverging lens, into cases with its token', () => {
    const job = parseJobText(HEAD + "aperture: {shape: lens, focal_length: ['100 mm', '-50 mm'], stop: 25 mm}\n");
    const cases = expandJob(job.spec);
    expect(cases.map((c) => (c.aperture as { focal: number }).focal)).toEqual([0.1, -0.05]);
    expect(cases.map((c) => c.id)).toEqual(['1_f-100mm', '2_f--50mm']);
  });

  it('sweeps a positive range of focal lengths', () => {
    const job = parseJobText(HEAD + 'aperture: {shape: lens, focal_length: {from: 90 mm, to: 110 mm, count: 3}, stop: 25 mm}\n');
    expect(expandJob(job.spec).map((c) => (c.aperture as { focal: number }).focal)).toEqual([0.09, 0.1, 0.11]);
  });

  it('takes a term in waves as given and a path with its unit in metres, by Noll index', () => {
    const job = parseJobText(HEAD + "aperture: {shape: lens, focal_length: 100 mm, stop: 25 mm, aberrations: {11: '30 nm', 4: 0.05}}\n");
    const a = expandJob(job.spec)[0]!.aperture as { aberrations: { j: number; rms: number; unit: string }[] };
    expect(a.aberrations[0]).toEqual({ j: 4, rms: 0.05, unit: 'waves' });
    expect(a.aberrations[1]!.j).toBe(11);
    expect(a.aberrations[1]!.unit).toBe('m');
    expect(Math.abs(a.aberrations[1]!.rms - 30e-9)).toBeLessThan(1e-20);
  });

  it('refuses a zero focal length, a lens without a stop in a plane wave, a wavefront error without a stop, and Noll indices beyond 231', () => {
    expect(loadProblems(HEAD + 'aperture: {shape: lens, focal_length: 0 mm, stop: 1 mm}\n')[0]!.path).toBe('aperture.focal_length');
    expect(loadProblems(HEAD + 'aperture: {shape: lens, focal_length: 100 mm}\n')[0]).toMatchObject({ path: 'aperture.stop' });
    expect(loadProblems(HEAD + 'aperture: {shape: lens, focal_length: 100 mm, aberrations: {4: 0.1}}\nillumination: {kind: gaussian, waist: 1 mm}\n')[0]).toMatchObject({ path: 'aperture.aberrations' });
    expect(loadProblems(HEAD + 'aperture: {shape: lens, focal_length: 100 mm, stop: 1 mm, aberrations: {232: 0.1}}\n')[0]!.path).toBe('aperture.aberrations.232');
  });

  it('loads an unbounded lens in a Gaussian beam', () => {
    const job = parseJobText(HEAD + 'aperture: {shape: lens, focal_length: 100 mm}\nillumination: {kind: gaussian, waist: 1 mm}\n');
    expect((expandJob(job.spec)[0]!.aperture as { stop: number | null }).stop).toBeNull();
  });
});
