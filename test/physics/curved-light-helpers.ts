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


/**
 * The exact on-axis intensity behind a disc of radius a lit by a point source at s on the axis: the
 * Rayleigh–Sommerfeld integral of the first kind, U = ∫₀^a U₀(r)·(z/ρ)(1/ρ − ik)e^{ikρ}/ρ · r dr
 * (Goodman §3.5, the azimuth done), with U₀ = (s/R)·e^{ik(R − s)}, R = √(r² + s²), the spherical
 * wave of unit amplitude at the aperture's centre; composite Simpson rule on `panels` panels (even;
 * enough for the phase, which turns through about πN_F, to change little across one). Test code only, sharing nothing with src/.
 */
export function exactOnAxis(lam: number, a: number, s: number, z: number, panels = 40000): number {
  const k = (2 * Math.PI) / lam;
  const n = panels;
  const h = a / n;
  let re = 0;
  let im = 0;
  for (let j = 0; j <= n; j++) {
    const r = j * h;
    const R = Math.hypot(r, s);
    const rho = Math.hypot(r, z);
    const amp0 = s / R;
    const ph = k * (R - s) + k * rho;
    // (z/ρ)(1/ρ − ik)/ρ · r
    const fr = ((z / rho) * r) / (rho * rho);
    const fi = (-(z / rho) * k * r) / rho;
    const c = Math.cos(ph) * amp0;
    const si = Math.sin(ph) * amp0;
    const wgt = j === 0 || j === n ? 1 : j % 2 ? 4 : 2;
    re += wgt * (fr * c - fi * si);
    im += wgt * (fr * si + fi * c);
  }
  re *= h / 3;
  im *= h / 3;
  return re * re + im * im;
}

