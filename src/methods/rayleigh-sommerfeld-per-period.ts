// The exact integral for a grating of slits lit by a plane wave: one period's field on a lattice
// commensurate with the period, summed over the periods (src/optics/rayleigh-sommerfeld.ts).
import { gratingOf } from '../elements/registry.js';
import { costRsPerPeriod1D, periodicAxis } from '../optics/rayleigh-sommerfeld.js';
import { axisPlan } from '../plan/axis-plans.js';
import { BASELINE_MEMORY } from '../plan/costs.js';
import { len } from '../plan/words.js';
import type { MethodDescriptor } from './types.js';
import { exactCell, exactOutputAxes, oneDCellRule } from './rayleigh-sommerfeld-shared.js';
import { rayleighSommerfeldValidity } from './validity.js';
import { cellSums1D, openIntervals, perPeriodSums } from './exact-intervals.js';

export const rayleighSommerfeldPerPeriod: MethodDescriptor = {
  id: 'rayleigh-sommerfeld-per-period',
  method: 'rayleigh-sommerfeld',
  form: 'per-period',
  grid: 'direct',
  sharesSourceSpectrum: false,
  apertureCells: true,
  binaryOnly: true,
  closedForm: false,
  validity: rayleighSommerfeldValidity,
  sample(g, c) {
    if (!g.oneD) return null;
    const a = gratingOf(c.aperture);
    const cell = exactCell(g, c);
    const out = exactOutputAxes(g, c)[0]!;
    const rule = oneDCellRule(cell);
    if (a && a.width !== null && a.count >= 2 && c.illumination.kind === 'plane') {
      const lo = out.output.start;
      const hi = out.output.start + (out.output.n - 1) * out.output.step;
      const pa = periodicAxis(a.period, out.output.step, lo, hi);
      const perPeriod = Math.ceil(a.width / cell);
      const lattice = (a.count - 1) * pa.p + (pa.axis.n - 1) * pa.s + 1;
      const axis = axisPlan(g, 0, { ...rule, rule: `${rule.rule}; one period's field on a lattice of ${len(a.period / pa.p)}, summed over the ${a.count} periods` }, perPeriod, perPeriod, pa.axis);
      axis.periodic = { p: pa.p, s: pa.s };
      return {
        axes: [axis],
        layout: 'one-d',
        // One period's field on the whole lattice, then the output.
        memory: BASELINE_MEMORY + 16 * (lattice + 2 * pa.axis.n + 5 * perPeriod),
        work: costRsPerPeriod1D(perPeriod, a.count, pa.axis.n, pa.p, pa.s),
      };
    }
    return null;
  },
  words: { method: 'Rayleigh–Sommerfeld integral', form: 'one period, summed over the periods' },
  propagate(plan, run) {
    const { prof, open, powerIn } = openIntervals(plan, run.obstructed);
    return { field: prof.kind === 'grating' ? perPeriodSums(plan, prof) : cellSums1D(plan, open), powerIn };
  },
};
