// Validity checks that need the computed field: power bookkeeping, wrap-around, band limit, and
// the light that goes into evanescent waves. Window loss and evanescent light are kept apart: the
// evanescent part never reaches any screen, so it is physics, not a fault of the window.
import { formatLength, trimNumber } from '../job/units.js';
import { LIMITS } from '../plan/limits.js';
import type { Plan, Warning } from '../plan/types.js';
import type { Diagnostics } from '../run/compute.js';

const pct = (x: number) => `${trimNumber(100 * x, 3)} %`;

/** A loss up to this many times the planner's own estimate (plus 1 %) is what the planner expected. */
export const WINDOW_LOSS_EXPECTED_SLACK = 1.25;

export type EvanescentSource = 'computed' | 'planner' | 'thin-grating' | 'none';

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

const SOURCE_WORDS: Record<EvanescentSource, string> = {
  computed: 'measured on the computed spectrum',
  planner: "the planner's model of the light",
  'thin-grating': 'thin-grating theory, Goodman §4.4',
  none: '',
};

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
  const windowSize = `${formatLength(2 * plan.x.windowHalf, 3)}${plan.y ? ` × ${formatLength(2 * plan.y.windowHalf, 3)}` : ''}`;
  if (missing > LIMITS.windowLossWarn) {
    const what = plan.babinet
      ? 'of the light the obstacle removes (its complementary hole, by Babinet)'
      : ev.value > 0
        ? `of the power that reaches the screen (the power through the aperture less the ${pct(ev.value)} that goes into evanescent waves)`
        : 'of the power through the aperture';
    const head = `${pct(missing)} ${what} falls outside the ${windowSize} window (limit ${pct(LIMITS.windowLossWarn)})`;
    const expected = plan.checks.windowLossEstimate;
    let tail: string;
    if (opaquePlane) tail = '';
    else if (c.window) tail = ': totals and encircled energies are low by that much; widen the window the job gives, or leave window out so that the planner sizes it';
    else if (missing <= WINDOW_LOSS_EXPECTED_SLACK * expected + 0.01) {
      tail =
        `, about what the planner expected when it chose this window (${pct(expected)}; its reasons say what it left out and why); ` +
        'totals and encircled energies are low by that much; a window given in the job around the light of interest holds it';
    } else {
      tail =
        `: unexpected for the window the planner chose, which it expected to miss about ${pct(expected)}; ` +
        'totals and encircled energies are low by that much; a wider window given in the job holds more';
    }
    w.push({ code: 'window-loss', message: head + tail });
  }
  if (ratio - 1 > LIMITS.powerExcessWarn) {
    w.push({
      code: 'power-excess',
      message: `the window holds ${pct(ratio - 1)} more power than went through the aperture: the result is aliased or under-sampled (check grid.pitch and the window); do not trust it`,
    });
  }
  const gridGiven = !!c.grid?.size;
  if (d.edgeEnergy !== undefined && d.edgeEnergy > LIMITS.edgeEnergyWarn) {
    w.push({
      code: 'edge-energy',
      message:
        `${pct(d.edgeEnergy)} of the power reaches the outer ${trimNumber(100 * LIMITS.edgeFrame, 2)} % of the padded grid: light wraps around the periodic FFT grid into the window; ` +
        (gridGiven
          ? 'use a larger grid.size, or leave grid.size out so that the planner sizes the grid'
          : `unexpected for the grid the planner chose (${plan.x.paddedSamples}${plan.y ? ` × ${plan.y.paddedSamples}` : ''} samples padded); give a larger grid.size`),
    });
  }
  if (d.bandLimitLoss !== undefined && d.bandLimitLoss > LIMITS.bandLimitWarn) {
    w.push({
      code: 'band-limit',
      message: `the angular-spectrum band limit removed ${pct(d.bandLimitLoss)} of the spectral power (light at angles the grid cannot carry to this distance without aliasing); the window misses that light; ${
        gridGiven ? 'use a larger grid.size' : 'unexpected for the grid the planner chose; give a larger grid.size'
      }`,
    });
  }
  if (ev.value > LIMITS.evanescentWarn) {
    const orders = grating?.cutoff && ev.source !== 'computed' ? ` (the grating orders m ≤ ${grating.cutoff[0]} and m ≥ ${grating.cutoff[1]})` : '';
    const small = plan.checks.featureOverWavelength < LIMITS.vectorFeature;
    w.push({
      code: 'evanescent',
      message:
        `${pct(ev.value)} of the light through the aperture goes into evanescent waves${orders}: spatial frequencies above 1/λ, which decay within a few wavelengths of the aperture and carry no power to any screen ` +
        `(${SOURCE_WORDS[ev.source]}). This is physics, not a fault of the window: the screen can receive at most ${pct(1 - ev.value)} of that power. ` +
        (small
          ? 'Features near or below λ make it: scalar theory is not reliable here; a rigorous vector method is needed for quantitative results'
          : "It comes from the aperture's sharp edges; in a real part, thickness and vector effects change how much"),
    });
  }
  return w;
}
