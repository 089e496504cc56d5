// The exact integral over a 2-D hole: boxes for every wholly open cell and Gauss–Legendre nodes with
// exact weights in the cells an edge crosses (src/optics/rs-2d-*.ts); the pitch and node count are
// the cheapest that keep the error within the target; round and mirror-symmetric sources take the
// radial or mirror path.
import { rs2DSampling, rsCells2DFromAperture, rsSum2D } from '../optics/rayleigh-sommerfeld.js';
import { axisPlan } from '../plan/axis-plans.js';
import { BASELINE_MEMORY } from '../plan/costs.js';
import { LIMITS } from '../plan/limits.js';
import { len } from '../plan/words.js';
import type { MethodDescriptor } from './types.js';
import { exactOutputAxes, uncostedSlits } from './rayleigh-sommerfeld-shared.js';
import { rayleighSommerfeldValidity } from './validity.js';

export const rayleighSommerfeldEdgeCells: MethodDescriptor = {
  id: 'rayleigh-sommerfeld-edge-cells',
  method: 'rayleigh-sommerfeld',
  form: 'direct',
  grid: 'direct',
  sharesSourceSpectrum: false,
  apertureCells: true,
  binaryOnly: true,
  closedForm: false,
  validity: rayleighSommerfeldValidity,
  sample(g, c) {
    if (g.oneD) return null;
    // A grating with too many slits to cost gets this form, impossible, in place of every 2-D one.
    const uncosted = uncostedSlits(g, c);
    if (uncosted) return uncosted;
    // Edge cells are exact for the edges the geometry names (boxes, rings); an element that only
    // samples itself is summed over area-sampled cells instead (rayleigh-sommerfeld-area-cells.ts).
    if (g.obstructed || !g.facts.exactEdges) return null;
    const out = exactOutputAxes(g, c);
    const s2 = rs2DSampling(c.aperture, c.illumination, g.lam, g.z, out[0]!.output, out[1]!.output, LIMITS.rsExactTarget);
    const pitch = c.grid?.pitch ? Math.min(c.grid.pitch, s2.pitch) : s2.pitch;
    const rule = { pitch, required: s2.pitch, rule: `boxes of ${len(s2.pitch)} with exact edges (${s2.edgeNodes}² nodes in each edge cell), the cheapest that keeps the error within ${LIMITS.rsExactTarget} of the peak; ${s2.choice.path} path` };
    const n = [0, 1].map((i) => 2 * Math.ceil(g.aEff[i]! / pitch + 0.5) + 1);
    const axes = [0, 1].map((i) => axisPlan(g, i, rule, n[i]!, n[i]!, out[i]!.output));
    return { axes, layout: 'two-d', memory: BASELINE_MEMORY + s2.choice.memory, work: s2.choice.work, exact2D: { edgeNodes: s2.edgeNodes, path: s2.choice.path } };
  },
  words: { method: 'Rayleigh–Sommerfeld integral', form: 'direct sums over the aperture' },
  claims: (plan) => !!plan.exact2D,
  propagate(plan) {
    // Boxes and exact edge cells (for an obstacle in a plane wave: its hole, for Babinet after).
    const c = plan.case;
    const cells = rsCells2DFromAperture(c.aperture, c.illumination, c.wavelength, plan.x.inputPitch, { edgeNodes: plan.exact2D!.edgeNodes });
    return { field: rsSum2D(cells, c.wavelength, c.distance, plan.x.output, plan.y!.output).field, powerIn: cells.power };
  },
};
