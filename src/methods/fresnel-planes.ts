// Planes in sequence (plan/sequence.ts): the Fresnel integral from each plane to the next (or, where
// wide light barely spreads, the angular spectrum), each element's transmittance multiplied in on
// the region the planner sampled there, each lens folded into the integral's curvature
// (optics/sequence.ts). The planner plans these cases itself, so
// `sample` offers this form for no single-element case.
import { apertureMask, apertureTransmittance, lensOf } from '../elements/registry.js';
import type { Aperture } from '../optics/aperture.js';
import type { Axis, Field } from '../optics/field.js';
import { passedPower, propagateLeg, propagateLegSpectrum, type PlaneCells, type Wave } from '../optics/sequence.js';
import { envelope } from '../optics/source.js';
import { compensateCellResponse } from '../optics/spectral.js';
import type { Engine } from '../optics/engine.js';
import type { MethodDescriptor, PlanePower } from './types.js';
import { paraxialValidity } from './validity.js';

export const fresnelPlanes: MethodDescriptor = {
  id: 'fresnel-planes',
  method: 'fresnel',
  form: 'planes',
  grid: 'direct',
  sharesSourceSpectrum: false,
  apertureCells: false,
  binaryOnly: false,
  closedForm: true,
  validity: paraxialValidity,
  sample: () => null,
  words: { method: 'Fresnel', form: 'plane to plane, with each curvature in closed form' },
  propagate(plan, run) {
    const c = plan.case;
    const legs = plan.sequence!.legs;
    const lam = c.wavelength;
    const elements = [c.aperture, ...(c.planes ?? []).map((p) => p.aperture)];
    const [xa, ya] = legs[0]!.input;
    const ex = envelope(c.illumination, xa);
    const ey = envelope(c.illumination, ya);
    const v = new Float64Array(2 * xa.n * ya.n);
    for (let r = 0; r < ya.n; r++) for (let q = 0; q < xa.n; q++) v[2 * (r * xa.n + q)] = ex[q]! * ey[r]!;
    const tilt = [Math.sin(c.illumination.tilt[0]) / lam, Math.sin(c.illumination.tilt[1]) / lam] as [number, number];
    let wave: Wave = { v, x: xa, y: ya, curvature: 0, carrier: tilt, wavelength: lam };
    const planes: PlanePower[] = [];
    let passed = 0;
    for (const [j, leg] of legs.entries()) {
      const cells = planeCells(elements[j]!, wave.x, wave.y, lam);
      // The cells are area averages (the element's exact transmission over each cell): what the sums
      // and the spectrum see is the element blurred by one cell, so that is undone as the other
      // sampled forms undo it (a few percent at the edges' wider angles otherwise).
      if (leg.cellResponse) removeCellResponse(run.engine, cells.t, wave.x, wave.y, lam);
      const arriving = passedPower(wave, null);
      passed = passedPower(wave, cells);
      planes.push({ plane: j + 1, arriving, passed, sampledFromLight: j > 0 && legs[j - 1]!.windowFromLight });
      wave = leg.form === 'spectrum' ? propagateLegSpectrum(wave, cells, leg.focal, leg.z, leg.output, leg.grid!, run.engine, leg.flat) : propagateLeg(wave, cells, leg.focal, leg.z, leg.output);
    }
    const field: Field = { data: wave.v, nx: wave.x.n, ny: wave.y.n, dx: wave.x.step, dy: wave.y.step, x0: wave.x.start, y0: wave.y.start, wavelength: lam };
    return { field, powerIn: passed, planes };
  },
};

/** An element's cells on a plane's grid: a lens's pupil (its phase folded elsewhere), a complex transmittance, or a mask. */
function planeCells(a: Aperture, xa: Axis, ya: Axis, lam: number): PlaneCells {
  const lens = lensOf(a);
  if (lens) return lens.pupil(xa, ya, lam);
  const complex = apertureTransmittance(a, xa, ya, lam);
  if (complex) return complex;
  const m = apertureMask(a, xa, ya);
  if (a.opaque) for (let i = 0; i < m.length; i++) m[i] = 1 - m[i]!;
  const t = new Float64Array(2 * m.length);
  for (let i = 0; i < m.length; i++) t[2 * i] = m[i]!;
  return { t, weight: m };
}

/**
 * compensateCellResponse on an element's cells, about the value the region's border holds: an
 * obstacle's region is open at its border (t = 1 there), and correcting t itself would treat the
 * region's edge, where the grid's zero padding begins, as an edge of the element; so t − 1 is
 * corrected and 1 added back.
 */
function removeCellResponse(engine: Engine, t: Float64Array, xa: Axis, ya: Axis, lam: number): void {
  const nx = xa.n;
  const ny = ya.n;
  let open = true;
  for (let q = 0; q < nx && open; q++) open = isOne(t, q) && isOne(t, (ny - 1) * nx + q);
  for (let r = 0; r < ny && open; r++) open = isOne(t, r * nx) && isOne(t, r * nx + nx - 1);
  if (open) for (let i = 0; i < nx * ny; i++) t[2 * i] = t[2 * i]! - 1;
  compensateCellResponse(engine, { data: t, nx, ny, dx: xa.step, dy: ya.step, x0: xa.start, y0: ya.start, wavelength: lam });
  if (open) for (let i = 0; i < nx * ny; i++) t[2 * i] = t[2 * i]! + 1;
}

function isOne(t: Float64Array, i: number): boolean {
  return Math.abs(t[2 * i]! - 1) < 1e-12 && Math.abs(t[2 * i + 1]!) < 1e-12;
}
