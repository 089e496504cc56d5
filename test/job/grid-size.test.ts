// grid.size takes the sizes the FFT kernels transform (no prime factor but 2, 3 and 5: the kernels
// are checked against the DFT definition at such sizes in test/optics/fft-sizes.test.ts), from 16
// to 2^24, and refuses others with the rule in the message.
import { describe, expect, it } from 'vitest';
import { JobError, parseJobText } from '../../src/job/load.js';

const JOB = 'name: pin\nwavelength: 633 nm\ndistance: 1 m\naperture: {shape: circle, diameter: 50 um}\n';

function gridSizeProblem(size: number): string | null {
  try {
    parseJobText(JOB + `grid: {size: ${size}}\n`, 'job.yaml');
    return null;
  } catch (e) {
    expect(e).toBeInstanceOf(JobError);
    const p = (e as JobError).problems.find((q) => q.path === 'grid.size');
    expect(p, `size ${size}`).toBeDefined();
    return p!.message;
  }
}

describe('grid.size', () => {
  it('accepts 5-smooth sizes, powers of two among them', () => {
    for (const n of [16, 18, 45, 100, 1000, 1024, 1080, 1125, 2 ** 16, 3 ** 15, 2 ** 24]) expect(gridSizeProblem(n), `${n}`).toBeNull();
  });

  it('refuses sizes with a larger prime factor, below 16 or above 2^24, with the rule', () => {
    for (const n of [14, 1100, 1022, 4097, 8, 15, 2 ** 24 + 2 ** 20, 1080.5]) {
      expect(gridSizeProblem(n), `${n}`).toMatch(/no prime factor but 2, 3 and 5/);
    }
  });
});
