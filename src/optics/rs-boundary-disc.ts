// The boundary integral of rs-boundary.ts around a centred circle of radius a, for a foot at
// distance d from the centre: one integral per output radius.
//
// Turn the frame so that the foot is at (d, 0). The circle's point a(cos φ, sin φ) is at
// ρ² = (a − d)² + 4ad·sin²(φ/2) from the foot and subtends dψ = (a(a − d) + 2ad·sin²(φ/2))/ρ² dφ,
// both even in φ (twice [0, π]). Written this way, no difference loses precision when the foot is
// near the circle (a − d is formed once, from the inputs). With t = tan(φ/4) ∈ [0, 1],
// sin(φ/2) = 2t/(1 + t²) and dφ = 4 dt/(1 + t²): rational in t, so a node costs no sine beyond the
// kernel's one sine and one cosine.
//
// Panels: the phase kR is monotonic on [0, π] (R grows with φ), with stationary points at both
// ends. A panel may hold the rule's phase limit Φ at the largest rate of phase it contains: width ×
// max k·dR/dt ≤ Φ (a linear phase is what the limit was measured on; at a stationary end the
// phase is quadratic and a step of Φ in phase would reach twice that rate). The end is first put
// where R has grown by Φ/k (closed form: sin²(φ/2) = (R − R₀)(R + R₀)/(4ad), R₀ = √(z² + (a − d)²)),
// then pulled in to Φ/(max rate): the rate dR/dt = 4ad·s·s′/R (s = sin(φ/2) as a function of t) is
// single-peaked on [0, 1], so its maximum over a panel is at an end or at the peak, found once. The kernel's only singularity
// near the real line is the branch point of R = √(ρ² + z²) at ρ² = −z², which in t lies on the
// imaginary axis at i·tanh(τ/4), cosh τ = 1 + R₀²/(2ad); panels near t = 0 are kept within β times
// their distance from it, and within β of the poles of 1/(1 + t²) at ±i.
import { glRule } from './rs-boundary-rules.js';

/** Per-node scratch (no allocation in the loops); rules have at most this many nodes. */
const MAX_NODES = 64;
const PHASE = new Float64Array(MAX_NODES);
const AMP = new Float64Array(MAX_NODES);
const REST = new Float64Array(MAX_NODES);

export interface DiscRule {
  /** Gauss–Legendre nodes per panel. */
  n: number;
  /** Phase change per panel (rad). */
  phase: number;
  /** Panels stay within beta times their distance from the nearest singularity. */
  beta: number;
}

/**
 * ∮ K(ρ²)·ρ² dψ around the circle (counter-clockwise) for the foot at distance d from its centre,
 * K as in rs-boundary.ts (relative to e^{ikz}). Writes re, im into out[0], out[1]; returns the
 * number of kernel evaluations.
 */
/** Reusable panel walker for one contour (no allocation per radius). */
class DiscPanels {
  private R0 = 0;
  private R0sq = 0;
  private ad4 = 0;
  private tau = 1;
  private D = 0;
  private beta = 0.5;
  private tPeak = 0.5;
  private ratePeak = 0;

  reset(a: number, d: number, z: number, k: number, rule: DiscRule): void {
    const amd = a - d;
    this.ad4 = 4 * a * d;
    this.R0sq = z * z + amd * amd;
    this.R0 = Math.sqrt(this.R0sq);
    this.D = rule.phase / k;
    this.beta = rule.beta;
    // Branch point of R in t (imaginary part); none when d = 0 (the integrand is then constant).
    const X = this.ad4 > 0 ? this.R0sq / (0.5 * this.ad4) : Infinity;
    this.tau = Number.isFinite(X) ? Math.tanh(Math.acosh(1 + X) / 4) : 1;
    // The rate's peak on [0, 1], by golden-section search (it is single-peaked; 20 steps place it
    // within 1e-4, where the rate is flat).
    if (this.ad4 > 0) {
      let lo = 0;
      let hi = 1;
      const g = 0.6180339887498949;
      let c = hi - g * (hi - lo);
      let e = lo + g * (hi - lo);
      let fc = this.rate(c);
      let fe = this.rate(e);
      for (let it = 0; it < 20; it++) {
        if (fc > fe) {
          hi = e;
          e = c;
          fe = fc;
          c = hi - g * (hi - lo);
          fc = this.rate(c);
        } else {
          lo = c;
          c = e;
          fc = fe;
          e = lo + g * (hi - lo);
          fe = this.rate(e);
        }
      }
      this.tPeak = 0.5 * (lo + hi);
      this.ratePeak = this.rate(this.tPeak);
    }
  }

  /** dR/dt at t. */
  rate(t: number): number {
    const p1 = 1 + t * t;
    const s = (2 * t) / p1;
    const ds = (2 * (1 - t * t)) / (p1 * p1);
    return (this.ad4 * s * ds) / Math.sqrt(this.R0sq + this.ad4 * s * s);
  }

  /** R at t. */
  R(t: number): number {
    const s = (2 * t) / (1 + t * t);
    return Math.sqrt(this.R0sq + this.ad4 * s * s);
  }

  /** The end of the panel that starts at t0. */
  next(t0: number): number {
    let t1 = 1;
    if (this.ad4 > 0) {
      const Rn = this.R(t0) + this.D;
      const R0 = this.R0;
      const s2 = ((Rn - R0) * (Rn + R0)) / this.ad4;
      t1 = s2 >= 1 ? 1 : Math.sqrt(s2) / (1 + Math.sqrt(1 - s2));
      let rm = Math.max(this.rate(t0), this.rate(t1));
      if (this.tPeak > t0 && this.tPeak < t1) rm = Math.max(rm, this.ratePeak);
      if ((t1 - t0) * rm > this.D) t1 = t0 + this.D / rm;
    }
    const cap = this.beta * Math.min(1, Math.sqrt(t0 * t0 + this.tau * this.tau));
    if (t1 > t0 + cap) t1 = t0 + cap;
    if (t1 > 1 || 1 - t1 < 1e-12) t1 = 1;
    return t1;
  }
}

const walker = new DiscPanels();

/**
 * ∮ K(ρ²)·ρ² dψ around the circle (counter-clockwise) for the foot at distance d from its centre,
 * K as in rs-boundary.ts (relative to e^{ikz}). Writes re, im into out[0], out[1]; returns the
 * number of kernel evaluations.
 */
export function discContour(a: number, d: number, z: number, k: number, rule: DiscRule, out: Float64Array): number {
  const amd = a - d;
  const ad4 = 4 * a * d;
  const z2 = z * z;
  const { x, w } = glRule(rule.n);
  const n = rule.n;
  if (n > MAX_NODES) throw new Error(`discContour: at most ${MAX_NODES} nodes per panel`);
  walker.reset(a, d, z, k, rule);
  const kHalf = 0.5 * k;
  const twoZ = 2 * z;
  const amd2 = amd * amd;
  const aamd = a * amd;
  const ad2 = 0.5 * ad4;
  let re = 0;
  let im = 0;
  let t0 = 0;
  let evaluations = 0;
  while (t0 < 1) {
    const t1 = walker.next(t0);
    const half = 0.5 * (t1 - t0);
    const mid = 0.5 * (t1 + t0);
    // Two passes: the algebra for all nodes, then the sines and cosines (the calls stall the
    // pipeline less when nothing else waits on them: measured 29 ns a node against 51–57 fused).
    for (let j = 0; j < n; j++) {
      const t = mid + half * x[j]!;
      const p1 = 1 + t * t;
      const s2 = (4 * t * t) / (p1 * p1);
      const rho2 = amd2 + ad4 * s2;
      const Rr = Math.sqrt(rho2 + z2);
      const S = Rr + z;
      const RR = Rr * rho2;
      // One division for 1/(1 + t²), 1/(R + z) and 1/(R·ρ²).
      const inv = 1 / (p1 * S * RR);
      const iS = p1 * RR * inv;
      PHASE[j] = kHalf * rho2 * iS;
      // K·ρ² dψ/dt = (a(a − d) + 2ad s²)·K(ρ²)·4/(1 + t²), twice (φ ∈ [−π, 0]); K's factor 1/(R·ρ²) here.
      AMP[j] = 8 * w[j]! * half * (aamd + ad2 * s2) * S * RR * inv * (p1 * S * inv);
      REST[j] = rho2 * iS;
    }
    for (let j = 0; j < n; j++) {
      const sn = Math.sin(PHASE[j]!);
      const cs = Math.cos(PHASE[j]!);
      const f = AMP[j]!;
      const A = twoZ * sn;
      re += f * (-A * sn - REST[j]!);
      im += f * A * cs;
    }
    evaluations += n;
    t0 = t1;
  }
  out[0] = re;
  out[1] = im;
  return evaluations;
}

/**
 * Panels walked exactly when costing a contour; past them the rest is extrapolated. A contour of
 * more panels than this is one of a case far beyond any work limit (a disc of metres at a
 * wavelength of a micrometre: 1e10 panels), whose walk alone would keep the planner for hours.
 */
export const DISC_COUNT_WALK = 1024;

/**
 * The number of kernel evaluations discContour makes (the same panel walk, no integrand). Beyond
 * DISC_COUNT_WALK panels the rest is extrapolated from the progress so far, in t and in R (a panel
 * advances R by at most the rule's phase step, and t by at most its cap), whichever says more.
 */
export function discContourCount(a: number, d: number, z: number, k: number, rule: DiscRule): number {
  walker.reset(a, d, z, k, rule);
  let t0 = 0;
  let panels = 0;
  while (t0 < 1) {
    t0 = walker.next(t0);
    panels++;
    if (panels >= DISC_COUNT_WALK && t0 < 1) {
      const r0 = walker.R(0);
      const doneR = walker.R(t0) - r0;
      const leftR = walker.R(1) - walker.R(t0);
      const ratio = Math.max((1 - t0) / Math.max(t0, 1e-300), doneR > 0 ? leftR / doneR : 0);
      return Math.min(Number.MAX_VALUE, panels * (1 + ratio)) * rule.n;
    }
  }
  return panels * rule.n;
}
