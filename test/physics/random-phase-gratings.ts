// Random binary phase gratings (1-D: any duty and step, any period and count) over the job
// schema's space, for random-phase-gratings.test.ts: run and compared as random-cases.ts does,
// against the exact 1-D Rayleigh–Sommerfeld integral (test/reference/reference.ts: the grating's
// extent plus its phase steps, by linearity), at distances from 2λ to 100 m, plane (sometimes
// tilted) or Gaussian light.
import type { Illumination } from '../../src/optics/aperture.js';
import { mulberry32 } from '../helpers.js';
import type { DrawnCase } from './random-cases.js';

export const PHASE_GRATING_SEED = 0x9a7e2026;
export const PHASE_GRATING_CASE_COUNT = 60;

const logUniform = (rnd: () => number, lo: number, hi: number) => lo * Math.pow(hi / lo, rnd());

export function drawPhaseGratings(seed = PHASE_GRATING_SEED, n = PHASE_GRATING_CASE_COUNT): DrawnCase[] {
  const rnd = mulberry32(seed);
  const out: DrawnCase[] = [];
  for (let index = 0; index < n; index++) {
    const lam = logUniform(rnd, 250e-9, 10e-6);
    const period = logUniform(rnd, 1.2 * lam, 300e-6);
    const count = Math.max(2, Math.round(logUniform(rnd, 2, 400)));
    const duty = 0.1 + 0.8 * rnd();
    const step = (rnd() * 2 - 1) * Math.PI;
    const z = logUniform(rnd, 2 * lam, 100);
    const tilted = rnd() < 0.2;
    const tilt: [number, number] = [tilted ? ((rnd() * 2 - 1) * 30 * Math.PI) / 180 : 0, 0];
    const half = (count * period) / 2;
    const illumination: Illumination = rnd() < 0.6 ? { kind: 'plane', tilt } : { kind: 'gaussian', waist: half * logUniform(rnd, 0.2, 5), tilt };
    out.push({ index, spec: { wavelength: lam, distance: z, aperture: { shape: 'grating', profile: { kind: 'binary-phase', duty, step }, count, period, opaque: false }, illumination } });
  }
  return out;
}
