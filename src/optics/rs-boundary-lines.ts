// Tables of the boundary integral along a straight line, for the edges of rectangles
// (rs-boundary.ts): one table per line and output row (or column), read at every output point of
// that row.
//
// An edge on a line at perpendicular offset c from the foot, parametrised by u (the distance along
// the line from the foot's projection), contributes ∫ c·K(c² + u²) du between its ends' u values
// (K as in rs-boundary.ts). For a row of outputs the offset c is the same for every output, and
// only the ends move: so we tabulate G(s) = ∫_0^s c·K(c² + u²) du once (G is odd in s) and read it
// at s = end − x for every output x and every edge end on the line. The table is a set of panels
// from u = 0 outwards, each a fixed step of the phase kR (R = √(c² + z² + u²), stationary at u = 0;
// the step's end in closed form, u² = (R − R_c)(R + R_c), R_c = √(c² + z²)), kept within β times
// the distance √(u² + R_c²) to the branch points of R at u = ±i·R_c. On each panel the integrand is
// sampled at n Gauss–Legendre nodes and the antiderivative of the interpolant kept as Chebyshev
// coefficients (rs-boundary-rules.ts), so that a reading costs a binary search and a Clenshaw sum.
import { antiderivativeMap, glRule } from './rs-boundary-rules.js';

export interface LineRule {
  /** Nodes per panel. */
  n: number;
  /** Phase change per panel (rad): the partial-integral limit of the interpolant. */
  phase: number;
  beta: number;
}

/** A reusable table (its arrays grow as needed; nothing is allocated per reading). */
export class LineTable {
  private readonly n: number;
  private readonly M: Float64Array;
  private readonly x: Float64Array;
  private readonly w: Float64Array;
  private readonly q: Float64Array;
  private readonly ph: Float64Array;
  private readonly amp: Float64Array;
  private readonly rest: Float64Array;
  /** Panel ends b[0] = 0 < b[1] < … < b[count]. */
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
    this.M = antiderivativeMap(rule.n);
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
    const { x, w, q, M, ph, amp, rest } = this;
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
    const deg = n; // the antiderivative has degree n
    let u0 = uLo;
    let R = Math.sqrt(uLo * uLo + Rc2);
    let gr = 0;
    let gi = 0;
    let p = 0;
    this.b[0] = uLo;
    while (u0 < uHi) {
      const Rn = R + dR;
      let u1 = Math.sqrt((Rn - Rc) * (Rn + Rc));
      const cap = beta * Math.sqrt(u0 * u0 + Rc2);
      if (u1 > u0 + cap) u1 = u0 + cap;
      if (u1 > uHi) u1 = uHi;
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
      // Antiderivative coefficients of this panel (t units; a reading multiplies by half).
      const base = p * 2 * (deg + 1);
      for (let m = 0; m <= deg; m++) {
        let ar = 0;
        let ai = 0;
        const row = m * n;
        for (let j = 0; j < n; j++) {
          const mj = M[row + j]!;
          ar += mj * q[2 * j]!;
          ai += mj * q[2 * j + 1]!;
        }
        coef[base + 2 * m] = ar;
        coef[base + 2 * m + 1] = ai;
      }
      gArr[2 * p] = gr;
      gArr[2 * p + 1] = gi;
      gr += half * sr;
      gi += half * si;
      p++;
      bArr[p] = u1;
      u0 = u1;
      R = Math.sqrt(u1 * u1 + Rc2);
    }
    this.count = p;
  }

  /** Adds weight·G(s) to acc[off], acc[off + 1] (uLo ≤ |s| ≤ uHi of the build). */
  addAt(s: number, weight: number, acc: Float64Array, off: number): void {
    const u = s < 0 ? -s : s;
    const b = this.b;
    const count = this.count;
    if (count === 0) return;
    // The panel holding u: b[lo] ≤ u < b[lo + 1].
    let lo = 0;
    let hi = count;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (b[mid]! <= u) lo = mid;
      else hi = mid;
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
  const Rc2 = c * c + z * z;
  const Rc = Math.sqrt(Rc2);
  const dR = rule.phase / k;
  let u0 = uLo;
  let R = Math.sqrt(uLo * uLo + Rc2);
  let p = 0;
  while (u0 < uHi) {
    const Rn = R + dR;
    let u1 = Math.sqrt((Rn - Rc) * (Rn + Rc));
    const cap = rule.beta * Math.sqrt(u0 * u0 + Rc2);
    if (u1 > u0 + cap) u1 = u0 + cap;
    if (u1 > uHi) u1 = uHi;
    p++;
    u0 = u1;
    R = Math.sqrt(u1 * u1 + Rc2);
  }
  return p * rule.n;
}
