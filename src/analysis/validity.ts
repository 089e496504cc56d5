// Validity checks that need the computed field: power bookkeeping, wrap-around, band limit, and
// the light that goes into evanescent waves. Window loss and evanescent light are kept apart: the
// evanescent part never reaches any screen, so it is physics, not a fault of the window.
import { LIMITS } from '../plan/limits.js';
import { PLANE_LOSS_WARN } from '../plan/sequence.js';
import type { Plan, Warning } from '../plan/types.js';
import type { Diagnostics } from '../run/compute.js';
import { warning, type EvanescentSource } from '../warnings/catalogue.js';

export type { EvanescentSource };

/** A loss up to this many times the planner's own estimate (plus 1 %) is what the planner expected. */
export const WINDOW_LOSS_EXPECTED_SLACK = 1.25;

/** A grating's own thin-grating figure (analysis/orders.ts), for cases the computation and plan say nothing about. */
export interface GratingEvanescence {
  evanescentFraction: number;
  /** The first evanescent orders below and above the ones that land. */
  cutoff?: [number, number];
}

/**
 * The fraction of the power through the aperture that goes into evanescent waves: measured by
 * the computation where it can (the angular spectrum sees the evanescent part of the spectrum),
 * else the planner's model of the light (plan.checks.evanescentFraction), else the grating's own
 * thin-grating figure, else 0.
 */
export function evanescentFraction(plan: Plan, d: Diagnostics, grating?: GratingEvanescence): { value: number; source: EvanescentSource } {
  if (d.evanescentLoss !== undefined) return { value: d.evanescentLoss, source: 'computed' };
  if (plan.checks.evanescentFraction !== undefined) return { value: plan.checks.evanescentFraction, source: 'planner' };
  if (grating) return { value: grating.evanescentFraction, source: 'thin-grating' };
  return { value: 0, source: 'none' };
}

export function postChecks(plan: Plan, d: Diagnostics, grating?: GratingEvanescence): Warning[] {
  const w: Warning[] = [];
  const c = plan.case;
  const opaquePlane = plan.babinet && c.illumination.kind === 'plane';
  const ratio = d.powerIn > 0 ? d.powerInWindow / d.powerIn : 0;
  const ev = evanescentFraction(plan, d, grating);
  // What should reach the screen is the propagating part; what the window misses of it is the
  // loss, as a fraction of it (the planner's estimate counts the same way).
  const reaching = 1 - ev.value;
  const missing = reaching > 0 ? (reaching - ratio) / reaching : 0;
  if (missing > LIMITS.windowLossWarn) {
    const expected = plan.checks.windowLossEstimate;
    w.push(
      warning('window-loss', {
        loss: missing,
        babinet: plan.babinet,
        evanescent: ev.value,
        window: [2 * plan.x.windowHalf, plan.y ? 2 * plan.y.windowHalf : null],
        limit: LIMITS.windowLossWarn,
        then: opaquePlane ? 'nothing' : c.window ? 'window-given' : missing <= WINDOW_LOSS_EXPECTED_SLACK * expected + 0.01 ? 'as-planned' : 'unexpected',
        expected,
      }),
    );
  }
  if (ratio - 1 > LIMITS.powerExcessWarn) w.push(warning('power-excess', { excess: ratio - 1 }));
  for (const [i, p] of (d.planes ?? []).entries()) {
    // A plane sampled where the planner expected the light (not over its element): what it missed
    // is lost to every later plane. (All the light that left the plane before arrives somewhere.)
    const before = i > 0 ? d.planes![i - 1]!.passed : 0;
    const loss = before > 0 ? 1 - p.arriving / before : 0;
    if (p.sampledFromLight && loss > PLANE_LOSS_WARN) w.push(warning('planes-window-loss', { plane: p.plane, loss, limit: PLANE_LOSS_WARN }));
  }
  const gridGiven = !!c.grid?.size;
  if (d.edgeEnergy !== undefined && d.edgeEnergy > LIMITS.edgeEnergyWarn) {
    w.push(warning('edge-energy', { fraction: d.edgeEnergy, frame: LIMITS.edgeFrame, gridGiven, padded: [plan.x.paddedSamples, plan.y ? plan.y.paddedSamples : null] }));
  }
  if (d.bandLimitLoss !== undefined && d.bandLimitLoss > LIMITS.bandLimitWarn) {
    w.push(warning('band-limit', { fraction: d.bandLimitLoss, gridGiven }));
  }
  if (ev.value > LIMITS.evanescentWarn) {
    w.push(
      warning('evanescent', {
        fraction: ev.value,
        cutoff: grating?.cutoff && ev.source !== 'computed' ? grating.cutoff : null,
        source: ev.source,
        nearWavelength: plan.checks.featureOverWavelength < LIMITS.vectorFeature,
      }),
    );
  }
  return w;
}
