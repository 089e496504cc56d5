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
// ends; each panel takes a fixed step of R (the rule's phase limit), whose end is found in closed
// form: sin²(φ/2) = (R − R₀)(R + R₀)/(4ad), R₀ = √(z² + (a − d)²). The kernel's only singularity
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
export function discContour(a: number, d: number, z: number, k: number, rule: DiscRule, out: Float64Array): number {
  const amd = a - d;
  const ad4 = 4 * a * d;
  const z2 = z * z;
  const R0sq = z2 + amd * amd;
  const R0 = Math.sqrt(R0sq);
  const dR = rule.phase / k;
  const beta = rule.beta;
  const { x, w } = glRule(rule.n);
  const n = rule.n;
  if (n > MAX_NODES) throw new Error(`discContour: at most ${MAX_NODES} nodes per panel`);
  // Branch point of R in t (imaginary part); 0 when d = 0 (no branch point: the integrand is constant).
  const X = ad4 > 0 ? R0sq / (0.5 * ad4) : Infinity;
  const tau = Number.isFinite(X) ? Math.tanh(Math.acosh(1 + X) / 4) : 1;
  const kHalf = 0.5 * k;
  const twoZ = 2 * z;
  const amd2 = amd * amd;
  const aamd = a * amd;
  const ad2 = 0.5 * ad4;
  let re = 0;
  let im = 0;
  let t0 = 0;
  let R = R0;
  let evaluations = 0;
  while (t0 < 1) {
    // End of the panel: a phase step, or the singularity cap, or the end of the range.
    let t1: number;
    if (ad4 > 0) {
      const Rn = R + dR;
      const s2 = ((Rn - R0) * (Rn + R0)) / ad4;
      t1 = s2 >= 1 ? 1 : Math.sqrt(s2) / (1 + Math.sqrt(1 - s2));
    } else t1 = 1;
    const cap = beta * Math.min(1, Math.sqrt(t0 * t0 + tau * tau));
    if (t1 > t0 + cap) t1 = t0 + cap;
    if (t1 > 1 || 1 - t1 < 1e-12) t1 = 1;
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
    if (t0 < 1 && ad4 > 0) {
      const s = (2 * t0) / (1 + t0 * t0);
      R = Math.sqrt(R0sq + ad4 * s * s);
    }
  }
  out[0] = re;
  out[1] = im;
  return evaluations;
}

/** The number of kernel evaluations discContour makes (the same panel walk, no integrand). */
export function discContourCount(a: number, d: number, z: number, k: number, rule: DiscRule): number {
  const amd = a - d;
  const ad4 = 4 * a * d;
  const R0sq = z * z + amd * amd;
  const R0 = Math.sqrt(R0sq);
  const dR = rule.phase / k;
  const X = ad4 > 0 ? R0sq / (0.5 * ad4) : Infinity;
  const tau = Number.isFinite(X) ? Math.tanh(Math.acosh(1 + X) / 4) : 1;
  let t0 = 0;
  let R = R0;
  let panels = 0;
  while (t0 < 1) {
    let t1: number;
    if (ad4 > 0) {
      const Rn = R + dR;
      const s2 = ((Rn - R0) * (Rn + R0)) / ad4;
      t1 = s2 >= 1 ? 1 : Math.sqrt(s2) / (1 + Math.sqrt(1 - s2));
    } else t1 = 1;
    const cap = rule.beta * Math.min(1, Math.sqrt(t0 * t0 + tau * tau));
    if (t1 > t0 + cap) t1 = t0 + cap;
    if (t1 > 1 || 1 - t1 < 1e-12) t1 = 1;
    panels++;
    t0 = t1;
    if (t0 < 1 && ad4 > 0) {
      const s = (2 * t0) / (1 + t0 * t0);
      R = Math.sqrt(R0sq + ad4 * s * s);
    }
  }
  return panels * rule.n;
}
