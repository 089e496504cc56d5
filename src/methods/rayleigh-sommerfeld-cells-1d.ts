// The exact integral for a 1-D aperture: cells no wider than the kernel's curvature allows over the
// open intervals, with exact edges, summed onto the window (src/optics/rayleigh-sommerfeld.ts).
import { gratingOf } from '../elements/registry.js';
import { costRsDirect1D } from '../optics/rayleigh-sommerfeld.js';
import { axisPlan } from '../plan/axis-plans.js';
import { BASELINE_MEMORY } from '../plan/costs.js';
import type { MethodDescriptor } from './types.js';
import { exactCell, exactOutputAxes, oneDCellRule } from './rayleigh-sommerfeld-shared.js';
import { rayleighSommerfeldValidity } from './validity.js';
import { cellSums1D, openIntervals } from './exact-intervals.js';

export const rayleighSommerfeldCells1D: MethodDescriptor = {
  id: 'rayleigh-sommerfeld-cells-1d',
  method: 'rayleigh-sommerfeld',
  form: 'direct',
  grid: 'direct',
  sharesSourceSpectrum: false,
  apertureCells: true,
  binaryOnly: true,
  closedForm: false,
  validity: rayleighSommerfeldValidity,
  sample(g, c) {
    if (!g.oneD) return null;
    const grating = gratingOf(c.aperture);
    const cell = exactCell(g, c);
    const out = exactOutputAxes(g, c)[0]!;
    const intervals = grating ? grating.count : 1;
    const open = g.obstructed ? 2 * g.aEff[0] : Number.isFinite(g.waist) ? Math.min(g.facts.openMeasure, 2 * g.aEff[0]) : g.facts.openMeasure;
    const cells = Math.ceil(open / cell) + intervals + (g.obstructed ? 1 : 0);
    const rule = oneDCellRule(cell);
    return {
      axes: [axisPlan(g, 0, rule, cells, cells, out.output)],
      layout: 'one-d',
      memory: BASELINE_MEMORY + 16 * (5 * cells + 2 * out.output.n),
      work: costRsDirect1D(cells, out.output.n),
    };
  },
  words: { method: 'Rayleigh–Sommerfeld integral', form: 'direct sums over the aperture' },
  claims: (plan) => plan.layout === 'one-d',
  propagate(plan, run) {
    const { open, powerIn } = openIntervals(plan, run.obstructed);
    return { field: cellSums1D(plan, open), powerIn };
  },
};
