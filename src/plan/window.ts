// The observation window: where the light lands. Every propagating beam (every propagating order
// of a grating, whatever its power) is held, each with its footprint and a margin for its
// diffraction tails, so that a grating's outer orders are never dropped for lying outside the
// planner's own window.
import { erfc } from '../optics/special.js';
import { LIMITS } from './limits.js';
import type { Beam, LightModel } from './light.js';

export interface WindowPlan {
  centre: [number, number];
  half: [number, number];
  /** Estimated fraction of the propagating power that lands outside the window. */
  lossEstimate: number;
  /** Propagating beams (grating orders) the planner could not hold at a pitch that resolves them. */
  omitted: Beam[];
}

/**
 * The largest direction cosine (64°) a margin stretches the window to: beyond it light grazes the
 * screen, and holding it would take a window many times the distance wide. A beam that itself
 * lands beyond (a grating's outer order) is held, without a margin on its far side; what falls
 * outside is estimated and reported.
 */
const MARGIN_S_MAX = 0.9;

function toScreen(s: number, z: number, cap = 1): number {
  const c = Math.max(-cap, Math.min(cap, s));
  return (z * c) / Math.sqrt(1 - c * c);
}

function toDirection(u: number, z: number): number {
  return u / Math.sqrt(u * u + z * z);
}

/**
 * Tail of one beam beyond an angular distance δs from its axis, per side: edge diffraction sends
 * power ≈ E·λ/(4π²·δs) per side beyond δs (E the beam's edge measure per unit power; both sides
 * together give the 1/u law of the Fresnel edge and of the sinc²/Airy tails,
 * λz·E/(2π²u) — e.g. Airy: 1 − EE(r) ≈ 2λz/(π²Dr)).
 */
function tail(edgesPerPower: number, lam: number, ds: number): number {
  if (!(ds > 0)) return 0.5;
  return Math.min(0.5, (edgesPerPower * lam) / (4 * Math.PI ** 2 * ds));
}

export interface WindowInputs {
  lam: number;
  z: number;
  model: LightModel;
  nearField: boolean;
  /** A Gaussian beam's radius at the screen (m), if the light is one. */
  beamRadius?: number;
  /** The window the job gives (full widths), if any. */
  given?: [number, number];
  /**
   * Behind a lens, |1 − z/f|: the equivalent propagation over z/|1 − z/f| magnified by |1 − z/f|
   * (the Fresnel scaling of a converging beam) makes the Fresnel zones at the screen √(λz·|1 − z/f|).
   */
  zoneScale?: number;
}

/**
 * The window: per axis the hull of every propagating beam's landing region — its footprint (the
 * illuminated aperture), widened by the angular margin δs at which its tails carry the planner's
 * loss target, mapped to the screen through x = z·s/√(1−s²) (exact in angle, so a beam at 60° gets
 * the stretched margin it needs). Near field: at least two Fresnel zones √(λz/2) of margin.
 */
export function planWindow(w: WindowInputs): WindowPlan {
  const { lam, z, model } = w;
  const axes = model.oneD ? [0] : [0, 1];
  const beams = model.propagating;
  const body = (i: number) => Math.max(model.footprint[i]!, w.beamRadius !== undefined ? LIMITS.beamWindow * w.beamRadius : 0);
  const centre: [number, number] = [0, 0];
  const half: [number, number] = [0, 0];
  const omitted: Beam[] = [];
  if (w.given) {
    // A window the job gives is centred where the main beam lands (the strongest beam).
    const main = beams[0];
    for (const i of axes) {
      centre[i] = main?.landing?.[i] ?? 0;
      half[i] = w.given[i]! / 2;
    }
    if (beams.some((b) => b.order !== null)) {
      omitted.push(...beams.filter((b) => axes.some((i) => Math.abs(b.landing![i]! - centre[i]!) > half[i]!)));
    }
  } else {
    const fresnel = w.nearField ? 2 * Math.sqrt((lam * z * (w.zoneScale ?? 1)) / 2) : 0;
    const hull = (list: Beam[], i: number): [number, number] => {
      let lo = Infinity;
      let hi = -Infinity;
      for (const b of list) {
        // Every beam may lose the target fraction of its own power, so the margin in angle is the
        // same for all: δs = E·λ/(2π²·target). A grating's missing orders (no power) count by
        // position. Order powers are reported to 1 %, so orders get a tighter target (their
        // margins cost little: a grating's window is mostly the span between its outer orders).
        // Along y too: a grating of finite length (the only grating with a y axis; its orders all
        // spread along x) sends every order the same sinc² tails of its ends in y, and the order
        // table integrates each order over the window's height, so what the y margin loses is
        // lost from every order's reported power (with the 2 % target there, orders-window fired
        // on 8 of 800 random gratings of finite length and on 2 with this one; a zeroth order of
        // 73.8 % came out 72.0 %, now 73.4 %: random-grating-report.mjs).
        const target = b.order === null ? LIMITS.windowLossTarget : LIMITS.orderLossTarget;
        const ds = (model.beamEdgesPerPower[i]! * lam) / (2 * Math.PI ** 2 * target);
        const s = b.dir[i]!;
        const at = toScreen(s, z);
        // Beyond MARGIN_S_MAX a beam still gets its margin, up to half its way to grazing: an order
        // at 76° spreads over decimetres of the screen, and without it half its light was outside.
        const cap = Math.max(MARGIN_S_MAX, Math.abs(s) + Math.min(ds, (1 - Math.abs(s)) / 2));
        lo = Math.min(lo, at - body(i) - Math.max(at - toScreen(s - ds, z, cap), fresnel));
        hi = Math.max(hi, at + body(i) + Math.max(toScreen(s + ds, z, cap) - at, fresnel));
      }
      if (!(hi > lo)) return [-body(i), body(i)];
      return [lo, hi];
    };
    // The output must resolve each beam (λz/(8D), D the footprint): a grating whose orders spread
    // over more than the output can sample at that pitch keeps as many of its strongest orders as
    // fit (and every order between them); the rest are reported as outside the window, never
    // dropped without a word.
    const maxSamples = model.oneD ? LIMITS.maxOutput1D : LIMITS.maxOutput2D;
    // The intensity's Nyquist pitch λz/(2D): coarser than that, the output-undersampled check fires.
    const resolved = (i: number) => (lam * z) / (4 * Math.max(model.footprint[i]!, 1e-30));
    const tooWide = (list: Beam[]) => axes.some((i) => {
      const [lo, hi] = hull(list, i);
      return (hi - lo) / resolved(i) > maxSamples;
    });
    let held = beams;
    if (beams.length > 1 && tooWide(beams)) {
      // The strongest orders first, while the window that holds them still fits the output.
      // Orders of equal power (±m at normal incidence) are taken together or not at all, so that a
      // symmetric pattern keeps a symmetric window. (Orders landing between the chosen ones are in
      // the window anyway; only the chosen ones size it.) The hull grows by each group's own.
      const byPower = [...beams].sort((a, b) => b.power - a.power);
      held = [byPower[0]!];
      const range = axes.map((i) => hull(held, i));
      for (let j = 1; j < byPower.length; ) {
        let k = j;
        while (k + 1 < byPower.length && Math.abs(byPower[k + 1]!.power - byPower[j]!.power) <= 1e-9 * byPower[j]!.power) k++;
        const group = byPower.slice(j, k + 1);
        const grown = axes.map((i, n) => {
          const [lo, hi] = hull(group, i);
          return [Math.min(lo, range[n]![0]), Math.max(hi, range[n]![1])] as [number, number];
        });
        if (grown.every(([lo, hi], n) => (hi - lo) / resolved(axes[n]!) <= maxSamples)) {
          held = held.concat(group);
          grown.forEach((g, n) => (range[n] = g));
        }
        j = k + 1;
      }
    }
    for (const i of axes) {
      const [lo, hi] = hull(held, i);
      const minHalf = LIMITS.minWindowOverAperture * model.footprint[i]!;
      const single = held.length === 1 ? held[0]!.landing : null;
      if (single) {
        // One beam: the window is centred on where it lands (its margins, mapped through tan θ,
        // are not symmetric; the larger one is kept on both sides).
        centre[i] = single[i]!;
        half[i] = Math.max(single[i]! - lo, hi - single[i]!, minHalf);
      } else {
        centre[i] = (lo + hi) / 2;
        half[i] = Math.max((hi - lo) / 2, minHalf);
      }
    }
    if (held !== beams) omitted.push(...beams.filter((b) => axes.some((i) => Math.abs(b.landing![i]! - centre[i]!) > half[i]!)));
  }
  return { centre, half, lossEstimate: windowLoss(w, centre, half), omitted };
}

/**
 * Estimated fraction of the propagating power outside a window: each beam's tails beyond the
 * window's edges (in angle, seen from the nearer edge of the beam's footprint), plus a Gaussian
 * beam's own profile outside it.
 */
export function windowLoss(w: WindowInputs, centre: [number, number], half: [number, number]): number {
  const { lam, z, model } = w;
  const axes = model.oneD ? [0] : [0, 1];
  let total = 0;
  let loss = 0;
  for (const b of model.propagating) {
    total += b.power;
    if (!b.landing) continue;
    let inside = 1;
    for (const i of axes) {
      const foot = model.footprint[i]!;
      const lo = centre[i]! - half[i]!;
      const hi = centre[i]! + half[i]!;
      let out: number;
      if (b.landing[i]! > hi || b.landing[i]! < lo) out = 1;
      else {
        // Direction from the footprint's near edge to each window edge, relative to the beam's axis.
        const dsHi = toDirection(hi - foot, z) - b.dir[i]!;
        const dsLo = b.dir[i]! - toDirection(lo + foot, z);
        out = Math.min(1, tail(model.beamEdgesPerPower[i]!, lam, dsHi) + tail(model.beamEdgesPerPower[i]!, lam, dsLo));
      }
      inside *= 1 - out;
    }
    loss += b.power * (1 - inside);
  }
  if (w.beamRadius !== undefined) {
    const main = model.propagating[0]?.landing;
    for (const i of axes) loss += total * erfc((Math.SQRT2 * (half[i]! - Math.abs(centre[i]! - (main?.[i] ?? 0)))) / w.beamRadius);
  }
  return total > 0 ? Math.min(1, loss / total) : 0;
}


export type { Beam };
