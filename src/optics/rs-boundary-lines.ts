// Tables of the boundary integral along a straight line, for the edges of rectangles
// (rs-boundary.ts): one table per line and output row (or column), read at every output point of
// that row.
//
// An edge on a line at perpendicular offset c from the foot, parametrised by u (the distance along
// the line from the foot's projection), contributes ∫ c·K(c² + u²) du between its ends' u values
// (K as in rs-boundary.ts). For a row of outputs the offset c is the same for every output, and
// only the ends move: so we tabulate G(s) = ∫_0^s c·K(c² + u²) du once (G is odd in s) and read it
// at s = end − x for every output x and every edge end on the line. The table is a set of panels
// from the smallest |s| read (0 when the readings change sign) outwards, each as long as the phase
// kR allows (R = √(c² + z² + u²), stationary at u = 0; lineBreak), kept within β times the distance
// √(u² + R_c²) to the branch points of R at u = ±i·R_c. On each panel the integrand is sampled at n
// Gauss–Legendre nodes and the antiderivative of the interpolant kept as Chebyshev coefficients
// (rs-boundary-rules.ts), so that a reading costs finding its panel and a Clenshaw sum. Where a
// table would integrate much more than the edges themselves, rs-boundary.ts integrates each open
// stretch per output instead (stretchIntegral, below).
import { glRule, integrateChebyshev, interpolantMap } from './rs-boundary-rules.js';

export interface LineRule {
  /** Nodes per panel. */
  n: number;
  /** Phase change per panel (rad): the partial-integral limit of the interpolant. */
  phase: number;
  beta: number;
}

/**
 * The end of the panel that starts at u0 (≥ 0) on a line at R_c = √(c² + z²): where R has grown by
 * D = Φ/k, pulled in so that width × the largest phase rate on the panel (k·u1/R(u1): the rate
 * u/R grows with u) stays within Φ (a stationary start would otherwise reach twice the rate the
 * limit was measured at), kept within β·√(u0² + R_c²) of the branch points, and at most uHi.
 */
export function lineBreak(u0: number, Rc: number, D: number, beta: number, uHi: number): number {
  const Rc2 = Rc * Rc;
  const Rn = Math.sqrt(u0 * u0 + Rc2) + D;
  let u1 = Math.sqrt((Rn - Rc) * (Rn + Rc));
  const rm = u1 / Math.sqrt(u1 * u1 + Rc2);
  if ((u1 - u0) * rm > D) u1 = u0 + D / rm;
  const cap = beta * Math.sqrt(u0 * u0 + Rc2);
  if (u1 > u0 + cap) u1 = u0 + cap;
  return u1 > uHi ? uHi : u1;
}

/** A reusable table (its arrays grow as needed; nothing is allocated per reading). */
export class LineTable {
  private readonly n: number;
  private readonly C: Float64Array;
  private readonly sym: Float64Array;
  private readonly anti: Float64Array;
  private readonly cheb: Float64Array;
  /** The panel of the last reading (readings come in runs of neighbouring s). */
  private hint = 0;
  private readonly x: Float64Array;
  private readonly w: Float64Array;
  private readonly q: Float64Array;
  private readonly ph: Float64Array;
  private readonly amp: Float64Array;
  private readonly rest: Float64Array;
  /** Panel ends b[0] = uLo < b[1] < … < b[count] = uHi. */
  private b = new Float64Array(64);
  /** G at each panel's start (re, im). */
  private g = new Float64Array(128);
  /** Per panel: n + 1 complex Chebyshev coefficients of the antiderivative (in t ∈ [−1, 1]). */
  private coef: Float64Array;
  private count = 0;
  /** Kernel evaluations made so far (for calibration and tests). */
  evaluations = 0;
  readonly rule: LineRule;

  constructor(rule: LineRule) {
    this.rule = rule;
    this.n = rule.n;
    if (rule.n % 4 !== 0) throw new Error('LineTable: the node count must be a multiple of 4');
    this.C = interpolantMap(rule.n);
    this.sym = new Float64Array(rule.n);
    this.anti = new Float64Array(rule.n);
    this.cheb = new Float64Array(2 * rule.n);
    const gl = glRule(rule.n);
    this.x = gl.x;
    this.w = gl.w;
    this.q = new Float64Array(2 * rule.n);
    this.ph = new Float64Array(rule.n);
    this.amp = new Float64Array(rule.n);
    this.rest = new Float64Array(rule.n);
    this.coef = new Float64Array(64 * 2 * (rule.n + 1));
  }

  private grow(): void {
    const cap = this.b.length * 2;
    const b = new Float64Array(cap);
    b.set(this.b);
    this.b = b;
    const g = new Float64Array(2 * cap);
    g.set(this.g);
    this.g = g;
    const c = new Float64Array(cap * 2 * (this.n + 1));
    c.set(this.coef);
    this.coef = c;
  }

  /**
   * Builds the table for the offset c (c ≠ 0), height z, wavenumber k, on |s| ∈ [uLo, uHi]: with
   * uLo = 0 it is G itself; with uLo > 0 (every reading on one side of the foot's projection) it is
   * G less a constant on each side, which the readings' weights cancel (each edge adds its far end
   * and subtracts its near end).
   */
  build(c: number, z: number, k: number, uLo: number, uHi: number): void {
    const n = this.n;
    const { x, w, q, C, ph, amp, rest, sym, anti, cheb } = this;
    const nh = n >> 1;
    let bArr = this.b;
    let gArr = this.g;
    let coef = this.coef;
    const c2 = c * c;
    const Rc2 = c2 + z * z;
    const Rc = Math.sqrt(Rc2);
    const dR = this.rule.phase / k;
    const beta = this.rule.beta;
    const z2 = z * z;
    const kHalf = 0.5 * k;
    const twoZ = 2 * z;
    let u0 = uLo;
    let gr = 0;
    let gi = 0;
    let p = 0;
    this.b[0] = uLo;
    while (u0 < uHi) {
      const u1 = lineBreak(u0, Rc, dR, beta, uHi);
      const half = 0.5 * (u1 - u0);
      const mid = 0.5 * (u1 + u0);
      // Two passes, as in rs-boundary-disc.ts: the algebra, then the sines and cosines.
      for (let j = 0; j < n; j++) {
        const u = mid + half * x[j]!;
        const rho2 = c2 + u * u;
        const Rr = Math.sqrt(rho2 + z2);
        const S = Rr + z;
        const RR = Rr * rho2;
        const inv = 1 / (S * RR); // 1/(R + z) = RR·inv, 1/(R·ρ²) = S·inv
        const iS = RR * inv;
        ph[j] = kHalf * rho2 * iS;
        amp[j] = c * S * inv;
        rest[j] = rho2 * iS;
      }
      let sr = 0;
      let si = 0;
      for (let j = 0; j < n; j++) {
        const sn = Math.sin(ph[j]!);
        const cs = Math.cos(ph[j]!);
        const f = amp[j]!;
        const A = twoZ * sn;
        const vr = f * (-A * sn - rest[j]!);
        const vi = f * A * cs;
        q[2 * j] = vr;
        q[2 * j + 1] = vi;
        sr += w[j]! * vr;
        si += w[j]! * vi;
      }
      this.evaluations += n;
      if (p + 1 >= bArr.length) {
        this.grow();
        bArr = this.b;
        gArr = this.g;
        coef = this.coef;
      }
      // The interpolant's Chebyshev coefficients from the nodal values, using the nodes' symmetry
      // (even m from q_j + q_{n−1−j}, odd m from the difference: half the multiplications), then
      // the antiderivative's (t units; a reading multiplies by half).
      for (let j = 0; j < nh; j++) {
        const jm = n - 1 - j;
        sym[2 * j] = q[2 * j]! + q[2 * jm]!;
        sym[2 * j + 1] = q[2 * j + 1]! + q[2 * jm + 1]!;
        anti[2 * j] = q[2 * j]! - q[2 * jm]!;
        anti[2 * j + 1] = q[2 * j + 1]! - q[2 * jm + 1]!;
      }
      for (let m = 0; m < n; m++) {
        const src = (m & 1) === 0 ? sym : anti;
        const row = m * n;
        // Two sums each for re and im: half the dependency chain (measured ~10 % of a build).
        let ar = 0;
        let ai = 0;
        let br = 0;
        let bi = 0;
        for (let j = 0; j < nh; j += 2) {
          const cj = C[row + j]!;
          const ck = C[row + j + 1]!;
          ar += cj * src[2 * j]!;
          ai += cj * src[2 * j + 1]!;
          br += ck * src[2 * j + 2]!;
          bi += ck * src[2 * j + 3]!;
        }
        cheb[2 * m] = ar + br;
        cheb[2 * m + 1] = ai + bi;
      }
      const base = p * 2 * (n + 1);
      integrateChebyshev(cheb, 0, n, coef, base);
      integrateChebyshev(cheb, 1, n, coef, base + 1);
      gArr[2 * p] = gr;
      gArr[2 * p + 1] = gi;
      gr += half * sr;
      gi += half * si;
      p++;
      bArr[p] = u1;
      u0 = u1;
    }
    this.count = p;
    this.hint = 0;
  }

  /** Adds weight·G(s) to acc[off], acc[off + 1] (uLo ≤ |s| ≤ uHi of the build). */
  addAt(s: number, weight: number, acc: Float64Array, off: number): void {
    const u = s < 0 ? -s : s;
    const b = this.b;
    const count = this.count;
    if (count === 0) return;
    // The panel holding u (b[lo] ≤ u ≤ b[lo + 1]): the last one or a neighbour, else a binary search.
    let lo = this.hint;
    if (lo >= count) lo = count - 1;
    if (!(b[lo]! <= u && u <= b[lo + 1]!)) {
      if (lo + 1 < count && u >= b[lo + 1]! && u <= b[lo + 2]!) lo++;
      else if (lo > 0 && u >= b[lo - 1]! && u <= b[lo]!) lo--;
      else {
        lo = 0;
        let hi = count;
        while (hi - lo > 1) {
          const mid = (lo + hi) >> 1;
          if (b[mid]! <= u) lo = mid;
          else hi = mid;
        }
      }
      this.hint = lo;
    }
    const b0 = b[lo]!;
    const b1 = b[lo + 1]!;
    const half = 0.5 * (b1 - b0);
    let t = (u - b0) / half - 1;
    if (t > 1) t = 1;
    else if (t < -1) t = -1;
    // Clenshaw's recurrence for both parts at once.
    const a = this.coef;
    const n = this.n;
    const base = lo * 2 * (n + 1);
    const t2 = 2 * t;
    let br1 = 0;
    let br2 = 0;
    let bi1 = 0;
    let bi2 = 0;
    for (let m = base + 2 * n; m > base; m -= 2) {
      const br0 = t2 * br1 - br2 + a[m]!;
      const bi0 = t2 * bi1 - bi2 + a[m + 1]!;
      br2 = br1;
      br1 = br0;
      bi2 = bi1;
      bi1 = bi0;
    }
    const pr = this.g[2 * lo]! + half * (t * br1 - br2 + a[base]!);
    const pi = this.g[2 * lo + 1]! + half * (t * bi1 - bi2 + a[base + 1]!);
    const wgt = s < 0 ? -weight : weight;
    acc[off] = acc[off]! + wgt * pr;
    acc[off + 1] = acc[off + 1]! + wgt * pi;
  }
}

/** Kernel evaluations LineTable.build makes for these arguments (the same panel walk, no integrand). */
export function lineTableCount(c: number, z: number, k: number, uLo: number, uHi: number, rule: LineRule): number {
  const Rc = Math.sqrt(c * c + z * z);
  const D = rule.phase / k;
  let u0 = uLo;
  let p = 0;
  while (u0 < uHi) {
    u0 = lineBreak(u0, Rc, D, rule.beta, uHi);
    p++;
    if (p === COUNT_WALK && u0 < uHi) {
      // Past the stationary point's neighbourhood each panel advances R by D: the rest of the walk
      // follows from R at its ends (the planner costs millions of these; walking them took minutes).
      p += Math.ceil((Math.sqrt(Rc * Rc + uHi * uHi) - Math.sqrt(Rc * Rc + u0 * u0)) / D);
      break;
    }
  }
  return p * rule.n;
}

/** Panels walked one by one when counting, before the rest is taken from R at the ends. */
const COUNT_WALK = 64;

// --- One edge at one output point ------------------------------------------------------------
//
// Where a table would integrate far more than the edges themselves (an output row much wider than
// the edges, as in the far field, or the gaps between a grating's lines), each open stretch of the
// line is integrated for each output point: Gauss–Legendre panels stepped in R from the end
// nearer the foot's projection, as in the tables.

const MAX_NODES = 64;
const PH = new Float64Array(MAX_NODES);
const AMP = new Float64Array(MAX_NODES);
const REST = new Float64Array(MAX_NODES);

/**
 * ∫_{uA}^{uB} c·K(c² + u²) du for 0 ≤ uA ≤ uB, added to out[off], out[off + 1] times weight. Returns the
 * kernel evaluations.
 */
export function lineIntegral(c: number, z: number, k: number, uA: number, uB: number, rule: LineRule, weight: number, out: Float64Array, off: number): number {
  const n = rule.n;
  if (n > MAX_NODES) throw new Error(`lineIntegral: at most ${MAX_NODES} nodes per panel`);
  const { x, w } = glRule(n);
  const c2 = c * c;
  const z2 = z * z;
  const Rc2 = c2 + z2;
  const Rc = Math.sqrt(Rc2);
  const dR = rule.phase / k;
  const kHalf = 0.5 * k;
  const twoZ = 2 * z;
  let u0 = uA;
  let re = 0;
  let im = 0;
  let ev = 0;
  while (u0 < uB) {
    const u1 = lineBreak(u0, Rc, dR, rule.beta, uB);
    const half = 0.5 * (u1 - u0);
    const mid = 0.5 * (u1 + u0);
    for (let j = 0; j < n; j++) {
      const u = mid + half * x[j]!;
      const rho2 = c2 + u * u;
      const Rr = Math.sqrt(rho2 + z2);
      const S = Rr + z;
      const RR = Rr * rho2;
      const inv = 1 / (S * RR);
      const iS = RR * inv;
      PH[j] = kHalf * rho2 * iS;
      AMP[j] = w[j]! * half * c * S * inv;
      REST[j] = rho2 * iS;
    }
    for (let j = 0; j < n; j++) {
      const sn = Math.sin(PH[j]!);
      const cs = Math.cos(PH[j]!);
      const f = AMP[j]!;
      const A = twoZ * sn;
      re += f * (-A * sn - REST[j]!);
      im += f * A * cs;
    }
    ev += n;
    u0 = u1;
  }
  out[off] = out[off]! + weight * re;
  out[off + 1] = out[off + 1]! + weight * im;
  return ev;
}

/**
 * ∫_{sA}^{sB} c·K(c² + u²) du for any sA ≤ sB (the integrand is even in u: a stretch across the
 * foot's projection is split there, where the phase is stationary). Returns the evaluations.
 */
export function stretchIntegral(c: number, z: number, k: number, sA: number, sB: number, rule: LineRule, weight: number, out: Float64Array, off: number): number {
  if (sA >= 0) return lineIntegral(c, z, k, sA, sB, rule, weight, out, off);
  if (sB <= 0) return lineIntegral(c, z, k, -sB, -sA, rule, weight, out, off);
  return lineIntegral(c, z, k, 0, -sA, rule, weight, out, off) + lineIntegral(c, z, k, 0, sB, rule, weight, out, off);
}

/** Kernel evaluations stretchIntegral makes. */
export function stretchIntegralCount(c: number, z: number, k: number, sA: number, sB: number, rule: LineRule): number {
  if (sA >= 0) return lineTableCount(c, z, k, sA, sB, rule);
  if (sB <= 0) return lineTableCount(c, z, k, -sB, -sA, rule);
  return lineTableCount(c, z, k, 0, -sA, rule) + lineTableCount(c, z, k, 0, sB, rule);
}
