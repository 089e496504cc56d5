// Helpers for the curved-light tests (point-source, gaussian-waist-distance, extended-source):
// cases built as the job expander builds them (plan/curved-light.ts flatIllumination), run on the
// planner's grids, and a map read between samples.
import { planCase } from '../../src/plan/planner.js';
import { runPlannedCase } from '../../src/run/run-case.js';
import { flatIllumination, type CaseSource } from '../../src/plan/curved-light.js';
import type { Aperture } from '../../src/optics/aperture.js';
import type { Case } from '../../src/plan/types.js';
import { makeCase, nm } from '../helpers.js';
import { testContext } from '../engine.js';

export const lam = 633 * nm;

export function sourceCase(aperture: Aperture, z: number, source: CaseSource, extra: Partial<Case> = {}): Case {
  const wavelength = extra.wavelength ?? lam;
  return { ...makeCase({ wavelength, distance: z, aperture }), illumination: flatIllumination(source, wavelength), source, ...extra };
}

export function run(c: Case) {
  const plan = planCase(c);
  if (plan.error) throw new Error(plan.error);
  const rec = runPlannedCase(plan, testContext());
  return { plan, rec, codes: rec.warnings.map((w) => w.code) };
}

/** The map's value at (x, y) by bilinear interpolation. */
export function valueAt(m: { nx: number; ny: number; dx: number; dy: number; x0: number; y0: number; intensity: Float64Array }, x: number, y: number): number {
  const fc = (x - m.x0) / m.dx;
  const c0 = Math.floor(fc);
  const tc = fc - c0;
  if (m.ny === 1) return (1 - tc) * m.intensity[c0]! + tc * m.intensity[c0 + 1]!;
  const fr = (y - m.y0) / m.dy;
  const r0 = Math.floor(fr);
  const tr = fr - r0;
  const at = (r: number, c: number) => m.intensity[r * m.nx + c]!;
  return (1 - tr) * ((1 - tc) * at(r0, c0) + tc * at(r0, c0 + 1)) + tr * ((1 - tc) * at(r0 + 1, c0) + tc * at(r0 + 1, c0 + 1));
}

