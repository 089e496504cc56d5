// Consistency checks of a computed grating case against the grating equation and thin-grating
// theory, made after the computation whatever method made it: are the orders where
// d(sin θ_m − sin θ_i) = mλ puts them, is there light where no order lands, and does each order
// carry the power thin-grating theory gives it? A paraxial method at wide angles fails the first
// two (it puts order m at z·sin θ_m instead of z·tan θ_m, and lands evanescent orders at
// z·sin θ_m > z); an aliased or truncated computation fails the last.
import { reflectionDepthWarnings } from './grating-answers.js';
import { formatLength } from '../job/units.js';
import { gratingOf } from '../elements/registry.js';
import { METHODS } from '../job/schema.js';
import type { Plan, Warning } from '../plan/types.js';
import { xAt } from '../model/grid.js';
import type { IntensityMap } from '../model/intensity-map.js';
import { warning } from '../warnings/catalogue.js';
import { erfc } from '../optics/special.js';
import { columnPower, integrateColumns, landingOrders, type GratingInput, type GratingOrder, type OrderTable } from './orders.js';
import { gratingHalfWidth, orderFraction, periodPower, periodSpectrum2 } from './grating-shape.js';

/** Orders below this fraction of the transmitted power (thin-grating theory) are not checked. */
export const CHECKED_ORDER_MIN = 1e-3;
/**
 * An order is well separated when its spot, the grating's illuminated width plus this many
 * far-field first-zero half-widths λz/(Wγ³) on each side, stays inside its interval, and the
 * neighbours' spots stay out of it (common practice: three lobes hold about 97 % of a sinc² beam's
 * power in 1-D, the 1/u tail law below).
 */
export const SEPARATION_LOBES = 3;
/**
 * Light counts as stray when a peak of the map outside every order's core stands above what a
 * correct computation puts there by at least this fraction of the peak an order carrying
 * CHECKED_ORDER_MIN of the transmitted power would have.
 */
export const STRAY_PEAK_LEVEL = 0.5;
/**
 * The power budget (the tolerance of orders-power) for order m:
 *   2·|P_model − P_thin|                        this finite grating's own departure from the
 *                                               thin-grating value, from its far-field model
 *   + 2·(1/u tails out of and into the interval) only beyond the grating's far field
 *   + P_thin·(1 − window fraction)              what the window misses (e.g. along y)
 *   + 0.5 %·P_thin + 1e-4                       the methods' own accuracy
 * The factor 2 is a judgement. Measured on correct computations (the far-field formula in its far
 * field, N = 10…1000, 50 % duty; orders 0 and ±1 depart from thin-grating theory by about 0.056/N
 * of their value: 0.56 % at N = 10, 0.017 % at N = 1000, where the method's 1.7e-4 dominates),
 * the largest |measured − thin-grating| used half of this budget (duty 0.9, N = 10), and exact
 * methods nearer the grating (N_F of the grating 0.3…16) at most 6 % of it.
 */
export const POWER_BUDGET_MARGIN = 2;
/** The grating's own Fresnel number (W/2)²/(λz) up to which it is in its far field (the planner's far-field regime). */
export const FAR_FIELD_NF = 1 / 8;
/**
 * The order table's measured powers belong to the finite grating: each order is a beam whose side
 * lobes (sinc² of the N lit periods, about 2/(π²N) of its power beyond its interval in all) spill
 * into its neighbours' intervals, so the power in an order's interval differs from the infinite
 * grating's efficiency |c_m|² by up to about 4/(π²N) of the strongest order (1 % at N ≈ 40 for a
 * blazed grating that sends everything into one order). Order powers are reported to 1 % (of the
 * incident power, or of the transmitted power without a plane wave); the case says so
 * (orders-finite) where this finite grating's far-field model puts a measured order more than
 * FINITE_ORDER_MODEL from the efficiency (the rest of the 1 % is left for the method's own error),
 * or where the order is measured more than FINITE_ORDER_DEPARTURE from it and the model puts it
 * at least FINITE_ORDER_SHARE of that away. The map is right; the table's fractions are not the
 * efficiencies.
 */
export const FINITE_ORDER_MODEL = 0.006;
export const FINITE_ORDER_DEPARTURE = 0.0075;
export const FINITE_ORDER_SHARE = 1 / 3;
/** orders-window: a measured order short by more than this (same measure) for the light beyond the window. */
export const WINDOW_ORDER_SHORTFALL = 0.005;
/** The budget's floor: the methods' own accuracy (about 0.25 % of a peak, limits.ts), as 0.5 % of the order plus 1e-4 of the transmitted power. */
export const POWER_FLOOR_RELATIVE = 5e-3;
export const POWER_FLOOR_ABSOLUTE = 1e-4;

export interface OrderCheck {
  m: number;
  position: number;
  /**
   * Centroid over the part of the interval symmetric about the position, less modelShift; null
   * when that part is dark.
   */
  centroid: number | null;
  /** The shift of that centroid from z·tan θ_m that the finite grating itself gives (far-field model). */
  modelShift: number;
  /** max(one output sample, 1 % of |position|). */
  centroidTolerance: number;
  measured: number;
  predicted: number;
  /** The far-field model's fraction for this finite grating. */
  model: number;
  /** Largest |measured − predicted| a correct computation of this finite grating should show. */
  powerTolerance: number;
}

export interface StrayLight {
  /** Position of the strongest peak of the stray light (m). */
  position: number;
  /** Power around it (over ± one spot half-width) / power through the slits. */
  fraction: number;
  /** The order whose paraxial landing point z·sin θ_m lies there, if any. */
  paraxialOrder: number | null;
  /** That order is evanescent (|sin θ_m| > 1): it should reach no screen at all. */
  evanescent: boolean;
  /** The nearest order that lands, and its position. */
  nearestOrder: number;
  nearestPosition: number;
}

export interface FiniteOrder {
  m: number;
  /** The table's measured fraction (of the incident power with a plane wave, else of the transmitted). */
  measured: number;
  /** The infinite grating's efficiency in the same measure. */
  efficiency: number;
  /** This finite grating's far-field model over the order's interval, in the same measure. */
  model: number;
}

export interface OrderCheckResult {
  checked: OrderCheck[];
  misplaced: OrderCheck[];
  powerOff: OrderCheck[];
  /** Measured orders whose power, as this finite grating's, departs from the efficiency (see FINITE_ORDER_MODEL). */
  finite: FiniteOrder[];
  stray: StrayLight[];
  warnings: Warning[];
}

export interface OrderCheckInput {
  grating: GratingInput;
  table: OrderTable;
  /** Full illuminated width of the grating along x (m). */
  illuminatedWidth: number;
  /** Gaussian waist (m), Infinity for a plane wave. */
  waist: number;
  /** Intensity at the grating's outer edges relative to its peak (1 for a plane wave). */
  edgeWeight: number;
  /** Power in the window over the propagating power (1 − evanescent) through the slits. */
  propagatingInWindow: number;
  /** What to do when a check fails (methodAdvice for a planned case). */
  advice: string;
  /** Warnings the case's element and order table call for beyond these checks (a reflection grating's groove phase). */
  elementWarnings?: Warning[];
}

/** Inputs from a plan: the illuminated width is the planner's, the edge weight a Gaussian's at the outline. */
export function orderCheckInput(plan: Plan, grating: GratingInput, table: OrderTable, powerInWindow: number): OrderCheckInput {
  const ill = plan.case.illumination;
  const waist = ill.kind === 'gaussian' ? ill.waist : Infinity;
  const a = gratingOf(plan.case.aperture);
  const halfExtent = a ? gratingHalfWidth(a) : plan.x.apertureHalf;
  const edgeWeight = Number.isFinite(waist) ? Math.exp((-2 * halfExtent * halfExtent) / (waist * waist)) : 1;
  const propagating = grating.powerTransmitted * (1 - table.evanescentFraction);
  return {
    grating,
    table,
    illuminatedWidth: 2 * plan.x.apertureHalf,
    waist,
    edgeWeight,
    propagatingInWindow: propagating > 0 ? powerInWindow / propagating : 1,
    advice: methodAdvice(plan),
    elementWarnings: reflectionDepthWarnings(plan, table.orders),
  };
}

export function checkOrders(map: IntensityMap, inp: OrderCheckInput): OrderCheckResult {
  const g = inp.grating;
  const lam = g.wavelength;
  const z = g.distance;
  const W = inp.illuminatedWidth;
  const beta = g.sinIncidenceY ?? 0;
  const dx = map.dx;
  const colPower = columnPower(map);
  const P = g.powerTransmitted;
  const model = gratingFarFieldModel(g, inp.waist);
  const sinOf = (m: number) => g.sinIncidence + (m * lam) / g.period;
  const gammaOf = (m: number) => Math.sqrt(Math.max(1e-12, 1 - sinOf(m) ** 2 - beta ** 2));
  const positionOf = (m: number) => (z * sinOf(m)) / gammaOf(m);
  /** Screen distance per λ/W of direction cosine: one far-field first-zero half-width (dx/dα = z(1 − β²)/γ³). */
  const lobe = (gamma: number) => (lam * z * (1 - beta * beta)) / (W * gamma ** 3);
  const lobeAt = (x: number) => lobe(Math.sqrt(Math.max(1e-12, 1 - (x / Math.hypot(x, z)) ** 2)));
  const extent = (m: number, lobes: number) => W / 2 + lobes * lobe(gammaOf(m));
  // A Gaussian beam's radius along x at the screen, for its own (Gaussian) tail.
  const beamRadius = (m: number) =>
    Number.isFinite(inp.waist) ? Math.hypot(inp.waist, (lam * z * (1 - beta * beta)) / (Math.PI * inp.waist * gammaOf(m) ** 3)) : 0;
  /**
   * Fraction of order m's power beyond u from its spot's edge, on one side: the edge-diffraction
   * tail λz/(2π²·W·u) (far-field sinc² side lobes and near-field edge ringing share this 1/u law;
   * the planner's window margin uses it too), scaled to the screen by 1/γ³ and weighted by the
   * light at the grating's outline; and a Gaussian beam's own tail ½erfc(√2·u/w).
   */
  const tail = (m: number, u: number) => {
    const uu = Math.max(u, 0.5 * lobe(gammaOf(m)));
    let t = (inp.edgeWeight * lobe(gammaOf(m))) / (2 * Math.PI ** 2 * uu);
    if (Number.isFinite(inp.waist)) t += 0.5 * erfc((Math.SQRT2 * (uu + W / 2)) / beamRadius(m));
    return Math.min(0.5, t);
  };
  // Beyond its far field the grating's orders are Fresnel patterns of its outline, whose tails the
  // far-field model does not hold; the 1/u tail estimate joins the budget there.
  const farField = (W / 2) ** 2 / (lam * z) <= FAR_FIELD_NF;

  const [lo, hi] = landingOrders(g.sinIncidence, beta, lam, g.period);
  const byM = new Map<number, GratingOrder>(inp.table.orders.map((o) => [o.m, o]));
  const checked: OrderCheck[] = [];
  for (const o of inp.table.orders) {
    if (o.status !== 'propagating' || o.predictedFraction < CHECKED_ORDER_MIN || !o.interval || o.position === null) continue;
    const x = o.position;
    const [a, b] = o.interval;
    const h = extent(o.m, SEPARATION_LOBES);
    if (x - a < h || b - x < h) continue;
    // The neighbours' spots must stay out of this interval.
    if (o.m > lo && Math.abs(positionOf(o.m - 1) - a) < extent(o.m - 1, SEPARATION_LOBES)) continue;
    if (o.m < hi && Math.abs(positionOf(o.m + 1) - b) < extent(o.m + 1, SEPARATION_LOBES)) continue;
    // Centroid over the part of the interval symmetric about the expected position, less the
    // shift the finite grating itself gives it: the single-slit envelope slopes across the order's
    // side lobes and pulls their light towards the brighter side, by about slope/(2π²N) of the
    // spacing (1.3 % of order 1's position at N = 10, 50 % duty); the model has it exactly.
    const r = Math.min(x - a, b - x);
    const core = integrateColumns(colPower, map, x - r, x + r);
    const modelCore = model.integrate(x - r, x + r);
    const shift = modelCore.power > 0 ? modelCore.moment / modelCore.power - x : 0;
    const centroid = core.power > 0 ? core.moment / core.power - shift : null;
    // Measured here over the interval (the table leaves it empty where its own, stricter test of
    // separation fails; this check has passed its own).
    const measured = P > 0 ? integrateColumns(colPower, map, a, b).power / P : 0;
    const f = o.predictedFraction;
    // The finite grating's own departure from the thin-grating fraction (leakage into and out of
    // the interval, the envelope across it), from the model; and beyond the far field the 1/u
    // tails of this order out of the interval and of the others into it.
    const modelPower = model.integrate(a, b).power;
    const finite = Math.abs(modelPower - f);
    let leak = 0;
    if (!farField) {
      leak = f * (tail(o.m, x - a - W / 2) + tail(o.m, b - x - W / 2));
      for (let k = Math.max(lo, o.m - 50); k <= Math.min(hi, o.m + 50); k++) {
        if (k === o.m) continue;
        const xk = positionOf(k);
        const near = Math.min(Math.abs(xk - a), Math.abs(xk - b)) - W / 2;
        const far = Math.max(Math.abs(xk - a), Math.abs(xk - b)) - W / 2;
        leak += orderFraction(g, k) * Math.max(0, tail(k, near) - tail(k, far));
      }
    }
    const windowLoss = f * Math.max(0, 1 - inp.propagatingInWindow);
    const powerTolerance = POWER_BUDGET_MARGIN * (finite + leak) + windowLoss + POWER_FLOOR_RELATIVE * f + POWER_FLOOR_ABSOLUTE;
    checked.push({
      m: o.m,
      position: x,
      centroid,
      modelShift: shift,
      // Nearer the grating than its far field the neighbours' tails (the leak above) lie inside the
      // interval on one side more than the other when the profile's orders are not symmetric (a
      // sinusoidal phase grating's ±1 amplitudes have opposite signs), and pull the centroid by up
      // to their share of the power times the half-width, twice over for their interference.
      // Equal slits have symmetric orders: their tolerance stays one sample or 1 % of the position.
      centroidTolerance: Math.max(dx, 0.01 * Math.abs(x), farField || f <= 0 || !g.profile ? 0 : (2 * leak * r) / f),
      measured,
      predicted: f,
      model: modelPower,
      powerTolerance,
    });
  }
  const short = windowShortfall(inp);
  const misplaced = checked.filter((c) => c.centroid === null || Math.abs(c.centroid - c.position) > c.centroidTolerance);
  const powerOff = checked.filter((c) => Math.abs(c.measured - c.predicted) > c.powerTolerance);

  // Stray light: peaks of the (row-summed) profile outside every landing order's core that stand
  // above what a correct computation puts there (expectedDensity: in the far field the model's side
  // lobes and secondary maxima between orders, which for a few slits are far from negligible) by
  // at least the peak an order carrying STRAY_PEAK_LEVEL·CHECKED_ORDER_MIN of the transmitted
  // power would have.
  const level = STRAY_PEAK_LEVEL * CHECKED_ORDER_MIN;
  const nearestLanding = (x: number): number => {
    // Positions increase with m: bisection for the nearest.
    let a = lo;
    let b = hi;
    while (b - a > 1) {
      const mid = (a + b) >> 1;
      if (positionOf(mid) < x) a = mid;
      else b = mid;
    }
    return Math.abs(positionOf(a) - x) <= Math.abs(positionOf(b) - x) ? a : b;
  };
  /**
   * An order's core, left to the centroid and power checks: its illuminated width plus one lobe
   * (and, nearer the grating, one Fresnel-zone width √(λz/2γ³), the scale of the ringing at the
   * beam's edges). Beyond it the expected density below holds the order's own side lobes and tails.
   */
  const core = (m: number) => W / 2 + lobe(gammaOf(m)) + (farField ? 0 : Math.sqrt((lam * z) / (2 * gammaOf(m) ** 3)));
  const inSpot = (x: number): boolean => {
    if (lo > hi) return false;
    const n = nearestLanding(x);
    for (let k = Math.max(lo, n - 3); k <= Math.min(hi, n + 3); k++) if (Math.abs(positionOf(k) - x) <= core(k)) return true;
    return false;
  };
  /**
   * What a correct computation puts at x outside the orders' cores. The far-field model's largest density
   * within ± one lobe (its fringes need not line up with the map's samples) holds the side lobes
   * and the array factor's secondary maxima between orders (1/N² of an order's peak midway, far
   * from negligible for a few slits); in the grating's far field it is exact, and gets a 25 %
   * allowance. Nearer the grating each order is a Fresnel pattern of the outline whose tail falls
   * off from the beam's edge rather than its centre: there the larger of the model and the orders'
   * tails, f_k·λz/(2π²W·u²) at u from the edge of order k's beam (the derivative of the 1/u tail
   * law) summed, counts twice over (two overlapping waves interfere up to twice their sum).
   */
  const expectedDensity = (x: number): number => {
    const l = lobeAt(x);
    let env = 0;
    for (let i = -8; i <= 8; i++) env = Math.max(env, model.density(x + (i / 8) * l));
    if (farField) return 1.25 * env;
    const n = nearestLanding(x);
    let sum = 0;
    for (let k = Math.max(lo, n - 50); k <= Math.min(hi, n + 50); k++) {
      const f = orderFraction(g, k);
      const lk = lobe(gammaOf(k));
      const dist = Math.abs(x - positionOf(k));
      const u = Math.max(dist - W / 2, lk / 2);
      sum += (f * inp.edgeWeight * lk) / (2 * Math.PI ** 2 * u * u);
      if (Number.isFinite(inp.waist)) {
        const wr = beamRadius(k);
        sum += (f * Math.sqrt(2 / Math.PI) * Math.exp((-2 * dist * dist) / (wr * wr))) / wr;
      }
    }
    return 2 * Math.max(env, sum);
  };
  const strayPeaks: { i: number; x: number }[] = [];
  for (let i = 1; i < map.nx - 1; i++) {
    const v = colPower[i]!;
    if (!(v > colPower[i - 1]! && v >= colPower[i + 1]!)) continue;
    const x = xAt(map, i);
    // Peak density (per metre) of an order carrying `level` of the power: level/(spot width), the
    // spot being the far-field lobe or, nearer the grating, its own illuminated width.
    const threshold = level / Math.max(lobeAt(x), W);
    const density = v / dx / P;
    if (density < threshold || inSpot(x)) continue;
    if (density - expectedDensity(x) < threshold) continue;
    strayPeaks.push({ i, x });
  }
  // One entry per cluster of stray peaks (a misplaced order's own side lobes are peaks too).
  const stray: StrayLight[] = [];
  let lastI = -1;
  for (const p of strayPeaks) {
    const last = stray[stray.length - 1];
    if (last && Math.abs(p.x - last.position) < 2 * SEPARATION_LOBES * lobeAt(p.x) + W) {
      if (colPower[p.i]! > colPower[lastI]!) {
        last.position = p.x;
        lastI = p.i;
      }
      continue;
    }
    const n = lo <= hi ? nearestLanding(p.x) : 0;
    stray.push({ position: p.x, fraction: 0, paraxialOrder: null, evanescent: false, nearestOrder: n, nearestPosition: lo <= hi ? positionOf(n) : NaN });
    lastI = p.i;
  }
  for (const s of stray) {
    const spread = lobeAt(s.position);
    const half = W / 2 + spread;
    s.fraction = integrateColumns(colPower, map, s.position - half, s.position + half).power / P;
    // A paraxial method lands order m at z·sin θ_m: a propagating order too close to the axis, an
    // evanescent one (|sin θ_m| > 1) on the screen at all.
    const m = Math.round(((s.position / z - g.sinIncidence) * g.period) / lam);
    let best = Infinity;
    for (const k of [m - 1, m, m + 1]) {
      const off = Math.abs(z * sinOf(k) - s.position);
      if (off <= W / 2 + SEPARATION_LOBES * spread && off < best) {
        best = off;
        s.paraxialOrder = k;
        s.evanescent = Math.abs(sinOf(k)) >= Math.sqrt(1 - beta * beta);
      }
    }
  }

  const warnings: Warning[] = [];
  if (misplaced.length || stray.length) {
    warnings.push(
      warning('orders-misplaced', {
        misplaced: misplaced.map((c) => {
          const o = byM.get(c.m)!;
          const paraxialAt = z * o.sinAngle;
          return {
            m: c.m,
            position: c.position,
            angle: o.angle ?? 0,
            centroid: c.centroid,
            paraxialAt: c.centroid !== null && Math.abs(paraxialAt - c.centroid) < Math.abs(c.centroid - c.position) / 3 ? paraxialAt : null,
            tolerance: c.centroidTolerance,
          };
        }),
        stray: stray.map((s) => ({
          position: s.position,
          fraction: s.fraction,
          paraxial:
            s.paraxialOrder !== null ? { order: s.paraxialOrder, at: z * sinOf(s.paraxialOrder), landsAt: s.evanescent ? null : positionOf(s.paraxialOrder) } : null,
          nearest: Number.isFinite(s.nearestPosition) ? { order: s.nearestOrder, position: s.nearestPosition } : null,
        })),
        sampleStep: dx,
        advice: inp.advice,
      }),
    );
  }
  if (powerOff.length) {
    warnings.push(
      warning('orders-power', {
        orders: powerOff.map((c) => ({ m: c.m, measured: c.measured, predicted: c.predicted, tolerance: c.powerTolerance })),
        farField,
        advice: inp.advice,
      }),
    );
  }
  // After the other checks: a measured departure they explain (an aliased map) is not this one.
  const finite = finiteOrders(inp, model, warnings.length > 0);
  if (finite.length) {
    warnings.push(
      warning('orders-finite', {
        count: g.count,
        orders: finite,
        ofIncident: !!g.powerIncident,
        departure: Math.max(...finite.map((o) => Math.abs(o.model - o.efficiency))),
      }),
    );
  }
  if (short.orders.length) {
    warnings.push(warning('orders-window', { shortfall: short.shortfall, orders: short.orders, ofIncident: !!g.powerIncident, twoD: map.ny > 1 }));
  }
  warnings.push(...(inp.elementWarnings ?? []));
  return { checked, misplaced, powerOff, finite, stray, warnings };
}

/**
 * The share of the light that should be in the window and is not (what passes beyond its edges:
 * along y for a grating of finite length, or an order's tails past the outer edges), and the
 * measured orders it could take more than WINDOW_ORDER_SHORTFALL from (each order loses about
 * that share of its own power: the orders share the grating's outline, so their tails along y
 * are alike). Orders the table lists as outside the window are not expected in it.
 */
function windowShortfall(inp: OrderCheckInput): { shortfall: number; orders: { m: number; measured: number; shortBy: number }[] } {
  const g = inp.grating;
  const t = inp.table;
  const evanescent = t.evanescentFraction;
  let outside = 0;
  for (const o of t.orders) if (o.status === 'outside-window') outside += o.predictedFraction;
  for (const o of t.omitted) outside += o.predictedFraction;
  const expected = 1 - evanescent - outside;
  const inWindow = inp.propagatingInWindow * (1 - evanescent);
  const shortfall = expected > 0 ? Math.max(0, 1 - inWindow / expected) : 0;
  const scale = g.powerIncident ? g.powerTransmitted / g.powerIncident : 1;
  const orders: { m: number; measured: number; shortBy: number }[] = [];
  if (shortfall > 0) {
    for (const o of t.orders) {
      if (o.status !== 'propagating' || o.fractionOfTransmitted === null) continue;
      const shortBy = o.predictedFraction * scale * shortfall;
      if (shortBy > WINDOW_ORDER_SHORTFALL) orders.push({ m: o.m, measured: o.fractionOfTransmitted * scale, shortBy });
    }
  }
  return { shortfall, orders };
}

/**
 * The measured orders this finite grating's far-field model puts more than FINITE_ORDER_MODEL from
 * the infinite grating's efficiency, or that are measured more than FINITE_ORDER_DEPARTURE from it
 * while the model puts them at least FINITE_ORDER_SHARE of that away (the finite grating is then a
 * real part of the reason; `explained`: another check has already said why the map is off, and only
 * the model counts). Only gratings of few enough lit periods for their side lobes to move that much
 * (at most about 4/(π²N) for N lit periods; a Gaussian's orders have far less) are integrated.
 */
function finiteOrders(inp: OrderCheckInput, model: GratingModel, explained: boolean): FiniteOrder[] {
  const g = inp.grating;
  const lit = Number.isFinite(inp.waist) ? Math.min(g.count, Math.max(1, (2 * inp.waist) / g.period)) : g.count;
  if (4 / (Math.PI ** 2 * lit) <= FINITE_ORDER_SHARE * FINITE_ORDER_DEPARTURE) return [];
  const scale = g.powerIncident ? g.powerTransmitted / g.powerIncident : 1;
  const out: FiniteOrder[] = [];
  for (const o of inp.table.orders) {
    if (o.status !== 'propagating' || o.fractionOfTransmitted === null || !o.interval) continue;
    const modelled = model.integrate(o.interval[0], o.interval[1]).power * scale;
    const efficiency = o.predictedFraction * scale;
    const measured = o.fractionOfTransmitted * scale;
    const byModel = Math.abs(modelled - efficiency);
    const byMap = Math.abs(measured - efficiency);
    if (byModel > FINITE_ORDER_MODEL || (!explained && byMap > FINITE_ORDER_DEPARTURE && byModel >= FINITE_ORDER_SHARE * FINITE_ORDER_DEPARTURE)) {
      out.push({ m: o.m, measured, efficiency, model: modelled });
    }
  }
  return out;
}

/**
 * The far field of the finite grating as lit, in thin-grating theory (Goodman §4.2–4.4): the
 * slits' spectrum w·sinc(w·f) times the array factor Σ_n g_n·e^{−i2πf·x_n} of the N slit centres
 * x_n weighted by the illumination g_n, with f = (α − α_i)/λ and the screen position
 * x = z·α/γ. Densities and integrals are fractions of the model's own transmitted power Σ g_n²·w.
 * It is exact in the far field of the whole grating; between the orders' spots it also gives the
 * tails a correct computation has at smaller distances (they follow the same 1/u law there).
 */
export interface GratingModel {
  /** Fraction of the transmitted power per metre of screen at x. */
  density(x: number): number;
  /** ∫ density and ∫ x·density over [a, b]. */
  integrate(a: number, b: number): { power: number; moment: number };
}

export function gratingFarFieldModel(g: GratingInput, waist: number): GratingModel {
  const N = g.count;
  const d = g.period;
  const lam = g.wavelength;
  const z = g.distance;
  const beta = g.sinIncidenceY ?? 0;
  const sb = Math.sqrt(Math.max(0, 1 - beta * beta));
  const plane = !Number.isFinite(waist);
  const first = -((N - 1) / 2) * d;
  // Slits that carry light (a Gaussian's amplitude e^{−x²/w₀²} above 1e-8).
  const centres: number[] = [];
  const weights: number[] = [];
  for (let n = 0; n < N; n++) {
    const x = first + n * d;
    const a = plane ? 1 : Math.exp(-(x * x) / (waist * waist));
    if (a < 1e-8) continue;
    centres.push(x);
    weights.push(a);
  }
  let total = 0;
  const perPeriod = periodPower(g);
  for (const a of weights) total += a * a * perPeriod;
  // Beyond a few hundred lit slits, a Gaussian's array factor is its Poisson sum: Gaussians of
  // width 1/(πw₀) at the orders (the grating is then much wider than the beam or nearly so).
  const poisson = !plane && centres.length > 400;
  const arrayFactor2 = (f: number): number => {
    if (plane) {
      const den = Math.sin(Math.PI * f * d);
      if (Math.abs(den) < 1e-12) return N * N;
      return (Math.sin(Math.PI * N * f * d) / den) ** 2;
    }
    if (poisson) {
      const k0 = Math.round(f * d);
      let s = 0;
      for (let k = k0 - 2; k <= k0 + 2; k++) s += Math.exp(-((Math.PI * waist * (f - k / d)) ** 2));
      return ((Math.sqrt(Math.PI) * waist) / d) ** 2 * s * s;
    }
    let re = 0;
    let im = 0;
    for (let n = 0; n < centres.length; n++) {
      const ph = -2 * Math.PI * f * centres[n]!;
      re += weights[n]! * Math.cos(ph);
      im += weights[n]! * Math.sin(ph);
    }
    return re * re + im * im;
  };
  const spectrum2 = (f: number) => periodSpectrum2(g, f) * arrayFactor2(f);
  const alphaOf = (x: number) => (x * sb) / Math.hypot(x, z);
  const xOfAlpha = (a: number) => (z * a) / Math.sqrt(Math.max(1e-300, sb * sb - a * a));
  // The spot of the whole lit grating in f is 1/W wide; panels of a quarter of that resolve every lobe.
  const lit = plane ? N * d : Math.min(N * d, 6 * waist);
  const panel = 1 / (4 * Math.max(lit, d));
  const GL = [
    [-Math.sqrt(3 / 5), 5 / 9],
    [0, 8 / 9],
    [Math.sqrt(3 / 5), 5 / 9],
  ] as const;
  return {
    density(x) {
      const r = Math.hypot(x, z);
      const dAlphaDx = (sb * z * z) / (r * r * r);
      return (spectrum2((alphaOf(x) - g.sinIncidence) / lam) * dAlphaDx) / lam / total;
    },
    integrate(a, b) {
      const ga = Math.max(-sb, Math.min(sb, Number.isFinite(a) ? alphaOf(a) : Math.sign(a) * sb));
      const gb = Math.max(-sb, Math.min(sb, Number.isFinite(b) ? alphaOf(b) : Math.sign(b) * sb));
      const fa = (ga - g.sinIncidence) / lam;
      const fb = (gb - g.sinIncidence) / lam;
      if (!(fb > fa)) return { power: 0, moment: 0 };
      const n = Math.min(400000, Math.max(4, Math.ceil((fb - fa) / panel)));
      const h = (fb - fa) / n;
      let power = 0;
      let moment = 0;
      for (let i = 0; i < n; i++) {
        const mid = fa + (i + 0.5) * h;
        for (const [t, wt] of GL) {
          const f = mid + (t * h) / 2;
          const v = spectrum2(f) * wt * (h / 2);
          power += v;
          moment += v * xOfAlpha(g.sinIncidence + lam * f);
        }
      }
      // ∫|U|²dx = ∫|Â(f)|²df (the far-field mapping conserves it: analysis/orders.ts).
      return { power: power / total, moment: moment / total };
    },
  };
}

/** A method the plan considered (Plan.options, where the planner records them). */
interface OfferedMethod {
  method: string;
  form?: string;
  valid: boolean;
  fits?: boolean;
  work?: number;
}

/**
 * What to do when the computation is off: why the method that made it can be (by method), and a
 * method the plan offers — valid here and within the limits, the cheapest other than this one —
 * or, where the plan records no options, the exact methods the job may ask for.
 */
export function methodAdvice(plan: Plan): string {
  const forced = plan.case.method !== 'auto';
  const requestable = (m: string) => (METHODS as readonly string[]).includes(m);
  const offered = ((plan as { options?: OfferedMethod[] }).options ?? []).filter((o) => o.valid && o.fits !== false && o.method !== plan.method);
  const cheapest = (os: OfferedMethod[]) => (os.length ? os.reduce((b, o) => ((o.work ?? Infinity) < (b.work ?? Infinity) ? o : b)) : null);
  const best = cheapest(offered);
  const bestAsked = cheapest(offered.filter((o) => requestable(o.method)));
  const exact = (METHODS as readonly string[]).filter((m) => m !== 'auto' && m !== plan.method && (m === 'angular-spectrum' || /rayleigh|sommerfeld/i.test(m)));
  let use: string;
  if (forced && best) {
    use = `use method: auto, with which the planner picks ${best.method} here (valid, and it fits)${bestAsked && bestAsked.method !== best.method ? `, or method: ${bestAsked.method}` : ''}`;
  } else if (bestAsked) use = `use method: ${bestAsked.method} (the plan found it valid here, and it fits)`;
  else if (best) use = `the plan found ${best.method} valid here and within the limits, but a job file cannot ask for it: report this case with its job file`;
  else if (exact.length) use = `use ${exact.map((m) => `method: ${m}`).join(' or ')} (exact for scalar waves)`;
  else use = 'no other method the plan offers is valid here';
  const why =
    plan.method === 'fresnel'
      ? 'the Fresnel method is paraxial: it sends order m to z·sin θ_m instead of z·tan θ_m and lands orders that should be evanescent'
      : plan.method === 'fraunhofer'
        ? `the far-field formula holds only far beyond 2D²/λ (here ${formatLength(plan.checks.farFieldDistance, 3)})`
        : plan.method === 'angular-spectrum'
          ? `the angular spectrum is exact for scalar waves, so its sampling is at fault (see the band-limit and edge-energy warnings, if any)${
              plan.case.grid?.size || plan.case.grid?.pitch
                ? '; a larger grid.size or finer grid.pitch, or no grid at all so that the planner samples it'
                : `; the planner's grid (pitch ${formatLength(plan.x.inputPitch, 3)}, ${plan.x.paddedSamples} samples padded) was expected to do, so this is unexpected`
            }`
          : `${plan.method} was expected to be accurate here, so this is unexpected`;
  return `${why}${forced ? ` (this case forces method: ${plan.case.method})` : ''}; ${use}`;
}

