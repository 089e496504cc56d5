// What a spectroscopist asks of a grating case beyond the order table (issue 14 §5): each order's
// resolving power with the periods the light really covers, the smallest resolvable wavelength
// difference, the linear dispersion in a camera lens's focal plane, the Littrow angle of a
// reflection grating, and order sorting for the wavelength range the job says it will use. All
// follow from the case's plan and its order table (analysis/orders.ts); nothing is measured on the
// map, so the answers can be added wherever the table is written (result.json, orders.csv, the
// report) and adding them twice changes nothing.
import { gratingOf } from '../elements/registry.js';
import { formatLength } from '../job/units.js';
import { directionCosines } from '../optics/source.js';
import type { Plan, Warning } from '../plan/types.js';
import { warning } from '../warnings/catalogue.js';
import { orderSorting, type OrderSorting } from './order-sorting.js';
import type { GratingOrder } from './orders.js';
import { illuminatedPeriods, type IlluminatedPeriods } from './resolving-power.js';

/** The sign convention of every grating angle the tool writes, in one sentence. */
export const SIGN_CONVENTION =
  'Angles are measured from the grating normal, positive toward +x, for the incident light and for each order alike, and sin θ_m = sin θ_i + mλ/d for transmission and reflection gratings: a reflection grating\'s orders leave on the incidence side and are given unfolded about the grating plane, so an order travelling back along the incident beam has θ_m = −θ_i.';

/** The case-level answers (result.json's metrics.spectroscopy). */
export interface GratingUse {
  convention: string;
  reflective: boolean;
  /** N_eff of analysis/resolving-power.ts: R = |m|·N_eff. */
  illuminatedPeriods: number;
  periodsRule: IlluminatedPeriods['rule'];
  periodsWords: string;
  /** The job's orders.focal_length (m), when given. */
  focalLength?: number;
  /** Order sorting for the job's orders.use, when given (null: none of the range lands in its order). */
  orderSorting?: OrderUseAnswer | null;
}

export interface OrderUseAnswer extends OrderSorting {
  /** The range the job asked for (m); `range` is the part of it that lands in its order. */
  requested: [number, number];
  /** The light's lowest and highest wavelength considered (m). */
  light: [number, number];
  /** Whether all of the requested range lands in its order at this incidence (else `range` is the part that does; none: the answer is null). */
  landsWhole: boolean;
  /** The answer in one paragraph. */
  words: string;
}

/**
 * Order sorting for a range used in one order, for light spanning [λmin, λmax] (from a spectrum's
 * bounds or the job's wavelengths), at a grating of period d lit at sin θ_i: only the part of the
 * range whose order m lands (|sin θ_i + mλ/d| < 1) reaches the screen, and the other orders' light
 * there lands with it (nλ' = mλ is the same angle). Null when none of the range lands.
 */
export function orderUseAnswer(use: { from: number; to: number; order: number }, light: [number, number], grating: { period: number; sinIncidence: number }): OrderUseAnswer | null {
  const m = use.order;
  // −1 < sin θ_i + mλ/d < 1 holds for λ < (1 − sign(m)·sin θ_i)·d/|m| (and every λ > 0 below it).
  const longest = ((1 - Math.sign(m) * grating.sinIncidence) * grating.period) / Math.abs(m);
  if (!(use.from < longest)) return null;
  const to = Math.min(use.to, longest * (1 - 1e-12));
  const s = orderSorting(m, [use.from, to], light, Math.max(20, Math.abs(m) + 1));
  const landsWhole = to === use.to;
  return { ...s, requested: [use.from, use.to], light, landsWhole, words: sortingWords(s, light, landsWhole) };
}

function span(a: number, b: number): string {
  return a === b ? formatLength(a) : `${formatLength(a)} – ${formatLength(b)}`;
}

function sortingWords(s: OrderSorting, light: [number, number], landsWhole: boolean): string {
  const [a, b] = s.range;
  const out = [`${span(a, b)} in order ${s.order}${landsWhole ? '' : ' (the part of the range that lands at this incidence)'}, light ${span(light[0], light[1])}:`];
  out.push(s.overlaps.length ? s.overlaps.map((o) => `order ${o.order} puts ${span(o.from, o.to)} there`).join('; ') + '.' : 'no other order puts light of this spectrum there; no filter is needed.');
  if (s.longPassNeeded) {
    out.push(s.longPass ? `A long-pass filter with its cut-on in (${formatLength(s.longPass.low)}, ${formatLength(s.longPass.high)}] removes the higher orders.` : 'No long-pass filter removes the higher orders: the range is wider than the free spectral range (split it, or narrow the light).');
  }
  if (s.shortPassNeeded) {
    out.push(s.shortPass ? `A short-pass filter with its edge in [${formatLength(s.shortPass.low)}, ${formatLength(s.shortPass.high)}) removes the lower orders.` : 'No short-pass filter removes the lower orders: their wavelengths reach into the range.');
  }
  return out.join(' ');
}

/** The grating's facts the answers need, or null when the case has no order table. */
function gratingFacts(plan: Plan) {
  const c = plan.case;
  const g = c.planes ? null : gratingOf(c.aperture);
  if (!g || c.aperture.opaque) return null;
  return {
    period: g.period,
    count: g.count,
    waist: c.illumination.kind === 'gaussian' ? c.illumination.waist : null,
    sinIncidence: directionCosines(c.illumination)[0],
    // (A key of the grating element; other elements have none.)
    reflective: (c.aperture as { reflective?: boolean }).reflective === true,
  };
}

/** The case-level answers for a grating case (null for others). */
export function gratingUse(plan: Plan): GratingUse | null {
  const g = gratingFacts(plan);
  if (!g) return null;
  const n = illuminatedPeriods(g.period, g.count, g.waist);
  const a = plan.case.analysis;
  const sorting = a.orderUse ? orderUseAnswer(a.orderUse, a.orderUse.light, g) : null;
  return {
    convention: SIGN_CONVENTION,
    reflective: g.reflective,
    illuminatedPeriods: n.periods,
    periodsRule: n.rule,
    periodsWords: n.words,
    ...(a.focalLength ? { focalLength: a.focalLength } : {}),
    ...(a.orderUse ? { orderSorting: sorting } : {}),
  };
}

/**
 * One order with the answers: resolving power |m|·N_eff (null for m = 0 and orders that do not
 * land), the smallest resolvable difference λ/R, the focal plane's linear dispersion f·m/(d cos θ_m)
 * when a focal length is given, the Littrow angle asin(mλ/2d) for a reflection grating.
 */
export function orderWithAnswers(o: GratingOrder, use: GratingUse, grating: { period: number; wavelength: number }): GratingOrder {
  const lands = o.angle !== null && o.m !== 0;
  const R = lands ? Math.abs(o.m) * use.illuminatedPeriods : null;
  const out: GratingOrder = { ...o, resolvingPower: R, smallestResolvable: R ? grating.wavelength / R : null };
  if (use.focalLength !== undefined) out.focalDispersion = lands ? (use.focalLength * o.m) / (grating.period * Math.cos(o.angle!)) : null;
  if (use.reflective) {
    const s = (o.m * grating.wavelength) / (2 * grating.period);
    out.littrowAngle = Math.abs(s) <= 1 ? Math.asin(s) : null;
  }
  return out;
}

/** The orders of a grating case with their answers (unchanged for other cases); `use` when already found. */
export function ordersWithAnswers(plan: Plan, orders: GratingOrder[], use: GratingUse | null = gratingUse(plan)): GratingOrder[] {
  const g = gratingFacts(plan);
  if (!use || !g) return orders;
  return orders.map((o) => orderWithAnswers(o, use, { period: g.period, wavelength: plan.case.wavelength }));
}

/** A case's metrics with the grating answers: its orders enriched and metrics.spectroscopy (for grating cases only). */
export function metricsWithAnswers<M extends { orders?: GratingOrder[] }>(plan: Plan, metrics: M): M & { spectroscopy?: GratingUse } {
  const use = metrics.orders ? gratingUse(plan) : null;
  if (!use) return metrics;
  return { ...metrics, orders: ordersWithAnswers(plan, metrics.orders!, use), spectroscopy: use };
}

/** A reflection grating's order whose groove phase differs from the computed one by more than this (waves) is warned of. */
export const REFLECTION_DEPTH_TOLERANCE = 0.02;
/** ... when thin-grating theory gives it at least this share of the power. */
const REFLECTION_ORDER_POWER = 0.01;

/**
 * A reflection grating's groove phase is taken where the order leaves along the specular or Littrow
 * direction, α = 2h·cos θ_i/λ waves (elements/grating.ts); an order leaving at θ_m meets
 * h·(cos θ_i + cos θ_m)/λ = α·(cos θ_i + cos θ_m)/(2 cos θ_i). Warns (accuracy) when the difference
 * exceeds REFLECTION_DEPTH_TOLERANCE at an order carrying at least 1 % of the power: near a blaze
 * peak the power moves by (πΔα)²/3, on the flank by up to about 1.4·Δα (the slope of sinc²).
 * Amplitude profiles have no groove phase. The run must call it on the case's order table.
 */
export function reflectionDepthWarnings(plan: Plan, orders: readonly GratingOrder[]): Warning[] {
  const a = plan.case.aperture as { reflective?: boolean; profile?: { kind: string; depth?: number; step?: number; modulation?: number } };
  if (a.reflective !== true || !a.profile) return [];
  const p = a.profile;
  const waves = p.kind === 'blazed' ? Math.abs(p.depth!) : p.kind === 'binary-phase' ? Math.abs(p.step!) / (2 * Math.PI) : p.kind === 'sinusoidal-phase' ? p.modulation! / (2 * Math.PI) : 0;
  if (waves === 0) return [];
  const [, beta, gammaI] = directionCosines(plan.case.illumination);
  const off = orders
    .filter((o) => o.angle !== null && o.predictedFraction >= REFLECTION_ORDER_POWER)
    .map((o) => ({ m: o.m, waves: (waves * Math.abs(Math.sqrt(Math.max(0, 1 - o.sinAngle ** 2 - beta ** 2)) - gammaI)) / (2 * gammaI) }))
    .filter((o) => o.waves > REFLECTION_DEPTH_TOLERANCE);
  return off.length ? [warning('reflection-depth-oblique', { depth: waves, cosIncidence: gammaI, orders: off })] : [];
}
