// What the exact integral's forms share in planning: the largest cell the kernel's curvature
// allows, the output axes in direction cosines, and the guard on gratings with too many slits to cost.
import { gratingOf } from '../elements/registry.js';
import { rsMaxCell } from '../optics/rayleigh-sommerfeld.js';
import { axisPlan, directionCosineAxisPlan } from '../plan/axis-plans.js';
import type { Geometry } from '../plan/geometry.js';
import type { AxisPlan, Case } from '../plan/types.js';
import { len } from '../plan/words.js';
import type { Sampling } from './types.js';

/** Most slits of a 2-D grating (one with a length) whose exact 2-D sums the planner costs. */
export const MAX_COSTED_SLITS = 16384;

/** The largest cell: the kernel's curvature rule, or a given grid.pitch (the job asked for at least that resolution). */
export function exactCell(g: Geometry, c: Case): number {
  const waist = Number.isFinite(g.waist) ? { waist: g.waist } : {};
  return Math.min(rsMaxCell(g.lam, g.z, waist), c.grid?.pitch ?? Infinity);
}

/** The cell rule of the 1-D sums, in the plan's terms. */
export function oneDCellRule(cell: number) {
  return { pitch: cell, required: cell, rule: `cells of at most ${len(cell)} over the open intervals, edges exact (the kernel's phase curvature across a cell stays within the accuracy target)` };
}

/** The output axes of the exact sums (1-D: x only). */
export function exactOutputAxes(g: Geometry, c: Case): AxisPlan[] {
  return (g.oneD ? [0] : [0, 1]).map((i) => directionCosineAxisPlan(g, i, c, false));
}

/**
 * Costing the 2-D sums walks every slit (its rectangles, its cells): past MAX_COSTED_SLITS the
 * walk alone holds the planner for seconds to minutes (a million slits overflowed the stack), so
 * no 2-D form is offered but this impossible one; the other methods are costed from the sizes alone.
 * Null when the aperture can be costed.
 */
export function uncostedSlits(g: Geometry, c: Case): Sampling | null {
  const a = gratingOf(c.aperture);
  const cell = exactCell(g, c);
  if (a && a.count > MAX_COSTED_SLITS) {
    const out = [0, 1].map((i) => directionCosineAxisPlan(g, i, c, false));
    const rule = { pitch: cell, required: cell, rule: `not costed: more than ${MAX_COSTED_SLITS} slits` };
    const axes = [0, 1].map((i) => axisPlan(g, i, rule, 1, 1, out[i]!.output));
    return { axes, layout: 'two-d', memory: Infinity, work: Infinity, impossible: `${a.count} slits: the exact 2-D sums are costed for at most ${MAX_COSTED_SLITS}` };
  }
  return null;
}
