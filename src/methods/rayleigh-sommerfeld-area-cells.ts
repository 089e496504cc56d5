// The exact integral for an obstacle in a Gaussian beam, the beam where the obstacle is not:
// area-sampled cells summed onto the window point by point (src/optics/rayleigh-sommerfeld.ts
// rsDirect2D); the exact edge cells are built for holes.
import { costRsDirect2D, rsAreaSamplingError, rsDirect2D } from '../optics/rayleigh-sommerfeld.js';
import { axisPlan, pitchFor } from '../plan/axis-plans.js';
import { BASELINE_MEMORY } from '../plan/costs.js';
import { steepestDirection } from '../plan/geometry.js';
import { LIMITS } from '../plan/limits.js';
import { fmt } from '../plan/words.js';
import type { MethodDescriptor } from './types.js';
import { exactCell, exactOutputAxes, uncostedSlits } from './rayleigh-sommerfeld-shared.js';
import { rayleighSommerfeldValidity } from './validity.js';
import { sampledSource2D } from './sampled-source.js';

export const rayleighSommerfeldAreaCells: MethodDescriptor = {
  id: 'rayleigh-sommerfeld-area-cells',
  method: 'rayleigh-sommerfeld',
  form: 'direct',
  grid: 'direct',
  sharesSourceSpectrum: false,
  apertureCells: true,
  binaryOnly: false,
  closedForm: false,
  validity: rayleighSommerfeldValidity,
  sample(g, c) {
    // For an obstacle in a Gaussian beam, and for elements whose edges only their own masks know
    // (their cells carry the element's complex transmittance averaged over each cell: source.ts).
    if (g.oneD || (!g.obstructed && g.facts.exactEdges) || uncostedSlits(g, c)) return null;
    const cell = exactCell(g, c);
    // Area-sampled edge cells carry their open fraction over the whole cell: the error grows as
    // (pitch·sin θ/λ)² at the steepest ray into the window (rsAreaSamplingError, measured).
    const sMax = Math.max(steepestDirection(g), 1e-6);
    const ref = g.lam;
    const areaPitch = ref * Math.sqrt(LIMITS.rsAreaError / rsAreaSamplingError(ref, g.lam, sMax));
    const p = pitchFor(g, c, { pitch: Math.min(cell, areaPitch), rule: `the finer of the kernel's curvature rule and the area-sampled edge cells' error at the steepest ray into the window (sin θ = ${fmt(sMax, 3)})` }, LIMITS.featureSamples2D);
    const out = exactOutputAxes(g, c);
    const n = [0, 1].map((i) => c.grid?.size ?? 2 * Math.ceil(g.aEff[i]! / p.pitch + 0.5) + 1);
    const axes = [0, 1].map((i) => axisPlan(g, i, p, n[i]!, n[i]!, out[i]!.output));
    const cells = n[0]! * n[1]!;
    const outputs = out[0]!.output.n * out[1]!.output.n;
    return { axes, layout: 'two-d', memory: BASELINE_MEMORY + 16 * (3 * cells) + 64 * outputs, work: costRsDirect2D(cells, outputs) };
  },
  words: { method: 'Rayleigh–Sommerfeld integral', form: 'direct sums over the aperture' },
  claims: (plan) => plan.layout === 'two-d' && !plan.exact2D,
  propagate(plan, run) {
    const lam = plan.case.wavelength;
    const { field: src, power } = sampledSource2D(plan, run);
    const k = (2 * Math.PI) / lam;
    return { field: rsDirect2D(src, plan.case.distance, plan.x.output, plan.y!.output, [k * run.carrier[0] * lam, k * run.carrier[1] * lam]), powerIn: power };
  },
};
