// The far-field formula, evaluated in direction cosines with the exact kernel (src/optics/direct.ts):
// 1-D sums, separable factors' spectra tabulated, a radial line for round untilted apertures, two
// matrix products where x/(λr) ≈ x/(λz) holds, and on wide windows the spectrum tabulated once and
// interpolated (src/optics/spectrum-table.ts).
import { isRound } from '../elements/registry.js';
import { mappingError, propagateFarField, propagateFarFieldSeparable } from '../optics/direct.js';
import { costFarFieldTable, farFieldBand } from '../optics/spectrum-table.js';
import { directionCosineAxisPlan } from '../plan/axis-plans.js';
import { BASELINE_MEMORY } from '../plan/costs.js';
import { factorisedLayout, type Geometry } from '../plan/geometry.js';
import type { AxisPlan, Case, Layout } from '../plan/types.js';
import type { MethodDescriptor } from './types.js';
import { farFieldUseWarning } from './use-warnings.js';
import { farFieldValidity } from './validity.js';
import { propagateSampled, sampledSource2D, type SampledSteps } from './sampled-source.js';

export const farField: MethodDescriptor = {
  id: 'far-field',
  method: 'fraunhofer',
  grid: 'direct',
  sharesSourceSpectrum: false,
  apertureCells: false,
  binaryOnly: false,
  closedForm: true,
  validity: farFieldValidity,
  sample(g, c) {
    const layout = factorisedLayout(g);
    const plans = (g.oneD ? [0] : [0, 1]).map((i) => directionCosineAxisPlan(g, i, c, true));
    return { axes: plans, layout, ...costFarField(plans, layout, g, c) };
  },
  words: { method: 'far-field formula' },
  useWarning: farFieldUseWarning,
  propagate: (plan, run) => propagateSampled(plan, run, steps),
};

/**
 * The far-field formula's cost by the path direct.ts takes: a 1-D sum per output sample; for
 * separable apertures each factor's spectrum tabulated (steps of 1/(32·reach)) and interpolated;
 * for round untilted apertures one radial line of the spectrum, interpolated; otherwise, where
 * x/(λr) ≈ x/(λz) holds across the aperture (mappingError), two matrix products, else a sum per
 * output point.
 */
function costFarField(axes: AxisPlan[], layout: Layout, g: Geometry, c: Case): { memory: number; work: number } {
  const m = axes.reduce((p, a) => p * a.output.n, 1);
  const table = (a: AxisPlan) => {
    const reach = a.apertureHalf + a.inputPitch;
    const fSpan = (2 * (Math.abs(a.windowCentre) + a.windowHalf)) / (g.lam * g.z);
    return Math.ceil(32 * reach * fSpan) + 5;
  };
  if (layout === 'one-d') {
    const a = axes[0]!;
    return { memory: BASELINE_MEMORY + 16 * (2 * a.inputSamples + 2 * a.output.n), work: 8 * a.inputSamples * a.output.n + 20 * m };
  }
  if (layout === 'separable') {
    const mem = axes.reduce((s, a) => s + 16 * (2 * a.inputSamples + table(a)), 0);
    return { memory: BASELINE_MEMORY + mem + 64 * m, work: axes.reduce((s, a) => s + 8 * a.inputSamples * table(a), 0) + 60 * m };
  }
  const [x, y] = axes as [AxisPlan, AxisPlan];
  const nin = x.inputSamples * y.inputSamples;
  const mem = BASELINE_MEMORY + 16 * (2 * nin + x.output.n * x.inputSamples + y.output.n * y.inputSamples + y.inputSamples * x.output.n) + 64 * m;
  const untilted = c.illumination.tilt[0] === 0 && c.illumination.tilt[1] === 0;
  if (untilted && isRound(c.aperture)) {
    // The line reaches as far as the source grid does (direct.ts: its whole extent, not the aperture's).
    const reach = Math.max(((x.inputSamples - 1) / 2) * x.inputPitch, ((y.inputSamples - 1) / 2) * y.inputPitch) + x.inputPitch;
    const fMax = (Math.SQRT2 * Math.max(x.windowHalf, y.windowHalf)) / (g.lam * g.z);
    const entries = Math.ceil(32 * reach * fMax) + 5;
    // The radial line is one dft2 onto (entries × 1) frequencies: its kernel (entries × nx), the
    // row pass (ny × entries), the line and its frequencies (direct.ts radialFarFieldSpectrum).
    const line = 16 * entries * (x.inputSamples + y.inputSamples + 2) + 8 * entries;
    return { memory: mem + line, work: 8 * nin * entries + 40 * m };
  }
  const outX = x.output;
  const outY = y.output;
  if (mappingError([x.apertureHalf, y.apertureHalf], g.z, outX, outY, g.lam) <= 1e-4) {
    return { memory: mem, work: 8 * (nin * x.output.n + y.output.n * y.inputSamples * x.output.n) + 40 * m };
  }
  // Wide windows: the spectrum tabulated once and interpolated (spectrum-table.ts).
  const t = costFarFieldTable({ nx: x.inputSamples, ny: y.inputSamples, dx: x.inputPitch, dy: y.inputPitch }, farFieldBand(outX, outY, g.z, g.lam, g.carrier), m);
  return { memory: BASELINE_MEMORY + 32 * nin + t.memory + 64 * m, work: t.work + 40 * m };
}

const steps: SampledSteps = {
  fftLattice: false,
  line: (src, plan, axis, carrier, run) => ({ field: propagateFarField(run.engine, src, plan.case.distance, axis.output, null, [carrier, 0]) }),
  separable: (sx, sy, plan, outX, outY, carrier) => propagateFarFieldSeparable(sx, sy, plan.case.distance, outX, outY, carrier),
  plane(plan, run) {
    const c = plan.case;
    const ill = c.illumination;
    const { field: src, power } = sampledSource2D(plan, run);
    // A centred round aperture in an untilted beam has a radially symmetric spectrum.
    const radial = isRound(c.aperture) && ill.tilt[0] === 0 && ill.tilt[1] === 0;
    return { field: propagateFarField(run.engine, src, c.distance, plan.x.output, plan.y ? plan.y.output : null, run.carrier, { radial }), powerIn: power };
  },
};
