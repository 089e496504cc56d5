// The propagations from a sampled source (the angular spectrum, Fresnel's three forms, the far-field
// formula) by layout: a 1-D aperture as one line, a separable one as the product of two lines (the
// paraxial and far-field kernels factorise), anything else on a 2-D grid.
import { isOneDAperture, separableProfiles } from '../optics/aperture.js';
import { createField, type Axis, type Field } from '../optics/field.js';
import { propagationPhase, rotate } from '../optics/phase.js';
import { sourceField1D, sourceField2D } from '../optics/source.js';
import type { SpectralReport } from '../optics/spectral.js';
import type { AxisPlan, Plan } from '../plan/types.js';
import { sourceAxis } from './grid-steps.js';
import type { FieldStep, Propagated, PropagationInputs } from './types.js';

export interface SampledSteps {
  /** The source is sampled on the FFT lattice, its carrier with it (the transfer forms). */
  fftLattice: boolean;
  /** One line: a 1-D aperture, or one factor of a separable one (carrier: that axis's). */
  line(src: Field, plan: Plan, axis: AxisPlan, carrier: number, run: PropagationInputs): FieldStep;
  /** Both factors of a separable aperture at once, where the form has a way of its own. */
  separable?(sx: Field, sy: Field, plan: Plan, outX: Axis, outY: Axis, carrier: [number, number]): Field;
  /** A 2-D grid (the source built by the step, or sampledSource2D). */
  plane(plan: Plan, run: PropagationInputs): Propagated;
}

/** The 2-D source of a form that sums from its samples (not on the FFT lattice, no carrier sampled). */
export function sampledSource2D(plan: Plan, run: PropagationInputs): { field: Field; power: number } {
  const c = plan.case;
  return sourceField2D(c.aperture, c.illumination, sourceAxis(plan.x, false), sourceAxis(plan.y!, false), c.wavelength, { sampleCarrier: false, obstructed: run.obstructed });
}

export function propagateSampled(plan: Plan, run: PropagationInputs, steps: SampledSteps): Propagated {
  const c = plan.case;
  const lam = c.wavelength;
  const z = c.distance;
  const ill = c.illumination;
  const fft = steps.fftLattice;
  const carrier = run.carrier;
  const outX = plan.x.output;
  const outY = plan.y ? plan.y.output : null;
  const opts = { sampleCarrier: fft, obstructed: run.obstructed };
  if (plan.layout === 'one-d') {
    if (!isOneDAperture(c.aperture)) throw new Error('one-d layout for a 2-D aperture');
    const prof = separableProfiles(c.aperture)!.x;
    const src = sourceField1D(prof, ill, sourceAxis(plan.x, fft), lam, carrier[0], opts);
    return { ...steps.line(src.field, plan, plan.x, carrier[0], run), powerIn: src.power };
  }
  if (plan.layout === 'separable') {
    const prof = separableProfiles(c.aperture)!;
    const yPlan = plan.y!;
    const sx = sourceField1D(prof.x, ill, sourceAxis(plan.x, fft), lam, carrier[0], opts);
    const sy = sourceField1D(prof.y!, ill, sourceAxis(yPlan, fft), lam, carrier[1], opts);
    const powerIn = sx.power * sy.power;
    if (steps.separable) return { field: steps.separable(sx.field, sy.field, plan, outX, outY!, carrier), powerIn };
    // Paraxial propagation factorises: U(x,y) = Ux(x)·Uy(y)·e^{−ikz} (each 1-D factor carries e^{ikz}).
    const px = steps.line(sx.field, plan, plan.x, carrier[0], run);
    const py = steps.line(sy.field, plan, yPlan, carrier[1], run);
    const f = createField(outX, outY, lam);
    const kz = propagationPhase(z, lam);
    for (let r = 0; r < f.ny; r++) {
      const ar = py.field.data[2 * r]!;
      const ai = py.field.data[2 * r + 1]!;
      for (let col = 0; col < f.nx; col++) {
        const br = px.field.data[2 * col]!;
        const bi = px.field.data[2 * col + 1]!;
        const i = 2 * (r * f.nx + col);
        f.data[i] = ar * br - ai * bi;
        f.data[i + 1] = ar * bi + ai * br;
        rotate(f.data, i, -kz);
      }
    }
    const loss = (a?: number, b?: number) => (a === undefined ? undefined : 1 - (1 - a) * (1 - (b ?? 0)));
    const merged: SpectralReport | undefined = px.report
      ? {
          bandLimitLoss: loss(px.report.bandLimitLoss, py.report?.bandLimitLoss)!,
          evanescentLoss: loss(px.report.evanescentLoss, py.report?.evanescentLoss)!,
          bandLimit: [px.report.bandLimit[0], py.report?.bandLimit[0] ?? Infinity],
        }
      : undefined;
    return {
      field: f,
      ...(merged ? { report: merged } : {}),
      ...(px.edge !== undefined ? { edge: Math.max(px.edge, py.edge ?? 0) } : {}),
      powerIn,
    };
  }
  return steps.plane(plan, run);
}
